/** The one-line caution's link to the summary sheet in the .xlsx writer: an internal <hyperlink> with a location. */
import JSZip from 'jszip';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { CAUTIONS, cautionLine } from '../../src/core/report/cautions';
import type { SheetSpec } from '../../src/core/report/types';
import { writeWorkbook } from '../../src/files/writeWorkbook';

// Invented sheets: a summary with the full cautions and a listing that links to it.
const summary: SheetSpec = { name: 'Summary', title: 'Summary', blocks: CAUTIONS.map((text) => ({ kind: 'paragraph', text, style: 'caution' })) };
const listing: SheetSpec = {
  name: 'Listing',
  title: 'Invented listing',
  blocks: [cautionLine('unblinded'), { kind: 'table', id: 'List', caption: 'Rows', columns: [{ header: 'Participant', format: 'text' }], rows: [['=1+1'], ['P-2']] }],
};

async function sheetXml(bytes: Uint8Array, n: number): Promise<string> {
  const zip = await JSZip.loadAsync(bytes);
  return (await zip.file(`xl/worksheets/sheet${n}.xml`)?.async('string')) ?? '';
}

describe('internal links in the written workbook', () => {
  it("writes the one-line caution on row 2 as a link to the summary sheet's A1, with the first table's header on row 4", async () => {
    const bytes = await writeWorkbook([summary, listing]);
    const xml = await sheetXml(bytes, 2);
    // ECMA-376 Part 1, §18.3.1.47: an in-workbook link has a location and no relationship id.
    expect(xml).toMatch(/<hyperlinks><hyperlink ref="A2" location="'Summary'!A1" display="[^"]+"\/><\/hyperlinks><pageMargins/);
    expect(xml).not.toMatch(/<hyperlink [^>]*r:id=/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
    const ws = wb.getWorksheet('Listing')!;
    expect(ws.getCell('A2').text).toBe(cautionLine('unblinded').text);
    expect(ws.getCell('A3').value).toBe('Rows');
    expect(ws.getCell('A4').value).toBe('Participant');
    expect(ws.getCell('A5').value).toBe('=1+1'); // text stays text
    expect(ws.getCell('A5').type).toBe(ExcelJS.ValueType.String);
  });

  it('follows the name the summary sheet got, and leaves plain text when there is no summary sheet', async () => {
    const renamed = await writeWorkbook([{ ...summary, name: 'summary', title: 'Another sheet' }, summary, listing]);
    // "summary" and "Summary" clash ignoring case, so the summary sheet is written as "Summary (2)" and the link follows.
    expect(await sheetXml(renamed, 3)).toContain(`location="'Summary (2)'!A1"`);
    const alone = await writeWorkbook([listing]);
    expect(await sheetXml(alone, 1)).not.toContain('<hyperlink');
  });

  it("escapes the location of a sheet whose name holds an apostrophe and an ampersand: 'Tom''s & co'!A1", async () => {
    const bytes = await writeWorkbook([{ ...summary, name: "Tom's & co" }, { ...listing, blocks: [{ ...cautionLine('unblinded'), link: { sheet: "Tom's & co", cell: 'A1' } }] }]);
    // The sheet name quoted, its apostrophe doubled (a formula reference), then XML-escaped inside the attribute.
    expect(await sheetXml(bytes, 2)).toContain('location="\'Tom\'\'s &amp; co\'!A1"');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(bytes as unknown as Parameters<typeof wb.xlsx.load>[0]);
    expect(wb.getWorksheet("Tom's & co")).toBeDefined();
  });
});
