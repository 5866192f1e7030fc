import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { GridSource } from '../../src/core/intake/cellSource';
import type { CellValue } from '../../src/core/intake/types';
import { readXlsxBuffer, readXlsxSource } from '../../src/files/readXlsx';
import { plainDecimal, SharedStringScanner, SheetScanner, type FoundCells } from '../../src/files/sheetScan';
import { readXlsxGrid } from '../support/gridXlsxReader';
import { sheetWorkbook, type SheetCell, type SheetRow } from '../support/sheetWorkbook';
import { makeZip, workbookParts } from '../support/zipFixture';

/**
 * The streaming .xlsx reader (src/files/sheetScan.ts, xlsxCells.ts) against the grid reader it replaced
 * (test/support/gridXlsxReader.ts): the same cells, addresses, messages. Parsing rules cited from ECMA-376 Part 1,
 * SpreadsheetML (section numbers from memory): §18.3.1.73 row (r: 1-based row number; a row without r follows the
 * one before), §18.3.1.4 c (r: A1 reference; a cell without r follows the one before; t: ST_CellType §18.18.11, s:
 * style), §18.3.1.96 v, §18.3.1.53 is / t / rPh (inline string, phonetic runs left out), §18.4 the shared-string
 * table (v of a t="s" cell is a 0-based index into it).
 */

/** Every way the old grid and the new source can be asked, compared: each cell (and one column past the width),
 * each row's cells, blank rows at two widths, and the grid readXlsxBuffer now makes. */
async function expectSameReading(bytes: Uint8Array, sheet?: string): Promise<void> {
  const before = await readXlsxGrid(bytes, sheet).then(
    (r) => ({ ok: true as const, r }),
    (e: unknown) => ({ ok: false as const, message: (e as Error).message, name: (e as Error).name }),
  );
  const after = await readXlsxSource(bytes, sheet).then(
    (r) => ({ ok: true as const, r }),
    (e: unknown) => ({ ok: false as const, message: (e as Error).message, name: (e as Error).name }),
  );
  if (!before.ok || !after.ok) {
    expect(after).toEqual(before);
    return;
  }
  const old = before.r;
  const now = after.r;
  expect({ sheet: now.sheet, topLeft: now.topLeft, dateSystem: now.dateSystem, sheetNames: now.sheetNames }).toEqual({
    sheet: old.sheet,
    topLeft: old.topLeft,
    dateSystem: old.dateSystem,
    sheetNames: old.sheetNames,
  });
  const grid = new GridSource(old.cells);
  const src = now.source;
  expect(src.rowCount).toBe(grid.rowCount);
  const width = old.cells[0]!.length;
  expect(src.width).toBe(width);
  for (let r = -1; r <= grid.rowCount; r++) {
    for (let c = -1; c <= width; c++) {
      const a = src.cell(r, c);
      const b = grid.cell(r, c);
      if (!Object.is(a, b)) expect(a, `cell (${r}, ${c})`).toBe(b);
    }
    expect(src.rowCells(r)).toEqual(grid.rowCells(r));
    expect(src.isBlankRow(r, width)).toBe(grid.isBlankRow(r, width));
    expect(src.isBlankRow(r, 1)).toBe(grid.isBlankRow(r, 1));
  }
  expect((await readXlsxBuffer(bytes, sheet)).cells).toEqual(old.cells);
  // longestText is a bound on every text cell.
  for (const row of old.cells) for (const v of row) if (typeof v === 'string') expect(v.length).toBeLessThanOrEqual(src.longestText);
}

/** The demo listing (demo/egfr-visits.csv, invented) as a spreadsheet program would store it: texts as shared
 * strings, dates as serials under a date style, numbers as numbers, blanks as no cell. */
function demoRows(): SheetRow[] {
  const lines = readFileSync(new URL('../../demo/egfr-visits.csv', import.meta.url), 'utf8').trim().split(/\r?\n/);
  const serial = (iso: string): number => Date.parse(`${iso}T00:00:00Z`) / 86_400_000 + 25569; // ECMA-376 §18.17.4.1, exact identity
  return lines.map((line, i) => ({
    row: i + 1,
    cells: line.split(',').map((f): SheetCell => {
      if (f === '') return null;
      if (i > 0 && /^\d{4}-\d{2}-\d{2}$/.test(f)) return { date: serial(f) };
      if (i > 0 && /^-?\d+(\.\d+)?$/.test(f)) return Number(f);
      return f;
    }),
  }));
}

