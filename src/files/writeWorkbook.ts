import ExcelJS from 'exceljs';
import type { ChartSpec, NumberFormat, ParagraphBlock, SheetCell, SheetSpec, TableBlock } from '../core/report/types';
import { numberFormatFor } from '../core/report/formats';
import { columnWidthPoints, LINE_POINTS, paragraphHeight } from '../core/report/paragraphHeight';
import { uniqueSheetNames, uniqueTableName } from './sheetNames';
import { addCharts, type PlacedChart } from './addCharts';
import type { PlacedLink } from './addLinks';
import { bindChart, type BoundSeries, type WrittenTable } from './bindChart';
import { keepWholeBreaks, columnPoints, footer, LANDSCAPE_FROM, PRINTABLE, type PrintStamp } from './printSetup';

/** Caption of the table a chart's numbers get when they are not all in a table of the sheet already. */
export const CHART_DATA_CAPTION = (title: string): string => `Numbers behind the chart: ${title}`;
/** Rows a chart covers (about 20 × 15 points, some 10 cm tall). */
export const CHART_ROWS = 20;

/** Every font we set names the workbook's default face, Calibri (LibreOffice shows it with the metric-compatible
 * Carlito): a font without a name is shown in the reader's own default face, wider than the widths row heights are
 * measured with (paragraphHeight.ts). */
const FACE = { name: 'Calibri', family: 2 } as const;
const TITLE_FONT: Partial<ExcelJS.Font> = { ...FACE, bold: true, size: 14 };
const HEADING_FONT: Partial<ExcelJS.Font> = { ...FACE, bold: true, size: 12 };
const CAPTION_FONT: Partial<ExcelJS.Font> = { ...FACE, bold: true, size: 11 };
const CAUTION_FONT: Partial<ExcelJS.Font> = { ...FACE, bold: true, italic: true, size: 11, color: { argb: 'FF9C2A00' } };
const MIN_WIDTH = 8;
const MAX_WIDTH = 60;

/** One style object per number-format code, shared by every cell with that code: exceljs recognises a style object it
 * has seen before and skips building and comparing its XML, which per cell cost a good part of writing a long listing.
 * A 'significant' column has a few codes, one per magnitude (numberFormatFor), so a few shared objects. Shared objects
 * are never changed after they are made (no font or fill is set on table data cells). */
const FORMAT_STYLES = new Map<string, Partial<ExcelJS.Style>>();
function formatStyle(code: string): Partial<ExcelJS.Style> {
  let style = FORMAT_STYLES.get(code);
  if (style === undefined) {
    style = Object.freeze({ numFmt: code }) as Partial<ExcelJS.Style>;
    FORMAT_STYLES.set(code, style);
  }
  return style;
}

/** The most characters an Excel cell holds (Excel specifications and limits: 32,767); longer text makes Excel
 * offer to repair the file. */
export const MAX_CELL_TEXT = 32_767;
/** What ends a cut text, so a reader sees that it was cut and where the whole is. */
export const CUT_MARKER = ' … [cut: the cell limit is 32,767 characters; the JSON results hold the whole text]';

/** Text cut to fit one Excel cell, ending with CUT_MARKER when cut. Example: fitCell('abc') → 'abc' */
export function fitCell(text: string): string {
  return text.length <= MAX_CELL_TEXT ? text : text.slice(0, MAX_CELL_TEXT - CUT_MARKER.length) + CUT_MARKER;
}

/** A table cell as exceljs should store it: text stays a string (never a formula) cut to the cell limit, non-finite
 * numbers become blank. */
function storedValue(v: SheetCell, format: NumberFormat): string | number | null {
  if (v === null) return null;
  if (typeof v === 'string') return fitCell(v);
  if (!Number.isFinite(v)) return null;
  return format === 'text' ? String(v) : v;
}

/** The data table behind a chart: one row per distinct x (in order of first appearance), one column per series
 * (and its interval bounds when given). */
