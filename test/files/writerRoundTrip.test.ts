// @vitest-environment jsdom
/**
 * Property tests of the streaming writer (fast-check, invented cells): whatever text and numbers a table holds, the
 * written package is well-formed XML (checked with jsdom's DOMParser, a conforming XML parser) and reads back through
 * src/files/readXlsx.ts as the same cells: text as text (XML-special characters, control characters escaped as
 * ECMA-376 Part 1 ST_Xstring _xHHHH_, a literal "_x0041_", lone surrogates, leading and trailing spaces, "=1+1"),
 * text past Excel's 32,767-character cell limit cut with its marker, numbers as the same doubles (−0 as 0, the smallest
 * subnormal, the largest double), day numbers in date columns unchanged.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { SheetCell, SheetSpec } from '../../src/core/report/types';
import { readXlsxBuffer } from '../../src/files/readXlsx';
import { fitCell, writeWorkbook } from '../../src/files/writeWorkbook';
import { cellText } from '../../src/files/xlsxText';
import { packageParts } from '../support/workbookContent';

/** Text with the characters that need care in SpreadsheetML, mixed with ordinary ones. */
const awkward = fc.oneof(
  fc.string({ unit: fc.constantFrom('<', '>', '&', '"', "'", '\t', '\n', '\r', '\u0000', '\u0001', '\u000b', '\u001f', '\ufffe', '\uffff', '\ud800', '\udfff', '_', 'x', '0', '4', '1', 'A', 'é', '😀', ' ', '=') }),
  fc.string({ unit: 'binary' }),
  fc.constantFrom('=1+1', '_x0041_', '_x005F_', ' lead', 'trail ', '\r\n', '+1', '@x', '-0'),
);

/** Doubles, with the edge cases named: −0, subnormals, the extremes. */
const numbers = fc.oneof(
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.constantFrom(-0, 5e-324, -5e-324, 2.2250738585072014e-308, 1.7976931348623157e308, -1.7976931348623157e308, 1e21, 0.1 + 0.2),
  fc.integer(),
);

/** What the reader gives back for a written cell: the text cut to the cell limit, −0 as 0, an empty text as blank. */
function expected(v: SheetCell): SheetCell {
  if (typeof v === 'string') return v === '' ? null : fitCell(v);
  if (typeof v === 'number') return Object.is(v, -0) ? 0 : v;
  return v;
}

function sheet(rows: SheetCell[][]): SheetSpec {
  return {
    name: 'Round trip',
    title: 'Invented cells',
    blocks: [
      {
        kind: 'table',
        id: 'Cells',
        caption: '',
        columns: [
          { header: 'Text', format: 'text' },
          { header: 'Number', format: 'decimal6' },
          { header: 'Day', format: 'date' },
        ],
        rows,
      },
    ],
  };
}

async function wellFormed(bytes: Uint8Array): Promise<void> {
  for (const [name, text] of await packageParts(bytes)) {
    if (!name.endsWith('.xml') && !name.endsWith('.rels')) continue;
    const doc = new DOMParser().parseFromString(text, 'application/xml');
    const error = doc.getElementsByTagName('parsererror')[0];
    if (error !== undefined) throw new Error(`${name} is not well-formed XML: ${error.textContent ?? ''}`);
  }
}

describe('the streaming writer round-trips any cell', () => {
  it('text, numbers and day numbers read back unchanged, and every part is well-formed XML', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(awkward, numbers, fc.integer({ min: 1, max: 2_958_465 })), { minLength: 1, maxLength: 30 }), async (rows) => {
        const bytes = await writeWorkbook([sheet(rows)]);
        await wellFormed(bytes);
        const read = await readXlsxBuffer(bytes);
        // Row 1 title, row 2 blank, row 3 header, then the table body (no caption).
        expect(read.cells[2]).toEqual(['Text', 'Number', 'Day']);
        const body = read.cells.slice(3).map((r) => [r[0] ?? null, r[1] ?? null, r[2] ?? null]);
        expect(body).toEqual(rows.map((r) => r.map(expected)));
      }),
      { numRuns: 60 },
    );
  });

  it('cuts text past the 32,767-character cell limit and keeps text up to it whole', async () => {
    await fc.assert(
      fc.asyncProperty(fc.integer({ min: 32_700, max: 40_000 }), fc.constantFrom('a', '<', '_x0041_', '\u0001'), async (n, unit) => {
        const text = unit.repeat(Math.ceil(n / unit.length)).slice(0, n);
        const read = await readXlsxBuffer(await writeWorkbook([sheet([[text, 1, 1]])]));
        expect(read.cells[3]![0]).toBe(fitCell(text));
        expect((read.cells[3]![0] as string).length).toBe(Math.min(text.length, 32_767));
      }),
      { numRuns: 8 },
    );
  });

  it('escapes exactly the characters XML cannot hold as _xHHHH_ (ECMA-376 Part 1 §22.9.2.19), a pair of surrogates passing through', () => {
    expect(cellText('a<b&c>"d"')).toBe('a&lt;b&amp;c&gt;&quot;d&quot;');
    expect(cellText('\r\u0001\t\n')).toBe('_x000D__x0001_\t\n');
    expect(cellText('_x0041_ and _x00')).toBe('_x005F_x0041_ and _x00');
    expect(cellText('\ud800x\udc00 😀')).toBe('_xD800_x_xDC00_ 😀');
    expect(cellText('plain text')).toBe('plain text');
  });
});
