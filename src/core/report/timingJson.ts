import { isoDate } from '../schedule/dates';
import type { StatusCounts } from '../schedule/types';
import type { DueStatus, LastRecord, TimingSummary, VisitSummaryRow } from './timingTypes';

/** A date in the JSON: ISO 8601 text (YYYY-MM-DD) for dated data, a study day for study-day data, or null. */
export type JsonDay = string | number | null;

/** One row of `byVisit` / `byArm`: the visit summary row itself, with `arm` (by-arm table only) moved first. */
export type VisitJson = VisitSummaryRow;

/**
 * The `visits` section of the results JSON. Keys are camelCase and stable:
 * - `timeScale`: "date" (dates are ISO text) or "studyDay" (the data carry study days; dates are study days).
 * - `cutoff`: ISO date, study day, or null when each subject's own last record serves; `cutoffRule`: "given",
 *   "latestDate" or "eachSubjectsLastRecord".
 * - `subjects`: subjects taking part in visit timing.
 * - `counts`: exactly {onTime, early, late, missed, notYetDue, afterExit, extra, repeat}: statuses of (subject, visit)
 *   pairs for the first six (afterExit: not expected, the participant had left by the window's last day), of records
 *   for extra (unscheduled) and repeat.
 * - `byVisit[]`: {visit, targetDay, expected, onTime, early, late, missed, notYetDue, afterExit, due, onTimeRate,
 *   medianDeviation, minDeviation, maxDeviation}; due = expected − notYetDue; onTimeRate = onTime / due (null if 0);
 *   deviations in days (record − target) over the visits' own records.
 * - `byArm[]` (unblinded mode only): the same with `arm` first.
 * - `bySite[]` (empty without a site column): {site, subjects, due, onTime, outOfWindow, missed, afterExit, left, onTimeRate,
 *   outOfWindowRate, missedRate, combinedRate}, worst first.
 * - `deviations[]`: {subject, site, visit, targetDate, windowOpens, windowCloses, actualDate, daysOff, status, row};
 *   status is one of the count keys; row is the worksheet row of the record (null for a missed visit); plus
 *   lastRecord (the participant's latest record), daysSinceLastRecord (to the cut-off) and noRecordLately (no record
 *   for longer than two scheduled intervals, and no exit date).
 * - `exits[]`: {subject, site, exitDate, exitStudyDay, lastVisit, status, reason}: participants who left the study.
 * - `upcoming[]`: {subject, site, visit, windowOpens, targetDate, windowCloses, daysUntilTarget, status} with status
 *   "overdue", "windowOpen" or "comingUp", and the same three last-record keys; participants who left are not listed.
 */
export interface VisitsJson {
  readonly timeScale: 'date' | 'studyDay';
  readonly cutoff: JsonDay;
  readonly cutoffRule: TimingSummary['cutoffRule'];
  readonly subjects: number;
  readonly counts: StatusCounts;
  readonly byVisit: readonly VisitJson[];
  readonly byArm?: readonly VisitJson[];
  readonly bySite: readonly Record<string, string | number | null>[];
  readonly deviations: readonly Record<string, string | number | boolean | null>[];
  readonly upcoming: readonly { readonly [k: string]: string | number | boolean | null; readonly status: DueStatus }[];
  readonly exits: readonly Record<string, string | number | null>[];
}

/** Builds the `visits` JSON section from the timing summary (see VisitsJson for the keys). O(listed lines). */
export function timingJson(summary: TimingSummary): VisitsJson {
  const day = (d: number | null): JsonDay => (d === null ? null : summary.dated ? isoDate(d) : d);
  const visit = ({ arm, ...rest }: VisitSummaryRow): VisitJson => ({ ...(arm !== undefined ? { arm } : {}), ...rest });
  const c = summary.counts;
  return {
    timeScale: summary.dated ? 'date' : 'studyDay',
    cutoff: day(summary.cutoff),
    cutoffRule: summary.cutoffRule,
    subjects: summary.subjects,
    counts: { onTime: c.onTime, early: c.early, late: c.late, missed: c.missed, notYetDue: c.notYetDue, afterExit: c.afterExit, extra: c.extra, repeat: c.repeat },
    byVisit: summary.byVisit.map(visit),
    ...(summary.byArm !== null ? { byArm: summary.byArm.map(visit) } : {}),
    bySite: (summary.bySite ?? []).map((s) => ({
      site: s.site,
      subjects: s.subjects,
      due: s.due,
      onTime: s.onTime,
      outOfWindow: s.outOfWindow,
      missed: s.missed,
      afterExit: s.afterExit,
      left: s.left,
      onTimeRate: s.onTimeRate,
      outOfWindowRate: s.outOfWindowRate,
      missedRate: s.missedRate,
      combinedRate: s.combinedRate,
    })),
    deviations: summary.deviations.map((d) => ({
      subject: d.subject,
      site: d.site,
      visit: d.visit,
      targetDate: day(d.targetDate),
      windowOpens: day(d.windowOpens),
      windowCloses: day(d.windowCloses),
      actualDate: day(d.actualDate),
      daysOff: d.daysOff,
      status: d.status,
      row: d.sheetRow,
      ...lastRecordJson(d.lastRecord),
    })),
    upcoming: summary.upcoming.map((u) => ({
      subject: u.subject,
      site: u.site,
      visit: u.visit,
      windowOpens: day(u.windowOpens),
      targetDate: day(u.targetDate),
      windowCloses: day(u.windowCloses),
      daysUntilTarget: u.daysUntilTarget,
      status: u.status,
      ...lastRecordJson(u.lastRecord),
    })),
    exits: summary.exits.map((e) => ({
      subject: e.subject,
      site: e.site,
      exitDate: isoDate(e.exitDate),
      exitStudyDay: e.exitStudyDay,
      lastVisit: e.lastVisit,
      status: e.status,
      reason: e.reason,
    })),
  };

  function lastRecordJson(l: LastRecord): { lastRecord: JsonDay; daysSinceLastRecord: number | null; noRecordLately: boolean } {
    return { lastRecord: day(l.date), daysSinceLastRecord: l.daysSince, noRecordLately: l.silent };
  }
}
