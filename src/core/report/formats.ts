import { isoDate } from '../schedule/dates';
import { exponentAfterRounding, fixedText, significantDigits } from './decimalText';
import type { NumberFormat, SheetCell } from './types';

/**
 * Spreadsheet number-format codes for each NumberFormat (ECMA-376 Part 1, numFmt, §18.8.30–31 — section numbers from
 * memory): "@" is text, "0.0%" a percentage with one decimal, and the p-value code uses a condition section so values
 * below 0.0001 show "<0.0001". A 'significant' cell gets its own code from its value (numberFormatFor); the code here
 * is for its blank cells only.
 */
export const EXCEL_FORMAT_CODES: Readonly<Record<NumberFormat, string>> = {
  text: '@',
  integer: '0',
  decimal1: '0.0',
  decimal2: '0.00',
  decimal3: '0.000',
  decimal4: '0.0000',
  decimal6: '0.000000',
  significant: 'General',
  percent1: '0.0%',
  pvalue: '[<0.0001]"<0.0001";0.0000',
  date: 'yyyy-mm-dd',
};

/** Significant digits of a 'significant' number: estimates, standard errors, limits, variances, means. */
export const SIGNIFICANT_DIGITS = 4;
/** Below this magnitude (after rounding) a 'significant' number is shown in scientific notation: more than 9 decimals
 * would be needed, far from any trial's values, rates per day included. */
export const SCIENTIFIC_BELOW = 1e-6;
/** From this magnitude on, too: 16 digits and more are past what a double holds (IEEE 754-2008, about 15.95 digits). */
export const SCIENTIFIC_FROM = 1e15;
/** The spreadsheet code of the scientific form, 4 significant digits: 1.230E-07. */
export const SCIENTIFIC_CODE = '0.000E+00';

const FIXED_DECIMALS: Partial<Record<NumberFormat, number>> = {
  integer: 0,
  decimal1: 1,
  decimal2: 2,
  decimal3: 3,
  decimal4: 4,
  decimal6: 6,
};

/** How a 'significant' number is shown: fixed with some decimals, or scientific. */
type Shape = { readonly kind: 'fixed'; readonly decimals: number } | { readonly kind: 'scientific'; readonly exponent: number };

/**
 * The rule for 'significant' numbers: 4 significant digits, the decimals chosen from the value's magnitude after
 * rounding (0.00062 → 7 decimals, 0.0006200; 12.3456 → 2, 12.35; 9.9996 → 2, 10.00); whole numbers keep all their
 * digits (1234.5678 → 1235, 123456.7 → 123457); zero is "0"; below 1e-6 or from 1e15 on, scientific (1.230E-07).
 */
function shapeOf(x: number): Shape {
  if (x === 0) return { kind: 'fixed', decimals: 0 };
  const exponent = exponentAfterRounding(x, SIGNIFICANT_DIGITS);
  if (exponent < Math.log10(SCIENTIFIC_BELOW) || exponent >= Math.log10(SCIENTIFIC_FROM)) return { kind: 'scientific', exponent };
  return { kind: 'fixed', decimals: Math.max(0, SIGNIFICANT_DIGITS - 1 - exponent) };
}

/** The spreadsheet code that shows `decimals` decimals: 0 → "0", 3 → "0.000". */
function decimalsCode(decimals: number): string {
  return decimals === 0 ? '0' : `0.${'0'.repeat(decimals)}`;
}

/**
 * The number-format code of one cell: the format's own code, except for a finite number in a 'significant' column,
 * which gets the fixed-decimal code that shows its 4 significant digits (or the scientific code), so a spreadsheet
 * shows the same text as formatCell. Front ends writing cells call this per cell and group equal codes. O(1).
 * Examples: numberFormatFor(0.00062, 'significant') → "0.0000000"; numberFormatFor(1234.5678, 'significant') → "0";
 * numberFormatFor(-0.0000123, 'significant') → "0.000000000"; numberFormatFor(0, 'significant') → "0";
 * numberFormatFor(5, 'decimal1') → "0.0".
 */
export function numberFormatFor(value: SheetCell, format: NumberFormat): string {
  if (format !== 'significant' || typeof value !== 'number' || !Number.isFinite(value)) return EXCEL_FORMAT_CODES[format];
  const shape = shapeOf(value);
  return shape.kind === 'fixed' ? decimalsCode(shape.decimals) : SCIENTIFIC_CODE;
}

/** 4 significant digits in scientific form, as the code "0.000E+00" shows them: -1.230E-07. */
function scientificText(x: number): string {
  const { digits, exponent } = significantDigits(x, SIGNIFICANT_DIGITS);
  const e = Math.abs(exponent);
  return `${x < 0 ? '-' : ''}${digits.slice(0, 1)}.${digits.slice(1)}E${exponent < 0 ? '-' : '+'}${e < 10 ? `0${e}` : String(e)}`;
}

/**
 * A cell as text for HTML and plain text and for sentences, the same text a spreadsheet shows under the cell's code
 * (numberFormatFor): blanks and non-finite numbers become "", text stays as it is, numbers get their format, rounded
 * half away from zero on their decimal value (decimalText.ts). O(1).
 * Examples: formatCell(0.1234, "percent1") → "12.3%"; formatCell(0.00003, "pvalue") → "<0.0001";
 * formatCell(45000, "date") → "2023-03-15"; formatCell(-2, "integer") → "-2"; formatCell(0.00062, "significant") →
 * "0.0006200"; formatCell(1234.5678, "significant") → "1235"; formatCell(-0.0000123, "significant") → "-0.00001230".
 */
export function formatCell(value: SheetCell, format: NumberFormat): string {
  if (value === null) return '';
  if (typeof value === 'string') return value;
  if (!Number.isFinite(value)) return '';
  switch (format) {
    case 'text':
      return String(value);
    case 'percent1':
      return `${fixedText(value * 100, 1)}%`;
    case 'pvalue':
      return value < 0.0001 ? '<0.0001' : fixedText(value, 4);
    case 'date':
      return isoDate(value);
    case 'significant': {
      const shape = shapeOf(value);
      return shape.kind === 'fixed' ? fixedText(value, shape.decimals) : scientificText(value);
    }
    default:
      return fixedText(value, FIXED_DECIMALS[format] ?? 2);
  }
}

/**
 * A number for a sentence, by the same rule as a 'significant' cell, so a sentence and a table show the same digits;
 * "n/a" when not finite. Example: shownNumber(4.0512) → "4.051"; shownNumber(NaN) → "n/a".
 */
export function shownNumber(x: number): string {
  return Number.isFinite(x) ? formatCell(x, 'significant') : 'n/a';
}
