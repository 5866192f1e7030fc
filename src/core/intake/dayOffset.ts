/**
 * Study days and calendar offsets. A calendar offset is `date − reference date` in whole days (0 on the reference
 * date, −1 the day before). The CDISC study day (SDTM Implementation Guide, --DY variables) is offset + 1 on or after
 * the reference date and the offset itself before it, so it has no day 0. All window arithmetic and model time use
 * offsets; study days are for display and for reading study-day input.
 */

/**
 * The calendar offset of a study day: day − 1 for day ≥ 1, the day itself for day ≤ −1 (CDISC SDTM IG). Day 0 does
 * not exist and gives NaN; NaN gives NaN. O(1).
 * @example offsetOfStudyDay(1) // 0; offsetOfStudyDay(85) // 84; offsetOfStudyDay(-1) // -1
 */
export function offsetOfStudyDay(day: number): number {
  if (day === 0) return NaN;
  return day >= 1 ? day - 1 : day;
}

/**
 * The CDISC study day of a calendar offset: offset + 1 for offset ≥ 0, the offset itself below 0 (the inverse of
 * offsetOfStudyDay). A fractional offset (a point on the model's time axis) keeps its fraction. O(1).
 * @example studyDayOfOffset(0) // 1; studyDayOfOffset(84) // 85; studyDayOfOffset(-1) // -1
 */
export function studyDayOfOffset(offset: number): number {
  return offset >= 0 ? offset + 1 : offset;
}
