import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import type { CellValue, DateSystem } from '../core/intake/types';
import { columnLetters } from '../core/intake/cellAddress';
import { workbookDateSystem } from './dateSystem';
import { FileFormatError } from './errors';

/** A sheet read from an .xlsx file: its name, the address of its first used cell, its date system and its cells. */
export interface XlsxSheet {
  readonly sheet: string;
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly cells: CellValue[][];
  /** Names of all worksheets in the workbook, in order. */
  readonly sheetNames: readonly string[];
}

const MS_PER_DAY = 86_400_000;
/** First bytes of a zip archive (every .xlsx is one) and of an OLE2 compound file (the older .xls format). */
const ZIP_MAGIC = [0x50, 0x4b, 0x03, 0x04] as const;
const OLE2_MAGIC = [0xd0, 0xcf, 0x11, 0xe0] as const;
/** Days from 1899-12-30 (serial 0 of the 1900 system) to 1970-01-01 (ECMA-376 Part 1, §18.17.4.1). */
const UNIX_EPOCH_SERIAL_1900 = 25_569;
/** 1904-system serial 0 is 1904-01-01, which is 1900-system serial 1462 (ECMA-376 Part 1, §18.17.4.1). */
const OFFSET_1904 = 1462;

/** exceljs turns a date-formatted number into a UTC Date; this turns it back into the workbook's own serial. */
function dateToSerial(d: Date, system: DateSystem): number {
  const serial1900 = d.getTime() / MS_PER_DAY + UNIX_EPOCH_SERIAL_1900;
  return system === 1904 ? serial1900 - OFFSET_1904 : serial1900;
}

function plainValue(v: ExcelJS.CellValue, system: DateSystem): CellValue {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  if (v instanceof Date) return Number.isNaN(v.getTime()) ? null : dateToSerial(v, system);
  if ('error' in v) return v.error;
  if ('richText' in v) return v.richText.map((r) => r.text).join('');
  if ('formula' in v || 'sharedFormula' in v) {
    const result = (v as ExcelJS.CellFormulaValue).result;
    return result === undefined ? null : plainValue(result, system);
  }
  if ('hyperlink' in v) return v.text;
  return String(v);
}

/**
 * Reads one worksheet of an .xlsx file into a grid of plain cells: numbers, text, booleans, null for blank.
 * Date-formatted cells become serials in the workbook's own date system (the 1904 flag is honoured and returned as
 * dateSystem, so intake treats dated and plain-number cells alike); formulas give their cached result; rich text
 * gives its plain text; error cells give their text such as "#N/A". The grid starts at the first used row and
 * column (topLeft) and ends at the last used ones. Cost O(cells).
 *
 * Example: a sheet "Visits" with A1 "id", A2 1 → { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, cells: [['id'],[1]] }
 * @throws FileFormatError when the bytes are not an .xlsx workbook, the named sheet does not exist, or it is empty.
 */
export async function readXlsxBuffer(buf: Uint8Array | ArrayBuffer, sheetName?: string): Promise<XlsxSheet> {
  // ArrayBuffer.isView rather than instanceof: a buffer made in another realm (a worker, a test DOM) fails instanceof.
  const head = ArrayBuffer.isView(buf) ? new Uint8Array(buf.buffer, buf.byteOffset, Math.min(4, buf.byteLength)) : new Uint8Array(buf, 0, Math.min(4, buf.byteLength));
  if (OLE2_MAGIC.every((b, k) => head[k] === b)) {
    throw new FileFormatError('The file is an older .xls workbook, not .xlsx; save it as .xlsx (Excel Workbook) or as CSV.');
  }
  if (!ZIP_MAGIC.every((b, k) => head[k] === b)) {
    throw new FileFormatError('The file is not an .xlsx workbook: an .xlsx file is a zip archive and this one is not. If it holds CSV text, give it the .csv extension.');
  }
  const wb = new ExcelJS.Workbook();
  let system: DateSystem;
  try {
    system = await workbookDateSystem(await JSZip.loadAsync(buf));
    await wb.xlsx.load(buf as unknown as Parameters<typeof wb.xlsx.load>[0]);
  } catch (e) {
    throw new FileFormatError(`The file is not a readable .xlsx workbook (${e instanceof Error ? e.message : String(e)}).`);
  }
  const sheetNames = wb.worksheets.map((w) => w.name);
  const ws = sheetName === undefined ? wb.worksheets[0] : wb.worksheets.find((w) => w.name === sheetName);
  if (!ws) {
    const which = sheetName === undefined ? 'any worksheet' : `a sheet named "${sheetName}"`;
    throw new FileFormatError(`The workbook has no ${which}; its sheets are: ${sheetNames.join(', ') || '(none)'}.`);
  }
  // exceljs turned date cells into Dates by its own reading of the flag (it accepts only "1"); undoing that with the
  // same reading gives back the cell's stored serial, which is a serial in the workbook's own system.
  const exceljsSystem: DateSystem = wb.properties.date1904 ? 1904 : 1900;
  let minRow = Infinity;
  let maxRow = 0;
  let minCol = Infinity;
  let maxCol = 0;
  const found: { r: number; c: number; v: CellValue }[] = [];
  ws.eachRow({ includeEmpty: false }, (row, r) => {
    row.eachCell({ includeEmpty: false }, (cell, c) => {
      const v = plainValue(cell.value, exceljsSystem);
      if (v === null || v === '') return;
      found.push({ r, c, v });
      minRow = Math.min(minRow, r);
      maxRow = Math.max(maxRow, r);
      minCol = Math.min(minCol, c);
      maxCol = Math.max(maxCol, c);
    });
  });
  if (found.length === 0) throw new FileFormatError(`The sheet "${ws.name}" is empty.`);
  const cells: CellValue[][] = Array.from({ length: maxRow - minRow + 1 }, () =>
    new Array<CellValue>(maxCol - minCol + 1).fill(null),
  );
  for (const { r, c, v } of found) cells[r - minRow]![c - minCol] = v;
  return { sheet: ws.name, topLeft: `${columnLetters(minCol - 1)}${minRow}`, dateSystem: system, cells, sheetNames };
}
