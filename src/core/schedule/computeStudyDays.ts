import type { IntakeTable } from '../intake/types';
import { textCodesOf } from '../intake/textCodes';
import { cellAddress } from './address';
import { labelKey } from './labels';
import { offsetOfStudyDay } from '../intake/dayOffset';
import type { ScheduleIssue, ScheduleVisit, StudyDays } from './types';

/** Where the data range sits, for cell addresses in issues. */
export interface DataPlace {
  readonly sheet: string;
  /** Top-left cell of the range (the header row's first cell), e.g. "A1". */
  readonly topLeft: string;
}

/**
 * Calendar offset (date − reference date, in days) and study day (CDISC SDTM IG: offset + 1 on or after the
 * reference, the offset before it; no day 0) of every row usable for visit timing. Window arithmetic and model time
 * use the offsets; study days are for display.
 * - Study-day data (table.timeKind 'studyDay'): the given study day is used as it is, and its offset is day − 1 for
 *   day ≥ 1, the day itself for day ≤ −1.
 * - Dated data with a reference-date column: the row's own reference date; when that cell is blank, the subject's
 *   first reference date found on another row.
 * - Dated data without one: the subject's baseline-visit date, i.e. the date of the subject's record of the schedule's
 *   first visit (the smallest target day) — found by label when a visit column is mapped (the earliest such record),
 *   else the subject's earliest dated record. That record is taken to fall on the first visit's target day, so when
 *   the first visit is not on day 1 (e.g. a screening visit on day −14) day 1 is that many days after it.
 * A row whose study day cannot be computed gets NaN and an issue (the date cell's address and a plain reason); it is
 * left out of visit timing and of the model's time axis. Cost O(rows + subjects).
 * Example: a subject dated 45000, 45084, 45168 with no reference column → study days 1, 85, 169, offsets 0, 84, 168.
 */
export function computeStudyDays(table: IntakeTable, schedule: readonly ScheduleVisit[], place: DataPlace): StudyDays {
  const n = table.nRows;
  const nSubjects = table.subjectIds.length;
  const days = new Float64Array(n).fill(NaN);
  const offsets = new Float64Array(n).fill(NaN);
  const refDay = new Float64Array(nSubjects).fill(NaN);
  const issues: ScheduleIssue[] = [];

  if (table.timeKind === 'studyDay') {
    for (let i = 0; i < n; i++) {
      if (table.usableTiming[i] === 1 && table.subjectIndex[i]! >= 0) {
        days[i] = table.studyDay[i]!;
        offsets[i] = offsetOfStudyDay(days[i]!);
      }
    }
    return { studyDays: days, offsets, referenceDay: refDay, issues };
  }

  // The columns as locals: the loops below read them once per row.
  const usableTiming = table.usableTiming;
  const subjectIndex = table.subjectIndex;
  const date = table.date;
  const reference = table.reference;
  const usable = (i: number): boolean => usableTiming[i] === 1 && subjectIndex[i]! >= 0 && Number.isFinite(date[i]!);
  const hasRefColumn = table.mapping.reference !== undefined;

  if (hasRefColumn) {
    for (let i = 0; i < n; i++) {
      const s = table.subjectIndex[i]!;
      const r = table.reference[i]!;
      if (s >= 0 && Number.isFinite(r) && Number.isNaN(refDay[s]!)) refDay[s] = r;
    }
  } else {
    const first = schedule.reduce<ScheduleVisit | null>((a, v) => (a === null || v.targetDay < a.targetDay ? v : a), null);
    const firstKey = first === null ? null : labelKey(first.label);
    // With a visit column, only records of the first visit count: decided once per distinct label (codes).
    const visits = textCodesOf(table, 'visit');
    const isFirst = visits === null ? null : Uint8Array.from(visits.texts, (t) => (firstKey !== null && labelKey(t) === firstKey ? 1 : 0));
    for (let i = 0; i < n; i++) {
      if (!usable(i)) continue;
      if (isFirst !== null && isFirst[visits!.codes[i]!] !== 1) continue;
      const s = table.subjectIndex[i]!;
      const d = table.date[i]!;
      if (Number.isNaN(refDay[s]!) || d < refDay[s]!) refDay[s] = d;
    }
    // The baseline record sits on the first visit's target day: shift to day 1 when that target is not 1.
    const shift = first === null ? 0 : offsetOfStudyDay(first.targetDay);
    if (shift !== 0) for (let s = 0; s < nSubjects; s++) refDay[s] = refDay[s]! - shift;
  }

  const dateColumn = table.mapping.date ?? 0;
  for (let i = 0; i < n; i++) {
    if (!usable(i)) continue;
    const s = subjectIndex[i]!;
    const own = hasRefColumn ? reference[i]! : NaN;
    const ref = Number.isFinite(own) ? own : refDay[s]!;
    if (Number.isFinite(ref)) {
      // CDISC study day of the calendar offset (studyDay.ts): the offset + 1 on or after the reference date.
      const offset = date[i]! - ref;
      days[i] = offset >= 0 ? offset + 1 : offset;
      offsets[i] = offset;
      continue;
    }
    const sheetRow = table.sheetRows[i]!;
    const subject = table.subjectIds[s]!;
    issues.push({
      code: hasRefColumn ? 'no-reference-date' : 'no-baseline-record',
      severity: 'warning',
      cell: cellAddress(place.sheet, place.topLeft, dateColumn, sheetRow),
      row: sheetRow,
      value: subject,
      use: 'timing',
      message: hasRefColumn
        ? `Participant ${subject} has no reference date on any row, so the study day of this visit cannot be computed; the row is left out of visit timing.`
        : `Participant ${subject} has no record of the first scheduled visit (the baseline), so the study day of this visit cannot be computed; the row is left out of visit timing.`,
    });
  }
  return { studyDays: days, offsets, referenceDay: refDay, issues };
}
