/**
 * Reads one cell for a numeric, study-day or date role. Each reader returns the number, or the issue code that says
 * why the cell cannot be used (no allocation on the hot path).
 */
import { isBlankCell, isErrorCell, parsePlainDecimal } from './cellText';
import { serialToDayNumber } from './dates';
import { parseDateText } from './dateText';
import type { CellValue, DateOrder, DateSystem } from './types';

export type NumericProblem = 'blank-value' | 'text-in-numeric' | 'not-finite' | 'error-value';

/**
 * A finite number from a numeric-role cell. Text is taken only when `acceptText` and it is plain decimal text.
 * @example readNumeric(7.5, false) // 7.5; readNumeric("7.5", false) // "text-in-numeric"; readNumeric("7.5", true) // 7.5
 */
export function readNumeric(cell: CellValue, acceptText: boolean): number | NumericProblem {
  if (typeof cell === 'number') return Number.isFinite(cell) ? cell : 'not-finite';
  if (isBlankCell(cell)) return 'blank-value';
  if (isErrorCell(cell)) return 'error-value';
  if (typeof cell === 'string' && acceptText) {
    const x = parsePlainDecimal(cell);
    if (Number.isFinite(x)) return x;
    if (!Number.isNaN(x)) return 'not-finite';
  }
  return 'text-in-numeric';
}

export type StudyDayProblem = 'blank-time' | 'text-in-numeric' | 'not-finite' | 'bad-study-day' | 'error-value';

/**
 * A study day: a whole number other than 0 (CDISC SDTM convention: the reference date is day 1, the day before is
 * day -1; there is no day 0).
 * @example readStudyDay(-1, false) // -1; readStudyDay(0, false) // "bad-study-day"; readStudyDay(2.5, false) // "bad-study-day"
 */
export function readStudyDay(cell: CellValue, acceptText: boolean): number | StudyDayProblem {
  const x = readNumeric(cell, acceptText);
  if (x === 'blank-value') return 'blank-time';
  if (typeof x !== 'number') return x;
  return Number.isInteger(x) && x !== 0 ? x : 'bad-study-day';
}

export type DateProblem = 'blank-time' | 'bad-date' | 'partial-date' | 'error-value';

/**
 * A day number (0 = 1899-12-30) from one date cell: a number is a serial in `system`, text is any form parseDateText
 * reads, with day and month as numbers read in `order` (a column is read with readDateColumn, which decides it).
 * @example readDate(45720, 1900) // 45720; readDate("04MAR2025", 1900) // 45720; readDate("2025-03", 1900) // "partial-date"
 */
export function readDate(cell: CellValue, system: DateSystem, order: DateOrder | null = null): number | DateProblem {
  if (typeof cell === 'number') {
    const d = serialToDayNumber(cell, system);
    return Number.isNaN(d) ? 'bad-date' : d;
  }
  if (isBlankCell(cell)) return 'blank-time';
  if (typeof cell !== 'string') return 'bad-date';
  if (isErrorCell(cell)) return 'error-value';
  const r = parseDateText(cell, order);
  if (r.kind === 'date') return r.day;
  return r.kind === 'partial' ? 'partial-date' : 'bad-date';
}
