/**
 * The .xlsx reader as it was before the sheet was read as a byte stream (src/files/readXlsx.ts at commit d42e807:
 * the string tokeniser xml.ts and a grid of CellValue), kept for one purpose: test/files/xlsxStream.test.ts compares
 * the streaming reader with it cell by cell. Not used by the product.
 */
import type { CellValue, DateSystem } from '../../src/core/intake/types';
import { columnLetters } from '../../src/core/intake/cellAddress';
import { xsdBoolean } from '../../src/files/dateSystem';
import { FileFormatError } from '../../src/files/errors';
import { attr, decodeXml, XmlStream, type XmlTag } from '../../src/files/xml';
import { inflatePart, zipEntries, type InflateBudget, type ZipEntry } from '../../src/files/zip';

/** A sheet read from an .xlsx file: its name, the address of its first used cell, its date system and its cells. */
export interface XlsxSheet {
  readonly sheet: string;
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly cells: CellValue[][];
  /** Names of all worksheets in the workbook, in order. */
  readonly sheetNames: readonly string[];
}

/** A worksheet's own limits (Excel specifications and limits: 1,048,576 rows by 16,384 columns, XFD). */
const SHEET_ROWS = 1_048_576;
const SHEET_COLUMNS = 16_384;

/**
 * Caps on the inflated size of each part, derived from Excel's row limit (1,048,576 rows): the sheet may hold 512
 * bytes of XML per row (about a dozen cells of the longest form, <c r="XFD1048576" s="12" t="s"><v>1048575</v></c>),
 * the shared strings 128 bytes per row (two distinct texts of ~40 characters per row), the small parts (workbook,
 * relationships) 4 MiB each. The total cap is their sum. Parts not needed (pictures, other sheets) are never inflated.
 */
export const XLSX_LIMITS = {
  sheetBytes: SHEET_ROWS * 512,
  sharedStringsBytes: SHEET_ROWS * 128,
  smallPartBytes: 4 * 1024 * 1024,
  totalBytes: SHEET_ROWS * 512 + SHEET_ROWS * 128 + 3 * 4 * 1024 * 1024,
  /** The most cells a grid may span (first to last used row and column): a full-height sheet of 32 columns. */
  gridCells: SHEET_ROWS * 32,
};
export type XlsxLimits = typeof XLSX_LIMITS;

/** First bytes of a zip archive (every .xlsx is one) and of an OLE2 compound file (.xls, or an encrypted .xlsx). */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04] as const;
const OLE2_MAGIC = [0xd0, 0xcf, 0x11, 0xe0] as const;

const REL_OFFICE_DOCUMENT = /\/officeDocument$/;
const REL_WORKSHEET = /\/worksheet$/;
const REL_SHARED_STRINGS = /\/sharedStrings$/;

/** Inflates a small part whole and returns it as text (undefined when the archive has no such part). */
async function partText(bytes: Uint8Array, entries: Map<string, ZipEntry>, name: string, budget: InflateBudget, cap: number): Promise<string | undefined> {
  const e = entries.get(name);
  if (e === undefined) return undefined;
  const decoder = new TextDecoder('utf-8');
  let text = '';
  await inflatePart(bytes, e, cap, budget, (c) => (text += decoder.decode(c, { stream: true })), 'workbook part');
  return text + decoder.decode();
}

/** Streams a part through an XML handler. */
async function streamPart(bytes: Uint8Array, e: ZipEntry, cap: number, budget: InflateBudget, xml: XmlStream, what: string): Promise<void> {
  const decoder = new TextDecoder('utf-8');
  await inflatePart(bytes, e, cap, budget, (c) => xml.push(decoder.decode(c, { stream: true })), what);
  xml.push(decoder.decode());
  xml.end();
}

/** The relationships of a part (Open Packaging Conventions, ECMA-376 Part 2): id → [type, absolute target]. */
function relationships(xml: string | undefined, from: string): Map<string, { type: string; target: string }> {
  const rels = new Map<string, { type: string; target: string }>();
  if (xml === undefined) return rels;
  const dir = from.includes('/') ? from.slice(0, from.lastIndexOf('/') + 1) : '';
  for (const m of xml.matchAll(/<(?:\w+:)?Relationship\b([^>]*)>/g)) {
    const a = m[1]!;
    const id = attr(a, 'Id');
    const target = attr(a, 'Target');
    if (id === undefined || target === undefined || attr(a, 'TargetMode') === 'External') continue;
    rels.set(id, { type: attr(a, 'Type') ?? '', target: resolvePath(dir, target) });
  }
  return rels;
}

