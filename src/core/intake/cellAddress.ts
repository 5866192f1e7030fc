/**
 * A1-style cell addresses: column letters to 0-based index and back, parsing "B3", and formatting "Sheet!C17" with
 * the sheet-name quoting spreadsheets use (the formula grammar of ECMA-376 Part 1, §18.17, section number from memory: a
 * sheet name that is not a plain identifier is written in single quotes, with an embedded quote doubled).
 */
import { IntakeUsageError } from './errors';

/** The last column of a worksheet, XFD, has 0-based index 16383 (16,384 columns; common practice in current spreadsheets). */
export const MAX_COLUMN_INDEX = 16383;
/** The last row of a worksheet is 1,048,576 (common practice in current spreadsheets). */
export const MAX_ROW = 1048576;

/**
 * Column letters for a 0-based column index (bijective base 26). O(log index).
 * @example columnLetters(0) // "A"; columnLetters(26) // "AA"; columnLetters(16383) // "XFD"
 */
export function columnLetters(index: number): string {
  if (!Number.isInteger(index) || index < 0 || index > MAX_COLUMN_INDEX) {
    throw new IntakeUsageError('columnLetters', `index must be an integer from 0 to ${MAX_COLUMN_INDEX}`, index);
  }
  let n = index + 1;
  let letters = '';
  while (n > 0) {
    const rem = (n - 1) % 26;
    letters = String.fromCharCode(65 + rem) + letters;
    n = (n - 1 - rem) / 26;
  }
  return letters;
}

/**
 * The 0-based index of column letters, case-insensitive.
 * @example columnIndex("A") // 0; columnIndex("aa") // 26; columnIndex("XFD") // 16383
 */
export function columnIndex(letters: string): number {
  if (!/^[A-Za-z]{1,3}$/.test(letters)) {
    throw new IntakeUsageError('columnIndex', 'column letters must be 1 to 3 letters', letters);
  }
  let n = 0;
  for (let i = 0; i < letters.length; i++) n = n * 26 + (letters.toUpperCase().charCodeAt(i) - 64);
  const index = n - 1;
  if (index > MAX_COLUMN_INDEX) {
    throw new IntakeUsageError('columnIndex', 'column letters must not pass XFD', letters);
  }
  return index;
}

/** A parsed cell: 1-based worksheet row, 0-based column index. */
export interface CellRef {
  readonly row: number;
  readonly col: number;
}

/**
 * Parses an A1-style address such as "B3" or "$B$3" (absolute markers are allowed and ignored).
 * @example parseCell("B3") // { row: 3, col: 1 }
 */
export function parseCell(address: string): CellRef {
  const m = /^\$?([A-Za-z]{1,3})\$?([1-9][0-9]{0,6})$/.exec(address.trim());
  if (m === null) throw new IntakeUsageError('parseCell', 'expected an address such as "B3"', address);
  const col = columnIndex(m[1]!);
  const row = Number(m[2]);
  if (row > MAX_ROW) throw new IntakeUsageError('parseCell', `row must be at most ${MAX_ROW}`, address);
  return { row, col };
}

/**
 * Whether a sheet name must be quoted in a reference: anything but a plain identifier (letters, digits, underscore,
 * period; not starting with a digit or period), or a name that reads as a cell reference (A1 or R1C1 style) or a
 * logical constant. Quoting a name that did not need it is harmless, so the test errs on the side of quoting.
 */
export function sheetNeedsQuotes(sheet: string): boolean {
  if (!/^[A-Za-z_\u00C0-\uFFFF][A-Za-z0-9_.\u00C0-\uFFFF]*$/.test(sheet)) return true;
  if (/^[A-Za-z]{1,3}[0-9]+$/.test(sheet)) return true; // looks like A1, XFD12
  if (/^(R[0-9]*)?(C[0-9]*)?$/i.test(sheet)) return true; // looks like R, C, R1C1, RC2
  return /^(TRUE|FALSE)$/i.test(sheet);
}

/**
 * Formats "Sheet!C17": sheet name (quoted when needed, an embedded ' doubled), then column letters and row.
 * An empty sheet name gives the bare address.
 * @example formatAddress("Visits", 17, 2) // "Visits!C17"; formatAddress("My Sheet", 17, 2) // "'My Sheet'!C17"
 * @example formatAddress("Bob's", 1, 0) // "'Bob''s'!A1"
 */
export function formatAddress(sheet: string, row: number, col: number): string {
  if (!Number.isInteger(row) || row < 1 || row > MAX_ROW) {
    throw new IntakeUsageError('formatAddress', `row must be an integer from 1 to ${MAX_ROW}`, row);
  }
  const cell = columnLetters(col) + String(row);
  if (sheet === '') return cell;
  const name = sheetNeedsQuotes(sheet) ? `'${sheet.replace(/'/g, "''")}'` : sheet;
  return `${name}!${cell}`;
}
