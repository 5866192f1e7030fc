import { mkdtemp, mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeFileAtomic } from '../../src/cli/atomicWrite';

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

  it('leaves the target as it was and no temporary file behind when the rename fails', async () => {
    const d = join(dir, 'blocked');
    await mkdir(join(d, 'out.xlsx', 'inner'), { recursive: true });
    await writeFile(join(d, 'out.xlsx', 'inner', 'keep.txt'), 'kept');
    await expect(writeFileAtomic(join(d, 'out.xlsx'), 'new')).rejects.toThrow();
    expect(await readdir(d)).toEqual(['out.xlsx']);
    expect(await readFile(join(d, 'out.xlsx', 'inner', 'keep.txt'), 'utf8')).toBe('kept');
  });
});
