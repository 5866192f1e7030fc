import { describe, expect, it } from 'vitest';
import { cellText, isBlankCell, isErrorCell, parsePlainDecimal, readTextCell } from '../../../src/core/intake';

describe('cell reading', () => {
  it('isBlankCell treats null, undefined, "" and spaces as blank, and 0 and FALSE as not blank', () => {
    for (const c of [null, undefined, '', '   ', '\t']) expect(isBlankCell(c)).toBe(true);
    for (const c of [0, false, '0', NaN]) expect(isBlankCell(c)).toBe(false);
  });

  it('isErrorCell knows the spreadsheet error values, ignoring case and surrounding spaces, and nothing else', () => {
    for (const c of ['#N/A', ' #n/a ', '#DIV/0!', '#GETTING_DATA', '#UNKNOWN!']) expect(isErrorCell(c)).toBe(true);
    for (const c of ['#', '#N/A!', 'N/A', '#1', '#VALUE', 0, null, true]) expect(isErrorCell(c)).toBe(false);
  });

  it('cellText writes numbers with String(n), so -0 gives "0", and booleans as TRUE/FALSE', () => {
    expect([cellText(-0), cellText(1e21), cellText(0.1), cellText(false), cellText(undefined)]).toEqual(['0', '1e+21', '0.1', 'FALSE', '']);
  });

  it('readTextCell gives trimmed text, "" for blank and null for an error value', () => {
    expect([readTextCell(' K-1 '), readTextCell(null), readTextCell('  '), readTextCell(' #REF! '), readTextCell(7)]).toEqual(['K-1', '', '', null, '7']);
  });

  it('parsePlainDecimal takes sign, digits, fraction and exponent only: no thousands separators, hex, words or inner spaces', () => {
    expect([parsePlainDecimal('61.5'), parsePlainDecimal(' -1.5e3 '), parsePlainDecimal('+.5'), parsePlainDecimal('7.'), parsePlainDecimal('1E-2')]).toEqual([
      61.5, -1500, 0.5, 7, 0.01,
    ]);
    for (const t of ['1,000', '0x10', 'Infinity', 'NaN', '1 000', '', '.', '-', '1e', '5%', '=1+1']) expect(parsePlainDecimal(t), t).toBeNaN();
  });
});
