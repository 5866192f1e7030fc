import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bindChart, type WrittenTable } from '../../src/files/bindChart';
import type { ChartSpec } from '../../src/core/report/types';

const byVisit: WrittenTable = {
  id: 'ByVisit',
  headerRow: 10,
  column: 0,
  headers: ['Visit', 'On time', 'Late', 'Median'],
  rows: [
    ['Baseline', 5, 0, 0],
    ['Week 12', 4, 1, 1.5],
    ['Week 24', 3, 2, null],
  ],
};

const chart = (series: ChartSpec['series'], sourceTable?: string): ChartSpec => ({
  kind: 'bar',
  id: 'C',
  title: 'T',
  xLabel: 'x',
  yLabel: 'y',
  series,
  ...(sourceTable === undefined ? {} : { sourceTable }),
});

describe('bindChart finds where a chart series stands on the sheet', () => {
  it('binds x and y to the same rows of one table (rows are 1-based, columns 0-based)', () => {
    const bound = bindChart(chart([{ name: 'Late', x: ['Week 12', 'Week 24'], y: [1, 2] }], 'ByVisit'), [byVisit]);
    expect(bound).toEqual([
      { name: 'Late', x: { first: 12, last: 13, column: 0 }, y: { first: 12, last: 13, column: 2 }, xValues: ['Week 12', 'Week 24'], yValues: [1, 2], dashed: false, markersOnly: false },
    ]);
  });

  it('takes a blank cell for a missing or non-finite value, and prefers the column headed by the series name', () => {
    // "On time" and "Late" hold no equal runs; the median column has a blank in the last row.
    const bound = bindChart(chart([{ name: 'Median', x: ['Baseline', 'Week 12', 'Week 24'], y: [0, 1.5, NaN] }]), [byVisit]);
    expect(bound?.[0]?.y).toEqual({ first: 11, last: 13, column: 3 });
    expect(bound?.[0]?.yValues).toEqual([0, 1.5, null]);
    // Late = 0 at baseline, Median = 0 at baseline: with the series named "Late" the Late column is chosen.
    const late = bindChart(chart([{ name: 'Late', x: ['Baseline'], y: [0] }]), [byVisit]);
    expect(late?.[0]?.y.column).toBe(2);
  });

  it('binds an interval to dashed series in the rows of its series', () => {
    const bound = bindChart(chart([{ name: 'Median', x: ['Baseline', 'Week 12'], y: [0, 1.5], lower: [5, 4], upper: [0, 1] }]), [byVisit]);
    expect(bound?.map((s) => [s.name, s.y.column, s.dashed])).toEqual([
      ['Median', 3, false],
      ['Median lower', 1, true],
      ['Median upper', 2, true],
    ]);
  });

  it('returns null when a series is not found whole in one table, so the writer charts from a table of its own', () => {
    expect(bindChart(chart([{ name: 'Late', x: ['Week 12', 'Week 24'], y: [1, 3] }]), [byVisit])).toBeNull();
    expect(bindChart(chart([{ name: 'Late', x: ['Week 24', 'Week 12'], y: [2, 1] }]), [byVisit])).toBeNull();
  });

  it('property: a series cut from any columns of a generated table binds to cells that hold exactly its values', () => {
    const cellArb = fc.oneof(fc.integer({ min: -3, max: 3 }), fc.constantFrom('A', 'B', '=1+1'), fc.constant(null));
    const tableArb = fc
      .record({ width: fc.integer({ min: 2, max: 5 }), height: fc.integer({ min: 1, max: 8 }), headerRow: fc.integer({ min: 1, max: 50 }) })
      .chain(({ width, height, headerRow }) =>
        fc.record({
          headerRow: fc.constant(headerRow),
          rows: fc.array(fc.array(cellArb, { minLength: width, maxLength: width }), { minLength: height, maxLength: height }),
          pick: fc.record({ x: fc.nat(width - 1), y: fc.nat(width - 1), start: fc.nat(height - 1), n: fc.integer({ min: 1, max: height }) }),
        }),
      );
    fc.assert(
      fc.property(tableArb, ({ headerRow, rows, pick }) => {
        const width = rows[0]!.length;
        const t: WrittenTable = { id: 'T', headerRow, column: 0, headers: rows[0]!.map((_, j) => `c${j}`), rows };
        const n = Math.min(pick.n, rows.length - pick.start);
        const yCol = pick.y === pick.x ? (pick.x + 1) % width : pick.y;
        const slice = rows.slice(pick.start, pick.start + n);
        const x = slice.map((r) => r[pick.x] ?? null);
        const y = slice.map((r) => r[yCol] ?? null);
        // Charted x values are never blank and y values are numbers or gaps.
        if (x.some((v) => v === null) || y.some((v) => typeof v === 'string')) return;
        const bound = bindChart(chart([{ name: `c${yCol}`, x: x as (string | number)[], y: y as (number | null)[] }], 'T'), [t]);
        expect(bound).not.toBeNull();
        const s = bound![0]!;
        const cellAt = (row: number, col: number): unknown => rows[row - headerRow - 1]?.[col] ?? null;
        for (let i = 0; i < n; i++) {
          expect(cellAt(s.x.first + i, s.x.column)).toEqual(x[i]);
          expect(cellAt(s.y.first + i, s.y.column)).toEqual(y[i]);
        }
        expect(s.x.last - s.x.first + 1).toBe(n);
        expect(s.y.first).toBe(s.x.first);
      }),
      { numRuns: 300 },
    );
  });
});