const SST = '<sst><si><t>alpha</t></si><si><t>  </t></si><si><t></t></si><si><r><t>be</t></r><r><t>ta</t></r><rPh><t>PH</t></rPh></si><si><t>Z&#252;rich &amp; _x000D_</t></si></sst>';
/** A one-sheet workbook with the shared-string table above. */
function withStrings(sheet: string): Uint8Array {
  const parts = workbookParts(sheet, [{ name: 'xl/sharedStrings.xml', data: SST }]).map((p) =>
    p.name === 'xl/_rels/workbook.xml.rels'
      ? { ...p, data: String(p.data).replace('</Relationships>', '<Relationship Id="rId9" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings" Target="sharedStrings.xml"/></Relationships>') }
      : p,
  );
  return makeZip(parts);
}
const sheet = (rows: string): string => `<?xml version="1.0"?><worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>${rows}</sheetData></worksheet>`;

describe('the streaming .xlsx reader against the grid reader it replaced', () => {
  it('reads the demo listing as a spreadsheet program stores it cell for cell as the grid reader did', async () => {
    const rows = demoRows();
    expect(rows.length).toBeGreaterThan(500);
    for (const strings of ['shared', 'inline'] as const) {
      const bytes = await sheetWorkbook(() => rows, { strings, sheetName: 'Visits' });
      await expectSameReading(bytes);
      const read = await readXlsxSource(bytes);
      // Spot checks against the CSV text itself: the header, a date serial, a value.
      expect(read.source.rowCells(0)).toEqual(rows[0]!.cells);
      const dated = rows[1]!.cells.findIndex((c) => typeof c === 'object' && c !== null && 'date' in c);
      expect(read.source.cell(1, dated)).toBe((rows[1]!.cells[dated] as { date: number }).date);
    }
  });

  it('gives the same cells for the forms a writer may use: prefixes, quotes, entities, escapes, cells and rows without r, odd values', async () => {
    const cases = [
      // Namespace prefixes, single quotes, spaces around '=', lower-case and absolute references.
      `<x:row r='1'><x:c r = 'A1' t='s'><x:v>0</x:v></x:c><c r="$B$1"><v>2</v></c><c r="c1" t="b"><v>1</v></c></x:row>`,
      // Rows and cells without r, a gap, an empty row tag, empty cells, an empty v.
      '<row><c><v>1</v></c><c/><c><v>3</v></c></row><row r="4"/><row><c r="B5"><v/></c><c t="s"><v>1</v></c></row>',
      // Attribute values with entities and _xHHHH_ escapes (decoded before use).
      '<row r="&#49;"><c r="A&#49;" t="&#115;"><v>3</v></c><c r="_x0042_1"><v>7</v></c></row>',
      // Numbers: every spelling Number() takes or refuses.
      '<row r="1">' +
        ['1', '-0', '+3', '.5', '5.', '1e3', '1E-3', '1.7976931348623157e308', '1e400', ' 12 ', '0x1A', '12345678901234567', '0.1', '3.14159265358979', '1e22', '1e23', '9007199254740993', 'abc', '1,5']
          .map((v, k) => `<c r="${String.fromCharCode(65 + k)}1"><v>${v}</v></c>`)
          .join('') +
        '</row>',
      // Booleans, shared indices out of range, blank, spaced, not integers; t="d", "str", "e" and an unknown type.
      '<row r="2"><c r="A2" t="b"><v>true</v></c><c r="B2" t="b"><v> 1 </v></c><c r="C2" t="b"><v>0</v></c><c r="D2" t="s"><v>9</v></c><c r="E2" t="s"><v>1</v></c>' +
        '<c r="F2" t="s"><v>2</v></c><c r="G2" t="s"><v> 4 </v></c><c r="H2" t="s"><v>1.0</v></c><c r="I2" t="s"><v>-1</v></c><c r="J2" t="d"><v>2025-01-06</v></c>' +
        '<c r="K2" t="str"><f>A1</f><v>x &lt; y</v></c><c r="L2" t="e"><v>#N/A</v></c><c r="M2" t="zz"><v>q</v></c><c r="N2" t=""><v>5</v></c></row>',
      // Inline strings: rich runs, phonetic runs left out, xml:space, text split by a comment, a v inside inlineStr.
      '<row r="3"><c r="A3" t="inlineStr"><is><r><t>ri</t></r><r><t xml:space="preserve"> ch </t></r><rPh sb="0" eb="1"><t>PH</t></rPh></is></c>' +
        '<c r="B3" t="inlineStr"><is><t>a<!-- c -->b</t></is></c><c r="C3" t="inlineStr"><v>plain</v></c><c r="D3" t="inlineStr"><is><t></t></is></c><c r="E3" t="inlineStr"><is><t>Z&#252;rich_x000D_&amp;</t></is></c>' +
        '<c r="F3" t="inlineStr"><is><t>\u00e9\u4e2d\ud83d\ude00</t></is></c><c r="G3" t="s"><is><t>0</t></is></c></row>',
      // Cells out of order and a cell written twice (the later one wins), and a value-less duplicate.
      '<row r="5"><c r="C5"><v>3</v></c><c r="A5"><v>1</v></c></row><row r="2"><c r="B2"><v>2</v></c><c r="B2"><v>22</v></c><c r="B2" t="inlineStr"><is><t></t></is></c></row>',
      // A processing instruction and comments holding tags; a tag name with a non-ASCII character.
      '<?pi <c r="Z9"><v>9</v></c>?><!-- <row r="7"><c r="A7"><v>1</v></c></row> --><row r="1"><c r="A1"><v>1</v></c><c\u00a0r="B1"><v>2</v></c><cé r="C1"><v>3</v></cé></row>',
      // c tags in every spacing: no space between attributes, two spaces, a tab, an empty cell with a space before
      // '/>', a '/' not before '>', a '>' inside a quoted value (the tag ends there for the tokeniser).
      '<row r="1"><c r="A1"t="s"><v>0</v></c><c  r="B1"><v>2</v></c><c\tr="C1"><v>3</v></c><c r="D1" /><c r="E1" / ><v>5</v></c><c r="F1>" t="s"><v>0</v></c><c r="G1"><v>7</v></c></row>',
      // Limits: a row number and references past the worksheet, and an unreadable reference.
      '<row r="1048577"><c><v>1</v></c></row>',
      '<row r="1"><c r="XFE1"><v>1</v></c></row>',
      '<row r="1"><c r="A1"><v>1</v></c><c r="1A"><v>2</v></c></row>',
      '<row r="1"><c r="A1"><v>1</v></c><c r="B1x"><v>2</v></c></row>',
      '<row r="1"><c r="ABCDEFGH1"><v>1</v></c></row>',
      '<row r="1"><c r="A0"><v>1</v></c></row>',
      '<row r="1.5"><c><v>1</v></c></row>',
      '<row r="1048576"><c r="XFD1048576"><v>1</v></c></row><row r="1"><c r="A1"><v>1</v></c></row>',
      '<row r="1"><c r="XFD1"><v>1</v></c><c><v>2</v></c></row>',
      // Nothing at all, and only empty strings.
      '',
      '<row r="1"><c r="A1" t="inlineStr"><is><t></t></is></c><c r="B1" t="s"><v>2</v></c></row>',
    ];
    for (const rows of cases) await expectSameReading(withStrings(sheet(rows)));
  });

  it('reads random sheets written by our writer back as written, as the grid reader did (property)', async () => {
    const text = fc.string({ maxLength: 12 }).filter((s) => !/[\uD800-\uDFFF]/.test(s));
    const cell: fc.Arbitrary<SheetCell> = fc.oneof(
      fc.constant(null),
      fc.double({ noNaN: true, noDefaultInfinity: true }),
      fc.integer({ min: -1e6, max: 1e6 }),
      fc.integer({ min: 0, max: 99_999 }).map((n) => n / 100),
      text,
      fc.constantFrom('Placebo', 'Week 12', 'Site 03'),
      fc.boolean(),
      fc.constantFrom('#N/A', '#DIV/0!', '#VALUE!').map((error) => ({ error })),
      fc.integer({ min: 40_000, max: 50_000 }).map((date) => ({ date })),
      text.map((formulaText) => ({ formulaText })),
    );
    const rowsArb = fc
      .array(fc.tuple(fc.integer({ min: 1, max: 3 }), fc.integer({ min: 1, max: 4 }), fc.array(cell, { maxLength: 6 })), { minLength: 1, maxLength: 12 })
      .map((list) => {
        let row = 0;
        return list.map(([gap, firstCol, cells]) => ({ row: (row += gap), firstCol, cells }));
      });
    await fc.assert(
      fc.asyncProperty(rowsArb, fc.constantFrom('shared', 'inline', 'mixed'), fc.boolean(), fc.boolean(), async (rows, strings, date1904, omit) => {
        const bytes = await sheetWorkbook(() => rows, { strings, date1904, omitRef: (r, c) => omit && (r + c) % 2 === 0 });
        await expectSameReading(bytes);
        // And as written: each cell where its row and column say (a blank text reads as no value, -0 as 0).
        const expected: [number, number, CellValue][] = [];
        for (const r of rows) {
          r.cells.forEach((c, k) => {
            if (c === null || c === undefined) return;
            const v: CellValue = typeof c === 'object' ? ('error' in c ? c.error : 'date' in c ? c.date : c.formulaText) : c;
            if (v === '') return;
            expected.push([r.row, (r.firstCol ?? 1) + k, typeof v === 'number' && v === 0 ? 0 : v]);
          });
        }
        if (expected.length === 0) return;
        const read = await readXlsxSource(bytes);
        const minR = Math.min(...expected.map((e) => e[0]));
        const minC = Math.min(...expected.map((e) => e[1]));
        expect(read.dateSystem).toBe(date1904 ? 1904 : 1900);
        for (const [r, c, v] of expected) expect(read.source.cell(r - minR, c - minC)).toBe(v);
      }),
      { numRuns: 100 },
    );
  });
});

