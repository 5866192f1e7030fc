import { isoDate } from '../schedule/dates';
import type { NumberFormat, SheetCell } from './types';

/**
 * Spreadsheet number-format codes for each NumberFormat (ECMA-376 Part 1, numFmt, §18.8.30–31 — section numbers from
 * memory): "@" is text, "0.0%" a percentage with one decimal, and the p-value code uses a condition section so values
 * below 0.0001 show "<0.0001".
 */
export const EXCEL_FORMAT_CODES: Readonly<Record<NumberFormat, string>> = {
  text: '@',
  integer: '0',
  decimal1: '0.0',
  decimal2: '0.00',
  decimal3: '0.000',
  decimal4: '0.0000',
  decimal6: '0.000000',
  percent1: '0.0%',
  pvalue: '[<0.0001]"<0.0001";0.0000',
  date: 'yyyy-mm-dd',
};

const DECIMALS: Partial<Record<NumberFormat, number>> = {
  integer: 0,
  decimal1: 1,
  decimal2: 2,
  decimal3: 3,
  decimal4: 4,
  decimal6: 6,
};

/**
 * A cell as text for HTML and plain-text output, matching what EXCEL_FORMAT_CODES shows: blanks and non-finite
 * numbers become "", text stays as it is, numbers get their format. O(1).
 * Examples: formatCell(0.1234, "percent1") → "12.3%"; formatCell(0.00003, "pvalue") → "<0.0001";
 * formatCell(45000, "date") → "2023-03-15"; formatCell(-2, "integer") → "-2".
 */
export function formatCell(value: SheetCell, format: NumberFormat): string {
  if (value === null) return '';
  if (typeof value === 'string') return value;
  if (!Number.isFinite(value)) return '';
  switch (format) {
    case 'text':
      return String(value);
    case 'percent1':
      return `${fixed(value * 100, 1)}%`;
    case 'pvalue':
      return value < 0.0001 ? '<0.0001' : fixed(value, 4);
    case 'date':
      return isoDate(value);
    default:
      return fixed(value, DECIMALS[format] ?? 2);
  }
}

/** toFixed without "-0": a value that rounds to zero is shown unsigned. */
function fixed(x: number, digits: number): string {
  const s = x.toFixed(digits);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}
