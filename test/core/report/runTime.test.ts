import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { isoWithOffset, readableRunTime } from '../../../src/core/report/runTime';

describe('run time', () => {
  // Hand-worked clock arithmetic (exact): 13:05:09 UTC is 14:05:09 at +01:00 and 08:05:09 at -05:00.
  it('isoWithOffset writes the local date-time of the moment with its offset, to the second', () => {
    const t = Date.UTC(2026, 11, 2, 13, 5, 9, 750);
    expect(isoWithOffset(t, 60)).toBe('2026-12-02T14:05:09+01:00');
    expect(isoWithOffset(t, -300)).toBe('2026-12-02T08:05:09-05:00');
    expect(isoWithOffset(t, 0)).toBe('2026-12-02T13:05:09+00:00');
    expect(isoWithOffset(t, 330)).toBe('2026-12-02T18:35:09+05:30');
    // The local date can be another day than the UTC date.
    expect(isoWithOffset(Date.UTC(2026, 11, 2, 3, 0), -300)).toBe('2026-12-01T22:00:00-05:00');
    expect(isoWithOffset(Date.UTC(2026, 11, 31, 23, 30), 60)).toBe('2027-01-01T00:30:00+01:00');
  });

  it('isoWithOffset refuses a moment that is not a number and an offset that is not whole minutes within ±18 h', () => {
    expect(() => isoWithOffset(NaN, 0)).toThrow(RangeError);
    expect(() => isoWithOffset(0, 0.5)).toThrow(/whole minutes/);
    expect(() => isoWithOffset(0, 19 * 60)).toThrow(/18 hours/);
  });

  it('readableRunTime shows date, hours and minutes and the UTC offset; other text unchanged', () => {
    expect(readableRunTime('2026-12-02T14:05:09+01:00')).toBe('2026-12-02 14:05 (UTC+01:00)');
    expect(readableRunTime('2026-12-02T13:05:09.123Z')).toBe('2026-12-02 13:05 (UTC+00:00)');
    expect(readableRunTime('2026-12-02T08:05-0500')).toBe('2026-12-02 08:05 (UTC-05:00)');
    expect(readableRunTime('today')).toBe('today');
    expect(readableRunTime('')).toBe('');
  });

  // Exact identity: the timestamp names the same moment (Date.parse reads ISO 8601 with an offset, ECMA-262 §21.4.3.2).
  it('property: the ISO text names the same moment, to the second, at every offset', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 4_102_444_800_000 }), fc.integer({ min: -14 * 60, max: 14 * 60 }), (t, offset) => {
        const iso = isoWithOffset(t, offset);
        expect(Date.parse(iso)).toBe(Math.floor(t / 1000) * 1000);
        expect(readableRunTime(iso)).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2} \(UTC[+-]\d{2}:\d{2}\)$/);
      }),
    );
  });
});
