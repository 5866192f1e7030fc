/** Cell addresses for schedule-layer issues, built on the intake layer's A1 address helper. */
import { columnLetters, formatAddress, parseCell } from '../intake/cellAddress';

export { columnLetters, parseCell };

/**
 * Address of a cell given the range's top-left cell, the 0-based column within the range and the 1-based worksheet
 * row; the sheet name is quoted when it needs to be. Throws the intake's usage error for a malformed top-left address.
 * Example: cellAddress("Visits", "B3", 2, 17) → "Visits!D17"; cellAddress("My Schedule", "A1", 0, 4) → "'My Schedule'!A4".
 */
export function cellAddress(sheet: string, topLeft: string, column: number, sheetRow: number): string {
  return formatAddress(sheet, sheetRow, parseCell(topLeft).col + column);
}
