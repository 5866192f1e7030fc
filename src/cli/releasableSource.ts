/**
 * A CellSource the command line can let go of once intake has read it. At 1,000,000 rows a CSV file's text and its
 * field index (or an .xlsx sheet's cell arrays) are 150–250 MB that nothing needs after the reading stage: intake
 * keeps typed columns and the text of every bad cell. The pipeline and the command line both hold this wrapper until
 * the run ends, so `release()` drops the one reference to the cells and the garbage collector can take them while the
 * model is fitted and the report is written. Reading a released source is a programming error and throws.
 */
import type { CellSource } from '../core/intake/cellSource';
import type { CellValue } from '../core/intake/types';

export class ReleasableSource implements CellSource {
  private inner: CellSource | null;
  readonly rowCount: number;
  readonly longestText?: number;

  constructor(inner: CellSource) {
    this.inner = inner;
    this.rowCount = inner.rowCount;
    if (inner.longestText !== undefined) this.longestText = inner.longestText;
  }

  private cells(): CellSource {
    if (this.inner === null) throw new Error('the data file was read into typed columns and then released; it cannot be read again');
    return this.inner;
  }

  cell(row: number, col: number): CellValue {
    return this.cells().cell(row, col);
  }

  rowCells(row: number): readonly CellValue[] {
    return this.cells().rowCells(row);
  }

  isBlankRow(row: number, width: number): boolean {
    return this.cells().isBlankRow(row, width);
  }

  /** Drops the cells (idempotent). */
  release(): void {
    this.inner = null;
  }
}
