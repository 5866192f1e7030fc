import type { IntakeTable } from '../intake/types';
import { textCodesOf } from '../intake/textCodes';
import type { DataPlace } from './computeStudyDays';
import { afterCutoffIssue, afterExitIssue, nearest, sortSegment } from './classifyParts';
import { labelKey } from './labels';
import { offsetOfStudyDay } from '../intake/dayOffset';
import { windowOffsets } from './studyDay';
import { NO_STATUS, STATUS_CODE, STATUS_ORDER } from './types';
import type { CutoffRule, ScheduleIssue, ScheduleVisit, StatusCounts, StudyDays, VisitStatus, VisitTiming } from './types';

/** Thrown on misuse: an empty schedule, or study days that do not belong to the table. */
export class ClassifyError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ClassifyError';
  }
}

export interface ClassifyOptions {
  /**
   * The data cut-off ("as of"). For dated data a day number (0 = 1899-12-30); default: the latest usable date in the
   * data. For study-day data a study day applied to every subject; default: each subject's own last record.
   */
  readonly cutoff?: number;
  /** Where the data range sits, so that issues carry cell addresses. */
  readonly place?: DataPlace;
  /** Dated data without a given cut-off: rows marked 1 here do not count toward the default cut-off (visit dates far
   * outside the data, e.g. a mistyped year; the pipeline decides which). */
  readonly ignoreForCutoff?: Uint8Array;
}

const { onTime: ON_TIME, early: EARLY, late: LATE, missed: MISSED, notYetDue: NOT_YET_DUE, afterExit: AFTER_EXIT, extra: EXTRA, repeat: REPEAT } = STATUS_CODE;

/**
 * Gives each (subject, scheduled visit) exactly one status and each record at most one (SPEC §4).
 *
 * Matching. With a visit column mapped, a record belongs to the visit whose label equals its label ignoring case and
 * spaces; a label matching no scheduled visit (blank included) makes the record "extra". Without one, a record is
 * drawn to the visit with the nearest target day (a tie between two visits goes to the earlier visit). Among the
 * records belonging to one visit, the one closest to the target day is the visit's record (a tie goes to the earlier
 * day, then the earlier row). The others are "repeat" — except, when matching by nearest target day, those outside
 * that visit's window, which match no visit and are "extra".
 *
 * All arithmetic is in calendar offsets from the reference date (days.offsets; the target study day t sits at offset
 * t − 1 for t ≥ 1 and t for t ≤ −1, see windowOffsets), so a window that crosses the reference date loses no day.
 * Status of a visit's record: on time when target − before ≤ offset ≤ target + after (bounds included, all in
 * offsets), else early or late; its deviation is offset − target offset in calendar days (negative = early). A visit
 * with no record is "not expected" (afterExit) when the participant's exit date (table.subjectExit, dated data) is on
 * or before the window's last day — a window that opens after the exit, or straddles it; otherwise "missed" when its
 * window's last day is before the cut-off, else "not yet due". A record dated after the exit date is kept, with an
 * 'after-exit' warning.
 *
 * Cut-off. Dated data: options.cutoff (a day number), else the latest usable date not marked in
 * options.ignoreForCutoff (all usable dates when every one is marked); each subject's cut-off offset
 * is cutoff − that subject's reference date; records dated after the cut-off are left out with an issue.
 * Study-day data: options.cutoff as a study day for every subject when given (later records left out likewise); else
 * each subject's own last record, so a visit without a record is missed when the subject has a record after the
 * visit's window closes, and not yet due otherwise.
 *
 * Subjects with no usable record take no part (their slots carry NO_STATUS). Rows whose study day is NaN carry
 * NO_STATUS. Cost: O(rows · log visits) plus sorting each subject's records by day; memory O(rows + subjects · visits).
 *
 * Example: schedule [{Week 12, 85, 7, 7}], one subject with records on study days 80 and 93 (no labels) → day 80 is
 * the visit's record, on time with deviation −5; day 93 is outside the window, so it is extra. With a baseline
 * {Day 1, 1, 3, 3}, a record 3 calendar days before the reference date (study day −3, offset −3) is on time, −3 days.
 */
