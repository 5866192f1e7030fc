import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { dayNumberToIso, FIRST_DAY, LAST_DAY, parseDateText, type DateTextResult } from '../../../src/core/intake';

// Reference days are exact identities: dayNumberToIso is itself checked against Date.UTC for every day in
// dates.test.ts, so a form that reads back to the same day number as its ISO 8601 spelling names the same day.
const dayOf = (iso: string): number => {
  const r = parseDateText(iso, null);
  if (r.kind !== 'date') throw new Error(`not a date: ${iso}`);
  return r.day;
};
const date = (iso: string): DateTextResult => ({ kind: 'date', day: dayOf(iso) });
const MONTHS = ['JAN', 'FEB', 'MAR', 'APR', 'MAY', 'JUN', 'JUL', 'AUG', 'SEP', 'OCT', 'NOV', 'DEC'];
const pad = (n: number, w = 2): string => String(n).padStart(w, '0');

describe('parseDateText: ISO 8601 (ISO 8601-1:2019 §5.2.2 calendar dates, extended format)', () => {
  it('reads a calendar date and a date-time with T or a space; the time is checked and ignored', () => {
    expect(dayNumberToIso(dayOf('2025-01-12'))).toBe('2025-01-12');
    for (const t of ['2025-01-12T08:30', '2025-01-12 08:30:00', ' 2025-01-12T08:30:00Z ']) expect(parseDateText(t, null), t).toEqual(date('2025-01-12'));
  });

  it('reports reduced precision (2025-01, 2025) and the SDTM "-" for a missing part (2025---15, --01-15) as partial, never guessed', () => {
    for (const t of ['2025-01', '2025', '2025---15', '--01-15']) expect(parseDateText(t, null), t).toEqual({ kind: 'partial' });
  });

  it('reports impossible days as impossible (Gregorian calendar: 2025 is not a leap year)', () => {
    for (const t of ['2025-02-29', '2025-13-01', '2025-01-12T25:00']) expect(parseDateText(t, null), t).toEqual({ kind: 'impossible' });
  });
});

describe('parseDateText: day-month-name-year (the form statistical exports write; common practice)', () => {
  it('reads 12JAN2025, 12-Jan-2025 and 12 jan 2025, upper or lower case, with or without separators', () => {
    for (const t of ['12JAN2025', '12-Jan-2025', '12 jan 2025', '12jan2025', '12/Jan/2025', '12.JAN.2025', '12 January 2025', '12JAN2025:08:30:00', '12JAN2025 08:30']) {
      expect(parseDateText(t, null), t).toEqual(date('2025-01-12'));
    }
    expect(parseDateText('1SEP2025', null)).toEqual(date('2025-09-01'));
  });

  it('does not read a two-digit year (the century would be a guess), a mix of separators or an unknown month word', () => {
    expect(parseDateText('12JAN25', null)).toEqual({ kind: 'two-digit-year' });
    expect(parseDateText('12-Jan-25', null)).toEqual({ kind: 'two-digit-year' });
    for (const t of ['12-Jan 2025', '12JUNO2025', '12JAN2025X', '12JAN20255', 'JAN 12, 2025']) expect(parseDateText(t, null), t).toEqual({ kind: 'malformed' });
  });

  it('reports a missing day or month (JAN2025, UNJAN2025, UN-JAN-2025, UNK UNK 2025) as partial, never guessed', () => {
    for (const t of ['JAN2025', 'Jan 2025', 'UNJAN2025', 'UN-JAN-2025', 'UNK UNK 2025', 'UNKUNK2025']) expect(parseDateText(t, null), t).toEqual({ kind: 'partial' });
  });

  it('reports 30FEB2025 and 00JAN2025 as impossible', () => {
    for (const t of ['30FEB2025', '00JAN2025', '32DEC2025']) expect(parseDateText(t, null), t).toEqual({ kind: 'impossible' });
  });
});

