/** The .xlsx file stores each 'significant' cell's own number-format code, so a spreadsheet shows the page's text. */
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { describe, expect, it } from 'vitest';
import { formatCell, numberFormatFor } from '../../src/core/report/formats';
import type { SheetSpec } from '../../src/core/report/types';
import { writeWorkbook } from '../../src/files/writeWorkbook';

// Invented numbers at the magnitudes of the brief: a rate per day, a count-sized mean, a tiny negative, zero.
const VALUES = [0.00062, 1234.5678, -0.0000123, 0, 0.00071, null];

const SPEC: SheetSpec = {
  name: 'Numbers',
  title: 'Numbers by magnitude (invented)',
  blocks: [
    {
      kind: 'table',
      id: 'Rates',
      caption: 'Estimates',
      columns: [
        { header: 'Term', format: 'text' },
        { header: 'Estimate', format: 'significant' },
        { header: 'Df', format: 'decimal1' },
      ],
      rows: VALUES.map((v, i) => [`Term ${i + 1}`, v, 10.25]),
    },
  ],
};

describe('significant cells in the .xlsx file', () => {
  it('stores per cell the code numberFormatFor gives, one style per distinct code', async () => {
    const bytes = await writeWorkbook([SPEC]);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
    const ws = wb.getWorksheet('Numbers')!;
    const header = 4; // title, blank, caption, header (writeWorkbook's layout)
    expect(ws.getCell(header, 2).value).toBe('Estimate');
    const codes = VALUES.map((_, i) => ws.getCell(header + 1 + i, 2).numFmt);
    // A blank cell gets General, the default; the streaming writer stores it as an explicit cell format, which exceljs
    // reads back as the code "General".
    expect(codes).toEqual(['0.0000000', '0', '0.00000000', '0', '0.0000000', 'General']);
    VALUES.slice(0, 5).forEach((v, i) => expect(codes[i]).toBe(numberFormatFor(v, 'significant')));
    expect(numberFormatFor(null, 'significant')).toBe('General');
    // The value stays the full double; only the shown digits follow the code.
    expect(ws.getCell(header + 1, 2).value).toBe(0.00062);
    expect(ws.getCell(header + 1, 3).numFmt).toBe('0.0');
    // Equal codes share one entry of the style sheet (ECMA-376 Part 1 §18.8.30 numFmt): 0.0000000, 0.00000000 and 0.0
    // are custom codes, each written once; "0" and General are built in (ids 1 and 0).
    const styles = await (await JSZip.loadAsync(bytes)).file('xl/styles.xml')!.async('string');
    const custom = [...styles.matchAll(/<numFmt [^>]*formatCode="([^"]*)"/g)].map((m) => m[1]);
    for (const code of ['0.0000000', '0.00000000', '0.0']) expect(custom.filter((c) => c === code)).toHaveLength(1);
  });

  it('the text of each cell under its code is the text the page and the pane show', () => {
    expect(VALUES.map((v) => formatCell(v, 'significant'))).toEqual(['0.0006200', '1235', '-0.00001230', '0', '0.0007100', '']);
  });
});
