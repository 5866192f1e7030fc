import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { deflateRawSync } from 'node:zlib';
import { readXlsxBuffer, XLSX_LIMITS } from '../../src/files/readXlsx';
import { FileFormatError } from '../../src/files/errors';
import { crc32Update } from '../../src/files/crc32';
import { inflatePart, zipEntries, PartTooLargeError } from '../../src/files/zip';
import { esc, makeZip, sheetXml, tableCells, workbookParts } from '../support/zipFixture';

const TABLE = tableCells([
  ['id', 'day', 'value'],
  ['S1', 1, 5.5],
  ['S2', 8, 6],
]);
const GRID = [
  ['id', 'day', 'value'],
  ['S1', 1, 5.5],
  ['S2', 8, 6],
];
const small = (limits: Partial<typeof XLSX_LIMITS>): typeof XLSX_LIMITS => ({ ...XLSX_LIMITS, ...limits });

describe('crc32Update', () => {
  it('gives the standard check value 0xCBF43926 for "123456789" and continues across pieces', () => {
    // CRC-32/ISO-HDLC check value for the nine ASCII digits (Greg Cook's catalogue of parametrised CRC algorithms).
    const digits = new TextEncoder().encode('123456789');
    expect(crc32Update(0, digits)).toBe(0xcbf43926);
    expect(crc32Update(crc32Update(0, digits.subarray(0, 4)), digits.subarray(4))).toBe(0xcbf43926);
  });
});

