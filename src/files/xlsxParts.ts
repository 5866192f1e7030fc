/**
 * The small fixed parts of a report package (ECMA-376 Part 1 SpreadsheetML; Part 2 Open Packaging Conventions): content
 * types, relationships, the workbook with its sheets and print titles, the styles (fonts, number formats, cell formats),
 * a table part (§18.5), and a sheet's drawing part (§20.5) holding its charts. Pure string builders.
 */
import { DRAWING_NS, REL_NS } from './chartXml';
import type { BoundSeries } from './bindChart';
import type { ChartSpec } from '../core/report/types';
import { cellText, xmlAttr } from './xlsxText';

export const XML_HEAD = '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n';
export const MAIN_NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const PACKAGE_REL_NS = 'http://schemas.openxmlformats.org/package/2006/relationships';
const REL_TYPE = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
const SPREADSHEET_DRAWING_NS = 'http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing';
export const CHART_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.drawingml.chart+xml';
export const DRAWING_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.drawing+xml';
const SHEET_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml';
const TABLE_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.table+xml';

/** A relationship of a part: id, type (the last segment of the officeDocument relationship type) and target. */
export interface Relationship {
  readonly id: string;
  readonly type: string;
  readonly target: string;
}

export function relsXml(rels: readonly Relationship[]): string {
  const items = rels.map((r) => `<Relationship Id="${r.id}" Type="${REL_TYPE}/${r.type}" Target="${xmlAttr(r.target)}"/>`).join('');
  return `${XML_HEAD}<Relationships xmlns="${PACKAGE_REL_NS}">${items}</Relationships>`;
}

/** [Content_Types].xml for the parts written: defaults for .rels and .xml, overrides for each main part. */
export function contentTypesXml(parts: { readonly sheets: number; readonly tables: number; readonly drawings: number; readonly charts: number }): string {
  const o = (name: string, type: string): string => `<Override PartName="${name}" ContentType="${type}"/>`;
  const ml = 'application/vnd.openxmlformats-officedocument.spreadsheetml';
  let s =
    `${XML_HEAD}<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">` +
    '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>' +
    '<Default Extension="xml" ContentType="application/xml"/>' +
    o('/xl/workbook.xml', `${ml}.sheet.main+xml`) +
    o('/xl/styles.xml', `${ml}.styles+xml`) +
    o('/docProps/app.xml', 'application/vnd.openxmlformats-officedocument.extended-properties+xml') +
    o('/docProps/core.xml', 'application/vnd.openxmlformats-package.core-properties+xml');
  for (let k = 1; k <= parts.sheets; k++) s += o(`/xl/worksheets/sheet${k}.xml`, SHEET_CONTENT_TYPE);
  for (let k = 1; k <= parts.tables; k++) s += o(`/xl/tables/table${k}.xml`, TABLE_CONTENT_TYPE);
  for (let k = 1; k <= parts.drawings; k++) s += o(`/xl/drawings/drawing${k}.xml`, DRAWING_CONTENT_TYPE);
  for (let k = 1; k <= parts.charts; k++) s += o(`/xl/charts/chart${k}.xml`, CHART_CONTENT_TYPE);
  return `${s}</Types>`;
}

/** The package's own relationships: the workbook and the two property parts. */
export function rootRelsXml(): string {
  return relsXml([
    { id: 'rId1', type: 'officeDocument', target: 'xl/workbook.xml' },
    { id: 'rId2', type: 'extended-properties', target: 'docProps/app.xml' },
  ]).replace(
    '</Relationships>',
    `<Relationship Id="rId3" Type="http://schemas.openxmlformats.org/package/2006/relationships/metadata/core-properties" Target="docProps/core.xml"/></Relationships>`,
  );
}

export function appXml(): string {
  return `${XML_HEAD}<Properties xmlns="http://schemas.openxmlformats.org/officeDocument/2006/extended-properties"><Application>longipane</Application></Properties>`;
}

export function coreXml(): string {
  return (
    `${XML_HEAD}<cp:coreProperties xmlns:cp="http://schemas.openxmlformats.org/package/2006/metadata/core-properties" ` +
    'xmlns:dc="http://purl.org/dc/elements/1.1/"><dc:creator>longipane</dc:creator></cp:coreProperties>'
  );
}

/** A sheet of the workbook: its name and, when its table's header repeats on printed pages, that row (1-based). */
export interface WorkbookSheet {
  readonly name: string;
  readonly printTitleRow: number;
}

