/**
 * The report workbook writer: SheetSpecs straight into an .xlsx package (ECMA-376 Part 1 SpreadsheetML), with no
 * spreadsheet library and no second pass over the package. Each sheet is laid out first (where every block goes, its
 * merges, widths, heights, page breaks, links and charts: O(blocks + rows of the sheet's small tables)), then its XML is
 * generated row by row into the zip writer, which compresses it as it comes (zipWriter.ts), so a 200,000-row listing
 * never exists as one string or as cell objects. Runs in Node and in the browser.
 */
import type { ChartSpec, NumberFormat, ParagraphBlock, SheetCell, SheetSpec, TableBlock, TableColumn } from '../core/report/types';
import { columnLetters } from '../core/intake/cellAddress';
import { EXCEL_FORMAT_CODES, numberFormatFor } from '../core/report/formats';
import { columnWidthPoints, LINE_POINTS, paragraphHeight } from '../core/report/paragraphHeight';
import { uniqueSheetNames, uniqueTableName } from './sheetNames';
import { bindChart, type BoundSeries, type WrittenTable } from './bindChart';
import { chartXml, REL_NS } from './chartXml';
import { keepWholeBreaks, columnPoints, footer, LANDSCAPE_FROM, PRINTABLE, type PrintStamp } from './printSetup';
import { cellText, needsPreserve, numberText, xmlAttr } from './xlsxText';
import {
  appXml,
  contentTypesXml,
  coreXml,
  drawingXml,
  MAIN_NS,
  quotedSheet,
  relsXml,
  rootRelsXml,
  stylesXml,
  tableXml,
  workbookRelsXml,
  workbookXml,
  XML_HEAD,
  type Look,
  type PlacedChart,
  type Relationship,
  type TablePart,
} from './xlsxParts';
import { asciiBytes, ByteRows } from './byteRows';
import { ZipWriter, type Compressor, type PartWriter } from './zipWriter';

/** Caption of the table a chart's numbers get when they are not all in a table of the sheet already. */
export const CHART_DATA_CAPTION = (title: string): string => `Numbers behind the chart: ${title}`;
/** Rows a chart covers (about 20 × 15 points, some 10 cm tall). */
export const CHART_ROWS = 20;

const MIN_WIDTH = 8;
const MAX_WIDTH = 60;

/** The most characters an Excel cell holds (Excel specifications and limits: 32,767); longer text makes Excel
 * offer to repair the file. */
export const MAX_CELL_TEXT = 32_767;
/** What ends a cut text, so a reader sees that it was cut and where the whole is. */
export const CUT_MARKER = ' … [cut: the cell limit is 32,767 characters; the JSON results hold the whole text]';

/** Text cut to fit one Excel cell, ending with CUT_MARKER when cut. Example: fitCell('abc') → 'abc' */
export function fitCell(text: string): string {
  return text.length <= MAX_CELL_TEXT ? text : text.slice(0, MAX_CELL_TEXT - CUT_MARKER.length) + CUT_MARKER;
}

/** A table cell as stored: text stays a string (never a formula) cut to the cell limit, non-finite numbers become
 * blank, a number in a text column becomes its text. */
function storedValue(v: SheetCell | undefined, format: NumberFormat): string | number | null {
  if (v === null || v === undefined) return null;
  if (typeof v === 'string') return fitCell(v);
  if (!Number.isFinite(v)) return null;
  return format === 'text' ? String(v) : v;
}

/** The number format of one body cell. Today every cell takes its column's format; a per-cell format from the
 * SheetSpec slots in here. */