describe('SheetScanner', () => {
  const scan = (bytes: Uint8Array, cuts: readonly number[]): FoundCells => {
    const s = new SheetScanner({ strings: ['a', 'b'], rowsMax: 1_048_576, columnsMax: 16_384, past: (w) => new Error(w) });
    let at = 0;
    for (const cut of [...cuts, bytes.length]) {
      s.push(bytes.subarray(at, Math.max(at, cut)));
      at = Math.max(at, cut);
    }
    s.end();
    return s.found;
  };
  const facts = (f: FoundCells): unknown => ({
    rows: [...f.rows.subarray(0, f.length)],
    cols: [...f.cols.subarray(0, f.length)],
    kinds: [...f.kinds.subarray(0, f.length)],
    nums: [...f.nums.subarray(0, f.length)],
    texts: f.texts,
  });

  it('finds the same cells whatever the chunks the inflater hands it, split inside tags, values and UTF-8 characters (property)', async () => {
    const xml = sheet(
      '<row r="1"><c r="A1" t="s"><v>1</v></c><c r="B1"><v>52.5</v></c><c r="C1" t="inlineStr"><is><t>Z\u00fcrich \u4e2d\ud83d\ude00 &amp; a&gt;b</t></is></c></row>' +
        '<row r="2"><c r="A2" t="inlineStr"><is><r><t>x</t></r><rPh><t>p</t></rPh><r><t>y</t></r></is></c><c r="B2" t="b"><v>1</v></c><c r="C2" t="e"><v>#N/A</v></c><c r="D2" s="1"><v>45663</v></c></row>' +
        `<row r="3"><c r="A3" t="inlineStr"><is><t>${'long text '.repeat(40)}</t></is></c></row>`,
    );
    const bytes = new TextEncoder().encode(xml);
    const whole = facts(scan(bytes, []));
    expect((whole as { texts: string[] }).texts).toContain('Z\u00fcrich \u4e2d\ud83d\ude00 & a>b');
    for (const size of [1, 2, 3, 5, 64]) {
      const cuts: number[] = [];
      for (let k = size; k < bytes.length; k += size) cuts.push(k);
      expect(facts(scan(bytes, cuts)), `chunks of ${size}`).toEqual(whole);
    }
    await fc.assert(
      fc.asyncProperty(fc.uniqueArray(fc.integer({ min: 1, max: bytes.length - 1 }), { maxLength: 40 }), async (cuts) => {
        expect(facts(scan(bytes, [...cuts].sort((a, b) => a - b)))).toEqual(whole);
      }),
      { numRuns: 200 },
    );
  });

  it('keeps memory flat on a long run of text outside any cell: it is passed over, not held (issue 12 item 3 style)', () => {
    const s = new SheetScanner({ strings: [], rowsMax: 1_048_576, columnsMax: 16_384, past: (w) => new Error(w) });
    s.push(new TextEncoder().encode('<worksheet><sheetData><row r="1"><c r="A1"><v>1</v></c></row>'));
    const spaces = new Uint8Array(1 << 20).fill(0x20);
    for (let k = 0; k < 16; k++) s.push(spaces);
    // Nothing of the 16 MiB waits for the next chunk.
    expect((s as unknown as { pending: Uint8Array }).pending.length).toBe(0);
    s.push(new TextEncoder().encode('</sheetData></worksheet>'));
    s.end();
    expect(s.found.length).toBe(1);
  });
});

