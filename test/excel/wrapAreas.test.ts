/** Wrap areas for paragraphs (src/excel/wrapAreas.ts) and their place in the sheet layout (src/excel/layout.ts). */
import { describe, expect, it } from 'vitest';
import type { SheetSpec, TableColumn } from '../../src/core/report/types';
import { layoutSheet } from '../../src/excel/layout';
import { fitHeight, LINE_POINTS, MAX_ROW_POINTS, textColumns } from '../../src/excel/wrapAreas';

/** Eight short-headed columns: each planned at the default 12 characters, 96 in all. */
const EIGHT: TableColumn[] = ['Site', 'Arm', 'Week', 'n', 'Mean', 'SD', 'Low', 'High'].map((header) => ({ header, format: 'decimal1' }));

/** Invented text of exactly `n` characters. */
const text = (n: number): string => 'eGFR fell in the invented demo trial. '.repeat(Math.ceil(n / 38)).slice(0, n);

/** An invented results sheet: a heading, a long caution, a short note and a table of 8 columns. */
function sheet(cautionLength: number): SheetSpec {
  return {
    name: 'Results',
    title: 'Results (invented demo data)',
    blocks: [
      { kind: 'paragraph', text: 'What the model says', style: 'heading' },
      { kind: 'paragraph', text: text(cautionLength), style: 'caution' },
      { kind: 'paragraph', text: 'Short note.' },
      { kind: 'table', id: 'BySite', caption: 'By site', columns: EIGHT, rows: [[1, 2, 3, 4, 5, 6, 7, 8]] },
    ],
  };
}

describe('textColumns', () => {
  it('spans the widest table, at least 6 and at most 12 columns', () => {
    expect(textColumns([3, 8, 2])).toBe(8);
    expect(textColumns([])).toBe(6);
    expect(textColumns([4])).toBe(6);
    expect(textColumns([20, 5])).toBe(12);
  });
});

describe('fitHeight', () => {
  // Exact arithmetic of the stated rule: lines = ceil(characters / (width × 1.1)), 15 points a line, at most 409.
  it('gives 15 points per estimated line, one line at least', () => {
    expect(fitHeight(0, 96)).toBe(LINE_POINTS);
    expect(fitHeight(105, 96)).toBe(15); // 105 / 105.6 → 1 line
    expect(fitHeight(106, 96)).toBe(30); // 106 / 105.6 → 2 lines
    expect(fitHeight(330, 96)).toBe(60); // 330 / 105.6 = 3.13 → 4 lines
  });

  it("never exceeds Excel's maximum row height of 409 points and never shrinks as text grows", () => {
    // 409 points: Excel specifications and limits (row height); 27 lines are 405 points, 28 would be 420.
    expect(fitHeight(27 * 105, 96)).toBe(405);
    expect(fitHeight(28 * 105.6, 96)).toBe(MAX_ROW_POINTS);
    expect(fitHeight(1_000_000, 96)).toBe(409);
    let last = 0;
    for (let n = 0; n <= 4000; n += 7) {
      const h = fitHeight(n, 72);
      expect(h).toBeGreaterThanOrEqual(last);
      last = h;
    }
  });
});

describe('layoutSheet wrap areas', () => {
  it('wraps the caution and the note across the 8 columns of the widest table, with heights that fit the text', () => {
    const layout = layoutSheet(sheet(330), 1900);
    // Rows: title 0, heading 2, caution 4, note 6. 8 columns × 12 characters = 96; 330 characters → 4 lines.
    expect(layout.wrapAreas).toEqual([
      { row: 4, columnCount: 8, heightPoints: 60 },
      { row: 6, columnCount: 8, heightPoints: 15 },
    ]);
  });

  it('keeps the title and headings single cells: no wrap area on their rows', () => {
    const layout = layoutSheet(sheet(330), 1900);
    const rows = layout.wrapAreas.map((a) => a.row);
    expect(rows).not.toContain(0);
    expect(rows).not.toContain(2);
    expect(layout.patches.find((p) => p.row === 2)?.style).toBe('heading');
  });

  it('grows the row height with the length of the text, up to 409 points', () => {
    const heights = [100, 330, 700, 1500, 3000, 20_000].map((n) => layoutSheet(sheet(n), 1900).wrapAreas[0]?.heightPoints);
    // 96 characters × 1.1 = 105.6 a line: 1, 4, 7, 15, 29 (capped) lines.
    expect(heights).toEqual([15, 60, 105, 225, 409, 409]);
  });

  it("uses the planned widths of the area's columns", () => {
    const wide: TableColumn[] = EIGHT.map((c, j) => (j === 0 ? { ...c, width: 30 } : c));
    const spec = sheet(330);
    const layout = layoutSheet({ ...spec, blocks: spec.blocks.map((b) => (b.kind === 'table' ? { ...b, columns: wide } : b)) }, 1900);
    // 30 + 7 × 12 = 114 characters; 330 / 125.4 → 3 lines.
    expect(layout.wrapAreas[0]).toEqual({ row: 4, columnCount: 8, heightPoints: 45 });
  });

  it('spans 6 columns on a sheet without tables and plans those columns at the default width the estimate used', () => {
    const layout = layoutSheet({ name: 'Notes', title: 'Notes', blocks: [{ kind: 'paragraph', text: text(330) }] }, 1900);
    // 6 × 12 = 72 characters; 330 / 79.2 = 4.17 → 5 lines.
    expect(layout.wrapAreas).toEqual([{ row: 2, columnCount: 6, heightPoints: 75 }]);
    expect(layout.columnWidths).toEqual([12, 12, 12, 12, 12, 12]);
  });

  it('plans no wrap areas and no extra widths on a sheet without normal or caution paragraphs', () => {
    const layout = layoutSheet(
      { name: 'T', title: 'T', blocks: [{ kind: 'paragraph', text: 'Only a heading', style: 'heading' }, { kind: 'table', id: 'X', caption: 'c', columns: [{ header: 'h', format: 'integer' }], rows: [[1]] }] },
      1900,
    );
    expect(layout.wrapAreas).toEqual([]);
    expect(layout.columnWidths).toEqual([12]);
  });
});