export function classifyVisits(
  table: IntakeTable,
  days: StudyDays,
  schedule: readonly ScheduleVisit[],
  options: ClassifyOptions = {},
): VisitTiming {
  const n = table.nRows;
  const V = schedule.length;
  const S = table.subjectIds.length;
  if (V === 0) throw new ClassifyError('The visit schedule has no visits.');
  if (days.offsets.length !== n || days.studyDays.length !== n || days.referenceDay.length !== S) {
    throw new ClassifyError(`Study days cover ${days.offsets.length} rows and ${days.referenceDay.length} subjects; the table has ${n} rows and ${S} subjects.`);
  }
  const sd = days.offsets;
  const subjectOf = table.subjectIndex;
  const dated = table.timeKind === 'date';
  const issues: ScheduleIssue[] = [];

  // Visits in order of target day, for nearest-target matching.
  const order = Array.from({ length: V }, (_, k) => k).sort((a, b) => schedule[a]!.targetDay - schedule[b]!.targetDay || a - b);
  const windows = schedule.map(windowOffsets);
  const sortedTargets = Float64Array.from(order, (k) => windows[k]!.target);
  const target = Float64Array.from(windows, (w) => w.target);
  const open = Float64Array.from(windows, (w) => w.opens);
  const close = Float64Array.from(windows, (w) => w.closes);
  const labelIndex = new Map<string, number>();
  schedule.forEach((v, k) => {
    if (!labelIndex.has(labelKey(v.label))) labelIndex.set(labelKey(v.label), k);
  });
  // With a visit column, each distinct label text is matched to a scheduled visit once (-1: none); rows by code.
  const visits = textCodesOf(table, 'visit');
  const byLabel = visits !== null;
  const visitOfCode = visits === null ? null : Int32Array.from(visits.texts, (t) => labelIndex.get(labelKey(t)) ?? -1);
  const visitCode = visits === null ? null : visits.codes;

  // Cut-off.
  let cutoff: number | null = options.cutoff ?? null;
  let cutoffRule: CutoffRule = options.cutoff === undefined ? (dated ? 'latestDate' : 'eachSubjectsLastRecord') : 'given';
  if (dated && cutoff === null) {
    let latest = -Infinity;
    // Rows in options.ignoreForCutoff do not count, unless every usable date is among them.
    for (const ignore of [options.ignoreForCutoff, undefined]) {
      for (let i = 0; i < n; i++) {
        if (Number.isFinite(sd[i]!) && subjectOf[i]! >= 0 && ignore?.[i] !== 1 && table.date[i]! > latest) latest = table.date[i]!;
      }
      if (Number.isFinite(latest) || options.ignoreForCutoff === undefined) break;
    }
    cutoff = Number.isFinite(latest) ? latest : null;
    cutoffRule = 'latestDate';
  }
  // The cut-off as a bound on the date (dated data) or on the offset (study-day data with a given cut-off).
  const date = table.date;
  const dateBound = cutoff !== null && dated ? cutoff : Infinity;
  const offsetBound = cutoff !== null && !dated && cutoffRule === 'given' ? offsetOfStudyDay(cutoff) : Infinity;
  const afterCutoff = (i: number): boolean => date[i]! > dateBound || sd[i]! > offsetBound;

  // Bucket usable rows by subject (counting sort), then sort each subject's rows by (day, row).
  const rowStatus = new Uint8Array(n).fill(NO_STATUS);
  const rowVisit = new Int32Array(n).fill(-1);
  const rowDeviation = new Float64Array(n).fill(NaN);
  const take = new Uint8Array(n);
  const start = new Int32Array(S + 1);
  for (let i = 0; i < n; i++) {
    const s = subjectOf[i]!;
    if (s < 0 || !Number.isFinite(sd[i]!)) continue;
    if (afterCutoff(i)) {
      issues.push(afterCutoffIssue(table, i, cutoff!, dated, options.place));
      continue;
    }
    take[i] = 1;
    start[s + 1]!++;
  }
  for (let s = 0; s < S; s++) start[s + 1]! += start[s]!;
  const fill = start.slice(0, S);
  const idx = new Int32Array(start[S]!);
  for (let i = 0; i < n; i++) if (take[i] === 1) idx[fill[subjectOf[i]!]!++] = i;
  const byDay = (a: number, b: number): number => sd[a]! - sd[b]! || a - b;
  for (let s = 0; s < S; s++) {
    // Listings are usually in day order within a participant: check that on numbers before sorting.
    let sorted = true;
    for (let j = start[s]! + 1; j < start[s + 1]! && sorted; j++) sorted = sd[idx[j - 1]!]! <= sd[idx[j]!]!; // rows are filled in row order, so ties are in order
    if (!sorted) sortSegment(idx, start[s]!, start[s + 1]!, byDay);
  }

  const slotStatus = new Uint8Array(S * V).fill(NO_STATUS);
  const slotRow = new Int32Array(S * V).fill(-1);
  const subjectInTiming = new Uint8Array(S);
  const cutoffOffset = new Float64Array(S).fill(NaN);
  const exitOffset = new Float64Array(S).fill(NaN);
  const counts = new Float64Array(STATUS_ORDER.length);

  // Per-participant columns as locals, read in the loop below.
  const subjectExit = table.subjectExit;
  const referenceDay = days.referenceDay;
  const visitOf = visitOfCode ?? new Int32Array(0);
  const rowCode = visitCode ?? new Int32Array(0);
  const givenCutoffOffset = !dated && cutoff !== null ? offsetOfStudyDay(cutoff) : NaN;
  for (let s = 0; s < S; s++) {
    const a = start[s]!;
    const b = start[s + 1]!;
    if (a === b) continue;
    subjectInTiming[s] = 1;
    const base = s * V;
    if (dated) exitOffset[s] = subjectExit[s]! - referenceDay[s]!;
    const exit = exitOffset[s]!;
    cutoffOffset[s] = dated
      ? cutoff === null
        ? NaN
        : cutoff - referenceDay[s]!
      : cutoff === null
        ? sd[idx[b - 1]!]!
        : givenCutoffOffset;
    // First pass: candidate visit per record; keep the closest record per visit (earlier wins ties: rows are sorted).
    for (let j = a; j < b; j++) {
      const i = idx[j]!;
      const d = sd[i]!;
      const v = byLabel ? visitOf[rowCode[i]!]! : order[nearest(sortedTargets, d)]!;
      rowVisit[i] = v;
      if (v < 0) continue;
      const best = slotRow[base + v]!;
      if (best < 0 || Math.abs(d - target[v]!) < Math.abs(sd[best]! - target[v]!)) slotRow[base + v] = i;
    }
    // Second pass: statuses of records.
    for (let j = a; j < b; j++) {
      const i = idx[j]!;
      if (sd[i]! > exit) issues.push(afterExitIssue(table, i, table.subjectExit[s]!, options.place));
      const v = rowVisit[i]!;
      const d = sd[i]!;
      let code: number;
      if (v < 0) code = EXTRA;
      else if (slotRow[base + v] === i) code = d < open[v]! ? EARLY : d > close[v]! ? LATE : ON_TIME;
      else if (byLabel || (d >= open[v]! && d <= close[v]!)) code = REPEAT;
      else {
        code = EXTRA;
        rowVisit[i] = -1;
      }
      rowStatus[i] = code;
      if (code !== EXTRA) rowDeviation[i] = d - target[v]!;
      counts[code]!++;
    }
    // Statuses of scheduled visits.
    for (let v = 0; v < V; v++) {
      const r = slotRow[base + v]!;
      const code = r >= 0 ? rowStatus[r]! : exit <= close[v]! ? AFTER_EXIT : close[v]! < cutoffOffset[s]! ? MISSED : NOT_YET_DUE;
      slotStatus[base + v] = code;
      if (r < 0) counts[code]!++;
    }
  }

  const countObject = Object.fromEntries(STATUS_ORDER.map((k, c) => [k, counts[c]!])) as Record<VisitStatus, number>;
  return {
    nVisits: V,
    nSubjects: S,
    rowStatus,
    rowVisit,
    rowDeviation,
    slotStatus,
    slotRow,
    subjectInTiming,
    cutoffOffset,
    exitOffset,
    cutoff,
    cutoffRule,
    counts: countObject as StatusCounts,
    issues,
  };
}