function chartTable(chart: ChartSpec): TableBlock {
  const xs: (number | string)[] = [];
  const seen = new Map<string, number>();
  for (const s of chart.series) {
    for (const x of s.x) {
      const key = `${typeof x}:${String(x)}`;
      if (!seen.has(key)) {
        seen.set(key, xs.length);
        xs.push(x);
      }
    }
  }
  const allNumeric = xs.every((x) => typeof x === 'number');
  const columns: { header: string; format: NumberFormat }[] = [{ header: chart.xLabel || 'x', format: allNumeric ? 'significant' : 'text' }];
  const rows: SheetCell[][] = xs.map((x) => [x]);
  for (const s of chart.series) {
    const parts: [string, readonly (number | null)[] | undefined][] = [
      [s.name, s.y],
      [`${s.name} lower`, s.lower],
      [`${s.name} upper`, s.upper],
    ];
    for (const [header, values] of parts) {
      if (!values) continue;
      columns.push({ header, format: 'significant' });
      for (const row of rows) row.push(null);
      s.x.forEach((x, i) => {
        const at = seen.get(`${typeof x}:${String(x)}`);
        if (at !== undefined) rows[at]![columns.length - 1] = values[i] ?? null;
      });
    }
  }
  return { kind: 'table', id: `${chart.id}Data`, caption: CHART_DATA_CAPTION(chart.title), columns, rows };
}

/** The series of a chart bound to its own data table (chartTable's layout: x in the first column, then each series'
 * y, lower and upper in order), so every chart is drawn even when its numbers are not on the sheet yet. */
function bindToOwnTable(chart: ChartSpec, t: WrittenTable): BoundSeries[] {
  const n = t.rows.length;
  const run = (j: number): { first: number; last: number; column: number } => ({ first: t.headerRow + 1, last: t.headerRow + n, column: t.column + j });
  const xValues = t.rows.map((r) => r[0] ?? null);
  const out: BoundSeries[] = [];
  let j = 1;
  for (const s of chart.series) {
    const markersOnly = (s.style ?? (chart.kind === 'scatter' ? 'points' : 'line')) === 'points';
    for (const [suffix, values] of [['', s.y], [' lower', s.lower], [' upper', s.upper]] as const) {
      if (values === undefined) continue;
      const yValues = t.rows.map((r) => (typeof r[j] === 'number' ? (r[j] as number) : null));
      out.push({ name: `${s.name}${suffix}`, x: run(0), y: run(j), xValues, yValues, dashed: suffix !== '', markersOnly: suffix === '' && markersOnly });
      j += 1;
    }
  }
  return out;
}

/** Header texts made unique within one table (Excel requires it): repeats get " 2", " 3", ... */
function uniqueHeaders(headers: readonly string[]): string[] {
  const used = new Set<string>();
  return headers.map((h) => {
    const base = h.trim() === '' ? 'Column' : h;
    let name = base;
    for (let k = 2; used.has(name.toLowerCase()); k++) name = `${base} ${k}`;
    used.add(name.toLowerCase());
    return name;
  });
}

interface SheetState {
  readonly ws: ExcelJS.Worksheet;
  /** The next free row. */
  row: number;
  /** True when the row above `row` is blank (so a table or heading needs no extra spacing). */
  spaced: boolean;
  /** Table ids on this sheet → the names their Excel tables got (unique in the workbook). */
  readonly tableIds: Map<string, string>;
  readonly widths: number[];
  /** Rows of wrapped paragraphs, their text and weight, laid out once the column widths are known. */
  readonly wraps: { readonly row: number; readonly text: string; readonly bold: boolean }[];
  /** The tables written so far, where they stand and what their cells hold (charts are bound to them). */
  readonly written: WrittenTable[];
  /** Charts placed so far: first row (1-based) and bound series; their width is set once column widths are known. */
  readonly charts: { readonly row: number; readonly spec: ChartSpec; readonly series: readonly BoundSeries[] }[];
  /** Rows of headings, kept on the page of the table or chart they head. */
  readonly headings: Set<number>;
  /** Cells that link to another sheet, added as hyperlinks once the package is written. */
  readonly links: PlacedLink[];
}

/** Widths of columns no table sets (Excel's default is about 8.43 characters). */
const DEFAULT_COLUMN_WIDTH = 8.43;
/** The height of one line of the default 11-point font, in points. */
const LINE_HEIGHT = LINE_POINTS;

