/**
 * Adds native charts to an .xlsx package written by exceljs (which writes no charts): per sheet with charts, one
 * drawing part (SpreadsheetML drawing, ECMA-376 Part 1 §20.5) holding a two-cell anchor per chart, one chart part per
 * chart (§21.2), the relationships sheet → drawing → chart (Part 2, Open Packaging Conventions), the content types,
 * and the sheet's <drawing> element in its place in the CT_Worksheet sequence (before legacyDrawing, tableParts and
 * extLst). Parts the function does not touch are copied as they are. Runs in Node and in the browser.
 */
import JSZip from 'jszip';
import type { ChartSpec } from '../../../src/core/report/types';
import type { BoundSeries } from '../../../src/files/bindChart';
import { FileFormatError } from '../../../src/files/errors';
import { chartXml, DRAWING_NS, REL_NS, xmlText } from '../../../src/files/chartXml';
import { withHyperlinks, type PlacedLink } from './addLinks';

/** A chart to place: its cells (0-based, the `to` cell is the first one past the chart) and its bound series. */
export interface PlacedChart {
  readonly spec: ChartSpec;
  readonly series: readonly BoundSeries[];
  readonly from: { readonly row: number; readonly column: number };
  readonly to: { readonly row: number; readonly column: number };
}

const SPREADSHEET_DRAWING_NS = 'http://schemas.openxmlformats.org/drawingml/2006/spreadsheetDrawing';
const PACKAGE_REL_NS = 'http://schemas.openxmlformats.org/package/2006/relationships';
const REL_TYPE = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
export const CHART_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.drawingml.chart+xml';
export const DRAWING_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.drawing+xml';

