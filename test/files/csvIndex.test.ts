import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { GridSource, sourceGrid } from '../../src/core/intake/cellSource';
import { readTable } from '../../src/core/intake/readTable';
import { indexCsv } from '../../src/files/csvIndex';

/** A field written as RFC 4180 §2 says: quoted when it holds the delimiter, a quote or a line break. */
const field = (s: string): string => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);

// Fields from a small alphabet that reaches every branch: delimiters, quotes, CR, LF, spaces, a no-break space.
const fieldArb = fc.string({ unit: fc.constantFrom('a', '1', ' ', ',', '"', '\n', '\r', '\u00a0', 'é', ';'), maxLength: 6 });

describe('indexCsv (the one CSV splitter, a CellSource over the text)', () => {
  it('round-trips any grid written with RFC 4180 quoting (property; rows padded, blank trailing columns and rows dropped)', () => {
    fc.assert(
      fc.property(fc.array(fc.array(fieldArb, { minLength: 1, maxLength: 5 }), { minLength: 1, maxLength: 8 }), (grid) => {
        const text = grid.map((r) => r.map(field).join(',')).join('\r\n');
        // The expected grid by the rules, written independently of the splitter.
        const rows = grid.map((r) => [...r]);
        while (rows.length > 0 && rows[rows.length - 1]!.every((f) => f.trim() === '')) rows.pop();
        let width = 0;
        for (const r of rows) {
          let last = r.length;
          while (last > 0 && r[last - 1]!.trim() === '') last--;
          width = Math.max(width, last);
        }
        const expected = rows.map((r) => Array.from({ length: width }, (_, c) => r[c] ?? ''));
        // A header line holding more semicolons than commas makes ';' the delimiter; keep to comma-led headers.
        fc.pre((grid[0]!.join('').match(/;/g) ?? []).length <= grid[0]!.length - 1);
        const read = indexCsv(text);
        expect(sourceGrid(read.source)).toEqual(expected);
        // Cell by cell and row blankness agree with the same cells as a 2-D array.
        const grid2 = new GridSource(expected);
        for (let r = 0; r < expected.length; r++) {
          expect(read.source.isBlankRow(r, width)).toBe(grid2.isBlankRow(r, width));
          for (let c = 0; c <= width; c++) expect(read.source.cell(r, c)).toBe(grid2.cell(r, c));
        }
      }),
    );
  });

  it('gives intake the same table and issues as the grid of the same file (the demo listing, with its four bad cells)', () => {
    const text = readFileSync(join(__dirname, '..', '..', 'demo', 'egfr-visits.csv'), 'utf8');
    const source = indexCsv(text).source;
    const options = { sheet: 'egfr-visits', topLeft: 'A1', dateSystem: 1900, mode: 'unblinded', numericText: 'accept' } as const;
    const fromIndex = readTable(source, options);
    const fromGrid = readTable(sourceGrid(source), options);
    expect(fromIndex.ok).toBe(true);
    expect(fromIndex).toEqual(fromGrid);
    expect(fromIndex.issues.map((i) => i.cell)).toContain("'egfr-visits'!G42");
  });

  it('names the row and column of a quoted field that never closes', () => {
    expect(() => indexCsv('a,b\n1,"open\n2,3\n')).toThrow(/cell B2/);
  });

  it('answers blank past the end and undefined past the width, as a padded grid does', () => {
    const s = indexCsv('a,b\n1\n').source;
    expect([s.cell(1, 0), s.cell(1, 1), s.cell(1, 2), s.cell(5, 0)]).toEqual(['1', '', undefined, undefined]);
    expect(s.rowCells(0)).toEqual(['a', 'b']);
  });
});