/** The sheet's text width in columns: the widest table's, at least 6 and at most 12. */
function textColumnCount(st: SheetState): number {
  return Math.min(12, Math.max(6, st.widths.length));
}

/**
 * Lays each long paragraph over a merged, wrapped area from column A across the sheet's text width, so a reader never
 * scrolls sideways to read a sentence, on a row as tall as its wrapped lines (paragraphHeight, measured with the
 * default font's character widths and a margin, the same function the add-in uses). A paragraph that fits on one
 * line keeps the default height.
 */
function wrapParagraphs(st: SheetState): void {
  const columns = textColumnCount(st);
  let points = 0;
  for (let j = 0; j < columns; j++) points += columnWidthPoints(st.widths[j] ?? DEFAULT_COLUMN_WIDTH);
  for (const { row, text, bold } of st.wraps) {
    st.ws.mergeCells(row, 1, row, columns);
    const cell = st.ws.getCell(row, 1);
    cell.alignment = { wrapText: true, vertical: 'top' };
    const height = paragraphHeight(text, points, bold);
    if (height > LINE_HEIGHT) st.ws.getRow(row).height = height;
  }
}

/** A blank row before a heading or table that follows text, so blocks stand apart. */
function space(st: SheetState): void {
  if (!st.spaced) st.row += 1;
  st.spaced = true;
}

/** Consecutive paragraphs sit on consecutive rows; a heading gets a blank row before it. */
function writeParagraph(st: SheetState, text: string, font: Partial<ExcelJS.Font> | null, heading = false): void {
  if (heading) space(st);
  if (heading) st.headings.add(st.row);
  const cell = st.ws.getCell(st.row, 1);
  cell.value = fitCell(text);
  if (font) cell.font = font;
  if (!heading) st.wraps.push({ row: st.row, text, bold: font?.bold === true });
  st.row += 1;
  st.spaced = false;
}

/**
 * A paragraph that links to a cell of another sheet (the one-line caution): written as one unwrapped line whose cell is an
 * internal link, right under the title when it is the sheet's first block, so the first table starts by row 4.
 * A link to a sheet not in this workbook is written as plain text.
 */
function writeLink(st: SheetState, b: ParagraphBlock & { link: NonNullable<ParagraphBlock['link']> }, first: boolean, names: ReadonlyMap<string, string>): void {
  if (first) st.row = 2;
  const cell = st.ws.getCell(st.row, 1);
  const sheet = names.get(b.link.sheet);
  const text = fitCell(b.text);
  cell.value = text;
  cell.font = { ...CAUTION_FONT, underline: sheet !== undefined };
  if (sheet !== undefined) st.links.push({ ref: cell.address, sheet, cell: b.link.cell, display: text });
  st.row += 1;
  st.spaced = first;
}

/** Writes one table (caption row, then a real Excel table) and returns the header's row number. */
function writeTable(st: SheetState, t: TableBlock, tableNames: Set<string>): number {
  space(st);
  if (t.caption) {
    st.ws.getCell(st.row, 1).value = fitCell(t.caption);
    st.ws.getCell(st.row, 1).font = CAPTION_FONT;
    st.row += 1;
  }
  const headerRow = st.row;
  const name = uniqueTableName(t.id, tableNames);
  tableNames.add(name);
  st.tableIds.set(t.id, name);
  const headers = uniqueHeaders(t.columns.map((c) => c.header));
  const width = t.columns.length;
  const rows = t.rows.map((r) => t.columns.map((c, j) => storedValue(r[j] ?? null, c.format)));
  // An Excel table needs at least one data row; an empty result gets one blank row.
  if (rows.length === 0) rows.push(new Array<null>(width).fill(null));
  st.ws.addTable({
    name,
    ref: `A${headerRow}`,
    headerRow: true,
    totalsRow: false,
    style: { theme: 'TableStyleMedium2', showRowStripes: true },
    columns: headers.map((name) => ({ name, filterButton: true })),
    rows,
  });
  t.columns.forEach((c, j) => {
    // Each cell's code from its value (the same text the page shows): one code for a whole column but 'significant'.
    const whole = c.format === 'significant' ? null : formatStyle(numberFormatFor(null, c.format));
    for (let i = 0; i < rows.length; i++) st.ws.getCell(headerRow + 1 + i, j + 1).style = whole ?? formatStyle(numberFormatFor(rows[i]![j] ?? null, c.format));
    const wanted = Math.min(MAX_WIDTH, Math.max(MIN_WIDTH, c.width ?? 0, (headers[j] ?? '').length + 3));
    st.widths[j] = Math.max(st.widths[j] ?? 0, wanted);
  });
  st.written.push({ id: t.id, headerRow, column: 0, headers, rows });
  st.row = headerRow + rows.length + 2;
  st.spaced = true;
  return headerRow;
}

