/**
 * Peak memory and time of the .xlsx reader on the hostile workbooks (items 1-3), each case generated here and
 * read in a child process of its own (bench/hostile-case.ts) so that its peak resident memory is measured alone.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { crc32, createDeflateRaw } from 'node:zlib';
import { makeZip, sheetXml, workbookParts, type FixturePart } from '../test/support/zipFixture';

export interface HostileEntry {
  readonly name: string;
  readonly fileKB: number;
  readonly seconds: number;
  readonly peakMB: number;
  readonly outcome: string;
}

/** Deflates `head`, then `fill` bytes of `byte`, then `tail`, streaming (nothing of the inflated size is held). */
async function deflatedRun(head: string, byte: number, fill: number, tail: string): Promise<FixturePart['raw'] & object> {
  const z = createDeflateRaw({ level: 9 });
  const out: Buffer[] = [];
  z.on('data', (c: Buffer) => out.push(c));
  const done = new Promise((r) => z.on('end', r));
  const chunk = Buffer.alloc(1 << 20, byte);
  const h = Buffer.from(head);
  const t = Buffer.from(tail);
  let crc = crc32(h);
  z.write(h);
  for (let left = fill; left > 0; left -= chunk.length) {
    const piece = left >= chunk.length ? chunk : chunk.subarray(0, left);
    crc = crc32(piece, crc);
    if (!z.write(piece)) await new Promise((r) => z.once('drain', r));
  }
  crc = crc32(t, crc);
  z.end(t);
  await done;
  return { bytes: new Uint8Array(Buffer.concat(out)), size: h.length + fill + t.length, crc };
}

const TABLE: [string, string | number][] = [['A1', 'USUBJID'], ['B1', 'ADY'], ['C1', 'AVAL']];
for (let i = 2; i <= 121; i++) TABLE.push([`A${i}`, `S${i % 30}`], [`B${i}`, 1 + 7 * (i % 4)], [`C${i}`, i / 3]);

export async function runHostileBench(): Promise<HostileEntry[]> {
  const dir = mkdtempSync(join(tmpdir(), 'longipane-hostile-bench-'));
  const here = dirname(fileURLToPath(import.meta.url));
  const cases: [string, () => Promise<Uint8Array>][] = [
    ['stray value at XFD1048576', async () => makeZip(workbookParts(sheetXml([...TABLE, ['XFD1048576', 'x']])))],
    ['stray value at row 99,999,999', async () => makeZip(workbookParts(sheetXml([...TABLE, ['A99999999', 'x']])))],
    ['120 rows + stray at A1048576', async () => makeZip(workbookParts(sheetXml([...TABLE, ['A1048576', 'stray']])))],
    [
      'unused media part of 1.9 GB',
      async () => makeZip(workbookParts(sheetXml(TABLE), [{ name: 'xl/media/image1.png', data: '', raw: await deflatedRun('', 0, 1_900_000_000, '') }])),
    ],
    [
      'sheet inflating to 600 MB',
      async () => {
        const xml = sheetXml(TABLE);
        const cut = xml.indexOf('</sheetData>');
        return makeZip(workbookParts({ name: 'xl/worksheets/sheet1.xml', data: '', raw: await deflatedRun(xml.slice(0, cut), 0x20, 600_000_000, xml.slice(cut)) }));
      },
    ],
    [
      '600 MB sheet, size understated',
      async () => {
        const xml = sheetXml(TABLE);
        const cut = xml.indexOf('</sheetData>');
        const raw = await deflatedRun(xml.slice(0, cut), 0x20, 600_000_000, xml.slice(cut));
        return makeZip(workbookParts({ name: 'xl/worksheets/sheet1.xml', data: '', raw: { ...raw, size: 4096 } }));
      },
    ],
  ];
  const entries: HostileEntry[] = [];
  try {
    for (const [name, make] of cases) {
      const file = join(dir, 'case.xlsx');
      const bytes = await make();
      writeFileSync(file, bytes);
      const json = execFileSync(process.execPath, ['--import', 'tsx', join(here, 'hostile-case.ts'), file], { encoding: 'utf8', maxBuffer: 1 << 20 });
      const r = JSON.parse(json) as { seconds: number; peakMB: number; outcome: string };
      entries.push({ name, fileKB: Math.round(bytes.length / 1024), ...r });
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return entries;
}