/** A relationship target made absolute within the package: "/xl/a.xml" or "worksheets/../a.xml" from "xl/". */
function resolvePath(dir: string, target: string): string {
  const parts = (target.startsWith('/') ? target.slice(1) : dir + target).split('/');
  const out: string[] = [];
  for (const p of parts) {
    if (p === '..') out.pop();
    else if (p !== '.' && p !== '') out.push(p);
  }
  return out.join('/');
}

/** The rels part that belongs to a part: "xl/workbook.xml" → "xl/_rels/workbook.xml.rels". */
function relsPath(part: string): string {
  const slash = part.lastIndexOf('/');
  return `${part.slice(0, slash + 1)}_rels/${part.slice(slash + 1)}.rels`;
}

/** Reads the shared-string table (ECMA-376 Part 1, §18.4): the plain text of each si, phonetic runs (rPh) left out. */
async function sharedStrings(bytes: Uint8Array, e: ZipEntry, budget: InflateBudget, cap: number): Promise<string[]> {
  const out: string[] = [];
  let raw = '';
  let inT = false;
  let inPh = 0;
  const xml = new XmlStream({
    tag(t: XmlTag) {
      if (t.name === 'si') {
        if (!t.close) raw = '';
        if (t.close || t.empty) out.push(decodeXml(raw));
      } else if (t.name === 'rPh') {
        if (!t.empty) inPh += t.close ? -1 : 1;
      } else if (t.name === 't') inT = !t.close && !t.empty && inPh === 0;
    },
    text(s: string) {
      if (inT) raw += s;
    },
  });
  await streamPart(bytes, e, cap, budget, xml, 'shared-string table');
  return out;
}

/** Column number (1-based) and row of an A1 reference; NaN parts when it is not one. */
function splitRef(ref: string): { col: number; row: number } {
  const m = /^\$?([A-Za-z]{1,7})\$?(\d{1,12})$/.exec(ref);
  if (m === null) return { col: NaN, row: NaN };
  let col = 0;
  for (const ch of m[1]!.toUpperCase()) col = col * 26 + (ch.charCodeAt(0) - 64);
  return { col, row: Number(m[2]) };
}

/** One cell with a value, as read: 1-based row and column. */
interface Found {
  rows: number[];
  cols: number[];
  values: CellValue[];
}

/**
 * Reads the cells of a worksheet part (ECMA-376 Part 1, §18.3.1.4 c, §18.18.11 ST_CellType) sparsely, in the order
 * they appear: only cells with a value are kept, so empty styled cells and stray formatting cost nothing.
 * @throws FileFormatError for a row or cell past the worksheet's limits.
 */
