import type { CellValue } from '../core/intake/types';
import { sourceGrid } from '../core/intake/cellSource';
import { indexCsv, type FileNote } from './csvIndex';

export type { FileNote } from './csvIndex';

/** CSV cells with the reader's warnings. `watched` is the cell that holds the character at `watchOffset`, if asked. */
export interface CsvRead {
  readonly cells: CellValue[][];
  readonly notes: readonly FileNote[];
  readonly watched?: string;
}

/**
 * Reads CSV text into a grid of cells, every field kept as text exactly as written (no number or date guessing:
 * intake decides that once, with the option numericText 'accept' because in CSV every number is text).
 * The rules are those of indexCsv (csvIndex.ts), the one CSV splitter: a UTF-8 byte-order mark stripped, the delimiter
 * (comma, semicolon or tab) from the header line, LF, CRLF and CR alike as line ends (mixed in one file too), interior
 * blank lines kept as rows of blanks so that row numbers match the file's lines, trailing blank lines and trailing
 * columns that are blank in every row dropped, short rows padded with "". A row with values past the header's last
 * field keeps them (they are in the grid and the fingerprint) and gets one grouped note naming its first such cell.
 * `watchOffset` (a character index into `text`) asks which cell holds that character, for a note about decoding.
 * Cost O(characters); the grid holds one string per cell (large files go to intake as the index instead).
 *
 * Example: readCsv('\uFEFFid,v\n1,2\n').cells → [['id','v'],['1','2']]
 * @throws FileFormatError when a quoted field never closes (the grid would be wrong from there on).
 */
export function readCsv(text: string, watchOffset = -1): CsvRead {
  const read = indexCsv(text, watchOffset);
  const out: CsvRead = { cells: sourceGrid(read.source), notes: read.notes };
  return read.watched === undefined ? out : { ...out, watched: read.watched };
}

/** The cells of readCsv alone (for callers that show no notes). Example: readCsvText('id\n1\n') → [['id'],['1']] */
export function readCsvText(text: string): CellValue[][] {
  return readCsv(text).cells;
}
