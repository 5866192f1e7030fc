import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { runAnalysis } from '../../../src/core/pipeline';
import type { AnalysisSettings } from '../../../src/core/pipeline';
import { ERROR_LITERALS, type CellValue } from '../../../src/core/intake';

// Property test of the whole run, as a careless export would feed it: for any grid shaped like a visit export (with
// any cell now and then replaced by anything at all), runAnalysis never throws, and every data row is accounted for:
// either it is used for visit timing or the excluded list names it for timing. Exact properties, no tolerance.

const anyCell: fc.Arbitrary<CellValue> = fc.oneof(
  fc.double(),
  fc.integer({ min: -100, max: 3_000_000 }),
  fc.string({ maxLength: 5 }),
  fc.constantFrom(...ERROR_LITERALS, '=1+1', '2025-02-30', '2025-03', '0', '', null),
  fc.boolean(),
);
const mostly = (values: readonly CellValue[]): fc.Arbitrary<CellValue> =>
  fc.oneof({ weight: 8, arbitrary: fc.constantFrom(...values) }, { weight: 1, arbitrary: anyCell });

const row: fc.Arbitrary<CellValue[]> = fc.tuple(
  mostly(['S1', 'S2', 'S3', 'S4', 'S5', 'S6']),
  mostly(['N', 'S']),
  mostly(['Placebo', 'Active', 'Boost']),
  mostly(['Baseline', 'Week 4', 'week 8', 'Unscheduled']),
  mostly(['2025-01-06', '2025-02-03', '2025-03-05', '2025-03-31', 45700, 45730]),
  mostly(['2025-01-06', '2025-01-08']),
  mostly([50, 51.5, '49.0', 'pending']),
);
// Now and then a blank row (empty, or blank cells), and runs of one repeated row, so that both the blank-row summary
// and the joining of consecutive identical exclusions into one entry are exercised.
const blankRow: fc.Arbitrary<CellValue[]> = fc.constantFrom<CellValue[]>([], ['', null, '  '], [null]);
const rowOrRun: fc.Arbitrary<CellValue[][]> = fc.oneof(
  { weight: 6, arbitrary: row.map((r) => [r]) },
  { weight: 1, arbitrary: blankRow.map((r) => [r]) },
  { weight: 1, arbitrary: fc.tuple(row, fc.integer({ min: 2, max: 5 })).map(([r, k]) => Array.from({ length: k }, () => r)) },
);
const grid: fc.Arbitrary<CellValue[][]> = fc
  .array(rowOrRun, { minLength: 0, maxLength: 10 })
  .map((runs) => runs.flat())
  .map((rows) => [['USUBJID', 'SITEID', 'TRT01P', 'AVISIT', 'ADT', 'RANDDT', 'AVAL'], ...rows]);

const settings = (unblinded: boolean, scheduledOnly: boolean): AnalysisSettings => ({
  sheet: 'Visits',
  topLeft: 'A1',
  dateSystem: 1900,
  mode: unblinded ? 'unblinded' : 'blinded',
  schedule: [
    { label: 'Baseline', targetDay: 1, before: 0, after: 3 },
    { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
    { label: 'Week 8', targetDay: 57, before: 5, after: 5 },
  ],
  timeUnit: 'month',
  dfMethod: 'kenward-roger',
  method: 'reml',
  level: 0.95,
  scheduledOnly,
  perSubject: false,
  inputLabel: 'invented property-test grid',
  runAt: '2026-01-01T00:00:00.000Z',
  numericText: 'accept',
});

describe('runAnalysis properties', () => {
  it('runAnalysis never throws on an export-shaped grid with stray cells, and accounts for every data row in visit timing', async () => {
    await fc.assert(
      fc.asyncProperty(grid, fc.boolean(), fc.boolean(), async (cells, unblinded, scheduledOnly) => {
        const before = JSON.stringify(cells);
        const out = await runAnalysis(cells, settings(unblinded, scheduledOnly));
        expect(JSON.stringify(cells)).toBe(before); // the input is never modified
        if (!out.ok) {
          expect(out.issues.some((i) => i.severity === 'error')).toBe(true);
          return;
        }
        const input = out.json.input as { rows: number; usedForTiming: number };
        expect(input.rows).toBe(cells.length - 1);
        // Entries may span rows (row..lastRow): expand them, and check no row is named twice for timing.
        const outOfTiming = new Set<number>();
        let named = 0;
        for (const e of out.excluded.filter((x) => x.use === 'timing')) {
          for (let r = e.row; r <= (e.lastRow ?? e.row); r++) {
            outOfTiming.add(r);
            named++;
          }
        }
        expect(input.usedForTiming + outOfTiming.size).toBe(input.rows);
        // A row is named for timing by one entry per reason; it is never both used and named.
        expect(named).toBeGreaterThanOrEqual(outOfTiming.size);
      }),
      { numRuns: 120 },
    );
  });
});
