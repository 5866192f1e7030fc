/** Rendering a SheetSpec into a new worksheet (src/excel/renderSheet.ts) against a recording fake (see fakeExcel.ts). */
import { afterEach, describe, expect, it } from 'vitest';
import type { SheetSpec } from '../../src/core/report/types';
import { paragraphHeight } from '../../src/core/report/paragraphHeight';
import { renderSheet } from '../../src/excel/renderSheet';
import { installFakeExcel, type Op } from './fakeExcel';

/** An invented model sheet: a caution, a small table with text, number, p-value and date columns, and a chart. */
const SPEC: SheetSpec = {
  name: 'Model',
  title: 'Mixed model (invented demo data)',
  blocks: [
    { kind: 'paragraph', text: 'This is an interim look.', style: 'caution' },
    {
      kind: 'table',
      id: 'Fixed',
      caption: 'Fixed effects',
      columns: [
        { header: 'Term', format: 'text' },
        { header: 'Estimate', format: 'decimal2', width: 10 },
        { header: 'p', format: 'pvalue' },
        { header: 'Visit date', format: 'date' },
      ],
      rows: [
        ['=1+1', 1.234, 0.00001, 45000],
        ['Time', Number.NaN, null, null],
      ],
    },
    {
      kind: 'chart',
      chart: {
        kind: 'line',
        id: 'Trend',
        title: 'Mean eGFR over time',
        xLabel: 'Week',
        yLabel: 'eGFR',
        series: [
          { name: 'Placebo', x: [0, 12, 24], y: [60, 59, 58] },
          { name: 'Active', x: [0, 12, 24], y: [60, null, 59.5], style: 'points' },
        ],
      },
    },
  ],
};

const ofKind = <K extends Op['op']>(ops: readonly Op[], k: K): Extract<Op, { op: K }>[] => ops.filter((o): o is Extract<Op, { op: K }> => o.op === k);

afterEach(() => {
  Reflect.deleteProperty(globalThis, 'Excel');
});

