import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  columnIndex,
  columnLetters,
  formatAddress,
  IntakeUsageError,
  parseCell,
  sheetNeedsQuotes,
} from '../../../src/core/intake';

describe('column letters', () => {
  // Exact identity of bijective base-26 numbering: A..Z are 1..26, AA follows Z, and the 16,384th column is XFD
  // (common practice: the column limit of current spreadsheets).
  it.each([
    ['A', 0],
    ['Z', 25],
    ['AA', 26],
    ['AZ', 51],
    ['BA', 52],
    ['ZZ', 701],
    ['AAA', 702],
    ['XFD', 16383],
  ])('columnLetters and columnIndex map %s to index %i and back', (letters, index) => {
    expect(columnLetters(index)).toBe(letters);
    expect(columnIndex(letters)).toBe(index);
    expect(columnIndex(letters.toLowerCase())).toBe(index);
  });

  it('columnIndex inverts columnLetters for every column A..XFD (exact identity)', () => {
    fc.assert(fc.property(fc.integer({ min: 0, max: 16383 }), (i) => columnIndex(columnLetters(i)) === i));
  });

  it('columnLetters and columnIndex throw a typed error outside A..XFD', () => {
    expect(() => columnLetters(16384)).toThrow(IntakeUsageError);
    expect(() => columnLetters(-1)).toThrow(IntakeUsageError);
    expect(() => columnLetters(1.5)).toThrow(IntakeUsageError);
    expect(() => columnIndex('XFE')).toThrow(IntakeUsageError);
    expect(() => columnIndex('A1')).toThrow(/columnIndex: column letters must be 1 to 3 letters \(got "A1"\)/);
  });
});

describe('parseCell', () => {
  it('parseCell reads a 1-based row and a 0-based column, ignoring $ markers and case', () => {
    expect(parseCell('B3')).toEqual({ row: 3, col: 1 });
    expect(parseCell('$B$3')).toEqual({ row: 3, col: 1 });
    expect(parseCell('xfd1048576')).toEqual({ row: 1048576, col: 16383 });
  });

  it('parseCell throws a typed error for text that is not an address', () => {
    for (const bad of ['', 'B0', '3B', 'B', 'B1048577', 'Sheet!B3', 'B-3']) {
      expect(() => parseCell(bad)).toThrow(IntakeUsageError);
    }
  });
});

describe('formatAddress', () => {
  it('formatAddress writes Sheet!C17 and leaves plain sheet names unquoted', () => {
    expect(formatAddress('Visits', 17, 2)).toBe('Visits!C17');
    expect(formatAddress('Data_2025', 1, 0)).toBe('Data_2025!A1');
    expect(formatAddress('', 17, 2)).toBe('C17');
  });

  it('formatAddress quotes a sheet name with a space and doubles an embedded quote', () => {
    expect(formatAddress('My Sheet', 17, 2)).toBe("'My Sheet'!C17");
    expect(formatAddress("Bob's visits", 2, 27)).toBe("'Bob''s visits'!AB2");
  });

  it('formatAddress quotes sheet names that start with a digit or read as a cell reference or constant', () => {
    for (const name of ['2025', '1st visits', 'A1', 'XFD12', 'R1C1', 'R', 'c', 'TRUE', 'Visits-2', 'a(b)']) {
      expect(sheetNeedsQuotes(name), name).toBe(true);
    }
    for (const name of ['Visits', 'eGFR', 'Sheet_1', 'Résumé', 'Visits.v2']) {
      expect(sheetNeedsQuotes(name), name).toBe(false);
    }
  });

  it('formatAddress throws a typed error for a row outside 1..1,048,576', () => {
    expect(() => formatAddress('Visits', 0, 0)).toThrow(IntakeUsageError);
    expect(() => formatAddress('Visits', 1048577, 0)).toThrow(IntakeUsageError);
  });
});
