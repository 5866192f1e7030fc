/**
 * The cells of one worksheet kept compactly behind a CellSource (src/core/intake/cellSource.ts): per stored cell a
 * column (Uint16), a kind (Uint8) and a number (Float64: the value, or an index into the shared-string table or into
 * the reader's own list of other texts), with each row's first cell in an Int32Array. A 1,048,576-row sheet of seven
 * columns costs about 11 bytes per cell plus its distinct texts, instead of an array per row and a value per cell.
 * Made by the .xlsx reader (sheetScan.ts, readXlsx.ts); intake asks for the cells it reads.
 */
import type { CellSource } from '../core/intake/cellSource';
import { isBlankCell } from '../core/intake/cellText';
import type { CellValue } from '../core/intake/types';

/** What a stored cell holds. */
export const KIND_NUMBER = 0;
export const KIND_SHARED = 1;
export const KIND_TEXT = 2;
export const KIND_TRUE = 3;
export const KIND_FALSE = 4;

export class XlsxCells implements CellSource {
  constructor(
    /** Rows of the range (first to last used row), the header row included. */
    readonly rowCount: number,
    /** Columns of the range (first to last used column). */
    readonly width: number,
    /** Index of each range row's first stored cell; rowStart[rowCount] is the number of stored cells. */
    private readonly rowStart: Int32Array,
    /** Column of each stored cell within the range (0-based), increasing within a row. */
    private readonly cols: Uint16Array,
    private readonly kinds: Uint8Array,
    private readonly nums: Float64Array,
    private readonly shared: readonly string[],
    private readonly texts: readonly string[],
    /** No text cell is longer than this (CellSource.longestText). */
    readonly longestText: number,
  ) {}

  /** Stored cells (cells that hold a value). */
  get storedCells(): number {
    return this.rowStart[this.rowCount]!;
  }

  private value(k: number): CellValue {
    switch (this.kinds[k]) {
      case KIND_NUMBER:
        return this.nums[k]!;
      case KIND_SHARED:
        return this.shared[this.nums[k]!]!;
      case KIND_TEXT:
        return this.texts[this.nums[k]!]!;
      case KIND_TRUE:
        return true;
      default:
        return false;
    }
  }

  cell(row: number, col: number): CellValue {
    if (!(row >= 0 && row < this.rowCount && col >= 0 && col < this.width)) return undefined;
    const a = this.rowStart[row];
    if (a === undefined) return undefined; // a row number that is not an integer
    const b = this.rowStart[row + 1]!;
    // A full row stores column c at a + c (the common case); otherwise search the row's few cells.
    const guess = a + col;
    if (guess < b && this.cols[guess] === col) return this.value(guess);
    let lo = a;
    let hi = b - 1;
    while (lo <= hi) {
      const mid = (lo + hi) >>> 1;
      const c = this.cols[mid]!;
      if (c === col) return this.value(mid);
      if (c < col) lo = mid + 1;
      else hi = mid - 1;
    }
    return Number.isInteger(col) ? null : undefined;
  }

  rowCells(row: number): readonly CellValue[] {
    const a = this.rowStart[row];
    if (!(row >= 0 && row < this.rowCount) || a === undefined) return [];
    const out = new Array<CellValue>(this.width).fill(null);
    const b = this.rowStart[row + 1]!;
    for (let k = a; k < b; k++) out[this.cols[k]!] = this.value(k);
    return out;
  }

  isBlankRow(row: number, width: number): boolean {
    const a = this.rowStart[row];
    if (!(row >= 0 && row < this.rowCount) || a === undefined) return true;
    const b = this.rowStart[row + 1]!;
    for (let k = a; k < b; k++) {
      if (this.cols[k]! >= width) break;
      const kind = this.kinds[k];
      if (kind === KIND_NUMBER || kind === KIND_TRUE || kind === KIND_FALSE) return false;
      if (!isBlankCell(this.value(k))) return false;
    }
    return true;
  }

  /**
   * The dense grid of the range, as the reader made it before: a row with no stored cell is one shared, frozen row of
   * nulls. O(rows + width × rows with a value).
   */
  toGrid(): CellValue[][] {
    const blank = Object.freeze(new Array<CellValue>(this.width).fill(null)) as CellValue[];
    const cells: CellValue[][] = new Array<CellValue[]>(this.rowCount).fill(blank);
    for (let r = 0; r < this.rowCount; r++) {
      const a = this.rowStart[r]!;
      const b = this.rowStart[r + 1]!;
      if (a === b) continue;
      const row = new Array<CellValue>(this.width).fill(null);
      for (let k = a; k < b; k++) row[this.cols[k]!] = this.value(k);
      cells[r] = row;
    }
    return cells;
  }
}
