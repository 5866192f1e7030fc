/**
 * A CSV file's bytes to cells, the one way the command line and the browser page both read CSV: decoding with its
 * notes (decodeText.ts), the RFC 4180 splitter with its notes (readCsv.ts), and the worksheet size check, so both
 * front ends show the same warnings with the same cell addresses.
 */
import type { CellValue } from '../core/intake/types';
import { columnLetters, MAX_COLUMN_INDEX, MAX_ROW, parseCell } from '../core/intake/cellAddress';
import { decodeCsv } from './decodeText';
import { FileFormatError } from './errors';
import { readCsv } from './readCsv';

export interface CsvFile {
  readonly cells: CellValue[][];
  /** The reader's warnings as sentences, each led by its first cell ("visits!C7: …"). */
  readonly notes: readonly string[];
  readonly encoding: string;
  /** For the analysis record: "visits.csv (A1:G921), read as UTF-8". */
  readonly label: string;
}

/** The A1 range a grid covers from its top-left cell, e.g. "A1:G921". */
export function gridRange(topLeft: string, cells: readonly (readonly CellValue[])[]): string {
  if (cells.length === 0) return topLeft;
  const { row, col } = parseCell(topLeft);
  const width = cells.reduce((w, r) => Math.max(w, r.length), 1);
  return `${topLeft}:${columnLetters(col + width - 1)}${row + cells.length - 1}`;
}

/**
 * Reads a CSV file's bytes. `fileName` names the file in messages and the label; `sheet` is the name used in cell
 * addresses (the file name without its extension, as a spreadsheet program shows it). A file decoded as UTF-8 with
 * damaged bytes gets a note naming the first cell that holds a replacement character. Throws FileFormatError for a
 * file that is not CSV text, an unclosed quote, an empty file (`emptyMessage` when given), or more rows or columns than a worksheet holds.
 * O(bytes).
 */
export function readCsvFile(bytes: Uint8Array, fileName: string, sheet: string, emptyMessage?: string): CsvFile {
  const decoded = decodeCsv(bytes, fileName);
  let read: ReturnType<typeof readCsv>;
  try {
    read = readCsv(decoded.text, decoded.firstReplaced);
  } catch (e) {
    if (e instanceof FileFormatError) throw new FileFormatError(`"${fileName}": ${e.message}`);
    throw e;
  }
  const notes = read.notes.map((n) => `${sheet}!${n.cell}: ${n.message}`);
  if (decoded.replaced > 0) {
    const at = read.watched === undefined ? '' : `${sheet}!${read.watched}: `;
    notes.unshift(
      `${at}the file is UTF-8 with ${decoded.replaced.toLocaleString('en-US')} invalid byte sequence${decoded.replaced === 1 ? '' : 's'}, shown as \uFFFD (the first in this cell); the file was read as UTF-8. Check those values and save the file as UTF-8 again.`,
    );
  }
  const cells = read.cells;
  if (cells.length === 0) throw new FileFormatError(emptyMessage ?? `"${fileName}" is empty: it needs a header row and one row per visit.`);
  // Every problem and result refers to a worksheet cell, so the file must fit on one worksheet.
  if (cells.length > MAX_ROW || (cells[0]?.length ?? 0) > MAX_COLUMN_INDEX + 1) {
    throw new FileFormatError(
      `"${fileName}" has ${cells.length.toLocaleString('en-US')} lines and ${cells[0]?.length ?? 0} columns; a worksheet holds at most ${MAX_ROW.toLocaleString('en-US')} rows (header included) and ${MAX_COLUMN_INDEX + 1} columns. Split the file, e.g. by site.`,
    );
  }
  return { cells, notes, encoding: decoded.encoding, label: `${fileName.replace(/^.*[\\/]/, '')} (${gridRange('A1', cells)}), read as ${decoded.encoding}` };
}
