import type { ScheduleVisit } from './types';

/**
 * An invented 12-weekly schedule for the starter sheet and the demo (a kidney-function trial measuring eGFR every
 * 12 weeks): baseline on day 1 with no allowance, then weeks 12 to 48 on days 85, 169, 253 and 337 (7 · weeks + 1),
 * each allowed 7 days either side. Invented for illustration; it is no real protocol's schedule.
 */
export const STARTER_SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 12', targetDay: 85, before: 7, after: 7 },
  { label: 'Week 24', targetDay: 169, before: 7, after: 7 },
  { label: 'Week 36', targetDay: 253, before: 7, after: 7 },
  { label: 'Week 48', targetDay: 337, before: 7, after: 7 },
];

/** Headings of the starter sheet (parseSchedule also accepts the CSV header visit,target_day,days_before,days_after). */
export const STARTER_HEADINGS: readonly string[] = ['Visit name', 'Target day', 'Days allowed before', 'Days allowed after'];

/** Headings of the schedule CSV file. */
export const CSV_HEADINGS: readonly string[] = ['visit', 'target_day', 'days_before', 'days_after'];

/**
 * The starter schedule as a cell grid, headings first; `csv` picks the CSV headings. parseSchedule reads it back
 * unchanged. Example: starterScheduleCells()[1] → ["Baseline", 1, 0, 0].
 */
export function starterScheduleCells(options: { readonly csv?: boolean } = {}): (string | number)[][] {
  const head = options.csv === true ? CSV_HEADINGS : STARTER_HEADINGS;
  return [[...head], ...STARTER_SCHEDULE.map((v) => [v.label, v.targetDay, v.before, v.after])];
}
