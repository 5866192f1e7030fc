import { describe, expect, it } from 'vitest';
import { extent, linearScale, niceStep, niceTicks, tickLabel } from '../../src/web/chartScale';

describe('niceTicks', () => {
  // Expected values worked by hand from Heckbert's rule (Graphics Gems, 1990, "Nice numbers for graph labels"):
  // step = the smallest of {1, 2, 5} x 10^k at or above range / count; ticks run from floor(min/step) to ceil(max/step).
  it('covers the range with steps of 1, 2 or 5 times a power of ten', () => {
    expect(niceTicks(0, 97, 5)).toEqual([0, 20, 40, 60, 80, 100]); // 97/5 = 19.4 -> step 20
    expect(niceTicks(-13, 41, 5)).toEqual([-20, 0, 20, 40, 60]); // 54/5 = 10.8 -> step 20
    expect(niceTicks(0.11, 0.93, 4)).toEqual([0, 0.5, 1]); // 0.82/4 = 0.205 -> step 0.5
    expect(niceTicks(1, 337, 6)).toEqual([0, 100, 200, 300, 400]); // 336/6 = 56 -> step 100
  });

  it('gives exact decimals without floating-point dust (exact identity: 0.1 + 0.2 is shown as 0.3)', () => {
    expect(niceTicks(0, 0.3, 3)).toEqual([0, 0.1, 0.2, 0.3]);
  });

  it('widens a zero-width range by one unit each side and returns nothing for non-finite bounds', () => {
    expect(niceTicks(5, 5, 2)).toEqual([4, 5, 6]);
    expect(niceTicks(Number.NaN, 1)).toEqual([]);
    expect(niceTicks(0, Infinity)).toEqual([]);
  });

  it('accepts bounds in either order', () => {
    expect(niceTicks(97, 0, 5)).toEqual(niceTicks(0, 97, 5));
  });
});

describe('niceStep', () => {
  it('rounds up to 1, 2, 5 or 10 times the power of ten below the rough step', () => {
    // Worked by hand from Heckbert's rule (Graphics Gems, 1990): the smallest of {1, 2, 5, 10} × 10^k at or above x.
    expect([niceStep(0.7), niceStep(1), niceStep(1.5), niceStep(3), niceStep(7), niceStep(230)]).toEqual([
      1, 1, 2, 5, 10, 500,
    ]);
  });
});

describe('linearScale', () => {
  // Exact arithmetic: s(x) = r0 + (x − d0)/(d1 − d0)·(r1 − r0); a zero-width domain maps to the middle of the range.
  it('maps the domain ends to the range ends, also when the range runs backwards (SVG y grows downwards)', () => {
    const s = linearScale(0, 10, 300, 20);
    expect(s(0)).toBe(300);
    expect(s(10)).toBe(20);
    expect(s(5)).toBe(160);
  });

  it('maps everything to the middle of the range when the domain has no width', () => {
    expect(linearScale(3, 3, 0, 100)(42)).toBe(50);
  });
});

describe('extent', () => {
  it('skips nulls and NaN across several lists and returns null when nothing is finite', () => {
    expect(extent([3, null, 1], undefined, [Number.NaN, 7])).toEqual([1, 7]);
    expect(extent([null], [Number.NaN])).toBeNull();
  });
});

describe('tickLabel', () => {
  it('writes integers with thousands separators and decimals without trailing zeros', () => {
    expect(tickLabel(12000)).toBe('12,000');
    expect(tickLabel(0.5)).toBe('0.5');
    expect(tickLabel(-2.25)).toBe('-2.25');
  });
});
