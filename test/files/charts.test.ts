// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import JSZip from 'jszip';
import { writeWorkbook, CHART_DATA_CAPTION } from '../../src/files/writeWorkbook';
import { readXlsxBuffer } from '../../src/files/readXlsx';
import { CHART_CONTENT_TYPE, DRAWING_CONTENT_TYPE } from '../../src/files/xlsxParts';
import { CHART_NS, runReference } from '../../src/files/chartXml';
import type { ChartSpec, SheetSpec, TableBlock } from '../../src/core/report/types';

// Part names, content types, relationship types and namespaces: ECMA-376 Part 1 §21.2 (charts), §20.5
// (spreadsheet drawings), §18.3.1 (worksheet), and Part 2 (Open Packaging Conventions: [Content_Types].xml, .rels).

/** A namespace-aware XML parse that fails on any well-formedness error (jsdom's DOMParser, a conforming XML parser). */
function parseXml(text: string, part: string): Document {
  const doc = new DOMParser().parseFromString(text, 'application/xml');
  const error = doc.getElementsByTagName('parsererror')[0];
  if (error !== undefined) throw new Error(`${part} is not well-formed XML: ${error.textContent ?? ''}`);
  return doc;
}

async function partsOf(bytes: Uint8Array): Promise<Map<string, string>> {
  const zip = await JSZip.loadAsync(bytes);
  const out = new Map<string, string>();
  for (const name of Object.keys(zip.files)) if (!zip.files[name]!.dir) out.set(name, await zip.files[name]!.async('string'));
  return out;
}

/** Relationships of a .rels part: id → { type (last path segment), target resolved against the source part }. */
function relationships(parts: Map<string, string>, source: string): Map<string, { type: string; target: string }> {
  const slash = source.lastIndexOf('/');
  const dir = source.slice(0, slash);
  const xml = parts.get(`${dir}/_rels/${source.slice(slash + 1)}.rels`);
  const out = new Map<string, { type: string; target: string }>();
  if (xml === undefined) return out;
  const doc = parseXml(xml, 'rels');
  for (const r of Array.from(doc.getElementsByTagName('Relationship'))) {
    const segments = `${dir}/${r.getAttribute('Target')!}`.split('/');
    const resolved: string[] = [];
    for (const s of segments) if (s === '..') resolved.pop(); else resolved.push(s);
    out.set(r.getAttribute('Id')!, { type: r.getAttribute('Type')!.split('/').pop()!, target: resolved.join('/') });
  }
  return out;
}

const bySite: TableBlock = {
  kind: 'table',
  id: 'BySite',
  caption: 'Scheduled visits by site',
  columns: [
    { header: 'Site', format: 'text' },
    { header: 'Visits due', format: 'integer' },
    { header: 'On-time rate', format: 'percent1' },
  ],
  rows: [
    ['Site 01', 40, 0.9],
    ['Site 02', 38, 0.75],
    ['Site 03', 12, 0.5],
  ],
};
const rateChart: ChartSpec = {
  kind: 'bar',
  id: 'OnTimeRateBySite',
  title: 'On-time rate by site',
  xLabel: 'Site',
  yLabel: 'On-time rate',
  series: [{ name: 'On-time rate', x: ['Site 01', 'Site 02', 'Site 03'], y: [0.9, 0.75, 0.5] }],
  sourceTable: 'BySite',
};
const trend: ChartSpec = {
  kind: 'scatter',
  id: 'Trend',
  title: 'Means over time',
  xLabel: 'Study day',
  yLabel: 'Value',
  series: [
    { name: 'All: model', x: [1, 85, 169], y: [55, 54.5, 54], lower: [53, 52.5, 52], upper: [57, 56.5, 56], style: 'line' },
    { name: 'All: observed mean', x: [1, 85], y: [55.2, 54.1], style: 'points' },
  ],
};
const timing: SheetSpec = {
  name: "Bob's timing",
  title: 'Visit timing',
  blocks: [{ kind: 'paragraph', text: 'Invented example.' }, bySite, { kind: 'chart', chart: rateChart }, { kind: 'chart', chart: trend }],
};
const plain: SheetSpec = { name: 'Record', title: 'Analysis record', blocks: [{ kind: 'paragraph', text: 'No chart here.' }] };

