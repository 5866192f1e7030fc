import { describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { writeWorkbook, CHART_DATA_CAPTION } from '../../src/files/writeWorkbook';
import { CAUTIONS } from '../../src/core/report/cautions';
import { columnWidthPoints, paragraphHeight } from '../../src/core/report/paragraphHeight';
import type { SheetSpec } from '../../src/core/report/types';

async function load(bytes: Uint8Array): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
  return wb;
}

/** Tables as exceljs reads them back from the file (name and range). */
function tablesOf(ws: ExcelJS.Worksheet): { name: string; ref: string; headers: string[] }[] {
  return ws.getTables().map((t) => {
    const model = (t as unknown as { table: { name: string; tableRef: string; columns: { name: string }[] } }).table;
    return { name: model.name, ref: model.tableRef, headers: model.columns.map((c) => c.name) };
  });
}

const listing: SheetSpec = {
  name: 'Deviations',
  title: 'Visits out of window',
  blocks: [
    { kind: 'paragraph', text: CAUTIONS[0]!, style: 'caution' },
    { kind: 'paragraph', text: 'Listing of early, late and missed visits.' },
    {
      kind: 'table',
      id: 'Listing',
      caption: 'Deviation listing',
      columns: [
        { header: 'Subject', format: 'text', width: 14 },
        { header: 'Visit date', format: 'date' },
        { header: 'Days off', format: 'integer' },
        { header: 'p', format: 'pvalue' },
      ],
      rows: [
        ['=1+1', 45663, -9, 0.00001],
        [1001, 45700, 12, NaN],
        ['+SUM(A1)', null, null, null],
      ],
    },
  ],
};

describe('writeWorkbook', () => {
  it('writes user text as string cells, never formulas: a subject id "=1+1" stays the text "=1+1"', async () => {
    const wb = await load(await writeWorkbook([listing]));
    const ws = wb.getWorksheet('Deviations')!;
    const subject = ws.getCell('A8');
    expect(subject.value).toBe('=1+1');
    expect(subject.type).toBe(ExcelJS.ValueType.String);
    expect(subject.formula).toBeUndefined();
    expect(ws.getCell('A10').type).toBe(ExcelJS.ValueType.String);
    // A number in a text column is written as its text.
    expect(ws.getCell('A9').value).toBe('1001');
  });

  it('puts the title in A1, emphasises cautions and writes each table as a real Excel table with its header row', async () => {
    const wb = await load(await writeWorkbook([listing]));
    const ws = wb.getWorksheet('Deviations')!;
    expect(ws.getCell('A1').value).toBe('Visits out of window');
    expect(ws.getCell('A1').font?.bold).toBe(true);
    expect(ws.getCell('A3').value).toBe(CAUTIONS[0]);
    expect(ws.getCell('A3').font?.bold).toBe(true);
    expect(ws.getCell('A4').value).toBe('Listing of early, late and missed visits.');
    expect(ws.getCell('A4').font?.bold).toBeFalsy();
    expect(ws.getCell('A5').value).toBeNull();
    expect(ws.getCell('A6').value).toBe('Deviation listing');
    expect(ws.getCell('A7').value).toBe('Subject');
    expect(tablesOf(ws)).toEqual([{ name: 'LP_Listing', ref: 'A7:D10', headers: ['Subject', 'Visit date', 'Days off', 'p'] }]);
  });

  it('applies the number-format codes of report/formats.ts and leaves non-finite numbers blank', async () => {
    const wb = await load(await writeWorkbook([listing]));
    const ws = wb.getWorksheet('Deviations')!;
    expect(ws.getCell('A8').numFmt).toBe('@');
    expect(ws.getCell('B8').numFmt).toBe('yyyy-mm-dd');
    // exceljs reads a date-formatted serial back as a Date: 45663 is 2025-01-06 (exact identity, ECMA-376 §18.17.4.1:
    // serial = days since 1899-12-30).
    expect(ws.getCell('B8').value).toEqual(new Date(Date.UTC(2025, 0, 6)));
    expect(ws.getCell('C8').numFmt).toBe('0');
    expect(ws.getCell('D8').numFmt).toBe('[<0.0001]"<0.0001";0.0000');
    expect(ws.getCell('D9').value).toBeNull();
  });

  it('freezes the header of a sheet that is one big table and sets column widths', async () => {
    const wb = await load(await writeWorkbook([listing]));
    const ws = wb.getWorksheet('Deviations')!;
    expect(ws.views[0]).toMatchObject({ state: 'frozen', ySplit: 7 });
    expect(ws.getColumn(1).width).toBe(14);
  });

  it('makes sheet names legal and unique, and table names unique across the workbook', async () => {
    const table = listing.blocks[2]!;
    const sheets: SheetSpec[] = [
      { name: 'Model: arms/time?', title: 'A', blocks: [table] },
      { name: 'model- arms-time-', title: 'B', blocks: [table] },
    ];
    const wb = await load(await writeWorkbook(sheets));
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Model- arms-time-', 'model- arms-time- (2)']);
    expect(tablesOf(wb.worksheets[1]!)[0]!.name).toBe('LP_Listing_2');
  });

  it('writes a table of the numbers of a chart that has no table on its sheet, one row per distinct x', async () => {
    const sheet: SheetSpec = {
      name: 'Trend',
      title: 'Mean over time',
      blocks: [
        {
          kind: 'chart',
          chart: {
            kind: 'line',
            id: 'Means',
            title: 'Observed means',
            xLabel: 'Study day',
            yLabel: 'eGFR',
            series: [
              { name: 'Placebo', x: [1, 85], y: [55, 54], lower: [53, 52], upper: [57, 56] },
              { name: 'Active', x: [1, 169], y: [56, null] },
            ],
          },
        },
      ],
    };
    const wb = await load(await writeWorkbook([sheet]));
    const ws = wb.getWorksheet('Trend')!;
    expect(ws.getCell('A3').value).toBe(CHART_DATA_CAPTION('Observed means'));
    const [t] = tablesOf(ws);
    expect(t!.headers).toEqual(['Study day', 'Placebo', 'Placebo lower', 'Placebo upper', 'Active']);
    const row = (r: number): unknown[] => [1, 2, 3, 4, 5].map((c) => ws.getCell(r, c).value);
    const top = Number(/^A(\d+)/.exec(t!.ref)![1]);
    expect(row(top + 1)).toEqual([1, 55, 53, 57, 56]);
    expect(row(top + 2)).toEqual([85, 54, 52, 56, null]);
    expect(row(top + 3)).toEqual([169, null, null, null, null]);
  });

  it('writes no text in place of a chart drawn from a table of its sheet: the native chart reads that table', async () => {
    const table = listing.blocks[2]!;
    const chart = { kind: 'chart' as const, chart: { kind: 'bar' as const, id: 'C', title: 'Days off', xLabel: 'Subject', yLabel: 'Days', series: [{ name: 'Days off', x: ['=1+1', '1001'], y: [-9, 12] }], sourceTable: 'Listing' } };
    const wb = await load(await writeWorkbook([{ name: 'Two', title: 'T', blocks: [table, chart] }]));
    const ws = wb.getWorksheet('Two')!;
    const texts: unknown[] = [];
    ws.eachRow((row) => texts.push(row.getCell(1).value));
    // Title, caption, header, three rows: nothing else (no note, no second copy of the numbers).
    expect(texts.filter((t) => typeof t === 'string')).toEqual(['T', 'Deviation listing', 'Subject', '=1+1', '1001', '+SUM(A1)']);
    expect(tablesOf(ws)).toHaveLength(1);
  });

  it('gives an empty table one blank row so the file stays valid', async () => {
    const sheet: SheetSpec = {
      name: 'Empty',
      title: 'Nothing due',
      blocks: [{ kind: 'table', id: 'Due', caption: 'Upcoming', columns: [{ header: 'Subject', format: 'text' }], rows: [] }],
    };
    const wb = await load(await writeWorkbook([sheet]));
    expect(tablesOf(wb.getWorksheet('Empty')!)[0]!.ref).toBe('A4:A5');
  });
});

