import { Sha256 } from './sha256';

/** A cell as fingerprinted: the intake's CellValue shape (number, text, boolean or blank). */
export type FingerprintCell = number | string | boolean | null | undefined;

/**
 * SHA-256 fingerprint of a cell grid's values, so an analysis record names exactly which data it used.
 *
 * Canonical serialisation (version 1), hashed as UTF-8 without ever building one big string:
 *   the prefix "LP-FP1\n", then for each row, each cell followed by ";" and the row followed by "\n", where a cell is
 *   - "n" + the number in JavaScript's shortest round-trip form (Number.prototype.toString: 1 → "1", 0.1 → "0.1",
 *     −0 → "0", NaN → "NaN");
 *   - "s" + the text's length in UTF-16 code units + ":" + the text (so separators inside text cannot collide);
 *   - "b1" or "b0" for true or false;
 *   - "e" for a blank (null, undefined or "" — the three blanks the intake treats alike).
 * The tags make 1 and "1" differ; trailing blanks count, so ["a"] and ["a", null] differ. Cost O(cells + characters).
 * Example: fingerprintCells([[1, "1"]]) hashes "LP-FP1\nn1;s1:1;\n".
 */
export function fingerprintCells(rows: readonly (readonly FingerprintCell[])[]): string {
  return new CellFingerprint().addRows(rows).hex();
}

/** Rows handed over one at a time (a CellSource of the intake, e.g. a CSV file's index), row 0 first. */
export interface FingerprintRows {
  readonly rowCount: number;
  rowCells(row: number): readonly FingerprintCell[];
}

/** fingerprintCells of rows read one at a time (the same digest as on the grid of those rows). O(cells + characters). */
export function fingerprintRows(rows: FingerprintRows): string {
  const f = new CellFingerprint();
  for (let r = 0; r < rows.rowCount; r++) f.addRows([rows.rowCells(r)]);
  return f.hex();
}

/**
 * The same fingerprint fed block by block (e.g. as the Excel adapter reads row blocks): adding the rows in any number
 * of consecutive blocks gives the same digest as fingerprintCells on all of them.
 */
export class CellFingerprint {
  private readonly hash = new Sha256().updateText('LP-FP1\n');

  addRows(rows: readonly (readonly FingerprintCell[])[]): this {
    for (const row of rows) {
      for (const cell of row) this.hash.updateText(serialiseCell(cell)).updateText(';');
      this.hash.updateText('\n');
    }
    return this;
  }

  /** The digest as 64 lower-case hex digits; call once. */
  hex(): string {
    return this.hash.hex();
  }
}

/** The canonical text of one cell (see fingerprintCells). Example: serialiseCell("ab") → "s2:ab". */
export function serialiseCell(cell: FingerprintCell): string {
  if (cell === null || cell === undefined || cell === '') return 'e';
  if (typeof cell === 'number') return `n${String(cell)}`;
  if (typeof cell === 'boolean') return cell ? 'b1' : 'b0';
  return `s${cell.length}:${cell}`;
}
