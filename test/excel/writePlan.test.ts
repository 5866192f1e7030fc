/** Grouping writes into requests (src/excel/writePlan.ts) and the sheet layout (src/excel/layout.ts); pure functions. */
import { describe, expect, it } from 'vitest';
import type { CellPatch } from '../../src/excel/layout';
import { layoutSheet } from '../../src/excel/layout';
import { halvePatch, planWrites } from '../../src/excel/writePlan';

const patch = (row: number, rows: number, cols: number): CellPatch => ({
  row,
  column: 0,
  values: Array.from({ length: rows }, (_, i) => Array.from({ length: cols }, (_, j) => i * cols + j)),
  formats: Array.from({ length: rows }, () => Array.from({ length: cols }, () => '0')),
  style: 'normal',
});

describe('planWrites', () => {
  it('keeps small patches together in one request', () => {
    const plan = planWrites([patch(0, 1, 1), patch(2, 3, 4)], 1_500_000, 200_000);
    expect(plan).toHaveLength(1);
    expect(plan[0]?.map((p) => [p.row, p.values.length])).toEqual([
      [0, 1],
      [2, 3],
    ]);
  });

  it('cuts a big patch by rows at the cell budget, covering every row once and in order', () => {
    // 10,000 rows × 10 columns at 20,000 cells per request → exactly 5 requests of 2,000 rows (exact arithmetic).
    const plan = planWrites([patch(5, 10_000, 10)], 1e12, 20_000);
    expect(plan.map((g) => g.map((p) => [p.row, p.values.length]))).toEqual([0, 1, 2, 3, 4].map((k) => [[5 + 2000 * k, 2000]]));
    expect(plan.flat().flatMap((p) => p.values.map((r) => r[0]))).toEqual(Array.from({ length: 10_000 }, (_, i) => i * 10));
  });

  it('respects the byte budget and never plans an empty request', () => {
    const plan = planWrites([patch(0, 5000, 5)], 50_000, 1e9);
    expect(plan.length).toBeGreaterThan(1);
    for (const g of plan) expect(g.every((p) => p.values.length > 0)).toBe(true);
    expect(plan.flat().reduce((n, p) => n + p.values.length, 0)).toBe(5000);
  });

  it('halvePatch splits rows, first half rounded up, second half starting where the first ends', () => {
    const [a, b] = halvePatch(patch(10, 5, 2));
    expect([a.row, a.values.length, b.row, b.values.length]).toEqual([10, 3, 13, 2]);
  });
});

describe('layoutSheet', () => {
  it('stacks title, paragraph and table with blank rows between and freezes through a lone table header', () => {
    const layout = layoutSheet(
      {
        name: 'S',
        title: 'T',
        blocks: [
          { kind: 'paragraph', text: 'p' },
          { kind: 'table', id: 'X', caption: 'c', columns: [{ header: 'h', format: 'integer' }], rows: [[1], [2]] },
        ],
      },
      1900,
    );
    expect(layout.patches.map((p) => p.row)).toEqual([0, 2, 4, 5, 6]);
    expect(layout.tables).toEqual([{ id: 'X', row: 5, column: 0, rowCount: 3, columnCount: 1 }]);
    expect(layout.freezeRows).toBe(6);
  });

  it('gives an empty table one body row, since an Excel table needs one', () => {
    const layout = layoutSheet({ name: 'S', title: 'T', blocks: [{ kind: 'table', id: 'E', caption: 'c', columns: [{ header: 'h', format: 'text' }], rows: [] }] }, 1900);
    expect(layout.tables[0]?.rowCount).toBe(2);
  });

  it('charts intervals as dashed series beside their estimate and lines up series on the union of x values', () => {
    const layout = layoutSheet(
      {
        name: 'S',
        title: 'T',
        blocks: [
          {
            kind: 'chart',
            chart: {
              kind: 'scatter',
              id: 'C',
              title: 't',
              xLabel: 'Month',
              yLabel: 'eGFR',
              series: [
                { name: 'A', x: [0, 3], y: [1, 2], lower: [0.5, 1.5], upper: [1.5, 2.5], style: 'line' },
                { name: 'B', x: [3, 6], y: [4, 5] },
              ],
            },
          },
        ],
      },
      1900,
    );
    const chart = layout.charts[0];
    expect(chart?.type).toBe('XYScatterLines');
    expect(chart?.series.map((s) => [s.name, s.column, s.dashed, s.markersOnly])).toEqual([
      ['A', 1, false, false],
      ['A lower', 2, true, false],
      ['A upper', 3, true, false],
      ['B', 4, false, true],
    ]);
    const body = layout.patches.find((p) => p.row === 4)?.values;
    expect(body).toEqual([
      [0, 1, 0.5, 1.5, ''],
      [3, 2, 1.5, 2.5, 4],
      [6, '', '', '', 5],
    ]);
  });

  it('does not mutate the spec it lays out', () => {
    const spec = { name: 'S', title: 'T', blocks: [{ kind: 'table' as const, id: 'X', caption: 'c', columns: [{ header: 'h', format: 'date' as const }], rows: [[45000]] }] };
    const copy = structuredClone(spec);
    layoutSheet(spec, 1904);
    expect(spec).toEqual(copy);
  });
});