describe('native charts in the written workbook (ECMA-376 Part 1 §21.2)', () => {
  it('adds well-formed chart and drawing parts whose content types and relationships all resolve', async () => {
    const parts = await partsOf(await writeWorkbook([plain, timing]));
    for (const [name, text] of parts) if (name.endsWith('.xml') || name.endsWith('.rels')) parseXml(text, name);
    const types = parseXml(parts.get('[Content_Types].xml')!, 'types');
    const override = new Map(Array.from(types.getElementsByTagName('Override')).map((o) => [o.getAttribute('PartName')!.slice(1), o.getAttribute('ContentType')!]));
    const charts = [...parts.keys()].filter((p) => /^xl\/charts\/chart\d+\.xml$/.test(p));
    const drawings = [...parts.keys()].filter((p) => /^xl\/drawings\/drawing\d+\.xml$/.test(p));
    expect(charts).toHaveLength(2);
    expect(drawings).toHaveLength(1);
    for (const c of charts) expect(override.get(c)).toBe(CHART_CONTENT_TYPE);
    expect(override.get(drawings[0]!)).toBe(DRAWING_CONTENT_TYPE);
    // The sheet that has charts is the second; its <drawing r:id> names a relationship to the drawing part, whose
    // graphic frames name relationships to the chart parts.
    const sheetPart = 'xl/worksheets/sheet2.xml';
    const sheet = parseXml(parts.get(sheetPart)!, sheetPart);
    const drawingEl = sheet.getElementsByTagName('drawing')[0]!;
    const rid = drawingEl.getAttributeNS('http://schemas.openxmlformats.org/officeDocument/2006/relationships', 'id')!;
    const sheetRels = relationships(parts, sheetPart);
    expect(sheetRels.get(rid)).toEqual({ type: 'drawing', target: drawings[0] });
    const drawing = parseXml(parts.get(drawings[0]!)!, 'drawing');
    const frames = Array.from(drawing.getElementsByTagNameNS(CHART_NS, 'chart')).map((c) => c.getAttribute('r:id')!);
    const drawingRels = relationships(parts, drawings[0]!);
    expect(frames.map((f) => drawingRels.get(f))).toEqual(charts.map((c) => ({ type: 'chart', target: c })));
    // The sheet without charts keeps no drawing.
    expect(parts.get('xl/worksheets/sheet1.xml')).not.toContain('<drawing');
    // CT_Worksheet order: drawing comes before tableParts.
    const xml = parts.get(sheetPart)!;
    expect(xml.indexOf('<drawing ')).toBeLessThan(xml.indexOf('<tableParts'));
  });

  it("binds each series to the sheet's own table cells, sheet name quoted, and those cells hold the charted values", async () => {
    const bytes = await writeWorkbook([timing]);
    const parts = await partsOf(bytes);
    const chart = parseXml(parts.get('xl/charts/chart1.xml')!, 'chart1');
    expect(chart.documentElement.localName).toBe('chartSpace');
    expect(chart.getElementsByTagNameNS(CHART_NS, 'barChart')).toHaveLength(1);
    const refs = Array.from(chart.getElementsByTagNameNS(CHART_NS, 'f')).map((f) => f.textContent);
    // The table "BySite" starts with its caption on row 5 (title, blank, paragraph, blank), header on row 6, body 7–9.
    expect(refs).toEqual(["'Bob''s timing'!$A$7:$A$9", "'Bob''s timing'!$C$7:$C$9"]);
    // Read back with the project's own reader: the referenced cells hold the series' x and y.
    const back = await readXlsxBuffer(bytes, "Bob's timing");
    const at = (row: number, col: number): unknown => back.cells[row - 1]?.[col];
    expect([7, 8, 9].map((r) => at(r, 0))).toEqual(rateChart.series[0]!.x);
    expect([7, 8, 9].map((r) => at(r, 2))).toEqual(rateChart.series[0]!.y);
  });

  it('writes a table of the numbers first for a chart whose numbers are in no table of the sheet, and charts from it', async () => {
    const bytes = await writeWorkbook([timing]);
    const parts = await partsOf(bytes);
    const chart = parseXml(parts.get('xl/charts/chart2.xml')!, 'chart2');
    expect(chart.getElementsByTagNameNS(CHART_NS, 'scatterChart')).toHaveLength(1);
    const series = Array.from(chart.getElementsByTagNameNS(CHART_NS, 'ser'));
    // Model line, its lower and upper bound (dashed), then the observed means (markers only).
    expect(series.map((s) => s.getElementsByTagNameNS(CHART_NS, 'v')[0]!.textContent)).toEqual(['All: model', 'All: model lower', 'All: model upper', 'All: observed mean']);
    expect(series.map((s) => s.getElementsByTagName('a:prstDash').length)).toEqual([0, 1, 1, 0]);
    const back = await readXlsxBuffer(bytes, "Bob's timing");
    const captionRow = back.cells.findIndex((r) => r[0] === CHART_DATA_CAPTION(trend.title)) + 1;
    expect(captionRow).toBeGreaterThan(0);
    const xRef = series[3]!.getElementsByTagNameNS(CHART_NS, 'xVal')[0]!.getElementsByTagNameNS(CHART_NS, 'f')[0]!.textContent;
    const yRef = series[3]!.getElementsByTagNameNS(CHART_NS, 'yVal')[0]!.getElementsByTagNameNS(CHART_NS, 'f')[0]!.textContent;
    expect(xRef).toBe(`'Bob''s timing'!$A$${captionRow + 2}:$A$${captionRow + 4}`);
    expect(yRef).toBe(`'Bob''s timing'!$E$${captionRow + 2}:$E$${captionRow + 4}`);
    // Observed means at days 1 and 85, none at day 169: the blank cell is a gap in the chart.
    expect([2, 3, 4].map((k) => back.cells[captionRow + k - 1]?.[4] ?? null)).toEqual([55.2, 54.1, null]);
  });

  it('leaves a chart without points out, and writes no chart part for it', async () => {
    const empty: ChartSpec = { ...rateChart, series: [] };
    const parts = await partsOf(await writeWorkbook([{ name: 'S', title: 'T', blocks: [bySite, { kind: 'chart', chart: empty }] }]));
    expect([...parts.keys()].some((p) => p.startsWith('xl/charts/'))).toBe(false);
  });

  it('puts the drawing element after the print settings and before the table parts (CT_Worksheet order, ECMA-376 Part 1 §18.3.1.99)', async () => {
    const parts = await partsOf(await writeWorkbook([{ name: 'S', title: 'T', blocks: [bySite, { kind: 'chart', chart: rateChart }] }]));
    const xml = parts.get('xl/worksheets/sheet1.xml')!;
    parseXml(xml, 'sheet1');
    const order = ['<sheetData', '<pageMargins', '<pageSetup', '<headerFooter', '<drawing ', '<tableParts'].map((tag) => xml.indexOf(tag));
    expect(order.every((at) => at >= 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
  });

  it("quotes every sheet name in a reference and doubles an apostrophe: 'Visit timing'!$B$12:$B$16", () => {
    expect(runReference('Visit timing', { first: 12, last: 16, column: 1 })).toBe("'Visit timing'!$B$12:$B$16");
    expect(runReference("Bob's", { first: 1, last: 2, column: 27 })).toBe("'Bob''s'!$AB$1:$AB$2");
  });
});
