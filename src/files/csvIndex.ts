/**
 * The CSV reader: RFC 4180 fields found in one pass over the text and kept as positions (two Int32Arrays), not as a
 * grid of strings. The result is a CellSource (src/core/intake/cellSource.ts): intake asks for each cell it reads and
 * gets it as a slice of the text, so a 1,000,000-row file costs its text plus 8 bytes per field, and the strings of
 * the cells intake reads die young. readCsv (readCsv.ts) turns the same index into a grid for callers that need one.
 */
import type { CellSource } from '../core/intake/cellSource';
import { columnLetters } from '../core/intake/cellAddress';
import type { CellValue } from '../core/intake/types';
import { FileFormatError } from './errors';

/** A warning about the file itself (not about a value), with the first cell it concerns. */
export interface FileNote {
  readonly cell: string;
  readonly message: string;
}

const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;
/** Cells named in a grouped note before "…". */
const NAMED_CELLS = 5;

/** A growable Int32Array; `push` is for the few pushes per row, `reserve` + `data[length++]` for one per field. */
class IntList {
  data: Int32Array;
  length = 0;

  constructor(capacity: number) {
    this.data = new Int32Array(Math.max(16, capacity));
  }

  /** Makes room for `more` values. */
  reserve(more: number): void {
    if (this.length + more <= this.data.length) return;
    const next = new Int32Array(Math.max(this.data.length * 2, this.length + more));
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }

  push(v: number): void {
    this.reserve(1);
    this.data[this.length++] = v;
  }

  /** The used part, without copying when it is full. */
  done(): Int32Array {
    return this.data.subarray(0, this.length);
  }
}

/**
 * The fields of a CSV text as a CellSource: every cell is text exactly as written ("" for a field the row does not
 * have up to the width, undefined past the width), as readCsv's grid has it.
 */
export class CsvIndex implements CellSource {
  constructor(
    private readonly text: string,
    /** Start of each field in `text`, row after row. */
    private readonly starts: Int32Array,
    /** End of each unquoted field; for a quoted field, ~k where k indexes `quotedValues`. */
    private readonly ends: Int32Array,
    /** Index of each row's first field in `starts`; rowFirst[rowCount] is the number of fields. */
    private readonly rowFirst: Int32Array,
    private readonly quotedValues: readonly string[],
    readonly rowCount: number,
    /** Columns of the range: the widest row after dropping fields that are blank in every row. */
    readonly width: number,
    /** The longest field's length in characters (CellSource.longestText). */
    readonly longestText: number,
  ) {}

  /** The text of field `f`. */
  private field(f: number): string {
    const e = this.ends[f]!;
    return e >= 0 ? this.text.slice(this.starts[f]!, e) : this.quotedValues[~e]!;
  }

  /** True when field `f` is blank after trimming, looking at its first character before making any string. */
  private fieldBlank(f: number): boolean {
    const e = this.ends[f]!;
    if (e >= 0) {
      const s = this.starts[f]!;
      if (s === e) return true;
      const c = this.text.charCodeAt(s);
      if (c > 32 && c < 0xa0) return false;
    }
    return this.field(f).trim() === '';
  }

  cell(row: number, col: number): CellValue {
    if (row < 0 || row >= this.rowCount || col < 0 || col >= this.width) return undefined;
    const f = this.rowFirst[row]! + col;
    return f < this.rowFirst[row + 1]! ? this.field(f) : '';
  }

  rowCells(row: number): readonly CellValue[] {
    if (row < 0 || row >= this.rowCount) return [];
    const out = new Array<CellValue>(this.width);
    for (let c = 0; c < this.width; c++) out[c] = this.cell(row, c);
    return out;
  }

  isBlankRow(row: number, width: number): boolean {
    if (row < 0 || row >= this.rowCount) return true;
    const first = this.rowFirst[row]!;
    const end = Math.min(this.rowFirst[row + 1]!, first + Math.min(width, this.width));
    for (let f = first; f < end; f++) if (!this.fieldBlank(f)) return false;
    return true;
  }
}

/** The CSV index with the reader's warnings. `watched` is the cell that holds the character at `watchOffset`, if asked. */
export interface CsvIndexRead {
  readonly source: CsvIndex;
  readonly notes: readonly FileNote[];
  readonly watched?: string;
}

/** The delimiter used in the header line: whichever of comma, semicolon and tab occurs most often outside quotes
 * (a header rarely holds a decimal comma, so this is safer than guessing from data rows); comma on a tie or none. */
function headerDelimiter(text: string): number {
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
  return best.charCodeAt(0);
}

/**
 * Indexes CSV text (RFC 4180 quoting), taking LF, CRLF and a lone CR each as a line end, in any mix. A quote that
 * opens a field runs to its closing quote ("" inside is one quote); text after the closing quote up to the next
 * delimiter is kept as written. Strips a UTF-8 byte-order mark, takes the delimiter (comma, semicolon or tab) from the
 * header line, keeps interior blank lines as rows of blanks so that row numbers match the file's lines, drops trailing
 * blank lines and trailing columns that are blank in every row; short rows read as "" up to the width. A row with
 * values past the header's last field keeps them and gets one grouped note naming its first such cell.
 * `watchOffset` (a character index into `text`) asks which cell holds that character, for a note about decoding.
 * Cost O(characters); memory the text plus 8 bytes per field.
 * @throws FileFormatError when a quoted field never closes (the grid would be wrong from there on).
 */