/** Places a chart below the blocks before it: bound to the sheet's cells where its numbers already stand, else to a
 * table of its numbers written first. A chart with no points is left out. */
function writeChart(st: SheetState, chart: ChartSpec, tableNames: Set<string>): void {
  let series = bindChart(chart, st.written);
  if (series === null) {
    writeTable(st, chartTable(chart), tableNames);
    series = bindToOwnTable(chart, st.written[st.written.length - 1]!);
  }
  if (series.length === 0) return;
  space(st);
  st.charts.push({ row: st.row, spec: chart, series });
  st.row += CHART_ROWS + 1;
  st.spaced = true;
}

/** Landscape when the widest table is wider than a portrait page holds readably; always one page wide; the header
 * row of a sheet's only table on every page; a page break before a chart that would be cut at the foot of a page;
 * the footer of printSetup.ts. Runs after the column widths and paragraph heights are set. */
function printSettings(st: SheetState, repeatRow: number, stamp: PrintStamp): void {
  const widthOf = (j: number): number => st.widths[j] ?? DEFAULT_COLUMN_WIDTH;
  const widest = Math.max(0, ...st.written.map((t) => t.headers.reduce((sum, _, j) => sum + widthOf(t.column + j), 0)));
  const orientation = widest > LANDSCAPE_FROM ? 'landscape' : 'portrait';
  const printed = Math.max(st.widths.length, st.wraps.length > 0 || st.charts.length > 0 ? textColumnCount(st) : 0);
  let sheetWidth = 0;
  for (let j = 0; j < printed; j++) sheetWidth += columnPoints(widthOf(j));
  const area = PRINTABLE[orientation];
  const scale = Math.min(1, area.width / Math.max(1, sheetWidth));
  const rowHeight = (r: number): number => st.ws.getRow(r).height ?? LINE_HEIGHT;
  // Readers differ in the height of a row that has none (15 points here, less in others), so on a sheet with more
  // than one block every row gets its height written and the breaks below hold in every reader.
  const several = st.charts.length + st.written.length > 1;
  if (several) for (let r = 1; r <= st.row; r++) st.ws.getRow(r).height = rowHeight(r);
  // A block starts at its heading when one stands just above it (one blank row between).
  const withHeading = (row: number, rows: number): { row: number; rows: number } => (st.headings.has(row - 2) ? { row: row - 2, rows: rows + 2 } : { row, rows });
  const blocks = [...st.charts.map((c) => withHeading(c.row, CHART_ROWS)), ...st.written.map((t) => withHeading(t.headerRow - 1, t.rows.length + 2))];
  blocks.sort((a, b) => a.row - b.row);
  if (several) for (const r of keepWholeBreaks(rowHeight, blocks, area.height, scale)) st.ws.getRow(r).addPageBreak();
  st.ws.pageSetup = {
    orientation,
    fitToPage: true,
    fitToWidth: 1,
    fitToHeight: 0,
    margins: { left: 0.5, right: 0.5, top: 0.6, bottom: 0.7, header: 0.3, footer: 0.3 },
    ...(repeatRow > 0 ? { printTitlesRow: `${repeatRow}:${repeatRow}` } : {}),
  };
  st.ws.headerFooter = { oddFooter: footer(stamp), evenFooter: footer(stamp) };
}

