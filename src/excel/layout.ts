/**
 * Where each part of a SheetSpec goes on a new worksheet: plain cell rectangles with their number formats, table
 * and chart placements, column widths and the rows to freeze. Pure; the renderer only carries the plan out.
 */
import type { DateSystem } from '../core/intake/types';
import type { ChartSpec, NumberFormat, SheetCell, SheetSpec } from '../core/report/types';
import { numberFormatFor } from '../core/report/formats';
import { GENERAL_FORMAT, TEXT_FORMAT } from './formatCodes';
import type { WrapArea } from './wrapAreas';
import { planWrapAreas, textColumns } from './wrapAreas';

/** A value as written: text, a number, or "" for an empty cell. */
export type WrittenValue = string | number;

export type PatchStyle = 'title' | 'heading' | 'caution' | 'caption' | 'normal';

/** A rectangle of cells written in one go. `formats` has the shape of `values`; text cells always get "@". */
export interface CellPatch {
  readonly row: number;
  readonly column: number;
  readonly values: readonly (readonly WrittenValue[])[];
  readonly formats: readonly (readonly string[])[];
  readonly style: PatchStyle;
}

export interface TablePlan {
  /** The spec's id (tables) or the chart id plus "Data" (chart data). */
  readonly id: string;
  /** Header row (0-based) and first column. */
  readonly row: number;
  readonly column: number;
  /** Rows including the header. */
  readonly rowCount: number;
  readonly columnCount: number;
}

export interface ChartSeriesPlan {
  readonly name: string;
  /** 0-based column of the series' values (its header is on the data table's header row). */
  readonly column: number;
  readonly dashed: boolean;
  readonly markersOnly: boolean;
}

export interface ChartPlan {
  readonly spec: ChartSpec;
  readonly type: 'LineMarkers' | 'ColumnClustered' | 'XYScatter' | 'XYScatterLines';
  /** The chart's data table: header row, x column, rows including the header. */
  readonly data: TablePlan;
  readonly series: readonly ChartSeriesPlan[];
  /** Cells the chart covers: top-left and bottom-right (0-based, inclusive). */
  readonly from: { readonly row: number; readonly column: number };
  readonly to: { readonly row: number; readonly column: number };
}

/** A cell that links to a cell of another sheet of the run (by that sheet's wanted name). */
export interface LinkPlan {
  readonly row: number;
  readonly column: number;
  readonly text: string;
  readonly sheet: string;
  readonly cell: string;
}

export interface SheetLayout {
  readonly patches: readonly CellPatch[];
  readonly tables: readonly TablePlan[];
  readonly charts: readonly ChartPlan[];
  /** Width in characters per column from column A; 0 leaves the column as it is. */
  readonly columnWidths: readonly number[];
  /** Rows to freeze at the top (the title row, or through the header of a sheet's single table near the top). */
  readonly freezeRows: number;
  /** Normal and caution paragraphs: merged, wrapped areas from column A with a row height that fits the text. */
  readonly wrapAreas: readonly WrapArea[];
  /** Cells that become links to another sheet once every sheet has its name (the one-line caution). */
  readonly links: readonly LinkPlan[];
}

/** Day numbers in specs count 1899-12-30 as 0; a 1904-system workbook counts 1904-01-01 as 0, 1462 days later. */
const DATE_SHIFT: Readonly<Record<DateSystem, number>> = { 1900: 0, 1904: 1462 };

const CHART_ROWS = 16;
const CHART_COLUMNS = 8;
const DEFAULT_WIDTH = 12;

/** A column as laid out: a spec column, or chart data whose numbers have no stated meaning ('general'). */
interface LaidColumn {
  readonly header: string;
  readonly format: NumberFormat | 'general';
}

/**
 * One cell of a table as written, with its format: text always gets "@" (so "=1+1" stays text), a number in a
 * text column keeps the general format, a number in a 'significant' column gets the code that shows its 4
 * significant digits (numberFormatFor, the same text the page shows), non-finite numbers and nulls become "" with the
 * column's format.
 */
