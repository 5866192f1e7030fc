/** Per-participant facts for the follow-up lists: the latest record, a long silence, and who left the study. */
import { studyDayOfOffset } from '../intake/dayOffset';
import { windowOffsets } from '../schedule/studyDay';
import { NO_STATUS } from '../schedule/types';
import type { ExitRow, LastRecord, TimingInput } from './timingTypes';
import { orderByKey } from './numberOrder';

/**
 * Days without a record after which a participant still in follow-up is marked as silent: two scheduled intervals,
 * an interval being the median gap between consecutive target days of the schedule (in calendar days). Null for a
 * schedule of one visit. O(visits log visits).
 * Example: targets on days 1, 85, 169, 253 → gaps 84, 84, 84 → 168.
 */
export function silenceThreshold(input: Pick<TimingInput, 'schedule'>): number | null {
  const targets = input.schedule.map((v) => windowOffsets(v).target).sort((a, b) => a - b);
  const gaps = targets.slice(1).map((t, k) => t - targets[k]!).sort((a, b) => a - b);
  if (gaps.length === 0) return null;
  const m = gaps.length;
  const median = m % 2 === 1 ? gaps[(m - 1) / 2]! : (gaps[m / 2 - 1]! + gaps[m / 2]!) / 2;
  return 2 * median;
}

/**
 * Each participant's latest record taking part in visit timing: its date (day number, or study day for study-day
 * data), the calendar days from it to the participant's cut-off, and whether that gap is longer than `silence` days
 * for a participant with no exit date (never a reclassification: a mark for follow-up only). O(rows + subjects).
 */
export function lastRecords(input: TimingInput, silence: number | null): LastRecord[] {
  const of = lastRecordOf(input, silence);
  return Array.from({ length: input.timing.nSubjects }, (_, s) => of(s));
}

/**
 * The same as lastRecords, as a function of the participant: one pass over the rows into typed arrays, and each
 * participant's record made when first asked for (then kept), so only participants named in a list cost an object.
 * O(rows) once, O(1) per participant.
 */
export function lastRecordOf(input: TimingInput, silence: number | null): (subject: number) => LastRecord {
  const { table, days, timing } = input;
  const S = timing.nSubjects;
  const last = new Float64Array(S).fill(NaN);
  const lastRow = new Int32Array(S).fill(-1);
  const status = timing.rowStatus;
  const subjectOf = table.subjectIndex;
  const offsets = days.offsets;
  const none = NO_STATUS;
  for (let i = 0; i < table.nRows; i++) {
    if (status[i] === none) continue;
    const s = subjectOf[i]!;
    const o = offsets[i]!;
    if (!(o <= last[s]!)) {
      last[s] = o;
      lastRow[s] = i;
    }
  }
  const dated = table.timeKind === 'date';
  const made: (LastRecord | undefined)[] = new Array<LastRecord | undefined>(S);
  const make = (s: number): LastRecord => {
    const r = lastRow[s]!;
    if (r < 0) return { date: null, daysSince: null, silent: false };
    const cut = timing.cutoffOffset[s]!;
    const daysSince = Number.isFinite(cut) ? cut - last[s]! : null;
    const silent = silence !== null && daysSince !== null && daysSince > silence && !Number.isFinite(timing.exitOffset[s]!);
    return { date: dated ? table.date[r]! : days.studyDays[r]!, daysSince, silent };
  };
  return (s) => made[s] ?? (made[s] = make(s));
}

/**
 * Participants who left the study (an exit date, dated data), in order of exit date then order of appearance: exit
 * date and study day, the last scheduled visit with a record, and the end-of-study status and reason when mapped.
 * O(subjects · visits + d log d) for d distinct exit dates.
 */
export function listExits(input: TimingInput, siteOf: (subject: number) => string): ExitRow[] {
  return exitRows(input, exitOrder(input), siteOf);
}

/** The participants who left, in listExits' order, as subject indices (rows are made by exitRows when written). O(subjects + d log d). */
export function exitOrder(input: TimingInput): Int32Array {
  const { table, timing } = input;
  // The participants who left, as indices sorted by exit date then index (a counting sort on the dates' ranks).
  const exitDate = table.subjectExit;
  let count = 0;
  for (let s = 0; s < timing.nSubjects; s++) if (timing.subjectInTiming[s] === 1 && Number.isFinite(timing.exitOffset[s]!)) count++;
  const left = new Int32Array(count);
  const keys = new Float64Array(count);
  count = 0;
  for (let s = 0; s < timing.nSubjects; s++) {
    if (timing.subjectInTiming[s] !== 1 || !Number.isFinite(timing.exitOffset[s]!)) continue;
    keys[count] = exitDate[s]!;
    left[count++] = s;
  }
  return orderByKey(keys, left);
}

/** The rows of the list of participants who left, for exitOrder's participants. O(participants · visits). */
export function exitRows(input: TimingInput, sorted: Int32Array, siteOf: (subject: number) => string): ExitRow[] {
  const { table, schedule, timing } = input;
  const V = timing.nVisits;
  const order = Array.from({ length: V }, (_, v) => v).sort((a, b) => schedule[a]!.targetDay - schedule[b]!.targetDay || a - b);
  const exitDate = table.subjectExit;
  const status = table.subjectExitStatus;
  const reason = table.subjectExitReason;
  const rows: ExitRow[] = new Array<ExitRow>(sorted.length);
  for (let k = 0; k < sorted.length; k++) {
    const s = sorted[k]!;
    let lastVisit = '';
    for (let j = 0; j < V; j++) {
      const v = order[j]!;
      if (timing.slotRow[s * V + v]! >= 0) lastVisit = schedule[v]!.label;
    }
    rows[k] = {
      subject: table.subjectIds[s]!,
      site: siteOf(s),
      exitDate: exitDate[s]!,
      exitStudyDay: studyDayOfOffset(timing.exitOffset[s]!),
      lastVisit,
      status: status?.[s] ?? '',
      reason: reason?.[s] ?? '',
    };
  }
  return rows;
}
