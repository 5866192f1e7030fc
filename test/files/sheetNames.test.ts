import { describe, expect, it } from 'vitest';
import { uniqueSheetNames, uniqueTableName } from '../../src/files/sheetNames';
import { columnLetters } from '../../src/files/cellAddress';

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
  it('keeps letters, digits and underscores, avoids names that read as cell references, and de-duplicates', () => {
    const used = new Set<string>();
    expect(uniqueTableName('ByVisit', used)).toBe('ByVisit');
    expect(uniqueTableName('byvisit', used)).toBe('byvisit_2');
    expect(uniqueTableName('AB12', used)).toBe('T_AB12');
    expect(uniqueTableName('R1C1', used)).toBe('T_R1C1');
    expect(uniqueTableName('9 lives', used)).toBe('T_9_lives');
  });
});

describe('columnLetters', () => {
  it('numbers columns A..Z, AA.. as in A1 references (ECMA-376 Part 1, §18.3.1.4)', () => {
    // Exact identity: 26 letters per place, bijective base 26; XFD is column 16384, Excel's last (common practice).
    expect([1, 26, 27, 52, 53, 702, 703, 16384].map(columnLetters)).toEqual(['A', 'Z', 'AA', 'AZ', 'BA', 'ZZ', 'AAA', 'XFD']);
  });
});