/** A sheet name quoted for a formula or a defined name: 'Visit timing' (inner quotes doubled). */
export const quotedSheet = (sheet: string): string => `'${sheet.replace(/'/g, "''")}'`;

/** xl/workbook.xml: the sheets in order (sheet k is rId k) and the print titles as defined names (§18.2.6). */
export function workbookXml(sheets: readonly WorkbookSheet[]): string {
  const list = sheets.map((s, k) => `<sheet name="${cellText(s.name)}" sheetId="${k + 1}" r:id="rId${k + 1}"/>`).join('');
  const titles = sheets
    .map((s, k) => (s.printTitleRow > 0 ? `<definedName name="_xlnm.Print_Titles" localSheetId="${k}">${xmlAttr(`${quotedSheet(s.name)}!$${s.printTitleRow}:$${s.printTitleRow}`)}</definedName>` : ''))
    .join('');
  return (
    `${XML_HEAD}<workbook xmlns="${MAIN_NS}" xmlns:r="${REL_NS}"><bookViews><workbookView activeTab="0"/></bookViews>` +
    `<sheets>${list}</sheets>${titles === '' ? '' : `<definedNames>${titles}</definedNames>`}</workbook>`
  );
}

export function workbookRelsXml(sheets: number): string {
  const rels: Relationship[] = [];
  for (let k = 1; k <= sheets; k++) rels.push({ id: `rId${k}`, type: 'worksheet', target: `worksheets/sheet${k}.xml` });
  rels.push({ id: `rId${sheets + 1}`, type: 'styles', target: 'styles.xml' });
  return relsXml(rels);
}

/** The cell looks the writer uses, besides one per number format: each is an index into cellXfs. */
export const LOOKS = ['plain', 'title', 'heading', 'caption', 'caution', 'link', 'wrapped', 'wrappedCaution'] as const;
export type Look = (typeof LOOKS)[number];

/** Number formats built into SpreadsheetML (§18.8.30) that the report uses; the others get ids from 164. */
const BUILT_IN: Partial<Record<string, number>> = { '0': 1, '0.00': 2, '@': 49 };

/**
 * The style part and the index of each cell look: fonts (default Calibri 11; title bold 14; heading bold 12; caption
 * bold; caution bold italic dark orange, and the same underlined for a link), one cell format per look, then one per
 * number-format code in `codes` (in that order; `format` maps each code to its cell format). Wrapped looks wrap text at the top of the cell.
 */
export function stylesXml(codes: readonly string[]): { xml: string; look: Record<Look, number>; format: Map<string, number> } {
  const fonts = [
    '<font><sz val="11"/><name val="Calibri"/><family val="2"/></font>',
    '<font><b/><sz val="14"/><name val="Calibri"/><family val="2"/></font>',
    '<font><b/><sz val="12"/><name val="Calibri"/><family val="2"/></font>',
    '<font><b/><sz val="11"/><name val="Calibri"/><family val="2"/></font>',
    '<font><b/><i/><sz val="11"/><color rgb="FF9C2A00"/><name val="Calibri"/><family val="2"/></font>',
    '<font><b/><i/><u/><sz val="11"/><color rgb="FF9C2A00"/><name val="Calibri"/><family val="2"/></font>',
  ];
  const wrap = '<alignment vertical="top" wrapText="1"/>';
  const xf = (font: number, inner = ''): string =>
    inner === '' ? `<xf numFmtId="0" fontId="${font}" fillId="0" borderId="0" xfId="0"${font > 0 ? ' applyFont="1"' : ''}/>` : `<xf numFmtId="0" fontId="${font}" fillId="0" borderId="0" xfId="0"${font > 0 ? ' applyFont="1"' : ''} applyAlignment="1">${inner}</xf>`;
  const lookXfs: Record<Look, string> = {
    plain: xf(0),
    title: xf(1),
    heading: xf(2),
    caption: xf(3),
    caution: xf(4),
    link: xf(5),
    wrapped: xf(0, wrap),
    wrappedCaution: xf(4, wrap),
  };
  const look = {} as Record<Look, number>;
  const xfs: string[] = [];
  for (const l of LOOKS) {
    look[l] = xfs.length;
    xfs.push(lookXfs[l]);
  }
  const numFmts: string[] = [];
  const format = new Map<string, number>();
  let next = 164;
  for (const code of codes) {
    if (format.has(code)) continue;
    let id = BUILT_IN[code];
    if (id === undefined) {
      id = next++;
      numFmts.push(`<numFmt numFmtId="${id}" formatCode="${xmlAttr(code)}"/>`);
    }
    format.set(code, xfs.length);
    xfs.push(`<xf numFmtId="${id}" fontId="0" fillId="0" borderId="0" xfId="0" applyNumberFormat="1"/>`);
  }
  const xml =
    `${XML_HEAD}<styleSheet xmlns="${MAIN_NS}">` +
    (numFmts.length > 0 ? `<numFmts count="${numFmts.length}">${numFmts.join('')}</numFmts>` : '') +
    `<fonts count="${fonts.length}">${fonts.join('')}</fonts>` +
    '<fills count="2"><fill><patternFill patternType="none"/></fill><fill><patternFill patternType="gray125"/></fill></fills>' +
    '<borders count="1"><border><left/><right/><top/><bottom/><diagonal/></border></borders>' +
    '<cellStyleXfs count="1"><xf numFmtId="0" fontId="0" fillId="0" borderId="0"/></cellStyleXfs>' +
    `<cellXfs count="${xfs.length}">${xfs.join('')}</cellXfs>` +
    '<cellStyles count="1"><cellStyle name="Normal" xfId="0" builtinId="0"/></cellStyles>' +
    '<dxfs count="0"/><tableStyles count="0"/>' +
    '</styleSheet>';
  return { xml, look, format };
}