async function sheetCells(bytes: Uint8Array, e: ZipEntry, budget: InflateBudget, cap: number, strings: readonly string[], sheet: string): Promise<Found> {
  const found: Found = { rows: [], cols: [], values: [] };
  let row = 0;
  let col = 0;
  let type = 'n';
  let raw = '';
  let collect: 'v' | 't' | null = null;
  let inIs = false;
  let inPh = 0;
  let inCell = false;
  const past = (where: string): FileFormatError =>
    new FileFormatError(
      `The sheet "${sheet}" has a cell at ${where}, past the last row or column a worksheet can have (${SHEET_ROWS.toLocaleString('en-US')} rows, ${SHEET_COLUMNS.toLocaleString('en-US')} columns to XFD); the file was not written by a spreadsheet program within its limits.`,
    );
  const finishCell = (): void => {
    let v: CellValue = null;
    if (type === 'inlineStr') v = decodeXml(raw);
    else if (raw !== '') {
      const text = decodeXml(raw);
      if (type === 's') v = strings[Number(text)] ?? null;
      else if (type === 'b') v = text.trim() === '1' || text.trim() === 'true';
      else if (type === 'n' || type === '') {
        const n = Number(text);
        v = text.trim() !== '' && Number.isFinite(n) ? n : text;
      } else v = text; // str (formula text), e (error value such as #N/A), d (ISO 8601 date text)
    }
    if (v === null || v === '') return;
    found.rows.push(row);
    found.cols.push(col);
    found.values.push(v);
  };
  const xml = new XmlStream({
    tag(t: XmlTag) {
      switch (t.name) {
        case 'row':
          if (!t.close) {
            const r = attr(t.attrs, 'r');
            row = r === undefined ? row + 1 : Number(r);
            if (!Number.isInteger(row) || row < 1 || row > SHEET_ROWS) throw past(`row ${r ?? String(row)}`);
            col = 0;
          }
          break;
        case 'c':
          if (t.close) {
            if (inCell) finishCell();
            inCell = false;
          } else {
            const r = attr(t.attrs, 'r');
            if (r === undefined) col += 1;
            else {
              const at = splitRef(r);
              if (!(at.row >= 1 && at.row <= SHEET_ROWS && at.col >= 1 && at.col <= SHEET_COLUMNS)) throw past(r);
              row = at.row;
              col = at.col;
            }
            if (col > SHEET_COLUMNS) throw past(`column ${col} of row ${row}`);
            type = attr(t.attrs, 't') ?? 'n';
            raw = '';
            inIs = false;
            inPh = 0;
            collect = null;
            inCell = !t.empty;
          }
          break;
        case 'v':
          collect = !t.close && !t.empty && inCell && !inIs ? 'v' : null;
          break;
        case 'is':
          inIs = !t.close && !t.empty;
          break;
        case 'rPh':
          if (!t.empty) inPh += t.close ? -1 : 1;
          break;
        case 't':
          collect = !t.close && !t.empty && inIs && inPh === 0 ? 't' : null;
          break;
        default:
          break;
      }
    },
    text(s: string) {
      if (collect !== null) raw += s;
    },
  });
  await streamPart(bytes, e, cap, budget, xml, `sheet "${sheet}"`);
  return found;
}

/**
 * Reads one worksheet of an .xlsx file into a grid of plain cells: numbers, text, booleans, null for blank.
 * Only the parts it needs are inflated (package and workbook relationships, the workbook, the shared strings, the one
 * sheet), each under a cap (XLSX_LIMITS) checked while it inflates, and each checked against its CRC-32. Cells are
 * read sparsely; the grid spans the first to the last cell that holds a value (so trailing empty or merely formatted
 * rows and columns are trimmed before it is made), and a span over XLSX_LIMITS.gridCells is refused with the far
 * cells named. Dates are the stored serials in the workbook's own date system (returned as dateSystem; the 1904 flag is
 * an xsd:boolean); formulas give their cached result; rich text gives its plain text; error cells give their text
 * such as "#N/A". `limits` exists for tests. Cost O(inflated bytes of those parts + cells); memory O(grid + shared strings), never O(file inflated).
 *
 * Example: a sheet "Visits" with A1 "id", A2 1 → { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, cells: [['id'],[1]] }
 * @throws FileFormatError when the bytes are not an .xlsx workbook, are damaged ("The file is damaged: …"), a part is
 * over its cap, the named sheet does not exist, the sheet is empty or past a worksheet's limits.
 */
