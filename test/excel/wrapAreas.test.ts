/** Wrap areas for paragraphs (src/excel/wrapAreas.ts) and their place in the sheet layout (src/excel/layout.ts). */
import { describe, expect, it } from 'vitest';
import type { SheetSpec, TableColumn } from '../../src/core/report/types';
import { layoutSheet } from '../../src/excel/layout';
import { paragraphHeight } from '../../src/core/report/paragraphHeight';
import { POINTS_PER_CHARACTER, textColumns } from '../../src/excel/wrapAreas';

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

describe('layoutSheet wrap areas', () => {
  it('wraps the caution and the note across the 8 columns of the widest table, with heights that fit the text', () => {
    const layout = layoutSheet(sheet(330), 1900);
    // Rows: title 0, heading 2, caution 4, note 6. 8 columns × 12 characters × 7 points = 672 points; the caution
    // is bold. Heights from the shared core function (its own tests pin the arithmetic): 330 characters → 3 lines.
    expect(layout.wrapAreas).toEqual([
      { row: 4, columnCount: 8, heightPoints: paragraphHeight(text(330), 96 * POINTS_PER_CHARACTER, true) },
      { row: 6, columnCount: 8, heightPoints: 15 },
    ]);
    expect(layout.wrapAreas[0]!.heightPoints).toBe(45);
  });

  it('keeps the title and headings single cells: no wrap area on their rows', () => {
    const layout = layoutSheet(sheet(330), 1900);
    const rows = layout.wrapAreas.map((a) => a.row);
    expect(rows).not.toContain(0);
    expect(rows).not.toContain(2);
    expect(layout.patches.find((p) => p.row === 2)?.style).toBe('heading');
  });

  it('grows the row height with the length of the text, up to 409 points', () => {
    const lengths = [100, 330, 700, 1500, 3000, 20_000];
    const heights = lengths.map((n) => layoutSheet(sheet(n), 1900).wrapAreas[0]?.heightPoints);
    expect(heights).toEqual(lengths.map((n) => paragraphHeight(text(n), 96 * POINTS_PER_CHARACTER, true)));
    for (let i = 1; i < heights.length; i++) expect(heights[i]!).toBeGreaterThanOrEqual(heights[i - 1]!);
    expect(heights[0]).toBe(15);
    expect(heights[heights.length - 1]).toBe(409); // 20,000 characters: more than 27 lines, capped
  });

  it("uses the planned widths of the area's columns", () => {
    const wide: TableColumn[] = EIGHT.map((c, j) => (j === 0 ? { ...c, width: 30 } : c));
    const spec = sheet(330);
    const layout = layoutSheet({ ...spec, blocks: spec.blocks.map((b) => (b.kind === 'table' ? { ...b, columns: wide } : b)) }, 1900);
    // 30 + 7 × 12 = 114 characters of 7 points.
    expect(layout.wrapAreas[0]).toEqual({ row: 4, columnCount: 8, heightPoints: paragraphHeight(text(330), 114 * POINTS_PER_CHARACTER, true) });
    expect(layout.wrapAreas[0]!.heightPoints).toBeLessThanOrEqual(layoutSheet(spec, 1900).wrapAreas[0]!.heightPoints);
  });

  it('spans 6 columns on a sheet without tables and plans those columns at the default width the estimate used', () => {
    const layout = layoutSheet({ name: 'Notes', title: 'Notes', blocks: [{ kind: 'paragraph', text: text(330) }] }, 1900);
    // 6 × 12 = 72 characters of 7 points; a normal (regular weight) paragraph.
    expect(layout.wrapAreas).toEqual([{ row: 2, columnCount: 6, heightPoints: paragraphHeight(text(330), 72 * POINTS_PER_CHARACTER, false) }]);
    expect(layout.wrapAreas[0]!.heightPoints).toBeGreaterThan(15);
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
