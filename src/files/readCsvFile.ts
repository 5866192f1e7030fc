/**
 * A CSV file's bytes to cells, the one way the command line and the browser page both read CSV: decoding with its
 * notes (decodeText.ts), the RFC 4180 splitter with its notes (readCsv.ts), and the worksheet size check, so both
 * front ends show the same warnings with the same cell addresses.
 */
import type { CellValue } from '../core/intake/types';
import { columnLetters, MAX_COLUMN_INDEX, MAX_ROW, parseCell } from '../core/intake/cellAddress';
import { sourceGrid } from '../core/intake/cellSource';
import { decodeCsv } from './decodeText';
import { FileFormatError } from './errors';
import { indexCsv, type CsvIndex } from './csvIndex';

export interface CsvFile {
  readonly cells: CellValue[][];
  /** The reader's warnings as sentences, each led by its first cell ("visits!C7: …"). */
  readonly notes: readonly string[];
  readonly encoding: string;
  /** For the analysis record: "visits.csv (A1:G921), read as UTF-8". */
  readonly label: string;
}

/** A CSV file read as an index of its fields (csvIndex.ts), for intake to read cell by cell. */
export interface CsvSourceFile {
  readonly source: CsvIndex;
  readonly notes: readonly string[];
  readonly encoding: string;
  readonly label: string;
}

/** The A1 range `rows` × `width` cells cover from their top-left cell, e.g. "A1:G921". */
export function rangeOf(topLeft: string, rows: number, width: number): string {
  if (rows === 0) return topLeft;
  const { row, col } = parseCell(topLeft);
  return `${topLeft}:${columnLetters(col + Math.max(width, 1) - 1)}${row + rows - 1}`;
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
  const read = readCsvSource(bytes, fileName, sheet, emptyMessage);
  return { cells: sourceGrid(read.source), notes: read.notes, encoding: read.encoding, label: read.label };
}

/**
 * readCsvFile without the grid: the same checks, notes and label, with the cells left in the file's text behind a
 * CellSource (csvIndex.ts), so a large file never becomes one string per cell. The command line reads data this way.
 * O(bytes).
 */
export function readCsvSource(bytes: Uint8Array, fileName: string, sheet: string, emptyMessage?: string): CsvSourceFile {
  const decoded = decodeCsv(bytes, fileName);
  let read: ReturnType<typeof indexCsv>;
  try {
    read = indexCsv(decoded.text, decoded.firstReplaced);
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
  const source = read.source;
  const rows = source.rowCount;
  if (rows === 0) throw new FileFormatError(emptyMessage ?? `"${fileName}" is empty: it needs a header row and one row per visit.`);
  // Every problem and result refers to a worksheet cell, so the file must fit on one worksheet.
  if (rows > MAX_ROW || source.width > MAX_COLUMN_INDEX + 1) {
    throw new FileFormatError(
      `"${fileName}" has ${rows.toLocaleString('en-US')} lines and ${source.width} columns; a worksheet holds at most ${MAX_ROW.toLocaleString('en-US')} rows (header included) and ${MAX_COLUMN_INDEX + 1} columns. Split the file, e.g. by site.`,
    );
  }
  return { source, notes, encoding: decoded.encoding, label: `${fileName.replace(/^.*[\\/]/, '')} (${rangeOf('A1', rows, source.width)}), read as ${decoded.encoding}` };
}