describe('readXlsxBuffer on hostile and careless workbooks', () => {
  it('trims an empty, merely formatted cell at XFD1048576 instead of building a grid to it (issue item 1)', async () => {
    const buf = makeZip(workbookParts(sheetXml(TABLE, '', '<row r="1048576"><c r="XFD1048576" s="1"/></row>')));
    const read = await readXlsxBuffer(buf);
    expect(read.cells).toEqual(GRID);
  });

  it('refuses a stray value at XFD1048576 with a message naming that cell, before any grid is made (issue item 1)', async () => {
    const buf = makeZip(workbookParts(sheetXml([...TABLE, ['XFD1048576', 'x']])));
    expect(buf.length).toBeLessThan(6 * 1024); // the issue's 6 KB workbook
    const err = await readXlsxBuffer(buf).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(FileFormatError);
    expect((err as Error).message).toMatch(/from A1 to XFD1048576 .*only 10 cells hold anything: the far cell is XFD1048576\./);
  });

  it('refuses a cell past the last row or column of a worksheet, naming it (issue item 1)', async () => {
    for (const [ref, shown] of [['A99999999', 'A99999999'], ['XFE1', 'XFE1']] as const) {
      const buf = makeZip(workbookParts(sheetXml([...TABLE, [ref, 1]])));
      await expect(readXlsxBuffer(buf)).rejects.toThrow(new RegExp(`cell at ${shown}, past the last row or column a worksheet can have \\(1,048,576 rows, 16,384 columns`));
    }
    const rowOnly = makeZip(workbookParts(sheetXml(TABLE, '', '<row r="99999999"></row>')));
    await expect(readXlsxBuffer(rowOnly)).rejects.toThrow(/row 99999999, past the last row/);
  });

  it('reads a table with one stray value at A1048576 as a full-height grid whose blank rows share one row (issue item 2)', async () => {
    const read = await readXlsxBuffer(makeZip(workbookParts(sheetXml([...TABLE, ['A1048576', 'stray']]))));
    expect(read.cells.length).toBe(1_048_576);
    expect(read.cells.slice(0, 3)).toEqual(GRID);
    expect(read.cells[1_048_575]).toEqual(['stray', null, null]);
    // Shared, frozen blank rows keep the grid to one pointer per blank row.
    expect(read.cells[10]).toBe(read.cells[900_000]);
    expect(Object.isFrozen(read.cells[10])).toBe(true);
  });

  it('never inflates a part it does not need: an unused media part declared at 1.9 GB of junk is ignored (issue item 3)', async () => {
    const junk = new Uint8Array(4096).fill(0xab); // not deflate data: inflating it would fail
    const media = { name: 'xl/media/image1.png', data: '', raw: { bytes: junk, size: 1_900_000_000, crc: 0 } };
    const read = await readXlsxBuffer(makeZip(workbookParts(sheetXml(TABLE), [media])));
    expect(read.cells).toEqual(GRID);
  });

  it('stops a sheet that inflates past its cap at the cap, with a message naming the part and the cap (issue item 3)', async () => {
    // 8 MiB of white space inside sheetData compresses to a few KB; the cap is set to 1 MiB for the test.
    const bomb = sheetXml(TABLE, '', ' '.repeat(8 * 1024 * 1024));
    const buf = makeZip(workbookParts(bomb));
    expect(buf.length).toBeLessThan(64 * 1024);
    await expect(readXlsxBuffer(buf, undefined, small({ sheetBytes: 1024 * 1024 }))).rejects.toThrow(
      /The sheet "Data" \(xl\/worksheets\/sheet1\.xml\) inflates to more than 1 MiB, past the most this reader takes/,
    );
    // The total cap binds too, across parts.
    await expect(readXlsxBuffer(buf, undefined, small({ totalBytes: 2 * 1024 * 1024 }))).rejects.toThrow(PartTooLargeError);
  });

  it('inflatePart hands on no byte past the cap and stops there even when the directory understates the size (issue item 3)', async () => {
    const plain = new Uint8Array(32 * 1024 * 1024);
    const body = new Uint8Array(deflateRawSync(plain));
    // The directory claims 10 bytes: the cap must be enforced on what actually comes out, not on the claim.
    const buf = makeZip([{ name: 'p', data: '', raw: { bytes: body, size: 10, crc: 0 } }]);
    const e = zipEntries(buf).get('p')!;
    let delivered = 0;
    const cap = 1024 * 1024;
    const err = await inflatePart(buf, e, cap, { used: 0, total: Infinity }, (c) => (delivered += c.length), 'part').catch((x: unknown) => x);
    expect(err).toBeInstanceOf(PartTooLargeError);
    expect(delivered).toBeLessThanOrEqual(cap);
  });

  it('says "The file is damaged" for a wrong CRC-32, a wrong size, broken deflate data, a cut-short file and a missing sheet part (issue item 12)', async () => {
    const sheet = sheetXml(TABLE);
    const good = crc32Update(0, new TextEncoder().encode(sheet));
    const cases: [string, Uint8Array, RegExp][] = [
      ['crc', makeZip(workbookParts({ name: 'xl/worksheets/sheet1.xml', data: sheet, crc: (good ^ 1) >>> 0 })), /fails its CRC-32 check/],
      ['size', makeZip(workbookParts({ name: 'xl/worksheets/sheet1.xml', data: sheet, size: sheet.length + 5 })), /has \d+ bytes where the zip directory says/],
      ['deflate', makeZip(workbookParts({ name: 'xl/worksheets/sheet1.xml', data: '', raw: { bytes: new Uint8Array(64).fill(0xff), size: 100, crc: 0 } })), /cannot be decompressed/],
      ['cut', makeZip(workbookParts(sheet)).subarray(0, 300), /zip directory is missing/],
      ['no part', makeZip(workbookParts(sheet).filter((p) => !p.name.startsWith('xl/worksheets'))), /part xl\/worksheets\/sheet1\.xml is missing/],
    ];
    for (const [what, bytes, why] of cases) {
      const err = await readXlsxBuffer(bytes).catch((e: unknown) => e);
      expect(err, what).toBeInstanceOf(FileFormatError);
      expect((err as Error).message, what).toMatch(/^The file is damaged: /);
      expect((err as Error).message, what).toMatch(why);
    }
  });

  it('says plainly when a workbook holds no worksheet (regression: "has no any worksheet")', async () => {
    const parts = workbookParts(sheetXml(TABLE)).map((p) => (p.name === 'xl/workbook.xml' ? { ...p, data: '<workbook><sheets/></workbook>' } : p));
    await expect(readXlsxBuffer(makeZip(parts))).rejects.toThrow(/^The workbook holds no worksheet\.$/);
  });

  it('decodes entities, _xHHHH_ escapes and shared strings, leaving out phonetic runs (ECMA-376 Part 1, §18.4, ST_Xstring)', async () => {
    const ss = '<sst><si><t>Z&#252;rich &amp; Co</t></si><si><r><t>ri</t></r><r><t>ch</t></r><rPh><t>PH</t></rPh></si><si><t>a_x000D_b</t></si></sst>';
    const sheet =
      '<worksheet><sheetData><row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c><c r="C1" t="s"><v>2</v></c>' +
      '<c r="D1" t="b"><v>1</v></c><c r="E1" t="e"><v>#N/A</v></c><c r="F1"><f>1+1</f><v>2</v></c><c r="G1" t="str"><f>"x"</f><v>x</v></c></row></sheetData></worksheet>';
    const parts = workbookParts(sheet, [{ name: 'xl/sharedStrings.xml', data: ss }]).map((p) =>
      p.name === 'xl/_rels/workbook.xml.rels'
        ? { ...p, data: String(p.data).replace('</Relationships>', '<Relationship Id="rId9" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="/xl/sharedStrings.xml"/></Relationships>') }
        : p,
    );
    expect((await readXlsxBuffer(makeZip(parts))).cells).toEqual([['Zürich & Co', 'rich', 'a\rb', true, '#N/A', 2, 'x']]);
  });

  it('places every generated cell where its address says, whatever the order and gaps (property)', async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.uniqueArray(fc.tuple(fc.integer({ min: 1, max: 40 }), fc.integer({ min: 1, max: 30 }), fc.oneof(fc.integer(), fc.string({ minLength: 1 }).filter((s) => s.trim() !== '' && !/[\uD800-\uDFFF\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/.test(s)))), {
          minLength: 1,
          maxLength: 30,
          selector: (t) => `${t[0]}:${t[1]}`,
        }),
        async (cells) => {
          const letter = (c: number): string => (c <= 26 ? String.fromCharCode(64 + c) : `A${String.fromCharCode(64 + c - 26)}`);
          const xml = `<worksheet><sheetData>${cells.map(([r, c, v]) => (typeof v === 'number' ? `<row r="${r}"><c r="${letter(c)}${r}"><v>${v}</v></c></row>` : `<row r="${r}"><c r="${letter(c)}${r}" t="inlineStr"><is><t xml:space="preserve">${esc(v)}</t></is></c></row>`)).join('')}</sheetData></worksheet>`;
          const read = await readXlsxBuffer(makeZip(workbookParts(xml)));
          const minR = Math.min(...cells.map((t) => t[0]));
          const minC = Math.min(...cells.map((t) => t[1]));
          expect(read.cells.length).toBe(Math.max(...cells.map((t) => t[0])) - minR + 1);
          for (const [r, c, v] of cells) expect(read.cells[r - minR]![c - minC]).toBe(v);
          expect(read.cells.flat().filter((v) => v !== null).length).toBe(cells.length);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('meets any damage to a valid workbook\'s bytes with a FileFormatError or a result, never another exception (property)', async () => {
    const good = makeZip(workbookParts(sheetXml(TABLE)));
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(fc.nat(good.length - 1), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 8 }), async (edits) => {
        const bad = good.slice();
        for (const [at, b] of edits) bad[at] = b;
        const out = await readXlsxBuffer(bad).then(() => null, (e: unknown) => e);
        if (out !== null) expect(out).toBeInstanceOf(FileFormatError);
      }),
      { numRuns: 150 },
    );
  });
});
