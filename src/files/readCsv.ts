import type { CellValue } from '../core/intake/types';
import { columnLetters } from '../core/intake/cellAddress';
import { FileFormatError } from './errors';

/** A warning about the file itself (not about a value), with the first cell it concerns. */
export interface FileNote {
  readonly cell: string;
  readonly message: string;
}

/** CSV cells with the reader's warnings. `watched` is the cell that holds the character at `watchOffset`, if asked. */
export interface CsvRead {
  readonly cells: CellValue[][];
  readonly notes: readonly FileNote[];
  readonly watched?: string;
}

const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;
/** Cells named in a grouped note before "…". */
const NAMED_CELLS = 5;

/** The delimiter used in the header line: whichever of comma, semicolon and tab occurs most often outside quotes
 * (a header rarely holds a decimal comma, so this is safer than guessing from data rows); comma on a tie or none. */
function headerDelimiter(text: string): string {
  const counts = new Map<string, number>([[',', 0], [';', 0], ['\t', 0]]);
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === '\n' || ch === '\r')) break;
    else if (!quoted && counts.has(ch)) counts.set(ch, counts.get(ch)! + 1);
  }
  let best = ',';
  for (const [d, n] of counts) if (n > counts.get(best)!) best = d;
  return best;
}

/**
 * Splits CSV text into records and fields (RFC 4180 quoting), taking LF, CRLF and a lone CR each as a line end, in
 * any mix. A quote that opens a field runs to its closing quote ("" inside is one quote); text after the closing quote
 * up to the next delimiter is kept as written. Cost O(characters).
 */
function splitRecords(body: string, delimiter: number, watch: number): { rows: string[][]; watched?: { row: number; col: number } } {
  const rows: string[][] = [];
  let row: string[] = [];
  let watched: { row: number; col: number } | undefined;
  const n = body.length;
  let i = 0;
  const fieldEnd = (from: number): number => {
    let k = from;
    while (k < n) {
      const ch = body.charCodeAt(k);
      if (ch === delimiter || ch === LF || ch === CR) break;
      k++;
    }
    return k;
  };
  for (;;) {
    let value: string;
    if (body.charCodeAt(i) === QUOTE) {
      let j = i + 1;
      let text = '';
      for (;;) {
        const q = body.indexOf('"', j);
        if (q < 0) {
          throw new FileFormatError(
            `The CSV text has a quoted field that never closes at cell ${columnLetters(row.length)}${rows.length + 1}: a field that opens with a double quote must close with one (a quote inside it is written twice, "").`,
          );
        }
        if (body.charCodeAt(q + 1) === QUOTE) {
          text += body.slice(j, q + 1);
          j = q + 2;
          continue;
        }
        text += body.slice(j, q);
        i = q + 1;
        break;
      }
      const k = fieldEnd(i);
      value = text + body.slice(i, k);
      i = k;
    } else {
      const k = fieldEnd(i);
      value = body.slice(i, k);
      i = k;
    }
    if (watched === undefined && watch >= 0 && watch < i) watched = { row: rows.length, col: row.length };
    row.push(value);
    if (i >= n) {
      rows.push(row);
      break;
    }
    const ch = body.charCodeAt(i);
    if (ch === delimiter) {
      i++;
      continue;
    }
    i += ch === CR && body.charCodeAt(i + 1) === LF ? 2 : 1;
    rows.push(row);
    row = [];
    if (i >= n) break;
  }
  return watched === undefined ? { rows } : { rows, watched };
}

/**
 * Reads CSV text into a grid of cells, every field kept as text exactly as written (no number or date guessing:
 * intake decides that once, with the option numericText 'accept' because in CSV every number is text).
 * Strips a UTF-8 byte-order mark, takes the delimiter (comma, semicolon or tab) from the header line, takes LF, CRLF
 * and CR alike as line ends (mixed in one file too), keeps interior blank lines as rows of blanks so that row numbers
 * match the file's lines, drops trailing blank lines and trailing columns that are blank in every row, and pads short
 * rows with "". A row with values past the header's last field keeps them (they are in the grid and the fingerprint)
 * and gets one grouped note naming its first such cell. `watchOffset` (a character index into `text`) asks which cell
 * holds that character, for a note about decoding. Cost O(characters).
 *
 * Example: readCsv('\uFEFFid,v\n1,2\n').cells → [['id','v'],['1','2']]
 * @throws FileFormatError when a quoted field never closes (the grid would be wrong from there on).
 */
export function readCsv(text: string, watchOffset = -1): CsvRead {
  const bom = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const body = bom === 1 ? text.slice(1) : text;
  const delimiter = headerDelimiter(body).charCodeAt(0);
  const { rows, watched } = splitRecords(body, delimiter, watchOffset < 0 ? -1 : watchOffset - bom);
  while (rows.length > 0 && rows[rows.length - 1]!.every((f) => f.trim() === '')) rows.pop();
  let width = 0;
  for (const r of rows) {
    let last = r.length;
    while (last > width && r[last - 1]!.trim() === '') last--;
    if (last > width) width = last;
  }
  const headerWidth = Math.min(rows[0]?.length ?? 0, width);
  const extra: string[] = [];
  let extraRows = 0;
  for (let i = 1; i < rows.length; i++) {
    const r = rows[i]!;
    for (let c = headerWidth; c < r.length; c++) {
      if (r[c]!.trim() !== '') {
        extraRows++;
        if (extra.length < NAMED_CELLS) extra.push(`${columnLetters(c)}${i + 1}`);
        break;
      }
    }
  }
  const notes: FileNote[] = [];
  if (extraRows > 0) {
    notes.push({
      cell: extra[0]!,
      message: `${extraRows.toLocaleString('en-US')} row${extraRows === 1 ? ' has' : 's have'} more fields than the header (${headerWidth}): ${extra.join(', ')}${extraRows > extra.length ? ', …' : ''}. Those values have no column heading, so no analysis reads them; check the file for a stray delimiter or an unquoted line break.`,
    });
  }
  const cells = rows.map((r) => (r.length === width ? r : r.length > width ? r.slice(0, width) : [...r, ...new Array<string>(width - r.length).fill('')]));
  const out: CsvRead = { cells, notes };
  return watched === undefined ? out : { ...out, watched: `${columnLetters(watched.col)}${watched.row + 1}` };
}

/** The cells of readCsv alone (for callers that show no notes). Example: readCsvText('id\n1\n') → [['id'],['1']] */
export function readCsvText(text: string): CellValue[][] {
  return readCsv(text).cells;
}