function cellFormat(column: TableColumn): NumberFormat {
  return column.format;
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

/** A table placed on a sheet: where it stands, its name, and its cells (read once, when the sheet is written). */
interface PlacedTable {
  readonly block: TableBlock;
  readonly name: string;
  readonly headerRow: number;
  readonly headers: readonly string[];
  /** Body rows on the sheet: the block's rows, or one blank row when it has none (an Excel table needs one). */
  readonly bodyRows: number;
}

/** A one-cell row in column A (title, paragraph, heading, caption, link line). */
interface LineCell {
  readonly text: string;
  readonly look: Look;
}

interface SheetState {
  /** The next free row. */
  row: number;
  /** True when the row above `row` is blank (so a table or heading needs no extra spacing). */
  spaced: boolean;
  readonly lines: Map<number, LineCell>;
  readonly tables: PlacedTable[];
  readonly widths: number[];
  /** Rows of wrapped paragraphs and their text, laid out once the column widths are known. */
  readonly wraps: { readonly row: number; readonly text: string; readonly caution: boolean }[];
  /** The tables written so far, where they stand and what their cells hold (charts are bound to them). */
  readonly written: WrittenTable[];
  readonly charts: { readonly row: number; readonly spec: ChartSpec; readonly series: readonly BoundSeries[] }[];
  /** Rows of headings, kept on the page of the table or chart they head. */
  readonly headings: Set<number>;
  readonly links: { readonly ref: string; readonly sheet: string; readonly cell: string; readonly display: string }[];
  readonly heights: Map<number, number>;
}

/** Widths of columns no table sets (Excel's default is about 8.43 characters). */
const DEFAULT_COLUMN_WIDTH = 8.43;
/** The height of one line of the default 11-point font, in points. */
const LINE_HEIGHT = LINE_POINTS;

/** The sheet's text width in columns: the widest table, at least 6 and at most 12 columns. */
function textColumnCount(st: SheetState): number {
  return Math.min(12, Math.max(6, st.widths.length));
}

/** A blank row before a heading or table that follows text, so blocks stand apart. */
function space(st: SheetState): void {
  if (!st.spaced) st.row += 1;
  st.spaced = true;
}

/** Consecutive paragraphs sit on consecutive rows; a heading gets a blank row before it. */
function writeParagraph(st: SheetState, b: ParagraphBlock): void {
  const heading = b.style === 'heading';
  if (heading) {
    space(st);
    st.headings.add(st.row);
    st.lines.set(st.row, { text: fitCell(b.text), look: 'heading' });
  } else {
    const caution = b.style === 'caution';
    st.lines.set(st.row, { text: fitCell(b.text), look: caution ? 'wrappedCaution' : 'wrapped' });
    st.wraps.push({ row: st.row, text: b.text, caution });
  }
  st.row += 1;
  st.spaced = false;
}

/**
 * A paragraph that links to a cell of another sheet (the one-line caution): one unwrapped line whose cell is an
 * internal link, right under the title when it is the sheet's first block, so the first table starts by row 4.
 * A link to a sheet not in this workbook is written as plain text.
 */
function writeLink(st: SheetState, b: ParagraphBlock & { link: NonNullable<ParagraphBlock['link']> }, first: boolean, names: ReadonlyMap<string, string>): void {
  if (first) st.row = 2;
  const sheet = names.get(b.link.sheet);
  const text = fitCell(b.text);
  st.lines.set(st.row, { text, look: sheet !== undefined ? 'link' : 'caution' });
  if (sheet !== undefined) st.links.push({ ref: `A${st.row}`, sheet, cell: b.link.cell, display: text });
  st.row += 1;
  st.spaced = first;
}

/** Places one table (caption row, then a real Excel table) and returns the header's row number. */
function placeTable(st: SheetState, t: TableBlock, tableNames: Set<string>): number {
  space(st);
  if (t.caption) {
    st.lines.set(st.row, { text: fitCell(t.caption), look: 'caption' });
    st.row += 1;
  }
  const headerRow = st.row;
  const name = uniqueTableName(t.id, tableNames);
  tableNames.add(name);
  const headers = uniqueHeaders(t.columns.map((c) => c.header));
  const bodyRows = Math.max(1, t.rows.length);
  st.tables.push({ block: t, name, headerRow, headers, bodyRows });
  t.columns.forEach((c, j) => {
    const wanted = Math.min(MAX_WIDTH, Math.max(MIN_WIDTH, c.width ?? 0, (headers[j] ?? '').length + 3));
    st.widths[j] = Math.max(st.widths[j] ?? 0, wanted);
  });
  // The stored cells are made only when a chart asks for them (bindChart), so a long listing is not copied.
  let stored: (string | number | null)[][] | undefined;
  st.written.push({
    id: t.id,
    headerRow,
    column: 0,
    headers,
    get rows() {
      stored ??= t.rows.length === 0 ? [t.columns.map(() => null)] : t.rows.map((r) => t.columns.map((c, j) => storedValue(r[j], c.format)));
      return stored;
    },
  });
  st.row = headerRow + bodyRows + 2;
  st.spaced = true;
  return headerRow;
}

/** Places a chart below the blocks before it: bound to the sheet's cells where its numbers already stand, else to a
 * table of its numbers placed first. A chart with no points is left out. */
function placeChart(st: SheetState, chart: ChartSpec, tableNames: Set<string>): void {
  let series = bindChart(chart, st.written);
  if (series === null) {
    placeTable(st, chartTable(chart), tableNames);
    series = bindToOwnTable(chart, st.written[st.written.length - 1]!);
  }
  if (series.length === 0) return;
  space(st);
  st.charts.push({ row: st.row, spec: chart, series });
  st.row += CHART_ROWS + 1;
  st.spaced = true;
}

/** Everything known about a sheet before its rows are written. */
interface SheetPlan {
  readonly name: string;
  readonly st: SheetState;
  readonly merges: readonly string[];
  /** Every row 1..lastHeightRow gets its height written (sheets with several blocks), else only `heights`. */
  readonly allHeightsTo: number;
  readonly frozenAt: number;
  readonly printTitleRow: number;
  readonly orientation: 'portrait' | 'landscape';
  readonly breaks: readonly number[];
  readonly footer: string;
  readonly charts: readonly PlacedChart[];
}

/** Lays out one sheet: every block's place, merged wrapped paragraphs, widths, heights, print settings, charts. */
function planSheet(spec: SheetSpec, name: string, nameOf: ReadonlyMap<string, string>, tableNames: Set<string>, stamp: PrintStamp): SheetPlan {
  const st: SheetState = { row: 3, spaced: true, lines: new Map(), tables: [], widths: [], wraps: [], written: [], charts: [], headings: new Set(), links: [], heights: new Map() };
  st.lines.set(1, { text: fitCell(spec.title), look: 'title' });
  const tables = spec.blocks.filter((b) => b.kind === 'table').length;
  const charts = spec.blocks.filter((b) => b.kind === 'chart').length;
  let frozenAt = 0;
  let onlyHeader = 0;
  spec.blocks.forEach((b, i) => {
    if (b.kind === 'paragraph' && b.link !== undefined) writeLink(st, { ...b, link: b.link }, i === 0, nameOf);
    else if (b.kind === 'paragraph') writeParagraph(st, b);
    else if (b.kind === 'table') {
      const header = placeTable(st, b, tableNames);
      if (tables === 1) onlyHeader = header;
      if (tables === 1 && charts === 0) frozenAt = header;
    } else placeChart(st, b.chart, tableNames);
  });
  // Long paragraphs lie over a merged, wrapped area from column A across the text width, on a row as tall as their
  // wrapped lines (paragraphHeight: the default font's character widths with a margin, the function the add-in uses).
  const across = textColumnCount(st);
  let points = 0;
  for (let j = 0; j < across; j++) points += columnWidthPoints(st.widths[j] ?? DEFAULT_COLUMN_WIDTH);
  const last = columnLetters(across - 1);
  const merges = st.wraps.map((w) => `A${w.row}:${last}${w.row}`);
  for (const { row, text, caution } of st.wraps) {
    const height = paragraphHeight(text, points, caution);
    if (height > LINE_HEIGHT) st.heights.set(row, height);
  }
  // Print: landscape when the widest table is wider than a portrait page holds readably; one page wide; the header row
  // of a sheet's only table on every page; page breaks that keep charts and tables whole (printSetup.ts).
  const widthOf = (j: number): number => st.widths[j] ?? DEFAULT_COLUMN_WIDTH;
  const widest = Math.max(0, ...st.written.map((t) => t.headers.reduce((sum, _, j) => sum + widthOf(t.column + j), 0)));
  const orientation = widest > LANDSCAPE_FROM ? 'landscape' : 'portrait';
  const printed = Math.max(st.widths.length, st.wraps.length > 0 || st.charts.length > 0 ? across : 0);
  let sheetWidth = 0;
  for (let j = 0; j < printed; j++) sheetWidth += columnPoints(widthOf(j));
  const area = PRINTABLE[orientation];
  const scale = Math.min(1, area.width / Math.max(1, sheetWidth));
  const rowHeight = (r: number): number => st.heights.get(r) ?? LINE_HEIGHT;
  // Readers differ in the height of a row that has none (15 points here, less in others), so on a sheet with more
  // than one block every row gets its height written and the breaks hold in every reader.
  const several = st.charts.length + st.written.length > 1;
  const withHeading = (row: number, rows: number): { row: number; rows: number } => (st.headings.has(row - 2) ? { row: row - 2, rows: rows + 2 } : { row, rows });
  const blocks = [...st.charts.map((c) => withHeading(c.row, CHART_ROWS)), ...st.tables.map((t) => withHeading(t.headerRow - 1, t.bodyRows + 2))];
  blocks.sort((a, b) => a.row - b.row);
  const breaks = several ? keepWholeBreaks(rowHeight, blocks, area.height, scale) : [];
  return {
    name,
    st,
    merges,
    allHeightsTo: several ? st.row : 0,
    frozenAt,
    printTitleRow: st.written.length === 1 ? onlyHeader : 0,
    orientation,
    breaks,
    footer: footer(stamp),
    charts: st.charts.map((c) => ({ spec: c.spec, series: c.series, from: { row: c.row - 1, column: 0 }, to: { row: c.row - 1 + CHART_ROWS, column: across } })),
  };
}

/** Column letters of the first `n` columns, made once per sheet. */
function lettersFor(n: number): string[] {
  const out: string[] = [];
  for (let j = 0; j < n; j++) out.push(columnLetters(j));
  return out;
}

/** An inline-string cell: text never becomes a formula or a number ("=1+1" stays text). */
function textCell(ref: string, style: number, text: string): string {
  if (text === '') return `<c r="${ref}" s="${style}"/>`;
  return `<c r="${ref}" s="${style}" t="inlineStr"><is><t${needsPreserve(text) ? ' xml:space="preserve"' : ''}>${cellText(text)}</t></is></c>`;
}

/** The fixed markup of a body cell, as bytes (ByteRows.raw): the same text textCell and writeSheet write. */
const EMPTY_END = asciiBytes('"/>');
const NUMBER_OPEN = asciiBytes('"><v>');
const NUMBER_CLOSE = asciiBytes('</v></c>');
const MINUS = asciiBytes('-');
const TEXT_OPEN = asciiBytes('" t="inlineStr"><is><t>');
const TEXT_OPEN_PRESERVE = asciiBytes('" t="inlineStr"><is><t xml:space="preserve">');
const TEXT_CLOSE = asciiBytes('</t></is></c>');
const ROW_CLOSE = asciiBytes('</row>');

/** Characters gathered before they go to the zip writer. */
const ROW_BUFFER = 64 * 1024;

/** Writes the worksheet part of `plan` row by row; `tableRel(k)` is the relationship id of the sheet's k-th table. */
async function writeSheet(out: PartWriter, plan: SheetPlan, styles: { look: Record<Look, number>; format: Map<string, number> }, tableRel: (k: number) => string, drawingRel: string | null, selected: boolean): Promise<void> {
  const { st } = plan;
  const across = textColumnCount(st);
  const widest = Math.max(1, ...st.tables.map((t) => t.block.columns.length), st.wraps.length > 0 ? across : 1);
  const letters = lettersFor(Math.max(widest, across));
  const lastRow = Math.max(plan.allHeightsTo, ...[...st.lines.keys()], ...st.tables.map((t) => t.headerRow + t.bodyRows));
  let head = `${XML_HEAD}<worksheet xmlns="${MAIN_NS}" xmlns:r="${REL_NS}"><sheetPr><pageSetUpPr fitToPage="1"/></sheetPr>`;
  head += `<dimension ref="A1:${letters[widest - 1]}${lastRow}"/>`;
  head += `<sheetViews><sheetView workbookViewId="0"${selected ? ' tabSelected="1"' : ''}>`;
  if (plan.frozenAt > 0) {
    head += `<pane ySplit="${plan.frozenAt}" topLeftCell="A${plan.frozenAt + 1}" activePane="bottomLeft" state="frozen"/><selection pane="bottomLeft" activeCell="A${plan.frozenAt + 1}" sqref="A${plan.frozenAt + 1}"/>`;
  }
  head += '</sheetView></sheetViews><sheetFormatPr defaultRowHeight="15"/>';
  const cols = st.widths.map((w, j) => (w > 0 ? `<col min="${j + 1}" max="${j + 1}" width="${w}" customWidth="1"/>` : '')).join('');
  if (cols !== '') head += `<cols>${cols}</cols>`;
  head += '<sheetData>';
  await out.write(head);

  let buf = '';
  const rowOpen = (r: number): string => {
    const h = st.heights.get(r) ?? (r <= plan.allHeightsTo ? LINE_HEIGHT : undefined);
    return h === undefined ? `<row r="${r}">` : `<row r="${r}" ht="${h}" customHeight="1">`;
  };
  const tables = [...st.tables].sort((a, b) => a.headerRow - b.headerRow);
  let next = 0; // the next table to reach
  for (let r = 1; r <= lastRow; r++) {
    const t = tables[next];
    if (t !== undefined && r === t.headerRow) {
      // The header row, then the body rows, cell by cell from the block's own rows.
      const plain = styles.look.plain;
      let row = rowOpen(r);
      t.headers.forEach((h, j) => (row += textCell(`${letters[j]}${r}`, plain, h)));
      buf += `${row}</row>`;
      const columns = t.block.columns;
      const formats = columns.map(cellFormat);
      const looks = formats.map((f) => styles.format.get(EXCEL_FORMAT_CODES[f])!);
      const significant = formats.map((f) => f === 'significant');
      // The body rows as bytes (byteRows.ts): the same markup as textCell and rowOpen make, without a string per cell.
      await out.write(buf);
      buf = '';
      const rows = new ByteRows(out);
      const cellOpen = columns.map((_, j) => asciiBytes(`<c r="${letters[j]}`));
      // '" s="<look>' per style number, made when first met (a 'significant' column's cells take several).
      const lookBytes: Uint8Array[] = [];
      const lookOf = (look: number): Uint8Array => (lookBytes[look] ??= asciiBytes(`" s="${look}`));
      for (let i = 0; i < t.bodyRows; i++) {
        const rr = r + 1 + i;
        const cells = t.block.rows[i];
        const open = rowOpen(rr);
        rows.room(open.length + 6);
        rows.ascii(open);
        for (let j = 0; j < columns.length; j++) {
          const v = storedValue(cells?.[j], formats[j]!);
          const look = lookOf(significant[j] ? styles.format.get(numberFormatFor(v, 'significant'))! : looks[j]!);
          const head = cellOpen[j]!;
          rows.room(head.length + look.length + 70);
          rows.raw(head);
          rows.digits(rr);
          rows.raw(look);
          if (v === null || v === '') rows.raw(EMPTY_END);
          else if (typeof v === 'number') {
            rows.raw(NUMBER_OPEN);
            // numberText: whole numbers in range as digits here (the same text String gives), others through it.
            if (Number.isInteger(v) && v > -0x80000000 && v < 0x80000000) {
              if (v < 0) rows.raw(MINUS);
              rows.digits(Math.abs(v));
            } else {
              const text = numberText(v);
              rows.room(text.length + 8);
              rows.ascii(text);
            }
            rows.raw(NUMBER_CLOSE);
          } else {
            rows.raw(needsPreserve(v) ? TEXT_OPEN_PRESERVE : TEXT_OPEN);
            rows.text(cellText(v));
            rows.room(TEXT_CLOSE.length);
            rows.raw(TEXT_CLOSE);
          }
        }
        rows.room(ROW_CLOSE.length);
        rows.raw(ROW_CLOSE);
        await rows.rowDone();
      }
      await rows.end();
      r += t.bodyRows;
      next += 1;
      continue;
    }
    const line = st.lines.get(r);
    if (line !== undefined) {
      const style = styles.look[line.look];
      buf += `${rowOpen(r)}${textCell(`A${r}`, style, line.text)}`;
      // The rest of a wrapped paragraph's merged area is written too (blank, same look), so readers count the whole
      // area as used: a printed page fitted to the width then holds the paragraph whole.
      if (line.look === 'wrapped' || line.look === 'wrappedCaution') for (let j = 1; j < across; j++) buf += `<c r="${letters[j]}${r}" s="${style}"/>`;
      buf += '</row>';
    }
    else if (r <= plan.allHeightsTo || st.heights.has(r)) buf += `${rowOpen(r)}</row>`;
    if (buf.length >= ROW_BUFFER) {
      await out.write(buf);
      buf = '';
    }
  }
  buf += '</sheetData>';
  if (plan.merges.length > 0) buf += `<mergeCells count="${plan.merges.length}">${plan.merges.map((m) => `<mergeCell ref="${m}"/>`).join('')}</mergeCells>`;
  if (st.links.length > 0) {
    buf += `<hyperlinks>${st.links.map((l) => `<hyperlink ref="${l.ref}" location="${cellText(`${quotedSheet(l.sheet)}!${l.cell}`)}" display="${cellText(l.display)}"/>`).join('')}</hyperlinks>`;
  }
  buf += '<pageMargins left="0.5" right="0.5" top="0.6" bottom="0.7" header="0.3" footer="0.3"/>';
  buf += `<pageSetup orientation="${plan.orientation}" fitToWidth="1" fitToHeight="0"/>`;
  buf += `<headerFooter><oddFooter>${xmlAttr(plan.footer)}</oddFooter></headerFooter>`;
  if (plan.breaks.length > 0) buf += `<rowBreaks count="${plan.breaks.length}" manualBreakCount="${plan.breaks.length}">${plan.breaks.map((b) => `<brk id="${b}" max="16383" man="1"/>`).join('')}</rowBreaks>`;
  if (drawingRel !== null) buf += `<drawing r:id="${drawingRel}"/>`;
  if (st.tables.length > 0) buf += `<tableParts count="${st.tables.length}">${st.tables.map((_, k) => `<tablePart r:id="${tableRel(k)}"/>`).join('')}</tableParts>`;
  buf += '</worksheet>';
  await out.write(buf);
  await out.end();
}

/** How the workbook is written (not what it holds). */
export interface WriteOptions {
  /** Compresses each part (default: the platform's compressor on this thread; the page's worker hands in one that
   * works on a thread of its own, src/web/workerCompressor.ts). The bytes of the package are the same either way. */
  readonly compressor?: Compressor;
}

/**
 * Renders sheet specs into an .xlsx workbook (ECMA-376) and returns its bytes. Per sheet: a title row, then each
 * block in order — a linking paragraph (the one-line caution) as an internal hyperlink on row 2 when it comes first, so
 * the first table's header is on row 4 at the latest; paragraphs on consecutive rows, each merged and wrapped across the
 * sheet's text width (cautions in bold italic), headings and tables set apart by a blank row, tables as real Excel
 * tables (table parts with header row, filter and banded rows) with number formats from numberFormatFor (per cell) and column
 * widths, and each chart as a native chart (chartXml.ts, in a drawing part) across the text width whose series read
 * the sheet's own table cells (bindChart.ts); a chart whose numbers are not all in a table of the sheet gets a table of
 * its numbers first. A sheet that is one big table gets its header frozen and repeated on every printed page; every
 * sheet prints one page wide with a footer naming the sheet, the page, the run date and the input fingerprint
 * (printSetup.ts). Text is always an inline string cell, never a formula: a subject id "=1+1" stays the text "=1+1".
 * Sheet names are made legal and unique (≤ 31 characters, none of \ / ? * : [ ]). Runs in Node and in the browser.
 * Cost O(cells); memory O(compressed size) besides the specs.
 *
 * Example: writeWorkbook([{ name: 'A', title: 'T', blocks: [] }]) → bytes of a workbook with sheet "A", A1 = "T".
 */
export async function writeWorkbook(sheets: readonly SheetSpec[], stamp: PrintStamp = {}, options: WriteOptions = {}): Promise<Uint8Array> {
  const names = uniqueSheetNames(sheets.map((s) => s.name));
  // Wanted name → the name each sheet got, for links between sheets (the first sheet of a wanted name wins).
  const nameOf = new Map<string, string>();
  sheets.forEach((spec, k) => {
    if (!nameOf.has(spec.name)) nameOf.set(spec.name, names[k]!);
  });
  const tableNames = new Set<string>();
  const plans = sheets.map((spec, k) => planSheet(spec, names[k]!, nameOf, tableNames, stamp));
  // The number-format codes in use: one per column, except a 'significant' column whose cells take a code by their
  // magnitude (numberFormatFor, the same digits the page and the pane show).
  const used = new Set<string>();
  for (const p of plans) for (const t of p.st.tables) t.block.columns.forEach((c, j) => {
    used.add(EXCEL_FORMAT_CODES[c.format]);
    if (c.format === 'significant') for (const r of t.block.rows) used.add(numberFormatFor(r[j] ?? null, c.format));
  });
  const styles = stylesXml([...used]);

  const zip = new ZipWriter(options.compressor);
  const counts = {
    sheets: plans.length,
    tables: plans.reduce((n, p) => n + p.st.tables.length, 0),
    drawings: plans.filter((p) => p.charts.length > 0).length,
    charts: plans.reduce((n, p) => n + p.charts.length, 0),
  };
  await zip.text('[Content_Types].xml', contentTypesXml(counts));
  await zip.text('_rels/.rels', rootRelsXml());
  let tableNo = 0;
  let drawingNo = 0;
  let chartNo = 0;
  for (const [k, plan] of plans.entries()) {
    const rels: Relationship[] = [];
    const tableIds: number[] = [];
    for (let j = 0; j < plan.st.tables.length; j++) {
      tableNo += 1;
      tableIds.push(tableNo);
      rels.push({ id: `rId${rels.length + 1}`, type: 'table', target: `../tables/table${tableNo}.xml` });
    }
    let drawingRel: string | null = null;
    if (plan.charts.length > 0) {
      drawingNo += 1;
      drawingRel = `rId${rels.length + 1}`;
      rels.push({ id: drawingRel, type: 'drawing', target: `../drawings/drawing${drawingNo}.xml` });
    }
    await writeSheet(zip.part(`xl/worksheets/sheet${k + 1}.xml`), plan, styles, (j) => `rId${j + 1}`, drawingRel, k === 0);
    if (rels.length > 0) await zip.text(`xl/worksheets/_rels/sheet${k + 1}.xml.rels`, relsXml(rels));
    const letters = lettersFor(Math.max(1, ...plan.st.tables.map((t) => t.block.columns.length)));
    for (const [j, t] of plan.st.tables.entries()) {
      const part: TablePart = {
        id: tableIds[j]!,
        name: t.name,
        ref: `A${t.headerRow}:${letters[t.headers.length - 1]}${t.headerRow + t.bodyRows}`,
        columns: t.headers,
      };
      await zip.text(`xl/tables/table${part.id}.xml`, tableXml(part));
    }
    if (plan.charts.length > 0) {
      const chartRels: Relationship[] = [];
      for (const [j, c] of plan.charts.entries()) {
        chartNo += 1;
        await zip.text(`xl/charts/chart${chartNo}.xml`, chartXml(c.spec, plan.name, c.series));
        chartRels.push({ id: `rId${j + 1}`, type: 'chart', target: `../charts/chart${chartNo}.xml` });
      }
      await zip.text(`xl/drawings/drawing${drawingNo}.xml`, drawingXml(plan.charts));
      await zip.text(`xl/drawings/_rels/drawing${drawingNo}.xml.rels`, relsXml(chartRels));
    }
  }
  await zip.text('xl/workbook.xml', workbookXml(plans.map((p) => ({ name: p.name, printTitleRow: p.printTitleRow }))));
  await zip.text('xl/_rels/workbook.xml.rels', workbookRelsXml(plans.length));
  await zip.text('xl/styles.xml', styles.xml);
  await zip.text('docProps/app.xml', appXml());
  await zip.text('docProps/core.xml', coreXml());
  return zip.finish();
}
