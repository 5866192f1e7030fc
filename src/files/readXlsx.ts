import type { CellValue, DateSystem } from '../core/intake/types';
import { columnLetters } from '../core/intake/cellAddress';
import { xsdBoolean } from './dateSystem';
import { FileFormatError } from './errors';
import { attr } from './xml';
import { type FoundCells, SharedStringScanner, SheetScanner } from './sheetScan';
import { XlsxCells } from './xlsxCells';
import { inflatePart, zipEntries, type InflateBudget, type ZipEntry } from './zip';

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
export const SHEET_ROWS = 1_048_576;
export const SHEET_COLUMNS = 16_384;

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

/** Reads the shared-string table (ECMA-376 Part 1, §18.4): the plain text of each si, phonetic runs (rPh) left out,
 * from its bytes as it inflates (sheetScan.ts). */
async function sharedStrings(bytes: Uint8Array, e: ZipEntry, budget: InflateBudget, cap: number): Promise<string[]> {
  const scanner = new SharedStringScanner();
  await inflatePart(bytes, e, cap, budget, (c) => scanner.push(c), 'shared-string table');
  scanner.end();
  return scanner.strings;
}

/**
 * Reads the cells of a worksheet part (ECMA-376 Part 1, §18.3.1.4 c, §18.18.11 ST_CellType) sparsely, in the order
 * they appear, streaming (sheetScan.ts): only cells with a value are kept, so empty styled cells and stray formatting
 * cost nothing.
 * @throws FileFormatError for a row or cell past the worksheet's limits.
 */
async function sheetCells(bytes: Uint8Array, e: ZipEntry, budget: InflateBudget, cap: number, strings: readonly string[], sheet: string): Promise<FoundCells> {
  const scanner = new SheetScanner({
    strings,
    rowsMax: SHEET_ROWS,
    columnsMax: SHEET_COLUMNS,
    past: (where: string): FileFormatError =>
      new FileFormatError(
        `The sheet "${sheet}" has a cell at ${where}, past the last row or column a worksheet can have (${SHEET_ROWS.toLocaleString('en-US')} rows, ${SHEET_COLUMNS.toLocaleString('en-US')} columns to XFD); the file was not written by a spreadsheet program within its limits.`,
      ),
  }, Math.min(e.size, cap));
  await inflatePart(bytes, e, cap, budget, (c) => scanner.push(c), `sheet "${sheet}"`);
  scanner.end();
  return scanner.found;
}

/** One worksheet read from an .xlsx file as a CellSource: the cells stay in typed arrays (xlsxCells.ts). */
export interface XlsxSheetSource {
  readonly sheet: string;
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly source: XlsxCells;
  readonly sheetNames: readonly string[];
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
export async function readXlsxBuffer(buf: Uint8Array | ArrayBuffer, sheetName?: string, limits: XlsxLimits = XLSX_LIMITS): Promise<XlsxSheet> {
  const read = await readXlsxSource(buf, sheetName, limits);
  return { sheet: read.sheet, topLeft: read.topLeft, dateSystem: read.dateSystem, sheetNames: read.sheetNames, cells: read.source.toGrid() };
}

/**
 * readXlsxBuffer without the grid: the same checks, limits and messages, with the cells left in typed arrays behind a
 * CellSource (xlsxCells.ts), read from the sheet part as it inflates (sheetScan.ts). The command line reads data this
 * way. Cost O(inflated bytes of the parts read + cells); memory about 11 bytes per cell with a value plus the
 * distinct texts and the shared strings, never O(sheet XML) or O(grid).
 * @throws FileFormatError as readXlsxBuffer.
 */
export async function readXlsxSource(buf: Uint8Array | ArrayBuffer, sheetName?: string, limits: XlsxLimits = XLSX_LIMITS): Promise<XlsxSheetSource> {
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
  return { sheet: chosen.name, dateSystem, sheetNames, ...toSource(found, strings, chosen.name, limits.gridCells) };
}

/**
 * The cells found, from the first to the last used row and column, as a CellSource. Cells come in row order in every
 * file a spreadsheet program writes; others are sorted (a later cell at the same address replaces an earlier one, as
 * in the grid before). A span over `gridCells` is refused with the far cells named.
 */
function toSource(found: FoundCells, strings: readonly string[], sheet: string, gridCells: number): { topLeft: string; source: XlsxCells } {
  const n = found.length;
  if (n === 0) throw new FileFormatError(`The sheet "${sheet}" is empty.`);
  const rows = found.rows;
  const cols = found.cols;
  let minRow = Infinity;
  let maxRow = 0;
  let minCol = Infinity;
  let maxCol = 0;
  let farRow = 0;
  let farCol = 0;
  for (let k = 0; k < n; k++) {
    const r = rows[k]!;
    const c = cols[k]!;
    if (r < minRow) minRow = r;
    if (r > maxRow) [maxRow, farRow] = [r, k];
    if (c < minCol) minCol = c;
    if (c > maxCol) [maxCol, farCol] = [c, k];
  }
  const height = maxRow - minRow + 1;
  const width = maxCol - minCol + 1;
  const address = (k: number): string => `${columnLetters(cols[k]! - 1)}${rows[k]!}`;
  const topLeft = `${columnLetters(minCol - 1)}${minRow}`;
  if (height * width > gridCells) {
    throw new FileFormatError(
      `The sheet "${sheet}" has values from ${topLeft} to ${columnLetters(maxCol - 1)}${maxRow} (${height.toLocaleString('en-US')} rows by ${width.toLocaleString('en-US')} columns), but only ${n.toLocaleString('en-US')} cells hold anything: ${farRow === farCol ? `the far cell is ${address(farRow)}` : `the last row with a value is at ${address(farRow)} and the last column at ${address(farCol)}`}. Delete stray cells outside the table (or copy the table to a new sheet) and save again.`,
    );
  }
  // The order to keep: every cell when they came in order, else sorted by address, the last of equal addresses kept.
  let order: Int32Array | null = null;
  let m = n;
  if (!found.ordered) {
    const key = (k: number): number => rows[k]! * 16_385 + cols[k]!;
    const all = Int32Array.from({ length: n }, (_, k) => k).sort((a, b) => key(a) - key(b) || a - b);
    order = new Int32Array(n);
    m = 0;
    for (let j = 0; j < n; j++) {
      const k = all[j]!;
      if (j + 1 < n && key(all[j + 1]!) === key(k)) continue;
      order[m++] = k;
    }
  }
  // In order, the found arrays are kept as they are (no copy; room never written costs no memory) and the columns
  // made relative in place; otherwise they are gathered in the sorted order.
  const rowStart = new Int32Array(height + 1);
  const outCols = order === null ? cols.subarray(0, n) : new Uint16Array(m);
  const kinds = order === null ? found.kinds.subarray(0, n) : new Uint8Array(m);
  const nums = order === null ? found.nums.subarray(0, n) : new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const k = order === null ? j : order[j]!;
    const at = rows[k]! - minRow + 1;
    rowStart[at] = rowStart[at]! + 1;
    outCols[j] = cols[k]! - minCol;
    if (order !== null) {
      kinds[j] = found.kinds[k]!;
      nums[j] = found.nums[k]!;
    }
  }
  found.rows = new Int32Array(0);
  for (let r = 0; r < height; r++) rowStart[r + 1] = rowStart[r + 1]! + rowStart[r]!;
  let longest = found.longestText;
  for (const t of strings) if (t.length > longest) longest = t.length;
  return { topLeft, source: new XlsxCells(height, width, rowStart, outCols, kinds, nums, strings, found.texts, longest) };
}
