/**
 * How intake reads one cell: blanks, spreadsheet error values, text of numbers and booleans, and plain decimal text.
 * Decided once here so every role treats a cell the same way.
 */
import type { CellValue } from './types';

/** Spreadsheet error values as hosts hand them over (as text). Common practice: the error values current
 * spreadsheets show; compared case-insensitively after trimming. */
export const ERROR_LITERALS: ReadonlySet<string> = new Set([
  '#N/A',
  '#VALUE!',
  '#REF!',
  '#DIV/0!',
  '#NUM!',
  '#NAME?',
  '#NULL!',
  '#SPILL!',
  '#CALC!',
  '#GETTING_DATA',
  '#FIELD!',
  '#BLOCKED!',
  '#CONNECT!',
  '#BUSY!',
  '#UNKNOWN!',
]);

/** True for null, undefined and text that is empty after trimming. */
export function isBlankCell(cell: CellValue): boolean {
  return cell === null || cell === undefined || (typeof cell === 'string' && cell.trim() === '');
}

/** True when the cell is text naming a spreadsheet error value, e.g. "#N/A". */
export function isErrorCell(cell: CellValue): boolean {
  if (typeof cell !== 'string') return false;
  const t = cell.trim();
  return t.charCodeAt(0) === 35 /* # */ && ERROR_LITERALS.has(t.toUpperCase());
}

/**
 * A cell as display text: text trimmed, numbers by String(n) (so -0 gives "0"), booleans as TRUE/FALSE, blank as "".
 * @example cellText(" A-01 ") // "A-01"; cellText(12) // "12"; cellText(true) // "TRUE"
 */
export function cellText(cell: CellValue): string {
  if (cell === null || cell === undefined) return '';
  if (typeof cell === 'string') return cell.trim();
  if (typeof cell === 'boolean') return cell ? 'TRUE' : 'FALSE';
  return String(cell);
}

const PLAIN_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The number written by plain decimal text (optional sign, digits, optional fraction, optional exponent; no thousands
 * separators, no spaces inside, no hex, no "Infinity"), or NaN. Surrounding spaces are ignored.
 * @example parsePlainDecimal("-1.5e3") // -1500; parsePlainDecimal("1,000") // NaN
 */
export function parsePlainDecimal(text: string): number {
  const t = text.trim();
  return PLAIN_DECIMAL.test(t) ? Number(t) : NaN;
}

/**
 * A cell of a text role read in one step: its text (trimmed; numbers and booleans as in cellText; "" when blank), or
 * null when it holds a spreadsheet error value. Trims once, so the row pass does not classify a cell three times.
 * @example readTextCell(" K-1 ") // "K-1"; readTextCell(null) // ""; readTextCell("#N/A") // null
 */
export function readTextCell(cell: CellValue): string | null {
  if (typeof cell !== 'string') return cellText(cell);
  const t = cell.trim();
  return t.charCodeAt(0) === 35 /* # */ && ERROR_LITERALS.has(t.toUpperCase()) ? null : t;
}
