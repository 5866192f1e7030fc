/**
 * Renders a SheetSpec into a new worksheet: title, paragraphs (merged and wrapped across the text width), real tables
 * with number formats, native charts, column widths and frozen rows. Never writes into an existing sheet. Every text
 * cell gets the text format "@" before its value is written, so user text such as "=1+1" stays text and never becomes
 * a formula.
 */
import type { DateSystem } from '../core/intake/types';
import type { SheetSpec } from '../core/report/types';
import type { WrittenSheet } from '../taskpane/actions';
import { rangeAddress } from './address';
import { ExcelAdapterError } from './errors';
import type { CellPatch, ChartPlan, PatchStyle, SheetLayout } from './layout';
import { layoutSheet } from './layout';
import { isPayloadTooLarge } from './readRange';
import { uniqueSheetName, uniqueTableName } from './sheetNames';
import { GENERAL_FORMAT } from './formatCodes';
import { halvePatch, planWrites, styleNameFor, uniformFormats, type FormatMode } from './writePlan';
import { POINTS_PER_CHARACTER } from './wrapAreas';

export interface RenderOptions {
  readonly dateSystem: DateSystem;
  /** Called after each request with the fraction of the sheet written (0 to 1). */
  readonly onProgress?: (fraction: number) => void;
  /** Aimed-for bytes per write request (default 1,500,000, under a third of the web host's 5 MB limit). */
  readonly targetBytes?: number;
  /** Most cells per write request (default 200,000). */
  readonly maxCells?: number;
  /** Wanted sheet name → the name that sheet got, for the sheets of this run written so far (links point into them). */
  readonly linkTargets?: ReadonlyMap<string, string>;
}

/** A place in the workbook as a hyperlink's document reference, e.g. 'Summary (2)'!A1 (inner apostrophes doubled). */
export const documentReference = (sheet: string, cell: string): string => `'${sheet.replace(/'/g, "''")}'!${cell}`;


const CAUTION_COLOUR = '#9C2B00';

/** Creates the sheet under a name no existing sheet has (ignoring case), in one request. */
async function addSheet(wanted: string): Promise<string> {
  return Excel.run(async (context) => {
    const sheets = context.workbook.worksheets;
    sheets.load('items/name');
    await context.sync();
    const name = uniqueSheetName(wanted, sheets.items.map((s) => s.name));
    sheets.add(name);
    await context.sync();
    return name;
  });
}

function applyStyle(range: Excel.Range, style: PatchStyle): void {
  if (style === 'normal') return;
  range.format.font.bold = true;
  if (style === 'title') range.format.font.size = 14;
  if (style === 'heading') range.format.font.size = 12;
  if (style === 'caution') range.format.font.color = CAUTION_COLOUR;
}

/**
 * Makes sure the workbook has a style for each format code (named by styleNameFor; it carries the number format
 * only, so applying it changes nothing else of a cell), in one request. Returns false when styles cannot be added
 * (a protected workbook, a host that refuses): the writes then carry a format per cell, as before.
 */
export async function ensureFormatStyles(codes: ReadonlySet<string>): Promise<boolean> {
  if (codes.size === 0) return true;
  try {
    await Excel.run(async (context) => {
      const styles = context.workbook.styles;
      styles.load('items/name');
      await context.sync();
      const have = new Set(styles.items.map((s) => s.name));
      for (const code of codes) {
        const name = styleNameFor(code);
        if (have.has(name)) continue;
        styles.add(name);
        const style = styles.getItem(name);
        style.includeNumber = true;
        style.includeFont = false;
        style.includeAlignment = false;
        style.includeBorder = false;
        style.includePatterns = false;
        style.includeProtection = false;
        style.numberFormat = code;
      }
      await context.sync();
    });
    return true;
  } catch {
    return false;
  }
}

/** The format codes of the columns that can go by style in any of `patches`. */
function styleCodes(patches: readonly CellPatch[]): Set<string> {
  const codes = new Set<string>();
  for (const p of patches) for (const code of uniformFormats(p)) if (code !== null) codes.add(code);
  return codes;
}

/**
 * Writes a group of patches in one request: number formats first (text cells "@"), then the values. In 'columns'
 * mode a column whose rows share one format gets its style (one name for the column) and the others a code per cell.
 */
async function writeGroup(sheet: string, group: readonly CellPatch[], mode: FormatMode): Promise<void> {
  await Excel.run(async (context) => {
    const ws = context.workbook.worksheets.getItem(sheet);
    for (const p of group) {
      const rows = p.values.length;
      const cols = p.values[0]?.length ?? 0;
      if (rows === 0 || cols === 0) continue;
      const range = ws.getRange(rangeAddress(p.row, p.column, rows, cols));
      if (mode === 'columns') {
        uniformFormats(p).forEach((code, c) => {
          const column = ws.getRange(rangeAddress(p.row, p.column + c, rows, 1));
          if (code !== null) column.style = styleNameFor(code);
          else column.numberFormat = p.formats.map((r) => [r[c] ?? GENERAL_FORMAT]);
        });
      } else range.numberFormat = p.formats.map((r) => [...r]);
      range.values = p.values.map((r) => [...r]);
      applyStyle(range, p.style);
    }
    await context.sync();
  });
}

