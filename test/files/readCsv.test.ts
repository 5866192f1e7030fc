import { describe, expect, it } from 'vitest';
import { readCsvText } from '../../src/files/readCsv';
import { FileFormatError } from '../../src/files/errors';

describe('readCsvText', () => {
  it('keeps every field as text exactly as written, with no number or date guessing', () => {
    expect(readCsvText('id,day,value\n007,2025-01-06,1e3\n')).toEqual([
      ['id', 'day', 'value'],
      ['007', '2025-01-06', '1e3'],
    ]);
  });

  it('strips a UTF-8 byte-order mark from the first header', () => {
    expect(readCsvText('\uFEFFUSUBJID,AVAL\r\nA,1\r\n')).toEqual([
      ['USUBJID', 'AVAL'],
      ['A', '1'],
    ]);
  });

  it('reads quoted fields with commas, doubled quotes and line breaks (RFC 4180 §2)', () => {
    expect(readCsvText('a,b\n"x, y","say ""hi"""\n"two\nlines",z\n')).toEqual([
      ['a', 'b'],
      ['x, y', 'say "hi"'],
      ['two\nlines', 'z'],
    ]);
  });

  it('keeps an interior blank line as a row of blanks so row numbers match the file, and drops trailing blank lines', () => {
    expect(readCsvText('a,b\n1,2\n\n3,4\n\n\n')).toEqual([
      ['a', 'b'],
      ['1', '2'],
      ['', ''],
      ['3', '4'],
    ]);
  });

  it('pads short rows with blanks to the widest row', () => {
    expect(readCsvText('a,b,c\n1\n')).toEqual([
      ['a', 'b', 'c'],
      ['1', '', ''],
    ]);
  });

  it('keeps a formula-looking subject id as text', () => {
    expect(readCsvText('id\n=1+1\n')[1]).toEqual(['=1+1']);
  });

  it('reads semicolon-separated files', () => {
    expect(readCsvText('id;value\nA;3,5\n')).toEqual([
      ['id', 'value'],
      ['A', '3,5'],
    ]);
  });

  it('throws a FileFormatError for a quoted field that never closes', () => {
    expect(() => readCsvText('a,b\n"open,1\n2,3\n')).toThrow(FileFormatError);
    // Regression: the message said "data row 2" for the first data row; it now names the worksheet cell (A2).
    expect(() => readCsvText('a,b\n"open,1\n2,3\n')).toThrow(/quoted field that never closes at cell A2: /);
    expect(() => readCsvText('a,b\n1,2\n3,"x\n')).toThrow(/never closes at cell B3: /);
  });
});
