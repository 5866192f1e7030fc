/**
 * Date text in the forms clinical systems write: ISO 8601 dates and date-times, the day-month-name-year form of
 * statistical exports (12JAN2025, 12-Jan-2025, 12 jan 2025), and day/month/year or month/day/year with "/", "." or
 * "-" (the order is decided per column, see dateOrder.ts). Partial dates are recognised and never guessed; two-digit
 * years are not read (the century would be a guess). Hand-written scanners: no regular expression backtracking, O(length).
 */
import { daysFromCivil, daysInMonth, FIRST_DAY, isoToDayNumber, LAST_DAY } from './dates';
import type { DateOrder } from './types';

/** Day number of 1970-01-01 (0 = 1899-12-30), as in dates.ts. */
const UNIX_EPOCH_DAY = 25569;

/** The outcome of reading one date text. */
export type DateTextResult =
  | { readonly kind: 'date'; readonly day: number }
  /** A partial date (ISO 8601 reduced precision such as "2025-03" or "2025", a missing part written "-" or "UNK",
   * or a month and year such as "JAN2025" or "03/2025"): reported, never guessed. */
  | { readonly kind: 'partial' }
  /** Well formed but no such day (30FEB2025, 2025-13-01), or outside 1900-01-01..9999-12-31. */
  | { readonly kind: 'impossible' }
  /** A year written with two digits (12JAN25, 12/01/25): not read, since the century would be a guess. */
  | { readonly kind: 'two-digit-year' }
  /** Day and month written as numbers, and no order given to read them with. */
  | { readonly kind: 'needs-order' }
  /** Day and month written as numbers that the given order cannot read but the other order can (13/01/2025 as mdy). */
  | { readonly kind: 'wrong-order' }
  /** None of the accepted forms. */
  | { readonly kind: 'malformed' };

const PARTIAL: DateTextResult = { kind: 'partial' };
const IMPOSSIBLE: DateTextResult = { kind: 'impossible' };
const TWO_DIGIT_YEAR: DateTextResult = { kind: 'two-digit-year' };
const NEEDS_ORDER: DateTextResult = { kind: 'needs-order' };
const WRONG_ORDER: DateTextResult = { kind: 'wrong-order' };
const MALFORMED: DateTextResult = { kind: 'malformed' };

/** English month names as statistical exports write them, three letters (JAN..DEC), and in full; common practice. */
const MONTH_WORDS: ReadonlyMap<string, number> = monthWords();

function monthWords(): Map<string, number> {
  const short = ['JAN', 'FEB', 'MAR', 'APR', 'MAY', 'JUN', 'JUL', 'AUG', 'SEP', 'OCT', 'NOV', 'DEC'];
  const full = ['JANUARY', 'FEBRUARY', 'MARCH', 'APRIL', 'MAY', 'JUNE', 'JULY', 'AUGUST', 'SEPTEMBER', 'OCTOBER', 'NOVEMBER', 'DECEMBER'];
  const words = new Map<string, number>([['SEPT', 9]]);
  short.forEach((m, k) => words.set(m, k + 1));
  full.forEach((m, k) => words.set(m, k + 1));
  return words;
}

/** Placeholders exports write for an unknown day or month (common practice): the date is partial. */
const UNKNOWN_WORDS: ReadonlySet<string> = new Set(['UN', 'UK', 'UNK', 'XX', 'XXX']);

const isDigit = (c: number): boolean => c >= 48 && c <= 57;
const isLetter = (c: number): boolean => (c >= 65 && c <= 90) || (c >= 97 && c <= 122);
/** Separators between day, month and year: "-", " ", "/" and ".". */
const isSeparator = (c: number): boolean => c === 45 || c === 32 || c === 47 || c === 46;

function digitsEnd(t: string, i: number): number {
  while (i < t.length && isDigit(t.charCodeAt(i))) i++;
  return i;
}
function lettersEnd(t: string, i: number): number {
  while (i < t.length && isLetter(t.charCodeAt(i))) i++;
  return i;
}

/**
 * True when t[i..] is empty or a time of day after " ", "T" or ":": H or HH (0..23), ":MM" (0..59), optionally ":SS"
 * (0..60) and a fraction after "." or ",". The time is checked, then ignored.
 */
