import { mkdtemp, mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { OutputWriteError, writeFileAtomic, writeFilesAtomic } from '../../src/cli/atomicWrite';

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'longipane-atomic-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('writeFileAtomic', () => {
  it('creates missing folders and replaces an existing file only with the complete new content', async () => {
    const target = join(dir, 'a', 'b', 'out.json');
    await writeFileAtomic(target, 'first');
    await writeFileAtomic(target, new TextEncoder().encode('second'));
    expect(await readFile(target, 'utf8')).toBe('second');
    expect(await readdir(join(dir, 'a', 'b'))).toEqual(['out.json']);
  });

  it('leaves the target as it was and no temporary file behind when the target cannot be replaced', async () => {
    const d = join(dir, 'blocked');
    await mkdir(join(d, 'out.xlsx', 'inner'), { recursive: true });
    await writeFile(join(d, 'out.xlsx', 'inner', 'keep.txt'), 'kept');
    await expect(writeFileAtomic(join(d, 'out.xlsx'), 'new')).rejects.toThrow();
    expect(await readdir(d)).toEqual(['out.xlsx']);
    expect(await readFile(join(d, 'out.xlsx', 'inner', 'keep.txt'), 'utf8')).toBe('kept');
  });

  it('writes no file at all when one of several cannot be written (regression: the report was kept when the JSON failed)', async () => {
    const d = join(dir, 'pair');
    await mkdir(d, { recursive: true });
    await writeFile(join(d, 'blocker'), 'a file, not a folder');
    const attempt = writeFilesAtomic([
      { target: join(d, 'report.xlsx'), data: 'report' },
      { target: join(d, 'blocker', 'results.json'), data: '{}' },
    ]);
    await expect(attempt).rejects.toThrow(OutputWriteError);
    await expect(attempt).rejects.toThrow(/results\.json": a part of the path is a file, not a folder\. Nothing was written\./);
    expect((await readdir(d)).sort()).toEqual(['blocker']);
  });

  it('says plainly that a folder is in the way, naming the target rather than a temporary file (regression: EISDIR on ".x.tmp")', async () => {
    const d = join(dir, 'folder-in-way');
    await mkdir(join(d, 'out.xlsx'), { recursive: true });
    await expect(writeFileAtomic(join(d, 'out.xlsx'), 'x')).rejects.toThrow(/^Cannot write ".*out\.xlsx": a folder of that name is in the way/);
  });

  it.runIf(process.platform === 'linux')('fails instead of hanging when the output folder cannot be made on a special file system (regression: endless mkdir under /proc)', async () => {
    // Linux only (/proc exists there): /proc refuses new entries with ENOENT, which sent Node's recursive mkdir into an endless loop.
    await expect(writeFileAtomic('/proc/longipane-no-such-folder/out.json', '{}')).rejects.toThrow(/its folder does not exist and cannot be made/);
  });
});
