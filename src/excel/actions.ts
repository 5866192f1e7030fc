/**
 * The pane's host actions for Excel: data from the selection or the used range, schedules from sheets, results as
 * new sheets, settings in the workbook. Each action is one operation against the workbook; a failure rejects with a
 * message the pane shows.
 */
import type { CellValue } from '../core/intake/types';
import { parseSchedule, starterScheduleCells } from '../core/schedule';
import type { ScheduleIssue } from '../core/schedule/types';
import type { DataSource, PaneActions, ScheduleLoad, WrittenSheet } from '../taskpane/actions';
import { rangeAddress, splitAddress } from './address';
import { probeDateSystem } from './dateSystem';
import { ExcelAdapterError, explain } from './errors';
import { supportsExcelApi } from './features';
import { FORMAT_CODES, TEXT_FORMAT } from './formatCodes';
import { readRange } from './readRange';
import { renderSheet } from './renderSheet';
import { loadSavedSettings, saveSettings } from './settings';
import { uniqueSheetName, uniqueTableName } from './sheetNames';

/** The wanted name of the starter schedule sheet. */
export const STARTER_SHEET_NAME = 'Visit schedule';

/** What the starter sheet's cell checks say when a value breaks them (ExcelApi 1.8 and later). */
export const STARTER_DAY_RULE = 'A target day is a whole number other than 0 (study days have no day 0).';
export const STARTER_ALLOWANCE_RULE = 'Days allowed before or after is a whole number, 0 or more.';

/** One line per blocking schedule problem, with its cell: "Visit schedule!B4: The target day must be ...". */
export function scheduleMessage(issues: readonly ScheduleIssue[]): string {
  const errors = issues.filter((i) => i.severity === 'error');
  const lines = errors.slice(0, 10).map((i) => (i.cell !== null ? `${i.cell}: ${i.message}` : i.message));
  if (errors.length > 10) lines.push(`… and ${errors.length - 10} more.`);
  return lines.join('\n');
}

/** The sheet names of the workbook, in tab order. One request. */
async function sheetNames(): Promise<string[]> {
  return Excel.run(async (context) => {
    const sheets = context.workbook.worksheets;
    sheets.load('items/name');
    await context.sync();
    return sheets.items.map((s) => s.name);
  });
}

/** Writes the starter schedule at A1 of a new sheet as a table (labels as text), activates it, returns its name. */
async function writeStarterSchedule(): Promise<string> {
  const cells = starterScheduleCells();
  return Excel.run(async (context) => {
    const sheets = context.workbook.worksheets;
    const tables = context.workbook.tables;
    sheets.load('items/name');
    tables.load('items/name');
    await context.sync();
    const name = uniqueSheetName(STARTER_SHEET_NAME, sheets.items.map((s) => s.name));
    const ws = sheets.add(name);
    const width = cells[0]?.length ?? 0;
    const range = ws.getRange(rangeAddress(0, 0, cells.length, width));
    range.numberFormat = cells.map((row, i) => row.map((_, j) => (i === 0 || j === 0 ? TEXT_FORMAT : FORMAT_CODES.integer)));
    range.values = cells;
    const table = ws.tables.add(range, true);
    table.name = uniqueTableName('Schedule', tables.items.map((t) => t.name));
    if (supportsExcelApi('1.8')) {
      // Data validation (ExcelApi 1.8) stops a fraction or a day 0 as it is typed; without it, reading the schedule
      // still reports each bad cell with its address.
      const body = cells.length - 1;
      const day = ws.getRange(rangeAddress(1, 1, body, 1)).dataValidation;
      day.rule = { wholeNumber: { formula1: 0, operator: 'NotEqualTo' } };
      day.errorAlert = { showAlert: true, style: 'Stop', title: 'Target day', message: STARTER_DAY_RULE };
      const allowed = ws.getRange(rangeAddress(1, 2, body, 2)).dataValidation;
      allowed.rule = { wholeNumber: { formula1: 0, operator: 'GreaterThanOrEqualTo' } };
      allowed.errorAlert = { showAlert: true, style: 'Stop', title: 'Days allowed', message: STARTER_ALLOWANCE_RULE };
    }
    range.format.autofitColumns();
    ws.activate();
    await context.sync();
    return name;
  });
}

/** Activates a sheet by name. One request. */
async function showSheet(name: string): Promise<void> {
  await explain(`Showing the sheet "${name}"`, () =>
    Excel.run(async (context) => {
      context.workbook.worksheets.getItem(name).activate();
      await context.sync();
    }),
  );
}

/** Creates the Excel implementation of the pane's host actions. */
export function createExcelActions(): PaneActions {
  return {
    sourceKinds: ['selection', 'usedRange'],

    async loadData(kind, _file, onProgress): Promise<DataSource> {
      if (kind === 'file') throw new ExcelAdapterError('In Excel, data come from the selection or the sheet in use, not from a file.');
      const what = kind === 'selection' ? 'Reading the selection' : 'Reading the sheet in use';
      const r = await explain(what, () => readRange({ kind }, onProgress !== undefined ? { onProgress } : {}));
      if (r.cells.length < 2) {
        throw new ExcelAdapterError(`${r.sheet}!${r.address} has no data rows: select a header row and the rows below it.`);
      }
      return { label: `${r.sheet}!${r.address}`, sheet: r.sheet, topLeft: r.topLeft, dateSystem: r.dateSystem, cells: r.cells };
    },

    async listScheduleSources() {
      const names = await explain('Listing the sheets', sheetNames);
      return names.map((name) => ({ name }));
    },

    async loadSchedule(name): Promise<ScheduleLoad> {
      const r = await explain(`Reading the schedule sheet "${name}"`, () => readRange({ kind: 'sheet', name }));
      const cells: readonly (readonly CellValue[])[] = r.cells;
      const parsed = parseSchedule(cells, r.sheet, r.topLeft);
      if (!parsed.ok) return { ok: false, message: scheduleMessage(parsed.issues) || `The sheet "${name}" does not hold a visit schedule.` };
      return { ok: true, schedule: parsed.schedule };
    },

    async createStarterSchedule() {
      return explain('Writing the starter schedule', writeStarterSchedule);
    },

    async writeResults(output, onProgress): Promise<readonly WrittenSheet[]> {
      const dateSystem = await probeDateSystem();
      const written: WrittenSheet[] = [];
      // Wanted name → the name each sheet got; the summary sheet comes first, so the links to it find their target.
      const linkTargets = new Map<string, string>();
      const n = output.sheets.length;
      for (const [i, spec] of output.sheets.entries()) {
        const sheet = await explain(`Writing the sheet "${spec.name}"`, () =>
          renderSheet(spec, { dateSystem, linkTargets, onProgress: (f) => onProgress?.((i + f) / Math.max(1, n)) }),
        );
        if (!linkTargets.has(spec.name)) linkTargets.set(spec.name, sheet.name);
        written.push(sheet);
      }
      const first = written[0];
      if (first !== undefined) await showSheet(first.name);
      return written;
    },

    showSheet,

    async selectCell(address) {
      const { sheet, cells } = splitAddress(address);
      await explain(`Selecting ${address}`, () =>
        Excel.run(async (context) => {
          const ws = context.workbook.worksheets.getItem(sheet);
          ws.activate();
          ws.getRange(cells).select();
          await context.sync();
        }),
      );
    },

    loadSaved: loadSavedSettings,
    save: saveSettings,
  };
}
