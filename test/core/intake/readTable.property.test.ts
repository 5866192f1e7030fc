import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  ERROR_LITERALS,
  parseCell,
  readTable,
  type CellValue,
  type ColumnMapping,
  type IntakeOptions,
  type IntakeResult,
} from '../../../src/core/intake';

// Property tests: for any grid, readTable never throws, never mutates its input, accounts for every data row per use
// and points every issue at a real cell of the grid. These are exact properties (no tolerance).

const anyCell: fc.Arbitrary<CellValue> = fc.oneof(
  fc.double(), // includes NaN, ±Infinity, -0, huge and tiny values
  fc.integer({ min: -100, max: 3_000_000 }),
  fc.string({ maxLength: 6 }),
  fc.constantFrom(...ERROR_LITERALS, ' #n/a ', '=1+1', '2025-02-30', '2025-03', '2025-03-04', '2025-03-04T10:30', '1,000', ' 7 ', '0', '-1e3'),
  fc.boolean(),
  fc.constantFrom(null, undefined, '', '   '),
);

/** Cells that often make usable rows, so the row pass and the arm checks run, not only the blocking checks. */
const likelyCell: fc.Arbitrary<CellValue> = fc.oneof(
  { weight: 4, arbitrary: fc.constantFrom<CellValue>('S1', 'S2', 'S3', 'S4', 'A', 'B', 45700, 1, 12, -3, 58.5, '2025-03-04', '61.5') },
  { weight: 1, arbitrary: anyCell },
);

const grid = (cell: fc.Arbitrary<CellValue>, header: fc.Arbitrary<CellValue[]>): fc.Arbitrary<CellValue[][]> =>
  header.chain((h) =>
    fc
      .array(fc.array(cell, { minLength: 0, maxLength: h.length + 2 }), { minLength: 0, maxLength: 12 })
      .map((rows) => [h, ...rows]),
  );

/** Rows shaped like the invented eGFR export, with a cell now and then replaced by any cell at all. */
const mostly = <T extends CellValue>(values: readonly T[]): fc.Arbitrary<CellValue> =>
  fc.oneof({ weight: 9, arbitrary: fc.constantFrom(...values) }, { weight: 1, arbitrary: anyCell });
const shapedRow: fc.Arbitrary<CellValue[]> = fc
  .tuple(
    mostly(['S1', 'S2', 'S3', 'S4', 'S5']),
    mostly([45700, 45712.5, '2025-03-04', '2025-03-04T10:30', 1500]),
    mostly([58.5, 61, '61.5', 70]),
    fc.boolean(),
    mostly(['S01', 'S02']),
    mostly([1, 85, -3]),
    mostly([40, 63, 'n/a']),
  )
  .map(([s, d, v, sameArm, site, day, age]) => {
    const arm = (s === 'S1' || s === 'S2' || s === 'S5') === sameArm ? 'Active' : 'Placebo';
    return [s, d, v, arm, site, day, age];
  });
const shapedGrid: fc.Arbitrary<CellValue[][]> = fc
  .array(shapedRow, { minLength: 1, maxLength: 15 })
  .map((rows) => [['USUBJID', 'ADT', 'AVAL', 'TRT01P', 'SITEID', 'ADY', 'AGE'], ...rows]);

const anyGrid = fc.oneof(
  { weight: 2, arbitrary: shapedGrid },
  grid(anyCell, fc.array(anyCell, { minLength: 0, maxLength: 7 })),
  grid(likelyCell, fc.constant<CellValue[]>(['Subject', 'Study day', 'Result', 'Arm'])),
);

const anyMapping: fc.Arbitrary<ColumnMapping | undefined> = fc.option(
  fc
    .record(
      {
        subject: fc.integer({ min: -1, max: 8 }),
        date: fc.integer({ min: -1, max: 8 }),
        studyDay: fc.integer({ min: -1, max: 8 }),
        reference: fc.integer({ min: -1, max: 8 }),
        visit: fc.integer({ min: -1, max: 8 }),
        value: fc.integer({ min: -1, max: 8 }),
        arm: fc.integer({ min: -1, max: 8 }),
        site: fc.integer({ min: -1, max: 8 }),
        covariates: fc.array(fc.integer({ min: 0, max: 8 }), { maxLength: 2 }),
      },
      { requiredKeys: ['covariates'] },
    )
    .map((m) => m as ColumnMapping),
  { nil: undefined, freq: 2 },
);

