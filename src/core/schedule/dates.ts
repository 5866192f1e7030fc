import { dayNumberToIso } from '../intake/dates';

/** Day numbers count whole days so that 1899-12-30 is 0 (the 1900-system serial for dates from 1900-03-01 on). */
const EPOCH_MS = Date.UTC(1899, 11, 30);
const DAY_MS = 86_400_000;

/**
 * ISO 8601 calendar date (YYYY-MM-DD) of a day number; "" for NaN or infinities (the intake's civil-date arithmetic,
 * no Date objects). O(1).
 * Example: isoDate(45000) → "2023-03-15"; isoDate(0) → "1899-12-30".
 */
export function isoDate(dayNumber: number): string {
  return Number.isFinite(dayNumber) ? dayNumberToIso(Math.floor(dayNumber)) : '';
}

/**
 * Day number of an ISO 8601 calendar date "YYYY-MM-DD"; NaN when the text is not a real calendar date. O(1).
 * Example: dayNumberFromIso("2023-03-15") → 45000.
 */
export function dayNumberFromIso(iso: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso.trim());
  if (!m) return NaN;
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  const ms = Date.UTC(y, mo - 1, d);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) return NaN;
  return Math.round((ms - EPOCH_MS) / DAY_MS);
}