export function indexCsv(text: string, watchOffset = -1): CsvIndexRead {
  const bom = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  const body = bom === 1 ? text.slice(1) : text;
  const watch = watchOffset < 0 ? -1 : watchOffset - bom;
  const delimiter = headerDelimiter(body);
  // A first guess of the sizes from the text's length (a field of a listing is rarely under 6 characters).
  const starts = new IntList(Math.ceil(body.length / 6));
  const ends = new IntList(Math.ceil(body.length / 6));
  const rowFirst = new IntList(Math.ceil(body.length / 48));
  const quotedValues: string[] = [];
  /** Per row: 1 + the index of its last field that is not blank (0 for a blank row). */
  const filled = new IntList(Math.ceil(body.length / 48));
  let watched: { row: number; col: number } | undefined;
  const n = body.length;
  let i = 0;
  let col = 0;
  let lastFilled = 0;
  let longest = 0;
  rowFirst.push(0);
  for (;;) {
    const start = i;
    let blank: boolean;
    if (body.charCodeAt(i) === QUOTE) {
      let j = i + 1;
      let value = '';
      for (;;) {
        const q = body.indexOf('"', j);
        if (q < 0) {
          throw new FileFormatError(
            `The CSV text has a quoted field that never closes at cell ${columnLetters(col)}${rowFirst.length}: a field that opens with a double quote must close with one (a quote inside it is written twice, "").`,
          );
        }
        if (body.charCodeAt(q + 1) === QUOTE) {
          value += body.slice(j, q + 1);
          j = q + 2;
          continue;
        }
        value += body.slice(j, q);
        i = q + 1;
        break;
      }
      let k = i;
      while (k < n) {
        const ch = body.charCodeAt(k);
        if (ch === delimiter || ch === LF || ch === CR) break;
        k++;
      }
      value += body.slice(i, k);
      i = k;
      starts.push(start);
      ends.push(~quotedValues.length);
      quotedValues.push(value);
      if (value.length > longest) longest = value.length;
      blank = value.trim() === '';
    } else {
      let k = i;
      while (k < n) {
        const ch = body.charCodeAt(k);
        if (ch === delimiter || ch === LF || ch === CR) break;
        k++;
      }
      i = k;
      starts.push(start);
      ends.push(k);
      if (k - start > longest) longest = k - start;
      if (k === start) blank = true;
      else {
        const c = body.charCodeAt(start);
        blank = c > 32 && c < 0xa0 ? false : body.slice(start, k).trim() === '';
      }
    }
    if (watched === undefined && watch >= 0 && watch < i) watched = { row: rowFirst.length - 1, col };
    col++;
    if (!blank) lastFilled = col;
    if (i >= n) {
      rowFirst.push(starts.length);
      filled.push(lastFilled);
      break;
    }
    const ch = body.charCodeAt(i);
    if (ch === delimiter) {
      i++;
      continue;
    }
    i += ch === CR && body.charCodeAt(i + 1) === LF ? 2 : 1;
    rowFirst.push(starts.length);
    filled.push(lastFilled);
    col = 0;
    lastFilled = 0;
    if (i >= n) break;
  }
  const widths = filled.done();
  let rows = widths.length;
  while (rows > 0 && widths[rows - 1] === 0) rows--;
  let width = 0;
  for (let r = 0; r < rows; r++) if (widths[r]! > width) width = widths[r]!;
  const firsts = rowFirst.done();
  const headerWidth = rows === 0 ? 0 : Math.min(firsts[1]! - firsts[0]!, width);
  const source = new CsvIndex(body, starts.done(), ends.done(), firsts.subarray(0, rows + 1), quotedValues, rows, width, longest);
  const extra: string[] = [];
  let extraRows = 0;
  for (let r = 1; r < rows; r++) {
    if (widths[r]! <= headerWidth) continue;
    extraRows++;
    if (extra.length < NAMED_CELLS) {
      // The first non-blank field past the header's width (there is one: the row is filled beyond it).
      let c = headerWidth;
      while (isBlankField(source, r, c)) c++;
      extra.push(`${columnLetters(c)}${r + 1}`);
    }
  }
  const notes: FileNote[] = [];
  if (extraRows > 0) {
    notes.push({
      cell: extra[0]!,
      message: `${extraRows.toLocaleString('en-US')} row${extraRows === 1 ? ' has' : 's have'} more fields than the header (${headerWidth}): ${extra.join(', ')}${extraRows > extra.length ? ', …' : ''}. Those values have no column heading, so no analysis reads them; check the file for a stray delimiter or an unquoted line break.`,
    });
  }
  const out: CsvIndexRead = { source, notes };
  return watched === undefined ? out : { ...out, watched: `${columnLetters(watched.col)}${watched.row + 1}` };
}

/** True when cell (r, c) of the index is blank after trimming. */
function isBlankField(source: CsvIndex, r: number, c: number): boolean {
  const v = source.cell(r, c);
  return typeof v !== 'string' || v.trim() === '';
}
