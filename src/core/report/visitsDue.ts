import { windowDates, windowOffsets, windowStudyDays } from '../schedule/studyDay';
import type { DueRow, DueStatus, LastRecord, TimingInput } from './timingTypes';
import { orderByKey } from './numberOrder';

/**
 * Upcoming and overdue visits as of the cut-off (SPEC §4 d). A subject is still in follow-up when no record is
 * matched to the final scheduled visit (the largest target day) and no exit date is known. For each such subject the next scheduled visit
 * without a record after the last visit that has one is listed with its window dates, the calendar days from the
 * cut-off to its target (negative = the target has passed; calendar offsets, the same arithmetic as the
 * classification) and a status: "overdue" when the window closed before the
 * cut-off, "windowOpen" when the cut-off falls inside the window (bounds included), else "comingUp". Dates are day
 * numbers for dated data and study days for study-day data (whose cut-off is the given study day, or else the
 * subject's own last record). Sorted by days until target (most overdue first), then subject order.
 * Cost O(subjects · visits + d log d) for d distinct days until the target.
 * Example: cut-off on study day 90, next visit Week 12 (target 85, window 78–92) → daysUntilTarget −5, "windowOpen".
 */
export function listVisitsDue(input: TimingInput, siteOf: (subject: number) => string, lastOf: (subject: number) => LastRecord): DueRow[] {
  return dueRows(input, dueOrder(input), siteOf, lastOf);
}

/** The visits due as numbers, in listing order: the participant, the visit and the days until its target. */
export interface DueOrder {
  readonly subjects: Int32Array;
  readonly visits: Int32Array;
  readonly until: Float64Array;
}

/** The visits due of listVisitsDue as numbers (rows are made by dueRows when the list is written). O(subjects · visits + d log d). */
export function dueOrder(input: TimingInput): DueOrder {
  const { schedule, timing } = input;
  const V = timing.nVisits;
  const order = Array.from({ length: V }, (_, v) => v).sort((a, b) => schedule[a]!.targetDay - schedule[b]!.targetDay || a - b);
  const last = order[V - 1]!;
  // Listed subjects and their days until the target first (numbers), ordered by a counting sort on those days (ties
  // in subject order); the rows are made in that order by dueRows.
  const target = Float64Array.from(schedule, (vis) => windowOffsets(vis).target);
  const slotRow = timing.slotRow;
  const listed = new Int32Array(timing.nSubjects);
  const listedVisit = new Int32Array(timing.nSubjects);
  const until = new Float64Array(timing.nSubjects);
  let m = 0;
  for (let s = 0; s < timing.nSubjects; s++) {
    if (timing.subjectInTiming[s] !== 1 || slotRow[s * V + last]! >= 0) continue;
    if (Number.isFinite(timing.exitOffset[s]!)) continue; // left the study: no visit is due
    const cut = timing.cutoffOffset[s]!;
    if (!Number.isFinite(cut)) continue;
    let k = V - 1;
    while (k > 0 && slotRow[s * V + order[k - 1]!]! < 0) k--;
    const v = order[k]!;
    listed[m] = s;
    listedVisit[m] = v;
    until[m++] = target[v]! - cut;
  }
  const position = orderByKey(until.subarray(0, m), Int32Array.from({ length: m }, (_, j) => j));
  return {
    subjects: Int32Array.from(position, (j) => listed[j]!),
    visits: Int32Array.from(position, (j) => listedVisit[j]!),
    until: Float64Array.from(position, (j) => until[j]!),
  };
}

/** The rows of the visits-due list for dueOrder's entries (window dates, status, latest record). O(entries). */
export function dueRows(input: TimingInput, due: DueOrder, siteOf: (subject: number) => string, lastOf: (subject: number) => LastRecord): DueRow[] {
  const { table, schedule, days, timing } = input;
  const dated = table.timeKind === 'date';
  const wins = schedule.map(windowOffsets);
  const rows: DueRow[] = new Array<DueRow>(due.subjects.length);
  for (let k = 0; k < rows.length; k++) {
    const s = due.subjects[k]!;
    const v = due.visits[k]!;
    const vis = schedule[v]!;
    const w = wins[v]!;
    const cut = timing.cutoffOffset[s]!;
    const status: DueStatus = w.closes < cut ? 'overdue' : w.opens <= cut ? 'windowOpen' : 'comingUp';
    const dates = dated ? windowDates(days.referenceDay[s]!, vis) : windowStudyDays(vis);
    rows[k] = {
      subject: table.subjectIds[s]!,
      site: siteOf(s),
      visit: vis.label,
      windowOpens: dates.opens,
      targetDate: dates.target,
      windowCloses: dates.closes,
      daysUntilTarget: due.until[k]!,
      status,
      lastRecord: lastOf(s),
    };
  }
  return rows;
}