function timeRestOk(t: string, i: number): boolean {
  if (i === t.length) return true;
  const c = t.charCodeAt(i);
  if (c !== 32 && c !== 84 && c !== 116 && c !== 58) return false;
  let j = digitsEnd(t, i + 1);
  if (j - (i + 1) < 1 || j - (i + 1) > 2 || Number(t.slice(i + 1, j)) > 23) return false;
  for (let part = 0; part < 2 && j < t.length && t.charCodeAt(j) === 58; part++) {
    const k = digitsEnd(t, j + 1);
    if (k - (j + 1) !== 2 || Number(t.slice(j + 1, k)) > (part === 0 ? 59 : 60)) return false;
    j = k;
  }
  if (j < t.length && (t.charCodeAt(j) === 46 || t.charCodeAt(j) === 44)) {
    const k = digitsEnd(t, j + 1);
    if (k === j + 1) return false;
    j = k;
  }
  return j === t.length;
}

/** The result for a checked year, month and day: a date, or impossible outside the calendar or the spreadsheet span. */
function civilResult(year: number, month: number, day: number): DateTextResult {
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return IMPOSSIBLE;
  const d = daysFromCivil(year, month, day) + UNIX_EPOCH_DAY;
  return d < FIRST_DAY || d > LAST_DAY ? IMPOSSIBLE : { kind: 'date', day: d };
}

/** Day and month as numbers, with a year: the parts of "13/01/2025" before any order is applied. */
export interface NumericDateParts {
  readonly first: number;
  readonly second: number;
  readonly year: number;
  /** How many digits the year has: 4, or 2 (not read). */
  readonly yearDigits: 2 | 4;
}

/**
 * The parts of a numeric date "D/M/YYYY" or "M/D/YYYY" (1–2 digits, the same separator "/", "." or "-" twice, a
 * 4- or 2-digit year, an optional time), or null when the text has another shape. `t` must be trimmed. O(length).
 * @example numericDateParts("13.01.2025") // { first: 13, second: 1, year: 2025, yearDigits: 4 }
 */
export function numericDateParts(t: string): NumericDateParts | null {
  const a = digitsEnd(t, 0);
  if (a < 1 || a > 2 || a >= t.length) return null;
  const sep = t.charCodeAt(a);
  if (sep !== 47 && sep !== 46 && sep !== 45) return null;
  const b = digitsEnd(t, a + 1);
  if (b - (a + 1) < 1 || b - (a + 1) > 2 || b >= t.length || t.charCodeAt(b) !== sep) return null;
  const y = digitsEnd(t, b + 1);
  const yearDigits = y - (b + 1);
  if ((yearDigits !== 4 && yearDigits !== 2) || !timeRestOk(t, y)) return null;
  return { first: Number(t.slice(0, a)), second: Number(t.slice(a + 1, b)), year: Number(t.slice(b + 1, y)), yearDigits };
}

/** Reads numeric parts in a given order. */
function numericResult(p: NumericDateParts, order: DateOrder | null): DateTextResult {
  if (p.yearDigits === 2) return TWO_DIGIT_YEAR;
  if (order === null) return NEEDS_ORDER;
  const [day, month] = order === 'dmy' ? [p.first, p.second] : [p.second, p.first];
  const r = civilResult(p.year, month, day);
  if (r.kind === 'date' || month <= 12) return r;
  // Month over 12 in this order: if the other order reads it, say so rather than "impossible".
  return civilResult(p.year, day, month).kind === 'date' ? WRONG_ORDER : IMPOSSIBLE;
}

/** The day of a date whose day is a placeholder (UN, UNK, ...). */
const UNKNOWN_DAY = -1;

/** The month of a word (upper case), 0 when it is a placeholder for an unknown month, -1 when it is neither. */
function monthOf(word: string): number {
  const m = MONTH_WORDS.get(word);
  if (m !== undefined) return m;
  return UNKNOWN_WORDS.has(word) ? 0 : -1;
}

/**
 * Day-month-name-year from index i of t, where t[0..i) is the day (digits, or a placeholder when `day` is UNKNOWN_DAY):
 * [sep] MONTH [same sep] YYYY [time]. The separators are both absent or both the same one of "-", " ", "/", ".".
 */
