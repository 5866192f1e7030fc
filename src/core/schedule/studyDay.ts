/**
 * The study-day rule of the CDISC SDTM Implementation Guide (--DY variables): the reference date is day 1, the day
 * after it day 2, the day before it day −1; there is no day 0.
 */
import { offsetOfStudyDay, studyDayOfOffset } from '../intake/dayOffset';

/** Thrown when a study day of 0 (which does not exist) or a non-integer day is asked for. */
export class StudyDayError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'StudyDayError';
  }
}

/**
 * Study day of a date, both given as whole day numbers: date − reference + 1 when date ≥ reference, else
 * date − reference (CDISC SDTM IG). NaN in gives NaN out. O(1).
 * Example: studyDay(45001, 45000) → 2; studyDay(45000, 45000) → 1; studyDay(44999, 45000) → −1.
 */
export function studyDay(date: number, reference: number): number {
  return studyDayOfOffset(date - reference);
}

/**
 * The date (day number) of a study day: the inverse of studyDay. Throws StudyDayError for day 0 or a non-integer.
 * Example: dateForStudyDay(45000, 1) → 45000; dateForStudyDay(45000, −1) → 44999.
 */
export function dateForStudyDay(reference: number, day: number): number {
  if (day === 0 || !Number.isInteger(day)) {
    throw new StudyDayError(`There is no study day ${day}: study days are whole numbers and skip 0.`);
  }
  return day > 0 ? reference + day - 1 : reference + day;
}

/** A visit window in calendar offsets from the reference date (see intake/dayOffset.ts), bounds included. */
export interface WindowOffsets {
  readonly opens: number;
  readonly target: number;
  readonly closes: number;
}

/**
 * The window of a scheduled visit in calendar offsets: the target study day t sits at offset t − 1 when t ≥ 1 and at
 * t when t ≤ −1 (CDISC SDTM IG study-day rule), and the window runs `before` calendar days before it to `after` days
 * after it, bounds included. So a window may cross the reference date with no day lost or added. O(1).
 * Example: windowOffsets({targetDay: 1, before: 3, after: 3}) → {opens: −3, target: 0, closes: 3}.
 */
export function windowOffsets(visit: { readonly targetDay: number; readonly before: number; readonly after: number }): WindowOffsets {
  const target = offsetOfStudyDay(visit.targetDay);
  return { opens: target - visit.before, target, closes: target + visit.after };
}

/**
 * The dates (day numbers) on which a visit window opens, is targeted and closes for a subject whose reference date is
 * `reference`: the reference date plus the window's calendar offsets (windowOffsets). O(1).
 * Example: windowDates(45000, {targetDay: 85, before: 7, after: 7}) → {opens: 45077, target: 45084, closes: 45091};
 * windowDates(45000, {targetDay: 1, before: 3, after: 0}) → {opens: 44997, target: 45000, closes: 45000}.
 */
export function windowDates(
  reference: number,
  visit: { readonly targetDay: number; readonly before: number; readonly after: number },
): { readonly opens: number; readonly target: number; readonly closes: number } {
  const w = windowOffsets(visit);
  return { opens: reference + w.opens, target: reference + w.target, closes: reference + w.closes };
}

/**
 * The window's bounds as CDISC study days, for study-day data (which have no calendar): the study days of the
 * window's calendar offsets. O(1).
 * Example: windowStudyDays({targetDay: 1, before: 3, after: 3}) → {opens: −3, target: 1, closes: 4}.
 */
export function windowStudyDays(visit: { readonly targetDay: number; readonly before: number; readonly after: number }): WindowOffsets {
  const w = windowOffsets(visit);
  return { opens: studyDayOfOffset(w.opens), target: visit.targetDay, closes: studyDayOfOffset(w.closes) };
}
