/**
 * The pane's host on a plain page: files come from a file picker, schedules from a CSV file or the starter, results
 * are kept in a ResultStore that the page draws beside the pane. Nothing is sent anywhere.
 */
import type { CellValue } from '../core/intake/types';
import type { ScheduleVisit } from '../core/schedule/types';
import { STARTER_SCHEDULE, parseCell, parseSchedule, starterScheduleCells } from '../core/schedule';
import { printStampOf, readCsvFile, readXlsxBuffer, uniqueSheetNames, writeWorkbook } from '../files';
import type { DataSource, PaneActions, SavedSettings, ScheduleLoad, WrittenSheet } from '../taskpane/actions';
import type { PaneEngine } from '../taskpane/engine';
import { downloadBlob, xlsxBlob } from './download';
import { baseName, isXlsx, readDataBytes } from './readData';
import { ResultStore, blindedHeaders, sheetDomId } from './resultStore';
import type { ReportFile, WorkerEngine } from './workerEngine';

export { baseName } from './readData';

export const STARTER_NAME = 'Starter schedule';

export interface WebActions extends PaneActions {
  readonly store: ResultStore;
  /** The engine the pane runs with: the worker's when the page has one, else (tests) the pane's default. */
  readonly engine?: PaneEngine;
}

/** Reads a picked file into a block of cells (readDataBytes: CSV as text, XLSX's first sheet). */
export async function readDataFile(file: File): Promise<DataSource> {
  // A byte view rather than the bare ArrayBuffer: readers that test `instanceof ArrayBuffer` can then not be misled
  // by a buffer from another realm (a worker, a frame, or the test environment's own File).
  return readDataBytes(new Uint8Array(await file.arrayBuffer()), file.name);
}

/** The message shown when a schedule table has errors: each problem with its cell, at most five. */
export function scheduleMessage(
  issues: readonly { readonly severity: string; readonly cell: string | null; readonly message: string }[],
): string {
  const errors = issues.filter((i) => i.severity === 'error');
  const shown = errors.slice(0, 5).map((i) => (i.cell !== null ? `${i.cell}: ${i.message}` : i.message));
  const more = errors.length > 5 ? ` (and ${errors.length - 5} more)` : '';
  return shown.join(' ') + more;
}

/** Splits "Sheet!C17" or "'My sheet'!C17" into the sheet name and the cell. */
export function splitAddress(address: string): { readonly sheet: string; readonly cell: string } | null {
  const bang = address.lastIndexOf('!');
  if (bang < 0) return null;
  let sheet = address.slice(0, bang);
  if (sheet.startsWith("'") && sheet.endsWith("'")) sheet = sheet.slice(1, -1).replace(/''/g, "'");
  return { sheet, cell: address.slice(bang + 1) };
}

/**
 * The page's actions. With `worker` (the page itself), a chosen data file is read in the engine worker (the page
 * gets its cells packed), runs happen there, and so does the report's writing; without it (tests), everything runs
 * on the calling thread.
 */
