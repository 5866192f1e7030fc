import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  dayNumberToIso,
  FIRST_DAY,
  isoToDayNumber,
  LAST_DAY,
  OFFSET_1904,
  serialToDayNumber,
} from '../../../src/core/intake';

const MS_PER_DAY = 86_400_000;
/** Exact identity used throughout: day number d is d days after 1899-12-30 (the definition of day numbers). */
const isoByDateUtc = (d: number): string => new Date(Date.UTC(1899, 11, 30) + d * MS_PER_DAY).toISOString().slice(0, 10);

describe('spreadsheet serials, 1900 date system (ECMA-376 Part 1, §18.17.4)', () => {
  it('serial 1 is 1900-01-01 and serial 59 is 1900-02-28 (ECMA-376 Part 1, §18.17.4)', () => {
    expect(dayNumberToIso(serialToDayNumber(1, 1900))).toBe('1900-01-01');
    expect(dayNumberToIso(serialToDayNumber(59, 1900))).toBe('1900-02-28');
  });

  it('serial 60 stands for the non-existent 1900-02-29 and is invalid (ECMA-376 Part 1, §18.17.4)', () => {
    expect(serialToDayNumber(60, 1900)).toBeNaN();
    expect(serialToDayNumber(60.75, 1900)).toBeNaN();
  });

  it('serial 61 is 1900-03-01, and from there a serial equals its day number (ECMA-376 Part 1, §18.17.4)', () => {
    expect(serialToDayNumber(61, 1900)).toBe(61);
    expect(dayNumberToIso(61)).toBe('1900-03-01');
  });

  it('serials 1..59 map to serial + 1 and serials from 61 to themselves, for every serial (exact identity vs Date.UTC)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2958465 }), (serial) => {
        fc.pre(serial !== 60);
        const day = serialToDayNumber(serial, 1900);
        // Serial s < 60 is s days after 1899-12-31 ("1900-01-00"); from 61 on it is s days after 1899-12-30.
        const expected = serial < 60 ? new Date(Date.UTC(1899, 11, 31) + serial * MS_PER_DAY) : new Date(Date.UTC(1899, 11, 30) + serial * MS_PER_DAY);
        return day === (serial < 60 ? serial + 1 : serial) && dayNumberToIso(day) === expected.toISOString().slice(0, 10);
      }),
      { numRuns: 2000 },
    );
  });

  it('a fractional serial (a date-time) gives the date of its whole part', () => {
    expect(serialToDayNumber(45720.999, 1900)).toBe(45720);
    expect(serialToDayNumber(1.5, 1900)).toBe(2);
  });

  it('serial 0, negative, non-finite and post-9999-12-31 serials are invalid', () => {
    // 2958465 is 9999-12-31 (ECMA-376 Part 1, §18.17.4, from memory; checked here by the Date.UTC identity).
    expect(dayNumberToIso(serialToDayNumber(2958465, 1900))).toBe('9999-12-31');
    for (const s of [0, 0.5, -1, 2958466, NaN, Infinity, -Infinity, 1e300]) expect(serialToDayNumber(s, 1900)).toBeNaN();
  });
});

describe('spreadsheet serials, 1904 date system (ECMA-376 Part 1, §18.17.4)', () => {
  it('1904 serial 0 is 1904-01-01 (ECMA-376 Part 1, §18.17.4)', () => {
    expect(dayNumberToIso(serialToDayNumber(0, 1904))).toBe('1904-01-01');
  });

  it('the two systems differ by 1462 days for every date from 1904-01-01 on (exact identity: 4 years incl. 1 leap day, plus the phantom 1900-02-29)', () => {
    expect(OFFSET_1904).toBe(4 * 365 + 1 + 1);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 2957003 }), (s) => serialToDayNumber(s, 1904) === serialToDayNumber(s + 1462, 1900)),
      { numRuns: 1000 },
    );
  });

  it('1904 serials below 0 or past 9999-12-31 are invalid', () => {
    expect(dayNumberToIso(serialToDayNumber(2957003, 1904))).toBe('9999-12-31');
    for (const s of [-1, -0.5, 2957004]) expect(serialToDayNumber(s, 1904)).toBeNaN();
  });
});

