import { readFile } from 'node:fs/promises';
import { basename, extname } from 'node:path';
import { columnLetters, MAX_COLUMN_INDEX, MAX_ROW, parseCell } from '../core/intake';
import type { CellValue, DateSystem } from '../core/intake/types';
import { parseSchedule } from '../core/schedule';
import type { ScheduleVisit } from '../core/schedule/types';
import { decodeCsv, FileFormatError, readCsv, readXlsxBuffer } from '../files';
import type { CsvRead } from '../files';
import { UsageError } from './args';

/** The data file as cells, with where they came from (for cell addresses and the analysis record). */
export interface DataInput {
  readonly label: string;
  readonly sheet: string;
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly cells: CellValue[][];
  /** CSV cells are all text, so intake accepts numbers written as text. */
  readonly numericText: 'accept' | 'reject';
  /** Warnings about the file itself (a repaired encoding, fields past the header), each led by its first cell. */
  readonly notes: readonly string[];
}

/** The A1 range a grid covers from its top-left cell, e.g. "A1:G921" (for the analysis record's input label). */
function rangeOf(topLeft: string, cells: readonly (readonly CellValue[])[]): string {
  if (cells.length === 0) return topLeft;
  const { row, col } = parseCell(topLeft);
  const width = cells.reduce((w, r) => Math.max(w, r.length), 1);
  return `${topLeft}:${columnLetters(col + width - 1)}${row + cells.length - 1}`;
}

async function readBytes(path: string, what: string): Promise<Buffer> {
  try {
    return await readFile(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : (e as Error).message;
    throw new UsageError(`Cannot read the ${what} "${path}": ${why}.`);
  }
}

/** The cells of a CSV file with its notes and encoding; a file that cannot be read as CSV is named in the message.
 * A file decoded as UTF-8 with damaged bytes gets a note naming the first cell that holds a replacement character. */
function csvCells(bytes: Uint8Array, path: string, sheet: string): CsvRead & { readonly encoding: string; readonly lines: readonly string[] } {
  const decoded = decodeCsv(bytes, path);
  let read: CsvRead;
  try {
    read = readCsv(decoded.text, decoded.firstReplaced);
  } catch (e) {
    if (e instanceof FileFormatError) throw new FileFormatError(`"${path}": ${e.message}`);
    throw e;
  }
  const lines = read.notes.map((n) => `${sheet}!${n.cell}: ${n.message}`);
  if (decoded.replaced > 0) {
    const at = read.watched === undefined ? '' : `${sheet}!${read.watched}: `;
    lines.unshift(
      `${at}the file is UTF-8 with ${decoded.replaced.toLocaleString('en-US')} invalid byte sequence${decoded.replaced === 1 ? '' : 's'}, shown as \uFFFD (the first in this cell); the file was read as UTF-8. Check those values and save the file as UTF-8 again.`,
    );
  }
  return { ...read, encoding: decoded.encoding, lines };
}

/** Reads --data: a .csv file (sheet name = the file name without extension, as a spreadsheet program shows it) or
 * one worksheet of an .xlsx file. */
export async function readDataFile(path: string, sheet: string | undefined): Promise<DataInput> {
  const ext = extname(path).toLowerCase();
  const bytes = await readBytes(path, 'data file');
  if (ext === '.csv' || ext === '.txt') {
    if (sheet !== undefined) throw new UsageError('--sheet applies to .xlsx files only.');
    const name = basename(path, extname(path));
    const read = csvCells(bytes, path, name);
    const cells = read.cells;
    if (cells.length === 0) throw new FileFormatError(`"${path}" is empty: it needs a header row and one row per visit.`);
    // Every problem and result refers to a worksheet cell, so the file must fit on one worksheet.
    if (cells.length > MAX_ROW || (cells[0]?.length ?? 0) > MAX_COLUMN_INDEX + 1) {
      throw new UsageError(
        `"${path}" has ${cells.length.toLocaleString('en-US')} lines and ${cells[0]?.length ?? 0} columns; a worksheet holds at most ${MAX_ROW.toLocaleString('en-US')} rows (header included) and ${MAX_COLUMN_INDEX + 1} columns. Split the file, e.g. by site.`,
      );
    }
    return {
      label: `${basename(path)} (${rangeOf('A1', cells)}), read as ${read.encoding}`,
      sheet: name,
      topLeft: 'A1',
      dateSystem: 1900,
      cells,
      numericText: 'accept',
      notes: read.lines,
    };
  }
  if (ext === '.xlsx' || ext === '.xlsm') {
    let read: Awaited<ReturnType<typeof readXlsxBuffer>>;
    try {
      read = await readXlsxBuffer(new Uint8Array(bytes), sheet);
    } catch (e) {
      if (e instanceof FileFormatError) throw new FileFormatError(`"${path}": ${e.message}`);
      throw e;
    }
    return {
      label: `${basename(path)}, sheet ${read.sheet}!${rangeOf(read.topLeft, read.cells)}`,
      sheet: read.sheet,
      topLeft: read.topLeft,
      dateSystem: read.dateSystem,
      cells: read.cells,
      numericText: 'reject',
      notes: [],
    };
  }
  throw new UsageError(`--data must be a .csv or .xlsx file; got "${path}".`);
}

/** Reads --schedule (CSV, header visit,target_day,days_before,days_after). Problems come back as lines to print. */
export async function readScheduleFile(
  path: string,
): Promise<{ readonly ok: true; readonly schedule: readonly ScheduleVisit[]; readonly warnings: readonly string[] } | { readonly ok: false; readonly errors: readonly string[] }> {
  const ext = extname(path).toLowerCase();
  if (ext !== '.csv' && ext !== '.txt') {
    throw new UsageError(`--schedule must be a CSV file with the header visit,target_day,days_before,days_after; got "${path}". Save the schedule sheet as CSV.`);
  }
  const bytes = await readBytes(path, 'schedule file');
  const cells = csvCells(bytes, path, basename(path, extname(path))).cells;
  if (cells.length === 0) throw new FileFormatError(`The schedule "${path}" is empty: it needs the header visit,target_day,days_before,days_after and one row per visit.`);
  const parsed = parseSchedule(cells, basename(path, extname(path)), 'A1');
  const line = (i: { cell: string | null; message: string }): string => (i.cell === null ? i.message : `${i.cell}: ${i.message}`);
  if (!parsed.ok) return { ok: false, errors: parsed.issues.filter((i) => i.severity === 'error').map(line) };
  return { ok: true, schedule: parsed.schedule, warnings: parsed.issues.map(line) };
}