/**
 * Renders sheet specs into an .xlsx workbook (ECMA-376) and returns its bytes. Per sheet: a title row, then each
 * block in order — a linking paragraph (the one-line caution) as an internal hyperlink (addLinks.ts) on row 2 when it comes first, so
 * the first table's header is on row 4 at the latest; paragraphs on consecutive rows, each merged and wrapped across the sheet's text width (cautions in
 * bold italic), headings and tables set apart by a blank row, tables as real Excel tables with header row, filter
 * buttons, number formats from numberFormatFor (per cell) and column widths, and each chart as a native chart (addCharts.ts)
 * across the text width whose series read the sheet's own table cells (bindChart.ts); a chart whose numbers are not
 * all in a table of the sheet gets a table of its numbers first. A sheet that is one big table gets its header frozen
 * and repeated on every printed page; every sheet prints one page wide with a footer naming the sheet, the page, the
 * run date and the input fingerprint (printSetup.ts). Text is always stored as a string cell, never as a formula: a
 * subject id "=1+1" stays the text "=1+1". Sheet names are made legal and unique (≤ 31 characters, none of
 * \ / ? * : [ ]). Runs in Node and in the browser. Cost O(cells).
 *
 * Example: writeWorkbook([{ name: 'A', title: 'T', blocks: [] }]) → bytes of a workbook with sheet "A", A1 = "T".
 */
export async function writeWorkbook(sheets: readonly SheetSpec[], stamp: PrintStamp = {}): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'longipane';
  const names = uniqueSheetNames(sheets.map((s) => s.name));
  const tableNames = new Set<string>();
  const placed = new Map<string, PlacedChart[]>();
  const linked = new Map<string, PlacedLink[]>();
  // Wanted name → the name each sheet got, for links between sheets (the first sheet of a wanted name wins).
  const nameOf = new Map<string, string>();
  sheets.forEach((spec, k) => {
    if (!nameOf.has(spec.name)) nameOf.set(spec.name, names[k]!);
  });
  sheets.forEach((spec, k) => {
    const ws = wb.addWorksheet(names[k]!);
    const st: SheetState = { ws, row: 3, spaced: true, tableIds: new Map(), widths: [], wraps: [], written: [], charts: [], headings: new Set(), links: [] };
    ws.getCell(1, 1).value = fitCell(spec.title);
    ws.getCell(1, 1).font = TITLE_FONT;
    const tables = spec.blocks.filter((b) => b.kind === 'table').length;
    const charts = spec.blocks.filter((b) => b.kind === 'chart').length;
    let frozenAt = 0;
    let onlyHeader = 0;
    spec.blocks.forEach((b, i) => {
      if (b.kind === 'paragraph' && b.link !== undefined) {
        writeLink(st, { ...b, link: b.link }, i === 0, nameOf);
      } else if (b.kind === 'paragraph') {
        const font = b.style === 'caution' ? CAUTION_FONT : b.style === 'heading' ? HEADING_FONT : null;
        writeParagraph(st, b.text, font, b.style === 'heading');
      } else if (b.kind === 'table') {
        const header = writeTable(st, b, tableNames);
        if (tables === 1) onlyHeader = header;
        if (tables === 1 && charts === 0) frozenAt = header;
      } else {
        writeChart(st, b.chart, tableNames);
      }
    });
    st.widths.forEach((w, j) => {
      if (w > 0) ws.getColumn(j + 1).width = w;
    });
    wrapParagraphs(st);
    if (frozenAt > 0) ws.views = [{ state: 'frozen', xSplit: 0, ySplit: frozenAt, topLeftCell: `A${frozenAt + 1}` }];
    printSettings(st, st.written.length === 1 ? onlyHeader : 0, stamp);
    linked.set(names[k]!, st.links);
    const across = textColumnCount(st);
    placed.set(
      names[k]!,
      st.charts.map((c) => ({ spec: c.spec, series: c.series, from: { row: c.row - 1, column: 0 }, to: { row: c.row - 1 + CHART_ROWS, column: across } })),
    );
  });
  const out = await wb.xlsx.writeBuffer();
  return addCharts(out instanceof Uint8Array ? out : new Uint8Array(out as ArrayBuffer), placed, linked);
}
