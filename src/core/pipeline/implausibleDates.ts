import type { Issue, IntakeTable } from '../intake/types';
import { renderMessage, PLAUSIBLE_SLACK_DAYS } from '../intake/messages';
import { offsetOfStudyDay } from '../intake/dayOffset';
import { cellAddress, dayNumberFromIso, isoDate } from '../schedule';
import type { DataPlace } from '../schedule';
import type { ScheduleVisit, StudyDays } from '../schedule/types';

/** Visit dates far outside the data: per row 1 when flagged, and one warning per flagged row. */
export interface ImplausibleDates {
  readonly flags: Uint8Array;
  readonly issues: readonly Issue[];
  readonly count: number;
}

/**
 * Flags visit dates that a mistyped year would give (2205 for 2025, 9999-12-31), so that one of them cannot move the
 * default cut-off. A dated row that serves visit timing is flagged, with a warning at its date cell (the record is
 * kept), when its date is
 *   (a) after the day of the run (`runAt`, passed in: core has no clock), or
 *   (b) more than PLAUSIBLE_SLACK_DAYS (180) days after the latest reference date plus the schedule's last window
 *       close (the last target's offset plus its days allowed after), or
 *   (c) more than PLAUSIBLE_SLACK_DAYS days before its participant's reference date plus the schedule's earliest
 *       window open (the first target's offset minus its days allowed before) — e.g. 400 days before randomisation.
 * The first rule that holds is the one reported. Study-day data are never flagged (no calendar). O(rows + schedule).
 * @example a visit dated 2205-03-01 in a trial randomising in 2025, run on 2026-01-01: flagged by (a)
 */
export function implausibleDates(table: IntakeTable, days: StudyDays, schedule: readonly ScheduleVisit[], runAt: string, place: DataPlace): ImplausibleDates {
  const n = table.nRows;
  const flags = new Uint8Array(n);
  const issues: Issue[] = [];
  const col = table.mapping.date;
  if (table.timeKind !== 'date' || col === undefined || schedule.length === 0) return { flags, issues, count: 0 };
  const runDay = dayNumberFromIso(runAt.slice(0, 10));
  let lastClose = -Infinity;
  let firstOpen = Infinity;
  for (const v of schedule) {
    const at = offsetOfStudyDay(v.targetDay);
    lastClose = Math.max(lastClose, at + v.after);
    firstOpen = Math.min(firstOpen, at - v.before);
  }
  let latestRef = -Infinity;
  for (let s = 0; s < days.referenceDay.length; s++) if (days.referenceDay[s]! > latestRef) latestRef = days.referenceDay[s]!;
  const lateBound = Number.isFinite(latestRef) ? latestRef + lastClose + PLAUSIBLE_SLACK_DAYS : Infinity;
  let count = 0;
  for (let i = 0; i < n; i++) {
    const d = table.date[i]!;
    if (table.usableTiming[i] !== 1 || !Number.isFinite(d)) continue;
    const s = table.subjectIndex[i]!;
    const ref = s >= 0 ? days.referenceDay[s]! : NaN;
    let context: string | null = null;
    let other = '';
    if (!Number.isNaN(runDay) && d > runDay) [context, other] = ['after-run', isoDate(runDay)];
    else if (d > lateBound) [context, other] = ['after-schedule', isoDate(lateBound)];
    else if (Number.isFinite(ref) && d < ref + firstOpen - PLAUSIBLE_SLACK_DAYS) [context, other] = ['before-reference', isoDate(ref)];
    if (context === null) continue;
    flags[i] = 1;
    count++;
    const cell = cellAddress(place.sheet, place.topLeft, col, table.sheetRows[i]!);
    const value = isoDate(d);
    const message = renderMessage({ code: 'implausible-date', role: 'date', value, cell, use: null, context, other });
    issues.push({ code: 'implausible-date', severity: 'warning', cell, row: table.sheetRows[i]!, role: 'date', value, use: null, message });
  }
  return { flags, issues, count };
}
