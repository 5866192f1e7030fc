/**
 * Spreadsheet dates and ISO 8601 text as whole day numbers, counted so that 1899-12-30 is day 0 (so from 1900-03-01 on
 * a day number equals the 1900-system serial). Pure arithmetic on the proleptic Gregorian calendar: no Date objects.
 */
import type { DateSystem } from './types';

/** Day number of 1970-01-01 (the 1900-system serial of that date, ECMA-376 Part 1, §18.17.4). */
const UNIX_EPOCH_DAY = 25569;
/** 1904-system serial 0 is 1904-01-01, which is day 1462 (ECMA-376 Part 1, §18.17.4). */
export const OFFSET_1904 = 1462;
/** The earliest accepted date, 1900-01-01 (day 2), and the latest, 9999-12-31 (day 2958465): the span spreadsheets
 * can show as dates (ECMA-376 Part 1, §18.17.4). */
export const FIRST_DAY = 2;
export const LAST_DAY = 2958465;

/**
 * Days since 1970-01-01 of a proleptic Gregorian date (Hinnant 2013, "chrono-Compatible Low-Level Date Algorithms",
 * days_from_civil). O(1). Assumes a valid month 1..12 and day within the month.
 * @example daysFromCivil(1970, 1, 1) // 0; daysFromCivil(2000, 3, 1) // 11017
 */
export function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month > 2 ? month - 3 : month + 9) + 2) / 5) + day - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

/**
 * The proleptic Gregorian date of a count of days since 1970-01-01 (Hinnant 2013, civil_from_days). O(1).
 * @example civilFromDays(0) // { year: 1970, month: 1, day: 1 }
 */
export function civilFromDays(days: number): { year: number; month: number; day: number } {
  const z = days + 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: yoe + era * 400 + (month <= 2 ? 1 : 0), month, day };
}

/** Number of days in a month of the proleptic Gregorian calendar. */
export function daysInMonth(year: number, month: number): number {
  if (month === 2) return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0 ? 29 : 28;
  return month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
}

/**
 * The day number of a spreadsheet date serial, or NaN when the serial names no real date.
 * 1900 system (ECMA-376 Part 1, §18.17.4): serial 1 is 1900-01-01, serials 1..59 run to 1900-02-28, serial 60 is the
 * non-existent 1900-02-29 (NaN), serial 61 is 1900-03-01; so serials 1..59 give serial + 1 and serials from 61 give
 * themselves. 1904 system: serial 0 is 1904-01-01, so day = serial + 1462. A fractional serial (a date-time) gives
 * its date; 0 in the 1900 system, negative serials and serials past 9999-12-31 give NaN. O(1).
 * @example serialToDayNumber(61, 1900) // 61 (1900-03-01); serialToDayNumber(60, 1900) // NaN; serialToDayNumber(0, 1904) // 1462
 */
export function serialToDayNumber(serial: number, system: DateSystem): number {
  if (!Number.isFinite(serial)) return NaN;
  const whole = Math.floor(serial);
  let day: number;
  if (system === 1904) day = whole >= 0 ? whole + OFFSET_1904 : NaN;
  else if (whole >= 61) day = whole;
  else if (whole >= 1 && whole <= 59) day = whole + 1;
  else day = NaN; // 0 ("1900-01-00"), 60 (the phantom 1900-02-29) and negative serials
  return day <= LAST_DAY ? day : NaN;
}

/**
 * The ISO 8601 calendar date "YYYY-MM-DD" of a day number (0 = 1899-12-30). O(1).
 * @example dayNumberToIso(45000) // "2023-03-15"; dayNumberToIso(0) // "1899-12-30"
 */
export function dayNumberToIso(dayNumber: number): string {
  if (!Number.isInteger(dayNumber)) return '';
  const { year, month, day } = civilFromDays(dayNumber - UNIX_EPOCH_DAY);
  const yyyy = year < 0 ? '-' + String(-year).padStart(4, '0') : String(year).padStart(4, '0');
  return `${yyyy}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

/** The outcome of reading ISO 8601 date text. */
export type IsoDateResult =
  | { readonly kind: 'date'; readonly day: number }
  /** Only a year ("2025") or a year and month ("2025-03"): reported, never guessed. */
  | { readonly kind: 'partial'; readonly precision: 'year' | 'month' }
  /** Well formed but no such date or time (2025-02-30, 2025-13-01, 25:00), or outside 1900-01-01..9999-12-31. */
  | { readonly kind: 'impossible' }
  /** Not ISO 8601 extended-format date text at all. */
  | { readonly kind: 'malformed' };

const ISO =
  /^(\d{4})(?:-(\d{2})(?:-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,]\d+)?)?(Z|[+-]\d{2}(?::?\d{2})?)?)?)?)?$/;

/**
 * Reads ISO 8601 extended-format date text (ISO 8601-1:2019, §5.2.2 calendar dates): "YYYY-MM-DD", optionally with a
 * time "THH:MM", " HH:MM:SS", fractional seconds and a zone designator; the date part is taken as written (a zone does
 * not move the date). "2025-03" and "2025" are partial; impossible dates are 'impossible'. Surrounding spaces are
 * ignored. O(length).
 * @example isoToDayNumber("2025-03-04T10:30") // { kind: 'date', day: 45720 }
 * @example isoToDayNumber("2025-02-30") // { kind: 'impossible' }; isoToDayNumber("2025-03") // { kind: 'partial', precision: 'month' }
 */
export function isoToDayNumber(text: string): IsoDateResult {
  const m = ISO.exec(text.trim());
  if (m === null) return { kind: 'malformed' };
  const year = Number(m[1]);
  if (m[2] === undefined) return { kind: 'partial', precision: 'year' };
  const month = Number(m[2]);
  if (month < 1 || month > 12) return { kind: 'impossible' };
  if (m[3] === undefined) return { kind: 'partial', precision: 'month' };
  const day = Number(m[3]);
  if (day < 1 || day > daysInMonth(year, month)) return { kind: 'impossible' };
  if (m[4] !== undefined && !validTime(Number(m[4]), Number(m[5]), m[6] === undefined ? 0 : Number(m[6]))) {
    return { kind: 'impossible' };
  }
  const dayNumber = daysFromCivil(year, month, day) + UNIX_EPOCH_DAY;
  if (dayNumber < FIRST_DAY || dayNumber > LAST_DAY) return { kind: 'impossible' };
  return { kind: 'date', day: dayNumber };
}

/** Hours 00..23 (24:00:00 allowed as end of day), minutes 00..59, seconds 00..60 (leap second). */
function validTime(h: number, min: number, s: number): boolean {
  if (h === 24) return min === 0 && s === 0;
  return h <= 23 && min <= 59 && s <= 60;
}
