import { rmSync } from 'node:fs';
import { mkdir, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';

/** An output file that could not be written, with a plain reason; nothing was replaced. */
export class OutputWriteError extends Error {
  constructor(
    readonly target: string,
    readonly reason: string,
  ) {
    super(`Cannot write "${target}": ${reason}. Nothing was written.`);
    this.name = 'OutputWriteError';
  }
}

/** Temporary files written and not yet renamed or removed: an interrupted run removes them on its way out. */
const LIVE_TEMPORARIES = new Set<string>();
/** The naming pattern of our temporaries: ".<target name>.<process id>-<8 hex digits>.tmp". */
export const TEMPORARY_NAME = /^\..+\.\d+-[0-9a-f]{8}\.tmp$/;
/** A temporary of our pattern this old is left over from a run that was killed outright (SIGKILL, power loss). */
export const STALE_AFTER_MS = 24 * 60 * 60 * 1000;

/** Removes every temporary file this process has not finished with. Synchronous, so it can run in a signal handler
 * just before the process exits. */
export function removeLiveTemporaries(): void {
  for (const t of LIVE_TEMPORARIES) rmSync(t, { force: true });
  LIVE_TEMPORARIES.clear();
}

/**
 * On SIGINT and SIGTERM, removes the run's temporary output files and exits with 128 + the signal's number (130, 143;
 * the shell's convention). SIGKILL cannot be caught by any process: its temporaries are removed by a later run
 * (removeStaleTemporaries). Call once, from the program's entry point only.
 */
export function removeTemporariesOnSignal(): void {
  for (const [signal, code] of [['SIGINT', 130], ['SIGTERM', 143]] as const) {
    process.once(signal, () => {
      removeLiveTemporaries();
      process.exit(code);
    });
  }
}

/** Removes temporaries of our naming pattern older than STALE_AFTER_MS from `dir`; errors are ignored (another
 * process may remove the same file, or the folder may not be listable). */
export async function removeStaleTemporaries(dir: string, now = Date.now()): Promise<void> {
  const names = await readdir(dir).catch(() => [] as string[]);
  for (const name of names) {
    if (!TEMPORARY_NAME.test(name)) continue;
    const full = join(dir, name);
    const st = await stat(full).catch(() => null);
    if (st?.isFile() && now - st.mtimeMs > STALE_AFTER_MS) await rm(full, { force: true }).catch(() => undefined);
  }
}

/** A plain reason for a file-system error code. */
function reasonOf(e: unknown): string {
  const code = (e as NodeJS.ErrnoException).code;
  switch (code) {
    case 'EACCES':
    case 'EPERM':
      return 'permission denied (a folder you may not write in); choose a folder of your own';
    case 'EROFS':
      return 'the file system is read-only; choose a folder of your own';
    case 'ENOSPC':
      return 'the disk is full';
    case 'ENOTDIR':
      return 'a part of the path is a file, not a folder';
    case 'EISDIR':
      return 'a folder of that name is in the way';
    case 'ENOENT':
      return 'its folder does not exist and cannot be made';
    default:
      return e instanceof Error ? e.message : String(e);
  }
}

/** Makes `dir` and any missing parents, one level at a time. Node's own recursive mkdir loops forever on some
 * special file systems (e.g. a path under /proc), so this walks up at most once per path segment. */
async function ensureFolder(dir: string): Promise<void> {
  try {
    if ((await stat(dir)).isDirectory()) return;
    throw Object.assign(new Error(`${dir} is not a folder`), { code: 'ENOTDIR' });
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ENOENT') throw e;
  }
  const parent = dirname(dir);
  if (parent === dir) throw Object.assign(new Error(`no root ${dir}`), { code: 'ENOENT' });
  await ensureFolder(parent);
  try {
    await mkdir(dir);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
  }
}

/**
 * Writes several whole files or none: each file's bytes go to a temporary file in its own folder (made if needed),
 * and only when every temporary file is complete are they renamed over their targets (rename within one folder
 * replaces atomically on POSIX file systems and on NTFS). If writing any of them fails, every temporary file is
 * removed, no target is touched, and an OutputWriteError names the file and says why.
 */
/** A file's contents: bytes, text, or text in pieces made while the file is written (written in order). */
export type FileData = Uint8Array | string | Iterable<string>;

export async function writeFilesAtomic(files: readonly { readonly target: string; readonly data: FileData }[]): Promise<void> {
  const staged: { tmp: string; full: string; target: string }[] = [];
  const cleanUp = async (): Promise<void> => {
    await Promise.all(staged.map((s) => rm(s.tmp, { force: true })));
    for (const s of staged) LIVE_TEMPORARIES.delete(s.tmp);
  };
  for (const { target, data } of files) {
    const full = resolve(target);
    const tmp = join(dirname(full), `.${basename(full)}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
    try {
      const existing = await stat(full).catch(() => null);
      if (existing?.isDirectory()) throw Object.assign(new Error('is a folder'), { code: 'EISDIR' });
      await ensureFolder(dirname(full));
      await removeStaleTemporaries(dirname(full));
      staged.push({ tmp, full, target });
      LIVE_TEMPORARIES.add(tmp);
      await writeFile(tmp, data);
    } catch (e) {
      await cleanUp();
      // A folder that exists but refuses new files (a system folder such as /proc) reports ENOENT for the new file.
      const folderThere = (e as NodeJS.ErrnoException).code === 'ENOENT' && (await stat(dirname(full)).catch(() => null))?.isDirectory() === true;
      throw new OutputWriteError(target, folderThere ? 'its folder does not accept new files (a system or read-only folder); choose a folder of your own' : reasonOf(e));
    }
  }
  for (const s of staged) {
    try {
      await rename(s.tmp, s.full);
      LIVE_TEMPORARIES.delete(s.tmp);
    } catch (e) {
      await cleanUp();
      throw new OutputWriteError(s.target, reasonOf(e));
    }
  }
}

/** Writes one whole file or nothing (see writeFilesAtomic). */
export async function writeFileAtomic(target: string, data: FileData): Promise<void> {
  await writeFilesAtomic([{ target, data }]);
}
