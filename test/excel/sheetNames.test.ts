/** Sheet and table names (src/excel/sheetNames.ts). Excel's naming rules are a fact of the trade (common practice):
 * at most 31 characters, none of \ / ? * : [ ], no apostrophe at either end, "History" reserved, case-insensitive. */
import { describe, expect, it } from 'vitest';
import { legalSheetName, uniqueSheetName, uniqueTableName } from '../../src/excel/sheetNames';

describe('legalSheetName', () => {
  it('replaces each illegal character with "-" and keeps the rest', () => {
    expect(legalSheetName('Site [A]: 1/2 \\ ? *')).toBe('Site -A-- 1-2 - - -');
  });

  it('drops apostrophes and spaces at either end, blanks become "Sheet", "History" is avoided', () => {
    expect(legalSheetName("'quoted'")).toBe('quoted');
    expect(legalSheetName("  ' ")).toBe('Sheet');
    expect(legalSheetName('history')).toBe('history sheet');
  });

  it('cuts names to 31 characters and does not leave a trailing apostrophe after the cut', () => {
    expect(legalSheetName('x'.repeat(40))).toHaveLength(31);
    expect(legalSheetName(`${'y'.repeat(30)}'z`)).toBe('y'.repeat(30));
  });
});

describe('uniqueSheetName', () => {
  it('keeps a free name and numbers a taken one, comparing without case', () => {
    expect(uniqueSheetName('Model', ['Data'])).toBe('Model');
    expect(uniqueSheetName('Model', ['model'])).toBe('Model (2)');
    expect(uniqueSheetName('Model', ['MODEL', 'Model (2)'])).toBe('Model (3)');
  });

  it('shortens a long name so the suffix fits within 31 characters', () => {
    const long = 'Visit timing by site and visit window';
    const first = uniqueSheetName(long, []);
    const second = uniqueSheetName(long, [first]);
    expect(first).toBe('Visit timing by site and visit'); // cut at 31, then the trailing space dropped
    expect(second).toBe('Visit timing by site and vi (2)'); // 27 characters + " (2)" = 31
    expect(second.length).toBeLessThanOrEqual(31);
    expect(second.endsWith(' (2)')).toBe(true);
    expect(second.toLowerCase()).not.toBe(first.toLowerCase());
  });

  it('makes illegal wanted names legal before checking collisions', () => {
    expect(uniqueSheetName('a/b', ['a-b'])).toBe('a-b (2)');
  });
});

describe('uniqueTableName', () => {
  it('prefixes ids so no name reads as a cell reference and numbers collisions across the workbook', () => {
    expect(uniqueTableName('ByVisit', [])).toBe('LP_ByVisit');
    expect(uniqueTableName('ByVisit', ['lp_byvisit', 'LP_ByVisit_2'])).toBe('LP_ByVisit_3');
    expect(uniqueTableName('AB12', [])).toBe('LP_AB12');
    expect(uniqueTableName('by visit!', [])).toBe('LP_by_visit_');
  });
});