function nameForm(t: string, day: number, i: number): DateTextResult {
  const sep1 = isSeparator(t.charCodeAt(i)) ? t.charCodeAt(i++) : -1;
  const m = lettersEnd(t, i);
  if (m === i) return MALFORMED;
  const month = monthOf(t.slice(i, m).toUpperCase());
  if (month < 0) return MALFORMED;
  let y = m;
  const sep2 = isSeparator(t.charCodeAt(y)) ? t.charCodeAt(y++) : -1;
  if (sep1 !== sep2) return MALFORMED;
  const e = digitsEnd(t, y);
  if ((e - y !== 4 && e - y !== 2) || !timeRestOk(t, e)) return MALFORMED;
  if (e - y === 2) return TWO_DIGIT_YEAR;
  if (day === UNKNOWN_DAY || month === 0) return PARTIAL;
  return civilResult(Number(t.slice(y, e)), month, day);
}

/** Text that starts with a letter: a month and a year ("JAN2025", "Jan 2025"), or an unknown day as a placeholder
 * ("UNJAN2025", "UN-JAN-2025", "UNK UNK 2025"): all partial. */
function letterFirst(t: string): DateTextResult {
  const w = lettersEnd(t, 0);
  const word = t.slice(0, w).toUpperCase();
  if (monthOf(word) > 0) {
    // A month and a year, no day: "JAN2025", "Jan 2025".
    const y = isSeparator(t.charCodeAt(w)) ? w + 1 : w;
    const e = digitsEnd(t, y);
    return e - y === 4 && e === t.length ? PARTIAL : MALFORMED;
  }
  if (UNKNOWN_WORDS.has(word)) return nameForm(t, UNKNOWN_DAY, w);
  // Day placeholder and month written together: "UNJAN2025", "UNKUNK2025".
  for (const p of ['UNK', 'UN', 'UK', 'XX']) {
    if (word.startsWith(p) && monthOf(word.slice(p.length)) >= 0) return nameForm(t, UNKNOWN_DAY, p.length);
  }
  return MALFORMED;
}

/**
 * Reads date text in any accepted form to a day number (0 = 1899-12-30). Day and month written as numbers need the
 * column's `order` ('dmy' or 'mdy'); without it they give 'needs-order'. Surrounding spaces are ignored; a time after
 * the date is checked and ignored. O(length).
 * Sources: ISO 8601-1:2019 §5.2.2 (calendar dates) and its reduced precision; the SDTM convention of "-" for a missing
 * part of a partial date ("2025---15", "--03-15"); the day-month-name-year form of statistical exports (common practice).
 * @example parseDateText("12JAN2025", null) // { kind: 'date', day: 45669 }
 * @example parseDateText("12/01/2025", "dmy") // { kind: 'date', day: 45669 }; parseDateText("2025-01", null) // { kind: 'partial' }
 */
export function parseDateText(text: string, order: DateOrder | null): DateTextResult {
  const t = text.trim();
  if (t.length === 0) return MALFORMED;
  const c0 = t.charCodeAt(0);
  if (c0 === 45) return t.charCodeAt(1) === 45 ? PARTIAL : MALFORMED; // "--03-15": the year is missing
  if (isLetter(c0)) return letterFirst(t);
  const a = digitsEnd(t, 0);
  if (a === 4) {
    if (t.startsWith('---', 4)) return PARTIAL; // "2025---15": the month is missing
    const r = isoToDayNumber(t);
    return r.kind === 'date' ? r : r.kind === 'partial' ? PARTIAL : r.kind === 'impossible' ? IMPOSSIBLE : MALFORMED;
  }
  if (a < 1 || a > 2 || a === t.length) return MALFORMED;
  const next = t.charCodeAt(a);
  if (isLetter(next) || (isSeparator(next) && isLetter(t.charCodeAt(a + 1)))) return nameForm(t, Number(t.slice(0, a)), a);
  const parts = numericDateParts(t);
  if (parts !== null) return numericResult(parts, order);
  // A month and a 4-digit year without a day: "03/2025", "3.2025".
  if (next === 47 || next === 46 || next === 45) {
    const e = digitsEnd(t, a + 1);
    if (e - (a + 1) === 4 && e === t.length) return PARTIAL;
  }
  return MALFORMED;
}
