import { describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import { footer, keepWholeBreaks, printStampOf, LANDSCAPE_FROM } from '../../src/files/printSetup';
import { writeWorkbook } from '../../src/files/writeWorkbook';
import type { SheetSpec, TableBlock } from '../../src/core/report/types';

async function load(bytes: Uint8Array): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
  return wb;
}

const table = (id: string, widths: number[], rows: number): TableBlock => ({
  kind: 'table',
  id,
  caption: id,
  columns: widths.map((w, j) => ({ header: `Column ${j}`, format: 'integer', width: w })),
  rows: Array.from({ length: rows }, (_, i) => widths.map(() => i)),
});

describe('print settings of every sheet', () => {
  it('footer: sheet name left, page of pages centre, run date and the first 12 characters of the fingerprint right', () => {
    // Codes &L &C &R &A &P &N and && for a literal ampersand: ECMA-376 Part 1 §18.3.1.36 (headerFooter).
    expect(footer({ runAt: '2026-12-02T09:30:00.000Z', fingerprint: '7e080844ee8f0123456789abcdef' })).toBe('&L&A&CPage &P of &N&RRun 2026-12-02, input 7e080844ee8f');
    expect(footer({})).toBe('&L&A&CPage &P of &N');
    expect(footer({ runAt: 'A&B' })).toBe('&L&A&CPage &P of &N&RRun A&&B');
  });

  it('reads the stamp from the results JSON and leaves out what is missing', () => {
    expect(printStampOf({ settings: { runAt: '2026-12-02T09:30:00Z' }, input: { fingerprint: 'ab' } })).toEqual({ runAt: '2026-12-02T09:30:00Z', fingerprint: 'ab' });
    expect(printStampOf({ settings: { runAt: 5 } })).toEqual({});
  });

  it('prints one page wide, landscape only for a wide table, with the only table header repeated and the footer', async () => {
    const wide: SheetSpec = { name: 'Wide', title: 'W', blocks: [table('Listing', Array<number>(10).fill(14), 3)] };
    const narrow: SheetSpec = { name: 'Narrow', title: 'N', blocks: [table('Small', [14, 12, 12], 3), table('Other', [12], 1)] };
    expect(10 * 14).toBeGreaterThan(LANDSCAPE_FROM);
    const wb = await load(await writeWorkbook([wide, narrow], { runAt: '2026-12-02T09:30:00Z', fingerprint: '0123456789abcdef' }));
    const w = wb.getWorksheet('Wide')!;
    expect(w.pageSetup).toMatchObject({ orientation: 'landscape', fitToPage: true, fitToWidth: 1, fitToHeight: 0, printTitlesRow: '4:4' });
    expect(w.headerFooter.oddFooter).toBe('&L&A&CPage &P of &N&RRun 2026-12-02, input 0123456789ab');
    const n = wb.getWorksheet('Narrow')!;
    expect(n.pageSetup).toMatchObject({ orientation: 'portrait', fitToWidth: 1, fitToHeight: 0 });
    // Two tables: no single header to repeat.
    expect(n.pageSetup.printTitlesRow).toBeUndefined();
  });

  it('keepWholeBreaks starts a block that would cross the foot of a page on the next page', () => {
    const h = (): number => 15;
    // Exact arithmetic: the page holds 0.95 × 300 = 285 points = 19 rows; rows 15–24 would end at 360 points.
    expect(keepWholeBreaks(h, [{ row: 15, rows: 10 }], 300, 1)).toEqual([14]);
    // At half scale the page holds 570 points = 38 rows: no break.
    expect(keepWholeBreaks(h, [{ row: 15, rows: 10 }], 300, 0.5)).toEqual([]);
    // A block taller than a page is left where it is; the walk goes on page by page (19 rows: pages start at rows
    // 20 and 39), so a block at rows 45–54 fits the third page and one at rows 52–61 does not.
    expect(keepWholeBreaks(h, [{ row: 2, rows: 40 }, { row: 45, rows: 10 }], 300, 1)).toEqual([]);
    expect(keepWholeBreaks(h, [{ row: 2, rows: 40 }, { row: 52, rows: 10 }], 300, 1)).toEqual([51]);
    // Two blocks: the second break is measured from the first one's page.
    expect(keepWholeBreaks(h, [{ row: 15, rows: 10 }, { row: 30, rows: 10 }], 300, 1)).toEqual([14, 29]);
  });
});
