import { mkdir, rename, rm, writeFile } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { randomBytes } from 'node:crypto';

/**
 * Writes a whole file or nothing: the bytes go to a temporary file in the same folder (created if needed), which is
 * then renamed over the target (rename within one folder replaces atomically on POSIX file systems and on NTFS).
 * If anything fails the temporary file is removed and an existing target is left as it was.
 */
export async function writeFileAtomic(target: string, data: Uint8Array | string): Promise<void> {
  const full = resolve(target);
  const dir = dirname(full);
  await mkdir(dir, { recursive: true });
  const tmp = join(dir, `.${basename(full)}.${process.pid}-${randomBytes(4).toString('hex')}.tmp`);
  try {
    await writeFile(tmp, data);
    await rename(tmp, full);
  } catch (e) {
    await rm(tmp, { force: true });
    throw e;
  }
}