describe('dayNumberToIso', () => {
  it('dayNumberToIso agrees with Date.UTC for every day 1900-01-01..9999-12-31 (exact identity)', () => {
    fc.assert(fc.property(fc.integer({ min: FIRST_DAY, max: LAST_DAY }), (d) => dayNumberToIso(d) === isoByDateUtc(d)), {
      numRuns: 5000,
    });
  });

  it('dayNumberToIso gives day 0 as 1899-12-30 and leap days correctly (exact identity vs Date.UTC)', () => {
    expect(dayNumberToIso(0)).toBe('1899-12-30');
    for (const d of [0, 1, 2, 1462, 36585 /* 2000-02-29 */, 45351 /* 2024-02-29 */]) expect(dayNumberToIso(d)).toBe(isoByDateUtc(d));
  });
});

describe('isoToDayNumber', () => {
  it('isoToDayNumber inverts dayNumberToIso for every day 1900-01-01..9999-12-31 (exact identity)', () => {
    fc.assert(
      fc.property(fc.integer({ min: FIRST_DAY, max: LAST_DAY }), (d) => {
        const r = isoToDayNumber(isoByDateUtc(d));
        return r.kind === 'date' && r.day === d;
      }),
      { numRuns: 5000 },
    );
  });

  it('isoToDayNumber takes the date part of a date-time with T or a space, with or without seconds and zone', () => {
    const day = isoToDayNumber('2025-03-04');
    expect(day).toEqual({ kind: 'date', day: 45720 }); // exact identity: 45720 days after 1899-12-30 (isoByDateUtc)
    expect(isoByDateUtc(45720)).toBe('2025-03-04');
    for (const t of ['2025-03-04T10:30', '2025-03-04 10:30:00', '2025-03-04T23:59:59.5', '2025-03-04T10:30Z', '2025-03-04T10:30:00+05:30', ' 2025-03-04 ']) {
      expect(isoToDayNumber(t), t).toEqual(day);
    }
  });

  it('isoToDayNumber reports year-only and year-month text as partial, never guessing a day (ISO 8601 reduced precision)', () => {
    expect(isoToDayNumber('2025-03')).toEqual({ kind: 'partial', precision: 'month' });
    expect(isoToDayNumber('2025')).toEqual({ kind: 'partial', precision: 'year' });
  });

  it('isoToDayNumber rejects impossible dates and times: 2025-02-30, 2025-13-01, 2023-02-29, 25:00', () => {
    for (const t of ['2025-02-30', '2025-13-01', '2025-00-10', '2025-04-31', '2023-02-29', '1900-02-29', '2025-03-04T25:00', '2025-03-04T10:60', '2025-13']) {
      expect(isoToDayNumber(t), t).toEqual({ kind: 'impossible' });
    }
    // 2024 and 2000 are leap years, 1900 is not (Gregorian rule: exact identity).
    expect(isoToDayNumber('2024-02-29').kind).toBe('date');
    expect(isoToDayNumber('2000-02-29').kind).toBe('date');
  });

  it('isoToDayNumber treats dates before 1900-01-01 as impossible (outside the spreadsheet date range)', () => {
    expect(isoToDayNumber('1899-12-31')).toEqual({ kind: 'impossible' });
    expect(isoToDayNumber('1900-01-01')).toEqual({ kind: 'date', day: 2 });
  });

  it('isoToDayNumber calls other text malformed: other orders, basic format, words, formulas', () => {
    for (const t of ['04/03/2025', '2025/03/04', '20250304', '2025-3-4', 'March 4, 2025', '=TODAY()', '', '2025-03-04T', '45720']) {
      expect(isoToDayNumber(t), t).toEqual({ kind: 'malformed' });
    }
  });
});
