/** Small helpers of classifyVisits: nearest-target search, per-subject sort, and the after-cut-off issue. */
import type { IntakeTable } from '../intake/types';
import { cellAddress } from './address';
import type { DataPlace } from './computeStudyDays';
import { isoDate } from './dates';
import type { ScheduleIssue } from './types';

/** Index (into ascending targets) of the target nearest to d; a tie goes to the lower index. O(log visits). */
export function nearest(targets: Float64Array, d: number): number {
  let lo = 0;
  let hi = targets.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (targets[mid]! < d) lo = mid + 1;
    else hi = mid;
  }
  // lo is the first target ≥ d (or the last one); compare with its left neighbour.
  if (lo > 0 && d - targets[lo - 1]! <= Math.abs(targets[lo]! - d)) return lo - 1;
  return lo;
}

/** Sorts idx[a..b) in place: insertion sort for short runs (the usual handful of visits), else the built-in sort. */
export function sortSegment(idx: Int32Array, a: number, b: number, cmp: (x: number, y: number) => number): void {
  let sorted = true;
  for (let j = a + 1; j < b && sorted; j++) sorted = cmp(idx[j - 1]!, idx[j]!) < 0;
  if (sorted) return;
  if (b - a > 24) {
    idx.subarray(a, b).sort(cmp);
    return;
  }
  for (let j = a + 1; j < b; j++) {
    const x = idx[j]!;
    let k = j - 1;
    while (k >= a && cmp(idx[k]!, x) > 0) {
      idx[k + 1] = idx[k]!;
      k--;
    }
    idx[k + 1] = x;
  }
}

/** A record dated after its participant's exit date: kept, with a warning at the date cell. */
export function afterExitIssue(table: IntakeTable, i: number, exitDay: number, place: DataPlace | undefined): ScheduleIssue {
  const sheetRow = table.sheetRows[i]!;
  const col = table.mapping.date;
  return {
    code: 'after-exit',
    severity: 'warning',
    cell: place !== undefined && col !== undefined ? cellAddress(place.sheet, place.topLeft, col, sheetRow) : null,
    row: sheetRow,
    value: isoDate(table.date[i]!),
    use: null,
    message: `This record is dated after the participant's exit date ${isoDate(exitDay)} (data after the exit date); it is kept.`,
  };
}

export function afterCutoffIssue(table: IntakeTable, i: number, cutoff: number, dated: boolean, place: DataPlace | undefined): ScheduleIssue {
  const sheetRow = table.sheetRows[i]!;
  const col = dated ? table.mapping.date : table.mapping.studyDay;
  return {
    code: 'after-cutoff',
    severity: 'warning',
    cell: place !== undefined && col !== undefined ? cellAddress(place.sheet, place.topLeft, col, sheetRow) : null,
    row: sheetRow,
    value: dated ? isoDate(table.date[i]!) : String(table.studyDay[i]),
    use: 'timing',
    message: dated
      ? `This visit is dated after the data cut-off ${isoDate(cutoff)}, so it is left out of visit timing.`
      : `This visit's study day is after the cut-off study day ${cutoff}, so it is left out of visit timing.`,
  };
}
