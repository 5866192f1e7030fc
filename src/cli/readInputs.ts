import { readFile } from 'node:fs/promises';
import { basename, extname } from 'node:path';
import type { DateSystem } from '../core/intake/types';
import { ReleasableSource } from './releasableSource';
import { parseSchedule } from '../core/schedule';
import type { ScheduleVisit } from '../core/schedule/types';
import { fileFingerprint, FileFormatError, rangeOf, readCsvFile, readCsvSource, readXlsxSource } from '../files';
import { UsageError } from './args';

/** The data file as cells, with where they came from (for cell addresses and the analysis record). */
export interface DataInput {
  readonly label: string;
  readonly sheet: string;
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  /** The cells, read cell by cell by intake (a CSV file stays an index over its text, csvIndex.ts; an .xlsx sheet
   * typed arrays, xlsxCells.ts). */
  readonly source: ReleasableSource;
  /** SHA-256 of the file's bytes (fileFingerprint), the run's input fingerprint. */
  readonly fingerprint: string;
  /** CSV cells are all text, so intake accepts numbers written as text. */
  readonly numericText: 'accept' | 'reject';
  /** Warnings about the file itself (a repaired encoding, fields past the header), each led by its first cell. */
  readonly notes: readonly string[];
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

/** Reads --data: a .csv file (sheet name = the file name without extension, as a spreadsheet program shows it) or
 * one worksheet of an .xlsx file. */
export async function readDataFile(path: string, sheet: string | undefined): Promise<DataInput> {
  const ext = extname(path).toLowerCase();
  const bytes = await readBytes(path, 'data file');
  if (ext === '.csv' || ext === '.txt') {
    if (sheet !== undefined) throw new UsageError('--sheet applies to .xlsx files only.');
    const name = basename(path, extname(path));
    const read = readCsvSource(bytes, path, name);
    return {
      label: read.label,
      sheet: name,
      topLeft: 'A1',
      dateSystem: 1900,
      source: new ReleasableSource(read.source),
      fingerprint: await fileFingerprint(bytes),
      numericText: 'accept',
      notes: read.notes,
    };
  }
  if (ext === '.xlsx' || ext === '.xlsm') {
    let read: Awaited<ReturnType<typeof readXlsxSource>>;
    try {
      // The sheet stays in typed arrays behind a CellSource (src/files/xlsxCells.ts), as a CSV file stays an index.
      read = await readXlsxSource(new Uint8Array(bytes), sheet);
    } catch (e) {
      if (e instanceof FileFormatError) throw new FileFormatError(`"${path}": ${e.message}`);
      throw e;
    }
    return {
      label: `${basename(path)}, sheet ${read.sheet}!${rangeOf(read.topLeft, read.source.rowCount, read.source.width)}`,
      sheet: read.sheet,
      topLeft: read.topLeft,
      dateSystem: read.dateSystem,
      source: new ReleasableSource(read.source),
      fingerprint: await fileFingerprint(bytes),
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
  const empty = `The schedule "${path}" is empty: it needs the header visit,target_day,days_before,days_after and one row per visit.`;
  const cells = readCsvFile(bytes, path, basename(path, extname(path)), empty).cells;
  const parsed = parseSchedule(cells, basename(path, extname(path)), 'A1');
  const line = (i: { cell: string | null; message: string }): string => (i.cell === null ? i.message : `${i.cell}: ${i.message}`);
  if (!parsed.ok) return { ok: false, errors: parsed.issues.filter((i) => i.severity === 'error').map(line) };
  return { ok: true, schedule: parsed.schedule, warnings: parsed.issues.map(line) };
}