/** One Excel table: part number (its id, unique in the workbook), name, range, and column names (the header cells). */
export interface TablePart {
  readonly id: number;
  readonly name: string;
  readonly ref: string;
  readonly columns: readonly string[];
}

/** A table part (§18.5.1.2) with a header row, a filter over the whole range and banded rows. */
export function tableXml(t: TablePart): string {
  const cols = t.columns.map((c, j) => `<tableColumn id="${j + 1}" name="${cellText(c)}"/>`).join('');
  return (
    `${XML_HEAD}<table xmlns="${MAIN_NS}" id="${t.id}" name="${xmlAttr(t.name)}" displayName="${xmlAttr(t.name)}" ref="${t.ref}" headerRowCount="1" totalsRowShown="0">` +
    `<autoFilter ref="${t.ref}"/><tableColumns count="${t.columns.length}">${cols}</tableColumns>` +
    '<tableStyleInfo name="TableStyleMedium2" showFirstColumn="0" showLastColumn="0" showRowStripes="1" showColumnStripes="0"/></table>'
  );
}

/** A chart to place: its cells (0-based, the `to` cell is the first one past the chart) and its bound series. */
export interface PlacedChart {
  readonly spec: ChartSpec;
  readonly series: readonly BoundSeries[];
  readonly from: { readonly row: number; readonly column: number };
  readonly to: { readonly row: number; readonly column: number };
}

function anchor(c: PlacedChart, k: number): string {
  const cell = (tag: string, p: { row: number; column: number }): string =>
    `<xdr:${tag}><xdr:col>${p.column}</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>${p.row}</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:${tag}>`;
  return (
    `<xdr:twoCellAnchor editAs="oneCell">${cell('from', c.from)}${cell('to', c.to)}` +
    `<xdr:graphicFrame macro=""><xdr:nvGraphicFramePr><xdr:cNvPr id="${k + 2}" name="${xmlAttr(c.spec.title)}"/><xdr:cNvGraphicFramePr/></xdr:nvGraphicFramePr>` +
    '<xdr:xfrm><a:off x="0" y="0"/><a:ext cx="0" cy="0"/></xdr:xfrm>' +
    `<a:graphic><a:graphicData uri="http://schemas.openxmlformats.org/drawingml/2006/chart"><c:chart xmlns:c="http://schemas.openxmlformats.org/drawingml/2006/chart" r:id="rId${k + 1}"/></a:graphicData></a:graphic>` +
    '</xdr:graphicFrame><xdr:clientData/></xdr:twoCellAnchor>'
  );
}

/** The drawing part of one sheet: one anchored frame per chart, the k-th pointing at relationship rId(k+1). */
export function drawingXml(charts: readonly PlacedChart[]): string {
  return `${XML_HEAD}<xdr:wsDr xmlns:xdr="${SPREADSHEET_DRAWING_NS}" xmlns:a="${DRAWING_NS}" xmlns:r="${REL_NS}">${charts.map(anchor).join('')}</xdr:wsDr>`;
}