function cell(value: SheetCell, format: NumberFormat | 'general', dateSystem: DateSystem): [WrittenValue, string] {
  const code = format === 'general' ? GENERAL_FORMAT : numberFormatFor(value, format);
  if (typeof value === 'string') return [value, TEXT_FORMAT];
  if (typeof value === 'number' && Number.isFinite(value)) {
    if (format === 'text') return [value, GENERAL_FORMAT];
    return [format === 'date' ? value - DATE_SHIFT[dateSystem] : value, code];
  }
  return ['', code];
}

function textPatch(row: number, text: string, style: PatchStyle): CellPatch {
  return { row, column: 0, values: [[text]], formats: [[TEXT_FORMAT]], style };
}

function tablePatches(row: number, columns: readonly LaidColumn[], rows: readonly (readonly SheetCell[])[], dateSystem: DateSystem): CellPatch[] {
  const header: CellPatch = { row, column: 0, values: [columns.map((c) => c.header)], formats: [columns.map(() => TEXT_FORMAT)], style: 'normal' };
  if (rows.length === 0) return [header];
  const values: WrittenValue[][] = [];
  const formats: string[][] = [];
  for (const r of rows) {
    const vr: WrittenValue[] = [];
    const fr: string[] = [];
    columns.forEach((c, j) => {
      const [v, f] = cell(r[j] ?? null, c.format, dateSystem);
      vr.push(v);
      fr.push(f);
    });
    values.push(vr);
    formats.push(fr);
  }
  return [header, { row: row + 1, column: 0, values, formats, style: 'normal' }];
}

/** The chart's numbers as a table: x, then each series' y (and its lower and upper bounds when given). */
function chartTable(spec: ChartSpec): { columns: LaidColumn[]; rows: SheetCell[][]; series: Omit<ChartSeriesPlan, 'column'>[] } {
  const xs: (number | string)[] = [];
  const index = new Map<string, number>();
  for (const s of spec.series) {
    for (const x of s.x) {
      const key = `${typeof x}:${String(x)}`;
      if (!index.has(key)) {
        index.set(key, xs.length);
        xs.push(x);
      }
    }
  }
  const columns: LaidColumn[] = [{ header: spec.xLabel, format: xs.every((x) => typeof x === 'number') ? 'general' : 'text' }];
  const series: Omit<ChartSeriesPlan, 'column'>[] = [];
  const cols: (number | null)[][] = [];
  const markersOnly = (style: string | undefined): boolean => (style ?? (spec.kind === 'scatter' ? 'points' : 'line')) === 'points';
  for (const s of spec.series) {
    const parts: [string, readonly (number | null)[] | undefined, boolean][] = [
      [s.name, s.y, false],
      [`${s.name} lower`, s.lower, true],
      [`${s.name} upper`, s.upper, true],
    ];
    for (const [name, ys, dashed] of parts) {
      if (ys === undefined) continue;
      const col: (number | null)[] = xs.map(() => null);
      s.x.forEach((x, i) => {
        const at = index.get(`${typeof x}:${String(x)}`);
        if (at !== undefined) col[at] = ys[i] ?? null;
      });
      cols.push(col);
      columns.push({ header: name, format: 'significant' });
      series.push({ name, dashed, markersOnly: !dashed && markersOnly(s.style) });
    }
  }
  const rows = xs.map((x, i) => [x, ...cols.map((c) => c[i] ?? null)]);
  return { columns, rows, series };
}

function chartType(spec: ChartSpec): ChartPlan['type'] {
  if (spec.kind === 'bar') return 'ColumnClustered';
  if (spec.kind === 'line') return 'LineMarkers';
  return spec.series.some((s) => s.style === 'line') ? 'XYScatterLines' : 'XYScatter';
}

/**
 * Lays a sheet out top to bottom from column A: the title (row 1), then each block followed by a blank row; a
 * linking paragraph (the one-line caution) that comes first sits on row 2 with the next block on row 3, so a table
 * that follows it has its header on row 4;
 * paragraphs take one row; a table takes a caption row, its header and its rows; a chart writes its numbers as a
 * small table with the chart beside it. Numbers in 'date' columns are shifted into the workbook's date system.
 * Normal and caution paragraphs (not the title or headings) get a wrap area across the sheet's text width (the
 * widest table's columns, 6 to 12); columns of that width without a planned width get the default of 12 characters,
 * so the row height estimated from the widths holds. Cost O(cells).
 * Example: a spec with one paragraph and a 2-row table → patches at rows 0, 2, 4, 5, 6, one table at row 5 with
 * 3 rows, and one wrap area at row 2 across 6 columns.
 */
