/** Splitting and building the A1-style addresses the host hands over ("Visits!A1:H2401", "'My data'!C17"). */
import { columnLetters } from '../core/schedule/address';
import { ExcelAdapterError } from './errors';

export { columnLetters };

/** An A1 address of a rectangle from 0-based indexes: rangeAddress(0, 0, 2, 3) → "A1:C2". */
export function rangeAddress(row: number, column: number, rowCount: number, columnCount: number): string {
  const first = `${columnLetters(column)}${row + 1}`;
  if (rowCount === 1 && columnCount === 1) return first;
  return `${first}:${columnLetters(column + columnCount - 1)}${row + rowCount}`;
}

/**
 * Splits "Sheet!C17" or "'My sheet'!C17:D20" into the sheet name (quotes removed, '' undone) and the cell part.
 * Throws ExcelAdapterError when there is no "!" or the cell part is not an A1 reference.
 * Example: splitAddress("'Bob''s data'!$A$1:B2") → { sheet: "Bob's data", cells: "A1:B2" }.
 */
export function splitAddress(address: string): { readonly sheet: string; readonly cells: string } {
  const bang = address.lastIndexOf('!');
  if (bang <= 0) throw new ExcelAdapterError(`"${address}" is not a cell address with a sheet name, such as Visits!C17.`);
  let sheet = address.slice(0, bang);
  if (sheet.startsWith("'") && sheet.endsWith("'") && sheet.length >= 2) sheet = sheet.slice(1, -1).replace(/''/g, "'");
  const cells = address.slice(bang + 1).replace(/\$/g, '').toUpperCase();
  if (!/^[A-Z]{1,3}\d+(:[A-Z]{1,3}\d+)?$/.test(cells)) {
    throw new ExcelAdapterError(`"${address}" is not a cell address with a sheet name, such as Visits!C17.`);
  }
  return { sheet, cells };
}

/** The first cell of an A1 range: topLeftOf("B3:H20") → "B3". */
export function topLeftOf(cells: string): string {
  return cells.split(':')[0] ?? cells;
}
