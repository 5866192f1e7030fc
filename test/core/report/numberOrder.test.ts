import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { medianMinMax, orderByKey } from '../../../src/core/report/numberOrder';

// Exact identities against the built-in sort: the counting sort is a stable sort by key, and selection finds the
// values a sorted copy holds at the middle and the ends. No tolerance: the same floating-point values are returned.

const keys = fc.array(fc.oneof(fc.integer({ min: -40, max: 40 }), fc.double({ noNaN: true, min: -1e6, max: 1e6 })), { maxLength: 60 });

describe('orderByKey', () => {
  it('orderByKey orders members by key and keeps the given order on ties (a stable sort)', () => {
    fc.assert(
      fc.property(keys, (k) => {
        const members = Int32Array.from(k, (_, j) => 100 + j);
        const got = orderByKey(Float64Array.from(k), members);
        const want = [...k.keys()].sort((a, b) => k[a]! - k[b]! || a - b).map((j) => 100 + j);
        expect([...got]).toEqual(want);
      }),
    );
  });

  it('orderByKey on the example of its documentation', () => {
    expect([...orderByKey(Float64Array.of(5, 2, 5, 1), Int32Array.of(0, 1, 2, 3))]).toEqual([3, 1, 0, 2]);
  });
});

describe('medianMinMax', () => {
  it('medianMinMax gives the sorted copy\'s middle (mean of the two middle values for an even count) and ends, and leaves its input alone', () => {
    fc.assert(
      fc.property(keys, (k) => {
        const x = Float64Array.from(k);
        const copy = Float64Array.from(k);
        const got = medianMinMax(x);
        expect([...x]).toEqual([...copy]);
        if (k.length === 0) {
          expect(got).toBeNull();
          return;
        }
        const d = Float64Array.from(k).sort();
        const n = d.length;
        const median = n % 2 === 1 ? d[(n - 1) / 2]! : (d[n / 2 - 1]! + d[n / 2]!) / 2;
        expect(got).toEqual({ median, min: d[0]!, max: d[n - 1]! });
      }),
      { numRuns: 500 },
    );
  });

  it('medianMinMax on the example of its documentation', () => {
    expect(medianMinMax(Float64Array.of(9, -2, 3, 4))).toEqual({ median: 3.5, min: -2, max: 9 });
  });
});
