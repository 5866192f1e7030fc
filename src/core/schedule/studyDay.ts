/**
 * The study-day rule of the CDISC SDTM Implementation Guide (--DY variables): the reference date is day 1, the day
 * after it day 2, the day before it day −1; there is no day 0.
 */

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
  const d = date - reference;
  return d >= 0 ? d + 1 : d;
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

/**
 * The dates (day numbers) on which a visit window opens and closes for a subject. Windows are compared in study days
 * exactly as SPEC §4 writes them (target − before ≤ day ≤ target + after); when a bound falls on the non-existent day 0,
 * the window effectively opens on day 1 or closes on day −1, and those dates are returned. O(1).
 * Example: windowDates(45000, {targetDay: 85, before: 7, after: 7}) → {opens: 45077, target: 45084, closes: 45091}.
 */
export function windowDates(
  reference: number,
  visit: { readonly targetDay: number; readonly before: number; readonly after: number },
): { readonly opens: number; readonly target: number; readonly closes: number } {
  const open = visit.targetDay - visit.before;
  const close = visit.targetDay + visit.after;
  return {
    opens: dateForStudyDay(reference, open === 0 ? 1 : open),
    target: dateForStudyDay(reference, visit.targetDay),
    closes: dateForStudyDay(reference, close === 0 ? -1 : close),
  };
}
