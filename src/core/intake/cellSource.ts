/**
 * What intake reads: a rectangle of cells, one row at a time or one cell at a time, without a 2-D array of every
 * cell. A CSV file is read into an index of field positions over its text (src/files/csvIndex.ts) and hands each
 * cell over only when intake asks for it; the add-in's cell blocks and an .xlsx grid go through `gridSource`, a
 * wrapper with no copy. Every intake rule reads cells through this interface, so every front end gets the same
 * typed columns and the same issues.
 */
import { isBlankCell } from './cellText';
import type { CellValue } from './types';

export interface CellSource {
  /** Rows in the range, the header row included (row 0). */
  readonly rowCount: number;
  /** The cell at range row `row` (0 = header) and range column `col`; undefined outside the rows or past a short row. */
  cell(row: number, col: number): CellValue;
  /** The cells of one row as an array, as long as the row is (used for the header row and small reads). */
  rowCells(row: number): readonly CellValue[];
  /** True when cells 0..width-1 of row `row` are all blank (isBlankCell). Stops at the first non-blank cell. */
  isBlankRow(row: number, width: number): boolean;
  /** When the source knows it: no text cell is longer than this many characters (lets checks of long text skip the
   * cells when none can be too long). */
  readonly longestText?: number;
}

/** The cells a front end holds: a 2-D array (row 0 the header) or a CellSource. */
export type CellInput = readonly (readonly CellValue[])[] | CellSource;

const EMPTY_ROW: readonly CellValue[] = [];

/** A CellSource over a 2-D array, sharing it (no copy). Readers may share one row object among blank rows (the
 * .xlsx reader does): a row object found blank once is not looked at again. O(1) to build. */
export class GridSource implements CellSource {
  private knownBlank: readonly CellValue[] | null = null;
  private knownWidth = -1;

  constructor(readonly cells: readonly (readonly CellValue[])[]) {}

  get rowCount(): number {
    return this.cells.length;
  }

  cell(row: number, col: number): CellValue {
    return this.cells[row]?.[col];
  }

  rowCells(row: number): readonly CellValue[] {
    return this.cells[row] ?? EMPTY_ROW;
  }

  isBlankRow(row: number, width: number): boolean {
    const r = this.cells[row] ?? EMPTY_ROW;
    if (r === this.knownBlank && width === this.knownWidth) return true;
    for (let c = 0; c < width; c++) if (!isBlankCell(r[c])) return false;
    this.knownBlank = r;
    this.knownWidth = width;
    return true;
  }
}

/** True for a CellSource (as opposed to a 2-D array). */
export function isCellSource(input: CellInput): input is CellSource {
  return !Array.isArray(input);
}

/** The CellSource of either kind of input: a source as it is, a 2-D array wrapped without copying. O(1). */
export function toCellSource(input: CellInput): CellSource {
  return isCellSource(input) ? input : new GridSource(input);
}

/** The whole source as a 2-D array (for front ends that show or keep every cell). O(cells). */
export function sourceGrid(source: CellSource): CellValue[][] {
  if (source instanceof GridSource) return source.cells.map((r) => [...r]);
  const out: CellValue[][] = new Array<CellValue[]>(source.rowCount);
  for (let r = 0; r < source.rowCount; r++) out[r] = [...source.rowCells(r)];
  return out;
}
