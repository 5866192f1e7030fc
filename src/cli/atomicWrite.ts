import { mkdir, rename, rm, stat, writeFile } from 'node:fs/promises';
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

/** A plain reason for a file-system error code. */
function reasonOf(e: unknown): string {
  const code = (e as NodeJS.ErrnoException).code;
  switch (code) {
    case 'EACCES':
    case 'EPERM':
      return 'permission denied';
    case 'EROFS':
      return 'the file system is read-only';
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
export async function writeFilesAtomic(files: readonly { readonly target: string; readonly data: Uint8Array | string }[]): Promise<void> {
  const staged: { tmp: string; full: string; target: string }[] = [];
  const cleanUp = async (): Promise<void> => {
    await Promise.all(staged.map((s) => rm(s.tmp, { force: true })));
  };
  for (const { target, data } of files) {
    const full = resolve(target);
    const tmp = join(dirname(full), `.${basename(full)}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
    try {
      const existing = await stat(full).catch(() => null);
      if (existing?.isDirectory()) throw Object.assign(new Error('is a folder'), { code: 'EISDIR' });
      await ensureFolder(dirname(full));
      staged.push({ tmp, full, target });
      await writeFile(tmp, data);
    } catch (e) {
      await cleanUp();
      throw new OutputWriteError(target, reasonOf(e));
    }
  }
  for (const s of staged) {
    try {
      await rename(s.tmp, s.full);
    } catch (e) {
      await cleanUp();
      throw new OutputWriteError(s.target, reasonOf(e));
    }
  }
}

/** Writes one whole file or nothing (see writeFilesAtomic). */
export async function writeFileAtomic(target: string, data: Uint8Array | string): Promise<void> {
  await writeFilesAtomic([{ target, data }]);
}