/** Writes a group; when the host refuses it for its size, writes each half separately (down to single rows). */
async function writeSplitting(sheet: string, group: readonly CellPatch[], mode: FormatMode): Promise<number> {
  try {
    await writeGroup(sheet, group, mode);
    return 1;
  } catch (error) {
    if (!isPayloadTooLarge(error)) throw error;
    if (group.length > 1) {
      const k = Math.ceil(group.length / 2);
      return (await writeSplitting(sheet, group.slice(0, k), mode)) + (await writeSplitting(sheet, group.slice(k), mode));
    }
    const only = group[0];
    if (only === undefined || only.values.length < 2) throw error;
    const [a, b] = halvePatch(only);
    return (await writeSplitting(sheet, [a], mode)) + (await writeSplitting(sheet, [b], mode));
  }
}

function addChart(ws: Excel.Worksheet, plan: ChartPlan, name: string): void {
  const d = plan.data;
  const yRange = ws.getRange(rangeAddress(d.row, d.column + 1, d.rowCount, d.columnCount - 1));
  const xRange = ws.getRange(rangeAddress(d.row + 1, d.column, d.rowCount - 1, 1));
  const chart = ws.charts.add(plan.type, yRange, 'Columns');
  chart.name = name;
  chart.title.text = plan.spec.title;
  chart.axes.categoryAxis.title.text = plan.spec.xLabel;
  chart.axes.valueAxis.title.text = plan.spec.yLabel;
  plan.series.forEach((s, i) => {
    const series = chart.series.getItemAt(i);
    series.setXAxisValues(xRange);
    if (s.dashed) series.format.line.lineStyle = 'Dash';
    if (s.markersOnly) {
      series.format.line.lineStyle = 'None';
      series.markerStyle = 'Circle';
    }
  });
  chart.setPosition(rangeAddress(plan.from.row, plan.from.column, 1, 1), rangeAddress(plan.to.row, plan.to.column, 1, 1));
}

/**
 * Turns the written cells into tables, adds the charts, sets widths and frozen rows, links cells to the sheets already
 * written (Range.hyperlink, ExcelApi 1.7), and merges and wraps each
 * paragraph's area (after its value is in the top-left cell, which keeps its value and its "@" format), in one request.
 */
async function finish(sheet: string, layout: SheetLayout, targets: ReadonlyMap<string, string>): Promise<void> {
  await Excel.run(async (context) => {
    const all = context.workbook.tables;
    all.load('items/name');
    await context.sync();
    const taken = all.items.map((t) => t.name);
    const ws = context.workbook.worksheets.getItem(sheet);
    for (const t of layout.tables) {
      const name = uniqueTableName(t.id, taken);
      taken.push(name);
      const table = ws.tables.add(ws.getRange(rangeAddress(t.row, t.column, t.rowCount, t.columnCount)), true);
      table.name = name;
    }
    for (const c of layout.charts) addChart(ws, c, `${c.spec.id}Chart`);
    layout.columnWidths.forEach((chars, j) => {
      if (chars > 0) ws.getRange(rangeAddress(0, j, 1, 1)).format.columnWidth = chars * POINTS_PER_CHARACTER;
    });
    for (const a of layout.wrapAreas) {
      const area = ws.getRange(rangeAddress(a.row, 0, 1, a.columnCount));
      area.merge(false);
      area.format.wrapText = true;
      area.format.verticalAlignment = 'Top';
      area.format.rowHeight = a.heightPoints;
    }
    for (const l of layout.links) {
      const target = targets.get(l.sheet);
      if (target === undefined) continue; // the linked sheet is not written: the text stands alone
      ws.getRange(rangeAddress(l.row, l.column, 1, 1)).hyperlink = { documentReference: documentReference(target, l.cell), textToDisplay: l.text, screenTip: 'Go to the full cautions' };
    }
    ws.freezePanes.freezeRows(layout.freezeRows);
    await context.sync();
  });
}

/**
 * Renders `spec` into a new worksheet named after spec.name (made legal and unique) and returns the name it got.
 * Requests: one to add the sheet, one to add the format styles it needs (when missing), one per write group (planned from the byte and cell budgets, split further if the
 * host refuses one for its size), one to add tables, charts, widths, frozen rows and paragraph wrapping. Cost O(cells).
 * Example: a 3-table model sheet of a few hundred cells → 3 requests.
 */
export async function renderSheet(spec: SheetSpec, options: RenderOptions): Promise<WrittenSheet> {
  const layout = layoutSheet(spec, options.dateSystem);
  const name = await addSheet(spec.name);
  // Number formats by column (one style name per column of a patch) when the workbook takes the styles; else per cell.
  const mode: FormatMode = (await ensureFormatStyles(styleCodes(layout.patches))) ? 'columns' : 'cells';
  const groups = planWrites(layout.patches, options.targetBytes ?? 1_500_000, options.maxCells ?? 200_000, mode);
  const total = groups.length + 2;
  options.onProgress?.(1 / total);
  let done = 1;
  for (const group of groups) {
    await writeSplitting(name, group, mode);
    done++;
    options.onProgress?.(done / total);
  }
  try {
    await finish(name, layout, options.linkTargets ?? new Map());
  } catch (error) {
    throw new ExcelAdapterError(
      `The cells of sheet "${name}" were written, but its tables, charts or paragraph wrapping could not be added: ${error instanceof Error ? error.message : String(error)}`,
      { cause: error },
    );
  }
  options.onProgress?.(1);
  return { name, title: spec.title };
}