export async function readXlsxGrid(buf: Uint8Array | ArrayBuffer, sheetName?: string, limits: XlsxLimits = XLSX_LIMITS): Promise<XlsxSheet> {
  // ArrayBuffer.isView rather than instanceof: a buffer made in another realm (a worker, a test DOM) fails instanceof.
  const bytes = ArrayBuffer.isView(buf) ? new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength) : new Uint8Array(buf);
  if (OLE2_MAGIC.every((b, k) => bytes[k] === b)) {
    throw new FileFormatError('The file is an older .xls workbook or a password-protected one, not a plain .xlsx; save it as .xlsx (Excel Workbook, no password) or as CSV.');
  }
  if (!ZIP_MAGIC.every((b, k) => bytes[k] === b)) {
    throw new FileFormatError('The file is not an .xlsx workbook: an .xlsx file is a zip archive and this one is not. If it holds CSV text, give it the .csv extension.');
  }
  const entries = zipEntries(bytes);
  const budget: InflateBudget = { used: 0, total: limits.totalBytes };
  const pkgRels = relationships(await partText(bytes, entries, '_rels/.rels', budget, limits.smallPartBytes), '');
  const wbPart = [...pkgRels.values()].find((r) => REL_OFFICE_DOCUMENT.test(r.type))?.target ?? 'xl/workbook.xml';
  const wbXml = await partText(bytes, entries, wbPart, budget, limits.smallPartBytes);
  if (wbXml === undefined) throw new FileFormatError('The file is a zip archive but not an .xlsx workbook: it has no workbook part.');
  const wbRels = relationships(await partText(bytes, entries, relsPath(wbPart), budget, limits.smallPartBytes), wbPart);

  const pr = /<(?:[\w.-]+:)?workbookPr\b([^>]*)>/.exec(wbXml);
  const flag = pr === null ? undefined : attr(pr[1]!, 'date1904');
  const dateSystem: DateSystem = flag !== undefined && xsdBoolean(flag) ? 1904 : 1900;

  const sheets: { name: string; part: string }[] = [];
  for (const m of wbXml.matchAll(/<(?:[\w.-]+:)?sheet\b([^>]*)>/g)) {
    const name = attr(m[1]!, 'name');
    const rel = wbRels.get(attr(m[1]!, 'id') ?? '');
    if (name !== undefined && rel !== undefined && REL_WORKSHEET.test(rel.type)) sheets.push({ name, part: rel.target });
  }
  const sheetNames = sheets.map((s) => s.name);
  const chosen = sheetName === undefined ? sheets[0] : sheets.find((s) => s.name === sheetName);
  if (chosen === undefined) {
    if (sheetName === undefined) throw new FileFormatError('The workbook holds no worksheet.');
    throw new FileFormatError(`The workbook has no sheet named "${sheetName}"; its sheets are: ${sheetNames.join(', ') || '(none)'}.`);
  }
  const sheetEntry = entries.get(chosen.part);
  if (sheetEntry === undefined) throw new FileFormatError(`The file is damaged: the sheet "${chosen.name}" is listed but its part ${chosen.part} is missing. Open it in Excel and save it again, or export the sheet as CSV.`);
  const ssRel = [...wbRels.values()].find((r) => REL_SHARED_STRINGS.test(r.type));
  const ssEntry = ssRel === undefined ? undefined : entries.get(ssRel.target);
  const strings = ssEntry === undefined ? [] : await sharedStrings(bytes, ssEntry, budget, limits.sharedStringsBytes);
  const found = await sheetCells(bytes, sheetEntry, budget, limits.sheetBytes, strings, chosen.name);
  return { sheet: chosen.name, dateSystem, sheetNames, ...toGrid(found, chosen.name, limits.gridCells) };
}

/** The dense grid from the first to the last used row and column; blank rows share one frozen row of nulls. */
function toGrid(found: Found, sheet: string, gridCells: number): { topLeft: string; cells: CellValue[][] } {
  const n = found.values.length;
  if (n === 0) throw new FileFormatError(`The sheet "${sheet}" is empty.`);
  let minRow = Infinity;
  let maxRow = 0;
  let minCol = Infinity;
  let maxCol = 0;
  let farRow = 0;
  let farCol = 0;
  for (let k = 0; k < n; k++) {
    const r = found.rows[k]!;
    const c = found.cols[k]!;
    if (r < minRow) minRow = r;
    if (r > maxRow) [maxRow, farRow] = [r, k];
    if (c < minCol) minCol = c;
    if (c > maxCol) [maxCol, farCol] = [c, k];
  }
  const height = maxRow - minRow + 1;
  const width = maxCol - minCol + 1;
  const address = (k: number): string => `${columnLetters(found.cols[k]! - 1)}${found.rows[k]!}`;
  const topLeft = `${columnLetters(minCol - 1)}${minRow}`;
  if (height * width > gridCells) {
    throw new FileFormatError(
      `The sheet "${sheet}" has values from ${topLeft} to ${columnLetters(maxCol - 1)}${maxRow} (${height.toLocaleString('en-US')} rows by ${width.toLocaleString('en-US')} columns), but only ${n.toLocaleString('en-US')} cells hold anything: ${farRow === farCol ? `the far cell is ${address(farRow)}` : `the last row with a value is at ${address(farRow)} and the last column at ${address(farCol)}`}. Delete stray cells outside the table (or copy the table to a new sheet) and save again.`,
    );
  }
  const blank = Object.freeze(new Array<CellValue>(width).fill(null)) as CellValue[];
  const cells: CellValue[][] = new Array<CellValue[]>(height).fill(blank);
  for (let k = 0; k < n; k++) {
    const i = found.rows[k]! - minRow;
    let row = cells[i]!;
    if (row === blank) {
      row = new Array<CellValue>(width).fill(null);
      cells[i] = row;
    }
    row[found.cols[k]! - minCol] = found.values[k];
  }
  return { topLeft, cells };
}
