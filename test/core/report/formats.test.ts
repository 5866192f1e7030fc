import { describe, expect, it } from 'vitest';
import { EXCEL_FORMAT_CODES, formatCell } from '../../../src/core/report/formats';

describe('formats', () => {
  it('maps every number format to a spreadsheet format code (ECMA-376 Part 1 numFmt syntax, §18.8.30–31 from memory)', () => {
    expect(EXCEL_FORMAT_CODES).toEqual({
      text: '@',
      integer: '0',
      decimal1: '0.0',
      decimal2: '0.00',
      decimal3: '0.000',
      decimal4: '0.0000',
      decimal6: '0.000000',
      percent1: '0.0%',
      pvalue: '[<0.0001]"<0.0001";0.0000',
      date: 'yyyy-mm-dd',
    });
  });

  it('formatCell shows what the format code shows: percent, p-value floor, date, decimals, blanks', () => {
    expect(formatCell(0.1234, 'percent1')).toBe('12.3%');
    expect(formatCell(0.00003, 'pvalue')).toBe('<0.0001');
    expect(formatCell(0.0001, 'pvalue')).toBe('0.0001');
    expect(formatCell(0.04567, 'pvalue')).toBe('0.0457');
    // 45000 is 2023-03-15 in the 1900 date system (ECMA-376 Part 1 §18.17.4; checked in studyDay.test.ts)
    expect(formatCell(45000, 'date')).toBe('2023-03-15');
    expect(formatCell(-2, 'integer')).toBe('-2');
    expect(formatCell(-0.0004, 'decimal2')).toBe('0.00');
    expect(formatCell(3.14159, 'decimal3')).toBe('3.142');
    expect(formatCell(null, 'decimal1')).toBe('');
    expect(formatCell(NaN, 'decimal1')).toBe('');
    expect(formatCell('=1+1', 'text')).toBe('=1+1');
  });
});