describe('writeWorkbook lays long sentences out to be read without scrolling sideways', () => {
  const long = 'An invented sentence that is much longer than one row of the sheet can show, repeated. '.repeat(6);
  const spec: SheetSpec = {
    name: 'Wrapped',
    title: 'Wrapping',
    blocks: [
      { kind: 'paragraph', text: CAUTIONS[0]!, style: 'caution' },
      { kind: 'paragraph', text: 'Short note.' },
      { kind: 'paragraph', text: long },
      { kind: 'paragraph', text: 'A heading', style: 'heading' },
      {
        kind: 'table',
        id: 'Eight',
        caption: 'Eight columns',
        columns: Array.from({ length: 8 }, (_, j) => ({ header: `Column ${j + 1}`, format: 'integer' as const, width: 10 })),
        rows: [[1, 2, 3, 4, 5, 6, 7, 8]],
      },
    ],
  };

  it('merges each paragraph across the widest table and wraps it; headings stay single cells', async () => {
    const ws = (await load(await writeWorkbook([spec]))).getWorksheet('Wrapped')!;
    for (const row of [3, 4, 5]) {
      expect(ws.getCell(row, 1).alignment).toMatchObject({ wrapText: true, vertical: 'top' });
      expect(ws.getCell(row, 8).isMerged, `row ${row}`).toBe(true);
      expect(ws.getCell(row, 9).isMerged, `row ${row}`).toBe(false);
    }
    const headingRow = 7;
    expect(ws.getCell(headingRow, 1).value).toBe('A heading');
    expect(ws.getCell(headingRow, 2).isMerged).toBe(false);
  });

  it('gives a long paragraph a taller row, its lines measured with the font widths across the merged width', async () => {
    const ws = (await load(await writeWorkbook([spec]))).getWorksheet('Wrapped')!;
    // 8 columns of 10 characters, (7 × 10 + 5) × 0.75 = 56.25 points each: 450 points; the shared core function
    // (paragraphHeight.test.ts pins its arithmetic) gives the 522-character text 6 lines of 15 points.
    expect(long.length).toBe(522);
    expect(ws.getRow(5).height).toBe(paragraphHeight(long, 8 * columnWidthPoints(10)));
    expect(ws.getRow(5).height).toBe(6 * 15);
    expect(ws.getRow(4).height ?? 15).toBe(15);
    expect(ws.getCell(5, 1).value).toBe(long);
  });
});
