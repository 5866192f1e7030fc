import { describe, expect, it } from 'vitest';
import { uniqueSheetNames, uniqueTableName } from '../../src/files/sheetNames';
import { uniqueTableName as excelTableName, uniqueSheetName } from '../../src/excel/sheetNames';

// Excel's naming rules are a fact of the trade (common practice): at most 31 characters, none of \ / ? * : [ ], no
// apostrophe at either end, "History" reserved, names compared without regard to case.

describe('uniqueSheetNames', () => {
  it('replaces the characters Excel forbids in sheet names (\\ / ? * : [ ]) and cuts names to 31 characters', () => {
    const [a, b] = uniqueSheetNames(['a/b\\c?d*e:f[g]', 'x'.repeat(40)]);
    expect(a).toBe('a-b-c-d-e-f-g-');
    expect(b).toBe('x'.repeat(31));
  });

  it('makes names unique without regard to case, as Excel compares them, and respects names already taken', () => {
    expect(uniqueSheetNames(['Visit timing', 'visit timing', 'Record'], ['record'])).toEqual([
      'Visit timing',
      'visit timing (2)',
      'Record (2)',
    ]);
  });

  it('keeps a de-duplicated long name within 31 characters', () => {
    const names = uniqueSheetNames(['y'.repeat(31), 'y'.repeat(31)]);
    expect(names[1]).toBe(`${'y'.repeat(27)} (2)`);
    expect(names.every((n) => n.length <= 31)).toBe(true);
  });

  it('never gives a blank name, a name starting with an apostrophe, or the reserved name History', () => {
    expect(uniqueSheetNames(['', "'quoted'", 'History'])).toEqual(['Sheet', 'quoted', 'History sheet']);
  });
});

describe('uniqueTableName', () => {
  it('prefixes ids so no name reads as a cell reference, keeps letters, digits and underscores, and de-duplicates', () => {
    expect(uniqueTableName('ByVisit', [])).toBe('LP_ByVisit');
    expect(uniqueTableName('byvisit', ['LP_ByVisit'])).toBe('LP_byvisit_2');
    expect(uniqueTableName('AB12', [])).toBe('LP_AB12');
    expect(uniqueTableName('R1C1', [])).toBe('LP_R1C1');
    expect(uniqueTableName('9 lives', [])).toBe('LP_9_lives');
  });
});

describe('one naming rule for the file writer and the add-in', () => {
  it('the .xlsx writer and the Excel add-in give the same sheet and table names (both use src/core/report/sheetNames.ts)', () => {
    const wanted = ['Visit timing', 'visit timing', 'a/b', 'History', 'x'.repeat(40)];
    const taken: string[] = [];
    const oneByOne = wanted.map((w) => {
      const n = uniqueSheetName(w, taken);
      taken.push(n);
      return n;
    });
    expect(uniqueSheetNames(wanted)).toEqual(oneByOne);
    expect(uniqueTableName('By visit', ['lp_by_visit'])).toBe(excelTableName('By visit', ['lp_by_visit']));
  });
});
