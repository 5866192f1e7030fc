import { describe, expect, it } from 'vitest';
import { readCsvText } from '../../src/files/readCsv';
import { readXlsxBuffer } from '../../src/files/readXlsx';
import { writeWorkbook } from '../../src/files/writeWorkbook';
import { readTable } from '../../src/core/intake';

const CSV = '\uFEFFUSUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL\r\n' +
  'K-01,Site 01,Placebo,Baseline,2025-01-06,2025-01-06,55.5\r\n' +
  'K-01,Site 01,Placebo,Week 12,2025-03-31,2025-01-06,-1.25e1\r\n' +
  '007,Site 03,Active,Baseline,2025-02-30,2025-01-10,pending\r\n';

describe('CSV → cells → intake', () => {
  it('reads CSV text as cells and intake (numericText accept) gives typed columns with cell addresses', () => {
    const cells = readCsvText(CSV);
    const read = readTable(cells, { sheet: 'visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded', numericText: 'accept' });
    if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('; '));
    const t = read.table;
    expect(t.headers).toEqual(['USUBJID', 'SITEID', 'TRT01P', 'AVISIT', 'ADT', 'RANDDT', 'AVAL']);
    // The subject "007" stays text with its leading zeros: CSV fields are never turned into numbers.
    expect(t.subjectIds).toEqual(['K-01', '007']);
    // 2025-01-06 is day number 45663 (exact identity: Date.UTC days since 1970-01-01 + 25569, ECMA-376 §18.17.4.1).
    const jan6 = Date.UTC(2025, 0, 6) / 86_400_000 + 25569;
    expect(t.date[0]).toBe(jan6);
    expect(t.date[1]).toBe(jan6 + 84);
    expect(Number.isNaN(t.date[2]!)).toBe(true);
    // Plain decimal text, including an exponent, is taken as a number when numericText is 'accept'.
    expect(Array.from(t.value.slice(0, 2))).toEqual([55.5, -12.5]);
    expect(read.issues.map((i) => [i.cell, i.use])).toEqual(
      expect.arrayContaining([
        ['visits!E4', 'timing'],
        ['visits!G4', 'model'],
      ]),
    );
  });
});

describe('SheetSpec → .xlsx → cells', () => {
  it('reads back what writeWorkbook wrote: text as text, numbers and date serials unchanged', async () => {
    const bytes = await writeWorkbook([
      {
        name: 'Listing',
        title: 'Listing',
        blocks: [
          {
            kind: 'table',
            id: 'Rows',
            caption: '',
            columns: [
              { header: 'Subject', format: 'text' },
              { header: 'Date', format: 'date' },
              { header: 'Value', format: 'decimal2' },
            ],
            rows: [
              ['=1+1', 45663, 55.125],
              ['007', 45747, -0.5],
            ],
          },
        ],
      },
    ]);
    const read = await readXlsxBuffer(bytes);
    // Exact identity: a date-formatted serial read back through exceljs's Date and our conversion is the same serial.
    expect(read.cells[0]![0]).toBe('Listing');
    expect(read.cells.slice(2)).toEqual([
      ['Subject', 'Date', 'Value'],
      ['=1+1', 45663, 55.125],
      ['007', 45747, -0.5],
    ]);
    expect(read.topLeft).toBe('A1');
  });
});
