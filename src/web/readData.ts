/**
 * Reading a data file's bytes into a block of cells, the one way the page reads data: the page's own thread (for the
 * column choices and "go to cell") and the engine's worker (for the run) both call it on the same bytes, so they hold
 * the same cells.
 */
import { readCsvFile, readXlsxBuffer } from '../files';
import type { DataSource } from '../taskpane/actions';

export const isXlsx = (name: string): boolean => /\.xlsx$/i.test(name);

/** The file name without its extension, used as the "sheet" in cell addresses of CSV data ("egfr-visits"). */
export function baseName(name: string): string {
  const stem = name.replace(/^.*[\\/]/, '').replace(/\.[^.]+$/, '');
  return stem === '' ? 'Data' : stem;
}

/** Reads a file's bytes into a block of cells: CSV as text (intake reads numbers from text; read as the command line
 * reads it, with the same notes about the file), XLSX's first sheet. */
export async function readDataBytes(bytes: Uint8Array, name: string): Promise<DataSource> {
  if (isXlsx(name)) {
    const sheet = await readXlsxBuffer(bytes);
    return {
      label: `${name} (sheet ${sheet.sheet})`,
      sheet: sheet.sheet,
      topLeft: sheet.topLeft,
      dateSystem: sheet.dateSystem,
      cells: sheet.cells,
      numericText: 'reject',
    };
  }
  // The same CSV reading as the command line: decoding with its notes, the splitter with its notes, the size check.
  const read = readCsvFile(bytes, name, baseName(name));
  return {
    // The page's label stays the file name (the page shows it beside each cell, and knows the demo by it).
    label: name,
    sheet: baseName(name),
    topLeft: 'A1',
    dateSystem: 1900,
    cells: read.cells,
    numericText: 'accept',
    ...(read.notes.length > 0 ? { fileNotes: read.notes } : {}),
  };
}
