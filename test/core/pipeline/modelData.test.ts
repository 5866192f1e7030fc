import { describe, expect, it } from 'vitest';
import { readTable } from '../../../src/core/intake';
import { classifyVisits, computeStudyDays } from '../../../src/core/schedule';
import { contrastDays, excludedRows, modelRows, observedMeans, orderedArms } from '../../../src/core/pipeline';
import type { CellValue, Issue } from '../../../src/core/intake/types';

const SCHEDULE = [
  { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
];

/** Invented study-day data: S1 and S3 in arm B, S2 and S4 in arm A; S1 has a repeat at week 4. */
const CELLS: CellValue[][] = [
  ['USUBJID', 'TRT01P', 'AVISIT', 'ADY', 'AVAL'],
  ['S1', 'B', 'Baseline', 1, 10],
  ['S1', 'B', 'Week 4', 29, 14],
  ['S1', 'B', 'Week 4', 31, 20],
  ['S2', 'A', 'Baseline', 1, 12],
  ['S2', 'A', 'Week 4', 30, 11],
  ['S3', 'B', 'Baseline', 1, 8],
  ['S4', 'A', 'Baseline', 1, 9],
];

function setup(mode: 'blinded' | 'unblinded') {
  const read = readTable(CELLS, { sheet: 'V', topLeft: 'A1', dateSystem: 1900, mode });
  if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('; '));
  const place = { sheet: 'V', topLeft: 'A1' };
  const days = computeStudyDays(read.table, SCHEDULE, place);
  const timing = classifyVisits(read.table, days, SCHEDULE, { place });
  return { table: read.table, days, timing };
}

describe('model rows, contrasts and observed means', () => {
  it('modelRows with scheduledOnly keeps each visit record and drops the repeat', () => {
    const { table, timing } = setup('blinded');
    expect(Array.from(modelRows(table, timing, true))).toEqual([1, 1, 0, 1, 1, 1, 1]);
    expect(Array.from(modelRows(table, timing, false))).toEqual([1, 1, 1, 1, 1, 1, 1]);
  });

  it('orderedArms puts the chosen reference arm first and keeps the order of appearance otherwise', () => {
    expect(orderedArms(['B', 'A', 'C'], 'A')).toEqual(['A', 'B', 'C']);
    expect(orderedArms(['B', 'A'], undefined)).toEqual(['B', 'A']);
    expect(orderedArms(['B', 'A'], 'Z')).toEqual(['B', 'A']);
  });

  it('contrastDays are the target days of every scheduled visit, baseline included, in order of target day', () => {
    expect(contrastDays(SCHEDULE)).toEqual([
      { label: 'Baseline', day: 1 },
      { label: 'Week 4', day: 29 },
    ]);
  });

  it('observedMeans average each subject’s matched record per visit, by arm when arms are given', () => {
    const { table, timing } = setup('unblinded');
    const include = modelRows(table, timing, false);
    const means = observedMeans(table, timing, SCHEDULE, include, ['A', 'B']);
    // By hand: Baseline A = (12 + 9) / 2, B = (10 + 8) / 2; Week 4 A = 11 (day 30), B = 14 (day 29 is closer to the
    // target than the repeat on day 31).
    expect(means.map((m) => [m.visit, m.arm, m.n, m.mean])).toEqual([
      ['Baseline', 'A', 2, 10.5],
      ['Baseline', 'B', 2, 9],
      ['Week 4', 'A', 1, 11],
      ['Week 4', 'B', 1, 14],
    ]);
    const pooled = observedMeans(table, timing, SCHEDULE, include, []);
    // Sample SD of {14, 11}: |14 − 11| / √2 (exact identity for two values).
    expect(pooled[1]).toMatchObject({ visit: 'Week 4', arm: null, n: 2, mean: 12.5 });
    expect(pooled[1]!.sd).toBeCloseTo(3 / Math.SQRT2, 12); // floating-point rounding only
  });
});

describe('excludedRows', () => {
  const issue = (row: number | null, use: Issue['use'], severity: Issue['severity'] = 'warning', message = `m${row}`): Issue => ({
    code: 'blank-value',
    severity,
    cell: row === null ? null : `V!E${row}`,
    row,
    role: 'value',
    value: '',
    use,
    message,
  });

  it('keeps row-level warnings with a use, sorted by row then timing before model, listed once each', () => {
    const list = excludedRows([issue(9, 'model'), issue(3, 'model'), issue(3, 'timing'), issue(3, 'timing'), issue(null, 'model'), issue(4, null), issue(5, 'model', 'error')]);
    expect(list).toEqual([
      { row: 3, cell: 'V!E3', use: 'timing', reason: 'm3' },
      { row: 3, cell: 'V!E3', use: 'model', reason: 'm3' },
      { row: 9, cell: 'V!E9', use: 'model', reason: 'm9' },
    ]);
  });
});