describe('renderSheet', () => {
  it('adds a new sheet under a free name and writes nowhere else', async () => {
    const wb = installFakeExcel(['Data', 'model']);
    const written = await renderSheet(SPEC, { dateSystem: 1900 });
    expect(written).toEqual({ name: 'Model (2)', title: SPEC.title });
    expect(ofKind(wb.ops, 'addSheet')).toEqual([{ op: 'addSheet', name: 'Model (2)' }]);
    expect(new Set(ofKind(wb.ops, 'getItem').map((o) => o.name))).toEqual(new Set(['Model (2)']));
    for (const o of wb.ops) if ('sheet' in o) expect(o.sheet).toBe('Model (2)');
    // Four requests for a small sheet: add the sheet, add the format styles (refused by this workbook, so the formats
    // go per cell), write the cells, add tables and the chart.
    expect(wb.runs()).toBe(4);
  });

  it('writes text cells with the "@" format before their values, so "=1+1" stays the text "=1+1"', async () => {
    const wb = installFakeExcel([]);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const body = wb.ops.findIndex((o) => o.op === 'values' && o.address === 'A7:D8');
    const format = wb.ops.findIndex((o) => o.op === 'numberFormat' && o.address === 'A7:D8');
    expect(format).toBeGreaterThanOrEqual(0);
    expect(format).toBeLessThan(body);
    const values = ofKind(wb.ops, 'values').find((o) => o.address === 'A7:D8')?.value;
    const formats = ofKind(wb.ops, 'numberFormat').find((o) => o.address === 'A7:D8')?.value;
    expect(values?.[0]?.[0]).toBe('=1+1'); // written as it is: no apostrophe or other prefix
    expect(formats?.[0]?.[0]).toBe('@');
    // Every string written anywhere has "@" at its position, set before the values of the same range.
    for (const [i, o] of wb.ops.entries()) {
      if (o.op !== 'values') continue;
      const f = wb.ops.slice(0, i).reverse().find((p) => p.op === 'numberFormat' && p.address === o.address);
      expect(f, o.address).toBeDefined();
      o.value.forEach((row, r) =>
        row.forEach((v, c) => {
          if (typeof v === 'string' && v !== '') expect((f as { value: unknown[][] }).value[r]?.[c]).toBe('@');
        }),
      );
    }
  });

  it('sets the number formats of the shared map and blanks non-finite numbers', async () => {
    const wb = installFakeExcel([]);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const formats = ofKind(wb.ops, 'numberFormat').find((o) => o.address === 'A7:D8')?.value;
    const values = ofKind(wb.ops, 'values').find((o) => o.address === 'A7:D8')?.value;
    expect(formats?.[0]).toEqual(['@', '0.00', '[<0.0001]"<0.0001";0.0000', 'yyyy-mm-dd']);
    expect(values?.[0]).toEqual(['=1+1', 1.234, 0.00001, 45000]);
    expect(values?.[1]).toEqual(['Time', '', '', '']);
    expect(ofKind(wb.ops, 'values').find((o) => o.address === 'A6:D6')?.value).toEqual([['Term', 'Estimate', 'p', 'Visit date']]);
  });

  it('shifts day numbers by 1462 in a 1904-system workbook so the same date shows', async () => {
    // 1462 = serial of 1904-01-01 in the 1900 system, day 0 of the 1904 system (ECMA-376 Part 1 §18.17.4.1).
    const wb = installFakeExcel([]);
    await renderSheet(SPEC, { dateSystem: 1904 });
    expect(ofKind(wb.ops, 'values').find((o) => o.address === 'A7:D8')?.value[0]?.[3]).toBe(45000 - 1462);
  });

  it('makes real tables over header and rows with workbook-unique names', async () => {
    const wb = installFakeExcel([], ['LP_Fixed']);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const tables = ofKind(wb.ops, 'table');
    expect(tables.map((t) => [t.address, t.hasHeaders, t.name])).toEqual([
      ['A6:D8', true, 'LP_Fixed_2'],
      ['A11:C14', true, 'LP_TrendData'],
    ]);
  });

  it("charts the chart's numbers natively with titles, x values and marker-only series", async () => {
    const wb = installFakeExcel([]);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const [chart] = ofKind(wb.ops, 'chart');
    expect(chart).toMatchObject({ type: 'LineMarkers', address: 'B11:C14', by: 'Columns' });
    const c = chart!.chart;
    expect(c.title.text).toBe('Mean eGFR over time');
    expect(c.axes.categoryAxis.title.text).toBe('Week');
    expect(c.axes.valueAxis.title.text).toBe('eGFR');
    expect(c.seriesMade.map((s) => s.xAxis)).toEqual(['A12:A14', 'A12:A14']);
    expect(c.seriesMade[1]).toMatchObject({ markerStyle: 'Circle', format: { line: { lineStyle: 'None' } } });
    expect(c.position).toEqual(['E10', 'L25']);
    const data = ofKind(wb.ops, 'values').find((o) => o.address === 'A12:C14')?.value;
    expect(data).toEqual([
      [0, 60, 60],
      [12, 59, ''],
      [24, 58, 59.5],
    ]);
  });

  it('styles the title and caution, sets column widths and freezes through the single table header near the top', async () => {
    const wb = installFakeExcel([]);
    const spec: SheetSpec = { ...SPEC, blocks: SPEC.blocks.slice(0, 2) };
    await renderSheet(spec, { dateSystem: 1900 });
    const fonts = ofKind(wb.ops, 'font');
    expect(fonts.filter((f) => f.address === 'A1').map((f) => [f.key, f.value])).toEqual([
      ['bold', true],
      ['size', 14],
    ]);
    expect(fonts.filter((f) => f.address === 'A3').map((f) => f.key)).toContain('color');
    expect(ofKind(wb.ops, 'freezeRows').map((f) => f.value)).toEqual([6]);
    // Widths in points: 7 points per character (common practice approximation); "Estimate" asked for 10 characters.
    expect(ofKind(wb.ops, 'columnWidth').find((o) => o.address === 'B1')?.value).toBe(70);
  });

  it('merges and wraps each normal and caution paragraph across the widest table, after writing its text as text', async () => {
    const wb = installFakeExcel([]);
    const long = 'Invented demo data: the interim look used half the planned visits, so estimates may move. '.repeat(4).trim();
    const columns = ['Site', 'Arm', 'Week', 'n', 'Mean', 'SD', 'Low', 'High'].map((header) => ({ header, format: 'decimal1' as const }));
    const spec: SheetSpec = {
      name: 'Results',
      title: 'Results (invented demo data)',
      blocks: [
        { kind: 'paragraph', text: 'What the model says', style: 'heading' },
        { kind: 'paragraph', text: long, style: 'caution' },
        { kind: 'table', id: 'BySite', caption: 'By site', columns, rows: [[1, 2, 3, 4, 5, 6, 7, 8]] },
      ],
    };
    await renderSheet(spec, { dateSystem: 1900 });
    // The caution is on row 5 (title 1, heading 3); its area spans the table's 8 columns, A to H.
    expect(ofKind(wb.ops, 'merge')).toEqual([{ op: 'merge', sheet: 'Results', address: 'A5:H5', across: false }]);
    const format = ofKind(wb.ops, 'format').filter((o) => o.address === 'A5:H5');
    // 8 columns × 12 characters × 7 points = 672 points; the caution's 359 bold characters take 3 lines of 15 points
    // (the shared core function, paragraphHeight.test.ts).
    expect(long.length).toBe(359);
    expect(paragraphHeight(long, 96 * 7, true)).toBe(45);
    expect(format.map((o) => [o.key, o.value])).toEqual([
      ['wrapText', true],
      ['verticalAlignment', 'Top'],
      ['rowHeight', 45],
    ]);
    // The text went in as text ("@" first, then the value) before the area was merged around it; the merge writes
    // no values or formats of its own, so the top-left cell keeps both.
    const textFormat = wb.ops.findIndex((o) => o.op === 'numberFormat' && o.address === 'A5');
    const value = wb.ops.findIndex((o) => o.op === 'values' && o.address === 'A5');
    const merge = wb.ops.findIndex((o) => o.op === 'merge');
    expect(ofKind(wb.ops, 'numberFormat').find((o) => o.address === 'A5')?.value).toEqual([['@']]);
    expect(textFormat).toBeGreaterThanOrEqual(0);
    expect(textFormat).toBeLessThan(value);
    expect(value).toBeLessThan(merge);
    expect(wb.ops.some((o) => (o.op === 'values' || o.op === 'numberFormat') && o.address === 'A5:H5')).toBe(false);
    expect(wb.cells.get('Results!A5')).toBe(long);
    // The title and the heading stay single cells, unwrapped.
    expect(wb.ops.some((o) => 'address' in o && /^A[13]:/.test(o.address))).toBe(false);
    // Still no request of its own: the wrapping rides in the request that adds tables and widths (four in all, as
    // for any small sheet).
    expect(wb.runs()).toBe(4);
    const lastRunStart = wb.ops.map((o) => o.op).lastIndexOf('sync', wb.ops.length - 2);
    expect(merge).toBeGreaterThan(lastRunStart);
  });

  it('writes a 30,000-row table in several requests, halving any the host refuses for its size', async () => {
    const rows = Array.from({ length: 30_000 }, (_, i) => [`S${i}`, i * 0.5]);
    const big: SheetSpec = { name: 'Listing', title: 'Listing', blocks: [{ kind: 'table', id: 'List', caption: 'All rows', columns: [{ header: 'Subject', format: 'text' }, { header: 'x', format: 'decimal1' }], rows }] };
    // Budget 200,000 bytes per request: about 30 bytes of JSON per row plus 64 of allowance → ~2,100 rows a request;
    // the fake host refuses more than 1,500 rows, so each planned request is halved once.
    const wb = installFakeExcel([], [], 1500);
    const progress: number[] = [];
    await renderSheet(big, { dateSystem: 1900, targetBytes: 200_000, onProgress: (f) => progress.push(f) });
    // Every row reached the sheet, in its place, from the writes the host accepted.
    for (let i = 0; i < 30_000; i++) {
      if (wb.cells.get(`Listing!A${5 + i}`) !== `S${i}` || wb.cells.get(`Listing!B${5 + i}`) !== i * 0.5) throw new Error(`row ${i} missing or misplaced`);
    }
    expect(wb.cells.get('Listing!A4')).toBe('Subject');
    // Refused requests were retried as halves: no accepted write holds more than 1,500 rows.
    const refusals = ofKind(wb.ops, 'values').filter((o) => o.value.length > 1500).length;
    expect(refusals).toBeGreaterThan(0);
    expect(ofKind(wb.ops, 'table')[0]?.address).toBe('A4:B30004');
    expect(progress.at(-1)).toBe(1);
    expect(wb.runs()).toBeGreaterThan(10);
  });

describe('renderSheet with number formats by column (workbook styles, ExcelApi 1.7)', () => {
  it('adds one style per format code carrying only the number format, and gives each uniform column its style before its values', async () => {
    const wb = installFakeExcel([], [], Infinity, true);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const added = ofKind(wb.ops, 'styleAdd').map((o) => o.name);
    expect(added).toContain('Longipane format @');
    expect(added).toContain('Longipane format 0.00');
    for (const name of added) {
      const set = Object.fromEntries(ofKind(wb.ops, 'styleSet').filter((o) => o.name === name).map((o) => [o.key, o.value]));
      expect(set).toEqual({
        includeNumber: true,
        includeFont: false,
        includeAlignment: false,
        includeBorder: false,
        includePatterns: false,
        includeProtection: false,
        numberFormat: name.replace('Longipane format ', ''),
      });
    }
    // The table body A7:D8: a style per column (A text, B 0.00, C p-value, D date), no format per cell.
    const styles = ofKind(wb.ops, 'style');
    expect(['A7:A8', 'B7:B8', 'C7:C8', 'D7:D8'].map((a) => styles.find((o) => o.address === a)?.value)).toEqual([
      'Longipane format @',
      'Longipane format 0.00',
      'Longipane format [<0.0001]"<0.0001";0.0000',
      'Longipane format yyyy-mm-dd',
    ]);
    expect(ofKind(wb.ops, 'numberFormat').find((o) => o.address.startsWith('A7') || o.address.startsWith('B7'))).toBeUndefined();
    // The text guard holds: every string written has the text format "@" over its cell, set before the values — by
    // the style of its column or a code of its own.
    const cols = (address: string): [number, number, number, number] => {
      const m = /^([A-Z]+)(\d+)(?::([A-Z]+)(\d+))?$/.exec(address)!;
      const c = (l: string): number => [...l].reduce((n, ch) => n * 26 + ch.charCodeAt(0) - 64, 0) - 1;
      return [c(m[1]!), Number(m[2]), c(m[3] ?? m[1]!), Number(m[4] ?? m[2])];
    };
    for (const [i, o] of wb.ops.entries()) {
      if (o.op !== 'values') continue;
      const [c0, r0] = cols(o.address);
      o.value.forEach((row, r) =>
        row.forEach((v, c) => {
          if (typeof v !== 'string' || v === '') return;
          const col = c0 + c;
          const line = r0 + r;
          const before = wb.ops.slice(0, i).reverse();
          const covering = before.find((p) => {
            if (p.op !== 'style' && p.op !== 'numberFormat') return false;
            const [a, b, x, y] = cols(p.address);
            return col >= a && col <= x && line >= b && line <= y;
          });
          const format =
            covering?.op === 'style'
              ? covering.value.replace('Longipane format ', '')
              : covering?.op === 'numberFormat'
                ? (covering.value[line - cols(covering.address)[1]]?.[col - cols(covering.address)[0]] as string | undefined)
                : undefined;
          expect(format, `${o.address} row ${r} column ${c}`).toBe('@');
        }),
      );
    }
  });

  it('does not add a style the workbook already has (a second report)', async () => {
    const wb = installFakeExcel([], [], Infinity, true);
    await renderSheet(SPEC, { dateSystem: 1900 });
    const first = ofKind(wb.ops, 'styleAdd').length;
    await renderSheet(SPEC, { dateSystem: 1900 });
    expect(ofKind(wb.ops, 'styleAdd')).toHaveLength(first);
    expect(ofKind(wb.ops, 'style').filter((o) => o.sheet === 'Model (2)').length).toBeGreaterThan(0);
  });
});
});