/** Reverses xmlText for the attribute values exceljs writes (sheet names in workbook.xml). */
function unescapeXml(s: string): string {
  return s
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&apos;/g, "'")
    .replace(/&#(\d+);/g, (_, d: string) => String.fromCodePoint(Number(d)))
    .replace(/&#x([0-9a-f]+);/gi, (_, h: string) => String.fromCodePoint(parseInt(h, 16)))
    .replace(/&amp;/g, '&');
}

function attr(tag: string, name: string): string | undefined {
  const m = new RegExp(`\\s${name}="([^"]*)"`).exec(tag);
  return m === null ? undefined : unescapeXml(m[1]!);
}

/** Sheet name → its part's path in the package (from xl/workbook.xml and its relationships). */
async function sheetParts(zip: JSZip): Promise<Map<string, string>> {
  const workbook = (await zip.file('xl/workbook.xml')?.async('string')) ?? '';
  const rels = (await zip.file('xl/_rels/workbook.xml.rels')?.async('string')) ?? '';
  const targets = new Map<string, string>();
  for (const m of rels.matchAll(/<Relationship\b[^>]*>/g)) {
    const id = attr(m[0], 'Id');
    const target = attr(m[0], 'Target');
    if (id !== undefined && target !== undefined) targets.set(id, target.startsWith('/') ? target.slice(1) : `xl/${target}`);
  }
  const parts = new Map<string, string>();
  for (const m of workbook.matchAll(/<sheet\b[^>]*>/g)) {
    const name = attr(m[0], 'name');
    const id = attr(m[0], 'r:id');
    const target = id === undefined ? undefined : targets.get(id);
    if (name !== undefined && target !== undefined) parts.set(name, target);
  }
  return parts;
}

function anchor(c: PlacedChart, k: number): string {
  const cell = (tag: string, p: { row: number; column: number }): string =>
    `<xdr:${tag}><xdr:col>${p.column}</xdr:col><xdr:colOff>0</xdr:colOff><xdr:row>${p.row}</xdr:row><xdr:rowOff>0</xdr:rowOff></xdr:${tag}>`;
  return (
    `<xdr:twoCellAnchor editAs="oneCell">${cell('from', c.from)}${cell('to', c.to)}` +
    `<xdr:graphicFrame macro=""><xdr:nvGraphicFramePr><xdr:cNvPr id="${k + 2}" name="${xmlText(c.spec.title)}"/><xdr:cNvGraphicFramePr/></xdr:nvGraphicFramePr>` +
    '<xdr:xfrm><a:off x="0" y="0"/><a:ext cx="0" cy="0"/></xdr:xfrm>' +
    `<a:graphic><a:graphicData uri="http://schemas.openxmlformats.org/drawingml/2006/chart"><c:chart xmlns:c="http://schemas.openxmlformats.org/drawingml/2006/chart" r:id="rId${k + 1}"/></a:graphicData></a:graphic>` +
    '</xdr:graphicFrame><xdr:clientData/></xdr:twoCellAnchor>'
  );
}

/** The drawing part of one sheet: one anchored frame per chart, the k-th pointing at relationship rId(k+1). */
export function drawingXml(charts: readonly PlacedChart[]): string {
  return (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n' +
    `<xdr:wsDr xmlns:xdr="${SPREADSHEET_DRAWING_NS}" xmlns:a="${DRAWING_NS}" xmlns:r="${REL_NS}">${charts.map(anchor).join('')}</xdr:wsDr>`
  );
}

function relsXml(rels: readonly { id: string; type: string; target: string }[]): string {
  const items = rels.map((r) => `<Relationship Id="${r.id}" Type="${REL_TYPE}/${r.type}" Target="${xmlText(r.target)}"/>`).join('');
  return `<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n<Relationships xmlns="${PACKAGE_REL_NS}">${items}</Relationships>`;
}

/** Adds one relationship to a .rels part (made when absent) under a fresh id, and returns that id. */
function addRelationship(rels: string | undefined, type: string, target: string): { xml: string; id: string } {
  const xml = rels ?? relsXml([]);
  const used = new Set([...xml.matchAll(/\sId="([^"]*)"/g)].map((m) => m[1]));
  let n = 1;
  while (used.has(`rId${n}`)) n++;
  const id = `rId${n}`;
  const item = `<Relationship Id="${id}" Type="${REL_TYPE}/${type}" Target="${xmlText(target)}"/>`;
  return { xml: xml.replace(/<\/Relationships>\s*$/, `${item}</Relationships>`), id };
}

/** The sheet XML with <drawing r:id="…"/> before the first element that must follow it, else before </worksheet>. */
export function withDrawingElement(sheetXml: string, relId: string): string {
  const element = `<drawing r:id="${relId}"/>`;
  const at = sheetXml.search(/<(legacyDrawing|legacyDrawingHF|drawingHF|picture|oleObjects|controls|webPublishItems|tableParts|extLst)\b/);
  const end = at >= 0 ? at : sheetXml.lastIndexOf('</worksheet>');
  const withNs = /xmlns:r="/.test(sheetXml.slice(0, sheetXml.indexOf('>', sheetXml.indexOf('<worksheet')))) ? sheetXml : sheetXml.replace('<worksheet', `<worksheet xmlns:r="${REL_NS}"`);
  const shift = withNs.length - sheetXml.length;
  return withNs.slice(0, end + shift) + element + withNs.slice(end + shift);
}

/** The next part number after `after` whose part `${prefix}${n}.xml` is not in the package yet. */
function freeNumber(zip: JSZip, prefix: string, after: number): number {
  let n = after + 1;
  while (zip.file(`${prefix}${n}.xml`) !== null) n++;
  return n;
}

/**
 * The package `bytes` with `charts` (sheet name → charts on that sheet) added as native charts, and `links` (sheet
 * name → links on that sheet) as internal hyperlinks (addLinks.ts). Sheets without either are left as they are; with
 * none at all the bytes are returned unchanged. Cost O(size of the touched parts); untouched parts keep their
 * compressed bytes.
 */
export async function addCharts(
  bytes: Uint8Array,
  charts: ReadonlyMap<string, readonly PlacedChart[]>,
  links: ReadonlyMap<string, readonly PlacedLink[]> = new Map(),
): Promise<Uint8Array> {
  if ([...charts.values()].every((c) => c.length === 0) && [...links.values()].every((l) => l.length === 0)) return bytes;
  const zip = await JSZip.loadAsync(bytes);
  const parts = await sheetParts(zip);
  for (const [sheet, placed] of links) {
    if (placed.length === 0) continue;
    const part = parts.get(sheet);
    if (part === undefined) throw new FileFormatError(`The report could not get its links: the workbook has no sheet named "${sheet}".`);
    zip.file(part, withHyperlinks((await zip.file(part)?.async('string')) ?? '', placed));
  }
  let types = (await zip.file('[Content_Types].xml')?.async('string')) ?? '';
  let chartNo = 0;
  let drawingNo = 0;
  for (const [sheet, placed] of charts) {
    if (placed.length === 0) continue;
    const part = parts.get(sheet);
    if (part === undefined) throw new FileFormatError(`The report could not get its charts: the workbook has no sheet named "${sheet}".`);
    drawingNo = freeNumber(zip, 'xl/drawings/drawing', drawingNo);
    const drawingPath = `xl/drawings/drawing${drawingNo}.xml`;
    const drawingRels: { id: string; type: string; target: string }[] = [];
    for (const [k, c] of placed.entries()) {
      chartNo = freeNumber(zip, 'xl/charts/chart', chartNo);
      zip.file(`xl/charts/chart${chartNo}.xml`, chartXml(c.spec, sheet, c.series));
      types = types.replace('</Types>', `<Override PartName="/xl/charts/chart${chartNo}.xml" ContentType="${CHART_CONTENT_TYPE}"/></Types>`);
      drawingRels.push({ id: `rId${k + 1}`, type: 'chart', target: `../charts/chart${chartNo}.xml` });
    }
    zip.file(drawingPath, drawingXml(placed));
    zip.file(`xl/drawings/_rels/drawing${drawingNo}.xml.rels`, relsXml(drawingRels));
    types = types.replace('</Types>', `<Override PartName="/${drawingPath}" ContentType="${DRAWING_CONTENT_TYPE}"/></Types>`);
    const slash = part.lastIndexOf('/');
    const relsPath = `${part.slice(0, slash)}/_rels/${part.slice(slash + 1)}.rels`;
    const rel = addRelationship(await zip.file(relsPath)?.async('string'), 'drawing', `../drawings/drawing${drawingNo}.xml`);
    zip.file(relsPath, rel.xml);
    const sheetXml = (await zip.file(part)?.async('string')) ?? '';
    zip.file(part, withDrawingElement(sheetXml, rel.id));
  }
  zip.file('[Content_Types].xml', types);
  return zip.generateAsync({ type: 'uint8array', compression: 'DEFLATE', compressionOptions: { level: 6 } });
}
