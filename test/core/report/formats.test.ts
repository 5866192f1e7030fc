import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fixedText, significantDigits } from '../../../src/core/report/decimalText';
import { EXCEL_FORMAT_CODES, formatCell, numberFormatFor, SCIENTIFIC_CODE, shownNumber } from '../../../src/core/report/formats';

/** Significant digits of a shown number: its digits without sign, point, exponent and leading zeros. */
function significantOf(text: string): number {
  return text.replace(/E.*$/, '').replace(/[-.]/g, '').replace(/^0+/, '').length;
}
/** Decimals of a shown fixed number or of a fixed-decimal code ("0.000" → 3, "12" → 0). */
function decimalsOf(text: string): number {
  const dot = text.indexOf('.');
  return dot < 0 ? 0 : text.length - dot - 1;
}

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
      significant: 'General',
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
    expect(formatCell(Infinity, 'significant')).toBe('');
    expect(formatCell('=1+1', 'text')).toBe('=1+1');
    expect(formatCell('n/a', 'significant')).toBe('n/a');
  });

  // Hand-worked decimal arithmetic (exact): 4 significant digits of each value, decimals from its magnitude.
  it('a significant number shows 4 significant digits by magnitude and its cell code shows the same decimals', () => {
    expect(formatCell(0.00062, 'significant')).toBe('0.0006200'); // not "0.0006" as 4 fixed decimals would show
    expect(numberFormatFor(0.00062, 'significant')).toBe('0.0000000');
    expect(formatCell(1234.5678, 'significant')).toBe('1235');
    expect(numberFormatFor(1234.5678, 'significant')).toBe('0');
    expect(formatCell(-0.0000123, 'significant')).toBe('-0.00001230');
    expect(numberFormatFor(-0.0000123, 'significant')).toBe('0.00000000');
    expect(formatCell(0, 'significant')).toBe('0');
    expect(formatCell(-0, 'significant')).toBe('0');
    expect(numberFormatFor(0, 'significant')).toBe('0');
    // The carry moves the point: 9.9996 → 10.00, 0.99995 → 1.000 (still 4 digits).
    expect(formatCell(9.9996, 'significant')).toBe('10.00');
    expect(numberFormatFor(9.9996, 'significant')).toBe('0.00');
    expect(formatCell(0.99995, 'significant')).toBe('1.000');
    // Whole numbers keep every digit (no rounding to tens, which a decimal code cannot show).
    expect(formatCell(123456.7, 'significant')).toBe('123457');
    // Outside trial magnitudes only, scientific with 4 significant digits and a two-digit exponent.
    expect(formatCell(1.23e-7, 'significant')).toBe('1.230E-07');
    expect(formatCell(-2.5e20, 'significant')).toBe('-2.500E+20');
    expect(numberFormatFor(1.23e-7, 'significant')).toBe(SCIENTIFIC_CODE);
    expect(formatCell(0.000001, 'significant')).toBe('0.000001000');
    // Other formats keep their one code; blanks and text in a significant column get the column's code.
    expect(numberFormatFor(5, 'decimal1')).toBe('0.0');
    expect(numberFormatFor(null, 'significant')).toBe('General');
    expect(shownNumber(4.0512)).toBe('4.051');
    expect(shownNumber(NaN)).toBe('n/a');
  });

  // 1.005 is stored as 1.00499999999999989… (IEEE 754 double, exact identity); read to 15 digits it is 1.005 and a
  // spreadsheet shows 1.01 (half away from zero on the shown decimal value, from memory), while toFixed(2) gives 1.00.
  it('rounds half away from zero on the 15-digit decimal value, as a spreadsheet shows it', () => {
    expect((1.005).toFixed(2)).toBe('1.00');
    expect(fixedText(1.005, 2)).toBe('1.01');
    expect(fixedText(2.5, 0)).toBe('3');
    expect(fixedText(-2.5, 0)).toBe('-3');
    expect(fixedText(0.0745 * 100, 1)).toBe('7.5');
    expect(fixedText(0.5, 0)).toBe('1');
    expect(fixedText(0.4, 0)).toBe('0');
    expect(fixedText(-0.4, 0)).toBe('0');
    expect(fixedText(99.96, 1)).toBe('100.0');
    expect(fixedText(1e20, 0)).toBe('100000000000000000000');
    expect(significantDigits(-0.000000123456, 4)).toEqual({ digits: '1235', exponent: -7 });
  });

  // Tolerance: the text is the value rounded to its last shown place, so it is within half a unit there; reading
  // the value to 15 significant digits first adds at most half a unit in the 15th digit (|x| × 1e-14 covers both).
  it('property: a significant number keeps max(4, whole digits) significant digits and is within half a unit of its last shown place', () => {
    const ordinary = fc
      .tuple(fc.double({ min: 1, max: 10, noNaN: true }), fc.integer({ min: -6, max: 14 }), fc.boolean())
      .map(([m, e, neg]) => (neg ? -1 : 1) * m * 10 ** e)
      .filter((x) => Math.abs(x) >= 1e-6 && Math.abs(x) < 9.9995e14);
    fc.assert(
      fc.property(ordinary, (x) => {
        const text = formatCell(x, 'significant');
        expect(text).toMatch(/^-?\d+(\.\d+)?$/);
        const decimals = decimalsOf(text);
        const whole = text.replace(/^-/, '').split('.')[0]!;
        expect(significantOf(text)).toBe(whole === '0' ? 4 : Math.max(4, whole.length));
        expect(Math.abs(Number(text) - x)).toBeLessThanOrEqual(0.5 * 10 ** -decimals + Math.abs(x) * 1e-14);
        expect(decimalsOf(numberFormatFor(x, 'significant'))).toBe(decimals);
        expect(text.startsWith('-')).toBe(x < 0);
      }),
      { numRuns: 2000 },
    );
  });

  it('property: tiny and huge numbers show 4 significant digits in scientific form, within half a unit of the 4th digit', () => {
    const extreme = fc
      .tuple(fc.double({ min: 1, max: 10, noNaN: true }), fc.oneof(fc.integer({ min: -300, max: -7 }), fc.integer({ min: 15, max: 300 })), fc.boolean())
      .map(([m, e, neg]) => (neg ? -1 : 1) * m * 10 ** e)
      .filter((x) => Number.isFinite(x) && x !== 0 && (Math.abs(x) < 9.999e-7 || Math.abs(x) >= 1e15)); // 9.9995e-7 rounds up to 1.000e-6, fixed
    fc.assert(
      fc.property(extreme, (x) => {
        const text = formatCell(x, 'significant');
        const m = /^(-?)(\d)\.(\d{3})E([-+])(\d{2,3})$/.exec(text);
        expect(m).not.toBeNull();
        const exponent = Number(`${m![4]}${m![5]}`);
        expect(Math.abs(Number(text) - x)).toBeLessThanOrEqual(0.5 * 10 ** (exponent - 3) * (1 + 1e-9) + Math.abs(x) * 1e-14);
        expect(numberFormatFor(x, 'significant')).toBe(SCIENTIFIC_CODE);
      }),
      { numRuns: 1000 },
    );
  });

  it('property: fixedText has the asked decimals and is within half a unit of the last place', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), fc.integer({ min: 0, max: 8 }), (x, d) => {
        const text = fixedText(x, d);
        expect(decimalsOf(text)).toBe(d);
        expect(Math.abs(Number(text) - x)).toBeLessThanOrEqual(0.5 * 10 ** -d + Math.abs(x) * 1e-14);
        expect(text).not.toMatch(/^-0(\.0*)?$/);
      }),
      { numRuns: 2000 },
    );
  });
});