export function layoutSheet(spec: SheetSpec, dateSystem: DateSystem): SheetLayout {
  const patches: CellPatch[] = [textPatch(0, spec.title, 'title')];
  const tables: TablePlan[] = [];
  const charts: ChartPlan[] = [];
  const widths: number[] = [];
  const widen = (column: number, chars: number): void => {
    while (widths.length <= column) widths.push(0);
    widths[column] = Math.max(widths[column] ?? 0, Math.min(60, chars));
  };
  const paragraphs: { row: number; text: string; bold: boolean }[] = [];
  const links: LinkPlan[] = [];
  let row = 2;
  for (const [i, block] of spec.blocks.entries()) {
    if (block.kind === 'paragraph' && block.link !== undefined) {
      // One line, not wrapped; right under the title when it comes first, with the next block on row 3.
      const at = i === 0 ? 1 : row;
      patches.push(textPatch(at, block.text, 'caution'));
      links.push({ row: at, column: 0, text: block.text, sheet: block.link.sheet, cell: block.link.cell });
      row = at + (i === 0 ? 1 : 2);
    } else if (block.kind === 'paragraph') {
      const style = block.style === 'caution' ? 'caution' : block.style === 'heading' ? 'heading' : 'normal';
      patches.push(textPatch(row, block.text, style));
      // Cautions are bold (renderSheet's style), so they are measured with the bold widths.
      if (style !== 'heading') paragraphs.push({ row, text: block.text, bold: style === 'caution' });
      row += 2;
    } else if (block.kind === 'table') {
      patches.push(textPatch(row, block.caption, 'caption'));
      patches.push(...tablePatches(row + 1, block.columns, block.rows, dateSystem));
      const rowCount = 1 + Math.max(1, block.rows.length); // a table needs a body row; Excel adds an empty one
      tables.push({ id: block.id, row: row + 1, column: 0, rowCount, columnCount: block.columns.length });
      block.columns.forEach((c, j) => widen(j, c.width ?? Math.max(DEFAULT_WIDTH, c.header.length + 2)));
      row += 1 + rowCount + 1;
    } else {
      const spec2 = block.chart;
      const t = chartTable(spec2);
      patches.push(textPatch(row, `Numbers behind the chart: ${spec2.title}`, 'caption'));
      patches.push(...tablePatches(row + 1, t.columns, t.rows, dateSystem));
      const rowCount = 1 + Math.max(1, t.rows.length);
      const data: TablePlan = { id: `${spec2.id}Data`, row: row + 1, column: 0, rowCount, columnCount: t.columns.length };
      tables.push(data);
      t.columns.forEach((c, j) => widen(j, Math.max(DEFAULT_WIDTH, c.header.length + 2)));
      const left = t.columns.length + 1;
      charts.push({
        spec: spec2,
        type: chartType(spec2),
        data,
        series: t.series.map((s, i) => ({ ...s, column: i + 1 })),
        from: { row, column: left },
        to: { row: row + CHART_ROWS - 1, column: left + CHART_COLUMNS - 1 },
      });
      row += Math.max(1 + rowCount, CHART_ROWS) + 1;
    }
  }
  const textWidth = textColumns(tables.map((t) => t.columnCount));
  if (paragraphs.length > 0) for (let j = 0; j < textWidth; j++) if ((widths[j] ?? 0) === 0) widen(j, DEFAULT_WIDTH);
  const wrapAreas = paragraphs.length > 0 ? planWrapAreas(paragraphs, textWidth, widths) : [];
  const only = tables.length === 1 ? tables[0] : undefined;
  return { patches, tables, charts, columnWidths: widths, freezeRows: only !== undefined && only.row <= 10 ? only.row + 1 : 1, wrapAreas, links };
}