describe('parseDateText: day and month as numbers', () => {
  it('reads 12/01/2025, 12.01.2025 and 12-01-2025 day first with dmy and month first with mdy', () => {
    for (const t of ['12/01/2025', '12.01.2025', '12-01-2025', '12/1/2025', '12/01/2025 08:30']) {
      expect(parseDateText(t, 'dmy'), t).toEqual(date('2025-01-12'));
      expect(parseDateText(t, 'mdy'), t).toEqual(date('2025-12-01'));
    }
  });

  it('needs an order to read them at all, and says when the given order cannot read a value the other order can', () => {
    expect(parseDateText('13/01/2025', null)).toEqual({ kind: 'needs-order' });
    expect(parseDateText('13/01/2025', 'mdy')).toEqual({ kind: 'wrong-order' });
    expect(parseDateText('01/13/2025', 'dmy')).toEqual({ kind: 'wrong-order' });
    expect(parseDateText('13/13/2025', 'dmy')).toEqual({ kind: 'impossible' });
    expect(parseDateText('31/04/2025', 'dmy')).toEqual({ kind: 'impossible' });
  });

  it('does not read two-digit years, mixed separators or a month and year alone (03/2025 is partial)', () => {
    expect(parseDateText('12/01/25', 'dmy')).toEqual({ kind: 'two-digit-year' });
    expect(parseDateText('25-01-12', 'dmy')).toEqual({ kind: 'two-digit-year' });
    for (const t of ['12/01-2025', '12/01/202', '123/01/2025', '12//2025']) expect(parseDateText(t, 'dmy'), t).toEqual({ kind: 'malformed' });
    expect(parseDateText('03/2025', 'dmy')).toEqual({ kind: 'partial' });
  });
});

describe('parseDateText properties', () => {
  const anyDay = fc.integer({ min: FIRST_DAY, max: LAST_DAY });
  const parts = (d: number): [number, number, number] => {
    const [y, m, dd] = dayNumberToIso(d).split('-').map(Number) as [number, number, number];
    return [y, m, dd];
  };

  it('a date written in every accepted form reads back to the same day number (exact identity)', () => {
    fc.assert(
      fc.property(anyDay, fc.constantFrom('/', '.', '-'), fc.constantFrom('', '-', ' '), fc.boolean(), (d, sep, nameSep, lower, ) => {
        const [y, m, dd] = parts(d);
        const mon = lower ? MONTHS[m - 1]!.toLowerCase() : MONTHS[m - 1]!;
        const forms: [string, 'dmy' | 'mdy' | null][] = [
          [dayNumberToIso(d), null],
          [`${dayNumberToIso(d)}T23:59:59`, null],
          [`${pad(dd)}${nameSep}${mon}${nameSep}${pad(y, 4)}`, null],
          [`${dd}${sep}${m}${sep}${pad(y, 4)}`, 'dmy'],
          [`${pad(m)}${sep}${pad(dd)}${sep}${pad(y, 4)}`, 'mdy'],
        ];
        for (const [text, order] of forms) expect(parseDateText(text, order), text).toEqual({ kind: 'date', day: d });
      }),
      { numRuns: 3000 },
    );
  });

  it('parseDateText never throws and always gives one of its kinds, on any text', () => {
    const kinds = new Set(['date', 'partial', 'impossible', 'two-digit-year', 'needs-order', 'wrong-order', 'malformed']);
    const dateish = fc.stringMatching(/^[0-9A-Za-z/.\- :T]{0,14}$/);
    fc.assert(
      fc.property(fc.oneof(fc.string(), dateish), fc.constantFrom('dmy' as const, 'mdy' as const, null), (t, order) => {
        const r = parseDateText(t, order);
        expect(kinds.has(r.kind)).toBe(true);
        if (r.kind === 'date') expect(Number.isInteger(r.day) && r.day >= FIRST_DAY && r.day <= LAST_DAY).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });

  it('reading time is linear: a 100,000-character text of digits and separators is rejected at once (no backtracking)', () => {
    // Not a timed assertion: a backtracking parser would not return within the test timeout on this input.
    expect(parseDateText(`1${'/1'.repeat(50_000)}`, 'dmy').kind).toBe('malformed');
    expect(parseDateText(`12${'JAN'.repeat(30_000)}2025`, null).kind).toBe('malformed');
  });
});
