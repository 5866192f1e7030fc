/** Reading the few things the pane itself needs from a block of cells: headers, a preview, the arms. */
import type { CellValue } from '../core/intake/types';

/** Shows a cell as the pane prints it: blanks as "", numbers and booleans as their text. */
export function cellText(value: CellValue): string {
  if (value === null || value === undefined) return '';
  return typeof value === 'string' ? value : String(value);
}

/** The header row as text (column letters stand in for blank headers, e.g. "Column C"). */
export function headersOf(cells: readonly (readonly CellValue[])[]): string[] {
  const first = cells[0] ?? [];
  return first.map((h, i) => cellText(h).trim() || `Column ${columnLetters(i)}`);
}

/** Spreadsheet column letters of a 0-based index: 0 gives "A", 26 gives "AA" (ECMA-376 Part 1, §18.3.1.4 cell references). */
export function columnLetters(index: number): string {
  let n = index + 1;
  let out = '';
  while (n > 0) {
    const r = (n - 1) % 26;
    out = String.fromCharCode(65 + r) + out;
    n = Math.floor((n - 1) / 26);
  }
  return out;
}

/** The distinct non-blank trimmed texts of one column below the header, in order of first appearance. */
export function distinctValues(cells: readonly (readonly CellValue[])[], column: number): string[] {
  const seen = new Set<string>();
  for (let r = 1; r < cells.length; r++) {
    const text = cellText(cells[r]?.[column]).trim();
    if (text !== '') seen.add(text);
  }
  return [...seen];
}
