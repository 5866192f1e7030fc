import { describe, expect, it } from 'vitest';
import ExcelJS from 'exceljs';
import JSZip from 'jszip';
import { runInNewContext } from 'node:vm';
import { readXlsxBuffer } from '../../src/files/readXlsx';
import { FileFormatError } from '../../src/files/errors';

/** Exact identity (ECMA-376 Part 1, §18.17.4.1): 1900-system serial = days since 1970-01-01 + 25569. */
const serial1900 = (y: number, m: number, d: number): number => Date.UTC(y, m - 1, d) / 86_400_000 + 25569;

async function workbook(build: (wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  build(wb);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe('readXlsxBuffer', () => {
  it('reads numbers, text, booleans, blanks, dates, cached formula results, rich text and error values', async () => {
    const buf = await workbook((wb) => {
      const ws = wb.addWorksheet('Visits');
      ws.addRow(['id', 'date', 'value', 'flag', 'note']);
      ws.addRow(['A-1', new Date(Date.UTC(2025, 0, 6)), 52.5, true, { richText: [{ text: 'bo', font: { bold: true } }, { text: 'ld' }] }]);
      ws.addRow([{ formula: 'CONCAT("B","2")', result: 'B2' }, null, { error: '#N/A' }, false, { formula: '1+1', result: 2 }]);
    });
    const read = await readXlsxBuffer(buf);
    expect(read.sheet).toBe('Visits');
    expect(read.topLeft).toBe('A1');
    expect(read.dateSystem).toBe(1900);
    expect(read.cells).toEqual([
      ['id', 'date', 'value', 'flag', 'note'],
      ['A-1', serial1900(2025, 1, 6), 52.5, true, 'bold'],
      ['B2', null, '#N/A', false, 2],
    ]);
  });

  it('starts the grid at the first used cell and reports its address', async () => {
    const buf = await workbook((wb) => {
      const ws = wb.addWorksheet('S');
      ws.getCell('C3').value = 'id';
      ws.getCell('D3').value = 'v';
      ws.getCell('C4').value = 'x';
    });
    const read = await readXlsxBuffer(buf);
    expect(read.topLeft).toBe('C3');
    expect(read.cells).toEqual([
      ['id', 'v'],
      ['x', null],
    ]);
  });

  it('honours the 1904 date system: dates come back as 1904 serials and dateSystem says 1904', async () => {
    const buf = await workbook((wb) => {
      wb.properties.date1904 = true;
      const ws = wb.addWorksheet('S');
      ws.addRow(['date']);
      ws.addRow([new Date(Date.UTC(2025, 0, 6))]);
    });
    const read = await readXlsxBuffer(buf);
    expect(read.dateSystem).toBe(1904);
    // Exact identity (ECMA-376 Part 1, §18.17.4.1): 1904 serial = 1900 serial − 1462.
    expect(read.cells[1]).toEqual([serial1900(2025, 1, 6) - 1462]);
  });

  /** Rewrites the date1904 attribute of xl/workbook.xml, as another program might spell it. */
  async function respellDate1904(buf: Uint8Array, spelling: string): Promise<Uint8Array> {
    const zip = await JSZip.loadAsync(buf);
    const xml = await zip.file('xl/workbook.xml')!.async('string');
    expect(xml).toMatch(/date1904="1"/); // the writer did put a flag there to respell
    const changed = xml.replace(/date1904="1"/, `date1904="${spelling}"`);
    zip.file('xl/workbook.xml', changed);
    return zip.generateAsync({ type: 'uint8array' });
  }

  it('recognises every legal xsd:boolean spelling of the 1904 flag, not only "1" (regression: "true" read as 1900)', async () => {
    const built = await workbook((wb) => {
      wb.properties.date1904 = true;
      const ws = wb.addWorksheet('S');
      ws.addRow(['date', 'plain']);
      ws.addRow([new Date(Date.UTC(2025, 0, 6)), 7]);
    });
    // W3C XML Schema Part 2, boolean: the lexical forms are true, false, 1 and 0 (from memory); ECMA-376 Part 1
    // types workbookPr@date1904 as xsd:boolean. The stored serial must come back unchanged in every case.
    const stored = serial1900(2025, 1, 6) - 1462; // exact identity (ECMA-376 Part 1, §18.17.4.1): 1904 = 1900 − 1462
    for (const [spelling, system] of [['true', 1904], [' true ', 1904], ['1', 1904], ['false', 1900], ['0', 1900]] as const) {
      const read = await readXlsxBuffer(await respellDate1904(built, spelling));
      expect(read.dateSystem, spelling).toBe(system);
      expect(read.cells[1], spelling).toEqual([stored, 7]);
    }
  });

  it('reads a workbook handed over as a byte view into a larger buffer, or as an ArrayBuffer made in another realm (regression: the zip check used instanceof)', async () => {
    const bytes = await workbook((wb) => wb.addWorksheet('S').addRow(['id']));
    const padded = new Uint8Array(bytes.length + 8);
    padded.set(bytes, 8);
    expect((await readXlsxBuffer(new Uint8Array(padded.buffer, 8, bytes.length))).cells).toEqual([['id']]);
    const foreign = runInNewContext(`new ArrayBuffer(${bytes.length})`) as ArrayBuffer;
    expect(foreign instanceof ArrayBuffer).toBe(false); // it really is from another realm
    new Uint8Array(foreign).set(bytes);
    expect((await readXlsxBuffer(foreign)).cells).toEqual([['id']]);
  });

  it('picks a sheet by name and lists the sheets when the name does not exist', async () => {
    const buf = await workbook((wb) => {
      wb.addWorksheet('First').addRow(['a']);
      wb.addWorksheet('Second').addRow(['b']);
    });
    expect((await readXlsxBuffer(buf, 'Second')).cells).toEqual([['b']]);
    await expect(readXlsxBuffer(buf, 'Third')).rejects.toThrow(/no sheet named "Third"; its sheets are: First, Second/);
  });

  it('throws a FileFormatError for bytes that are not a workbook and for an empty sheet', async () => {
    await expect(readXlsxBuffer(new TextEncoder().encode('id,value\n1,2\n'))).rejects.toThrow(FileFormatError);
    const empty = await workbook((wb) => wb.addWorksheet('Empty'));
    await expect(readXlsxBuffer(empty)).rejects.toThrow(/is empty/);
  });
});
