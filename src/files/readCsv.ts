import Papa from 'papaparse';
import type { CellValue } from '../core/intake/types';
import { columnLetters } from '../core/intake/cellAddress';
import { FileFormatError } from './errors';

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
 * Reads CSV text into a grid of cells, every field kept as text exactly as written (no number or date guessing:
 * intake decides that once, with the option numericText 'accept' because in CSV every number is text).
 * Strips a UTF-8 byte-order mark, takes the delimiter (comma, semicolon or tab) from the header line, keeps interior blank lines as rows of
 * blanks so that row numbers match the file's lines, drops trailing blank lines, and pads short rows with "".
 * Cost O(characters).
 *
 * Example: readCsvText('\uFEFFid,v\n1,2\n') → [['id','v'],['1','2']]
 * @throws FileFormatError when a quoted field never closes (the grid would be wrong from there on).
 */
export function readCsvText(text: string): CellValue[][] {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const delimiter = headerDelimiter(body);
  const parsed = Papa.parse<string[]>(body, { header: false, dynamicTyping: false, skipEmptyLines: false, delimiter });
  const quoteError = parsed.errors.find((e) => e.type === 'Quotes');
  if (quoteError) {
    // Papa's row is the 0-based record index, header included, so the worksheet row is one more; the open field is
    // the last one the record got.
    const record = quoteError.row === undefined ? undefined : parsed.data[quoteError.row];
    const at = quoteError.row === undefined || record === undefined ? '' : ` at cell ${columnLetters(Math.max(0, record.length - 1))}${quoteError.row + 1}`;
    throw new FileFormatError(
      `The CSV text has a quoted field that never closes${at}: a field that opens with a double quote must close with one (a quote inside it is written twice, "").`,
    );
  }
  const rows: string[][] = parsed.data.map((r) => r.map((f) => String(f)));
  while (rows.length > 0 && rows[rows.length - 1]!.every((f) => f.trim() === '')) rows.pop();
  const width = rows.reduce((w, r) => Math.max(w, r.length), 0);
  return rows.map((r) => (r.length < width ? [...r, ...new Array<string>(width - r.length).fill('')] : r));
}