const anyOptions = fc.record({
  mode: fc.constantFrom('blinded' as const, 'unblinded' as const),
  dateSystem: fc.constantFrom(1900 as const, 1904 as const),
  numericText: fc.constantFrom('accept' as const, 'reject' as const),
  topLeft: fc.constantFrom('A1', 'C5', 'XEA100'),
  sheet: fc.constantFrom('Visits', "Bob's data", ''),
});

function run(cells: CellValue[][], o: Omit<IntakeOptions, 'mapping'>, mapping: ColumnMapping | undefined): IntakeResult {
  return readTable(cells, mapping === undefined ? o : { ...o, mapping });
}

describe('readTable properties', () => {
  it('readTable never throws on any grid and never mutates it', () => {
    fc.assert(
      fc.property(anyGrid, anyOptions, anyMapping, (cells, o, mapping) => {
        const copy = structuredClone(cells);
        run(cells, o, mapping);
        expect(cells).toEqual(copy);
        // Object.is per cell, so NaN, -0 and undefined versus a hole are compared exactly.
        cells.forEach((row, r) => row.forEach((c, k) => expect(Object.is(c, copy[r]![k])).toBe(true)));
      }),
      { numRuns: 600 },
    );
  });

  it('readTable accounts for every data row per use: usable, or named by an issue with that use', () => {
    let okRuns = 0;
    fc.assert(
      fc.property(anyGrid, anyOptions, anyMapping, (cells, o, mapping) => {
        const r = run(cells, o, mapping);
        if (!r.ok) {
          expect(r.issues.some((i) => i.severity === 'error')).toBe(true);
          return;
        }
        okRuns++;
        const t = r.table;
        expect(t.nRows).toBe(cells.length - 1);
        const rangeUses = new Set(r.issues.filter((i) => i.row === null).map((i) => i.use));
        for (let i = 0; i < t.nRows; i++) {
          expect(t.usableModel[i]! <= t.usableTiming[i]!).toBe(true);
          for (const use of ['timing', 'model'] as const) {
            const usable = use === 'timing' ? t.usableTiming[i] === 1 : t.usableModel[i] === 1;
            const row = t.sheetRows[i]!;
            // A blank row is named by the one summary issue whose spans cover it (left out of both uses).
            const spanned = r.issues.some((x) => x.rowSpans?.some(([a, b]) => a <= row && row <= b) === true);
            const named = rangeUses.has(use) || spanned || r.issues.some((x) => x.row === row && x.use === use);
            expect(usable || named, `row ${t.sheetRows[i]} ${use}`).toBe(true);
          }
          if (t.usableTiming[i] === 1) {
            expect(t.subjectIndex[i]).toBeGreaterThanOrEqual(0);
            expect(Number.isFinite(t.timeKind === 'date' ? t.date[i]! : t.studyDay[i]!)).toBe(true);
          }
          if (t.usableModel[i] === 1) expect(Number.isFinite(t.value[i]!)).toBe(true);
        }
        if (t.mode === 'blinded') {
          expect(t.arm).toBeNull();
          expect(t.mapping.arm).toBeUndefined();
        }
      }),
      { numRuns: 600 },
    );
    // The generator must reach a full table often enough for the property to bite: about 100 of 600 runs do (seen
    // over repeated runs, binomial spread about 9), so 60 leaves a wide margin against a seed-dependent failure.
    expect(okRuns).toBeGreaterThan(60);
  });

  it('readTable points every issue cell at a real cell of the grid, on the row it names', () => {
    fc.assert(
      fc.property(anyGrid, anyOptions, anyMapping, (cells, o, mapping) => {
        const r = run(cells, o, mapping);
        const top = parseCell(o.topLeft);
        const width = Math.max(1, cells[0]!.length);
        for (const issue of r.issues) {
          expect(issue.message.length).toBeGreaterThan(0);
          if (issue.cell === null) {
            expect(issue.row).toBeNull();
            continue;
          }
          const bang = issue.cell.lastIndexOf('!');
          const sheetPart = bang < 0 ? '' : issue.cell.slice(0, bang);
          expect(sheetPart === o.sheet || sheetPart === `'${o.sheet.replace(/'/g, "''")}'`).toBe(true);
          const ref = parseCell(issue.cell.slice(bang + 1));
          expect(ref.col).toBeGreaterThanOrEqual(top.col);
          expect(ref.col).toBeLessThan(top.col + width);
          expect(ref.row).toBeGreaterThanOrEqual(top.row);
          expect(ref.row).toBeLessThanOrEqual(top.row + cells.length - 1);
          if (issue.row !== null) expect(ref.row).toBe(issue.row);
        }
      }),
      { numRuns: 600 },
    );
  });
});