describe('SharedStringScanner', () => {
  it('reads each si as the text of its t elements outside rPh, decoded, whatever the chunks (ECMA-376 Part 1, §18.4; property)', async () => {
    const xml =
      '<?xml version="1.0"?><x:sst xmlns:x="main" count="6"><x:si><x:t>alpha</x:t></x:si><si><t xml:space="preserve">  </t></si><si/><si><t></t></si>' +
      '<si><r><rPr><b/></rPr><t>be</t></r><r><t>ta</t></r><rPh sb="0" eb="1"><t>PH</t></rPh></si><si><t>Z&#252;rich &amp; _x000D_ \u4e2d\ud83d\ude00 a&gt;b</t></si>' +
      '<!-- a comment --><si><t>last</t></si></x:sst>';
    const bytes = new TextEncoder().encode(xml);
    const read = (cuts: readonly number[]): string[] => {
      const s = new SharedStringScanner();
      let at = 0;
      for (const cut of [...cuts, bytes.length]) {
        s.push(bytes.subarray(at, Math.max(at, cut)));
        at = Math.max(at, cut);
      }
      s.end();
      return s.strings;
    };
    const expected = ['alpha', '  ', '', '', 'beta', 'Z\u00fcrich & \r \u4e2d\ud83d\ude00 a>b', 'last'];
    expect(read([])).toEqual(expected);
    for (const size of [1, 2, 3, 5]) {
      const cuts: number[] = [];
      for (let k = size; k < bytes.length; k += size) cuts.push(k);
      expect(read(cuts), `chunks of ${size}`).toEqual(expected);
    }
    await fc.assert(
      fc.asyncProperty(fc.uniqueArray(fc.integer({ min: 1, max: bytes.length - 1 }), { maxLength: 30 }), async (cuts) => {
        expect(read([...cuts].sort((a, b) => a - b))).toEqual(expected);
      }),
      { numRuns: 200 },
    );
  });
});

describe('plainDecimal', () => {
  it('gives exactly the double Number() gives for plain decimals, and declines the rest (Clinger 1990 exact case; property)', () => {
    const enc = new TextEncoder();
    for (const t of ['0', '-0', '52.5', '0.1', '1e22', '123456789012345', '4.35', '1E-5', '+7']) {
      const b = enc.encode(t);
      expect(Object.is(plainDecimal(b, 0, b.length), Number(t)), t).toBe(true);
    }
    for (const t of ['', '.', '-', '1e23', '1e', '1234567890123456', '0x10', ' 1', '1 ', 'Infinity', '1.2.3', '1e-23']) {
      const b = enc.encode(t);
      expect(plainDecimal(b, 0, b.length), t).toBeNull();
    }
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 20 }), (v, digits) => {
        for (const t of [String(v), v.toFixed(digits), v.toExponential(Math.min(digits, 14))]) {
          const b = enc.encode(t);
          const got = plainDecimal(b, 0, b.length);
          if (got !== null) expect(Object.is(got, Number(t)), t).toBe(true);
        }
      }),
      { numRuns: 2000 },
    );
  });
});