export function createWebActions(store: ResultStore = new ResultStore(), worker?: WorkerEngine): WebActions {
  const schedules = new Map<string, readonly ScheduleVisit[]>();
  let saved: SavedSettings | null = null;

  const loadScheduleFile = async (file: File): Promise<ScheduleLoad> => {
    let cells: CellValue[][];
    let sheet = baseName(file.name);
    let topLeft = 'A1';
    if (isXlsx(file.name)) {
      const x = await readXlsxBuffer(await file.arrayBuffer());
      cells = x.cells;
      sheet = x.sheet;
      topLeft = x.topLeft;
    } else cells = readCsvFile(new Uint8Array(await file.arrayBuffer()), file.name, sheet).cells;
    const parsed = parseSchedule(cells, sheet, topLeft);
    if (!parsed.ok) return { ok: false, message: scheduleMessage(parsed.issues) || 'The schedule could not be read.' };
    schedules.set(file.name, parsed.schedule);
    return { ok: true, schedule: parsed.schedule };
  };

  return {
    store,
    ...(worker !== undefined ? { engine: worker.engine } : {}),
    sourceKinds: ['file'],

    async loadData(kind, file, onProgress) {
      if (kind !== 'file' || file === undefined)
        throw new Error('On this page, data come from a file: choose a CSV or .xlsx file.');
      onProgress?.(0.1);
      const source =
        worker !== undefined ? await worker.readSource(await file.arrayBuffer(), file.name) : await readDataFile(file);
      onProgress?.(1);
      store.update({ source, highlight: null, notice: null, shownHeaders: null });
      return source;
    },

    async listScheduleSources() {
      return [...schedules.keys()].map((name) => ({ name }));
    },

    async loadSchedule(name, file) {
      if (file !== undefined) return loadScheduleFile(file);
      const known = schedules.get(name);
      return known !== undefined
        ? { ok: true, schedule: known }
        : { ok: false, message: `No schedule named “${name}” has been loaded on this page.` };
    },

    async createStarterSchedule() {
      schedules.set(STARTER_NAME, STARTER_SCHEDULE);
      const csv = starterScheduleCells({ csv: true })
        .map((row) =>
          row
            .map((v) => (typeof v === 'string' && /[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : String(v)))
            .join(','),
        )
        .join('\r\n');
      downloadBlob(new Blob([`${csv}\r\n`], { type: 'text/csv' }), 'starter-schedule.csv');
      return STARTER_NAME;
    },

    async writeResults(output, onProgress) {
      const names = uniqueSheetNames(output.sheets.map((s) => s.name));
      const counts = worker?.tableRowsOf(output);
      const sheets = output.sheets.map((spec, i) => {
        const tableRows = counts?.[i];
        return { name: names[i] ?? spec.name, spec, ...(tableRows !== undefined ? { tableRows } : {}) };
      });
      const stamp = printStampOf(output.json);
      const report =
        worker !== undefined
          ? () => worker.writeReport(output, names, stamp)
          : async (): Promise<ReportFile> => ({
              blob: xlsxBlob(await writeWorkbook(sheets.map((s) => ({ ...s.spec, name: s.name })), stamp)),
              url: null,
            });
      store.update({ sheets, highlight: null, notice: null, shownHeaders: blindedHeaders(output.json), stamp, report });
      // The page draws the sheets one task at a time (ResultsView), so it keeps answering; the run is finished once
      // they are all on the page.
      await store.drawn(onProgress);
      onProgress?.(1);
      return sheets.map((s): WrittenSheet => ({ name: s.name, title: s.spec.title }));
    },

    async showSheet(name) {
      const heading = document.getElementById(`${sheetDomId(name)}-title`);
      heading?.scrollIntoView({ block: 'start' });
      heading?.focus();
    },

    async selectCell(address) {
      const { source } = store.get();
      const parts = splitAddress(address);
      if (source === null || parts === null) {
        store.update({ highlight: null, notice: `The page cannot show ${address}.` });
        return;
      }
      let cell: { col: number; row: number };
      let top: { col: number; row: number };
      try {
        cell = parseCell(parts.cell);
        top = parseCell(source.topLeft);
      } catch {
        store.update({ highlight: null, notice: `“${address}” is not a cell address.` });
        return;
      }
      const rowIndex = cell.row - top.row;
      const colIndex = cell.col - top.col;
      if (rowIndex < 0 || rowIndex >= source.cells.length || colIndex < 0) {
        store.update({ highlight: null, notice: `${address} lies outside the loaded data (${source.label}).` });
        return;
      }
      store.update({ highlight: { address, rowIndex, colIndex }, notice: null });
      requestAnimationFrame(() => {
        const box = document.getElementById('source-row');
        box?.scrollIntoView({ block: 'start' });
        box?.focus();
      });
    },

    async loadSaved() {
      return saved;
    },

    async save(settings) {
      saved = settings;
    },
  };
}
