import { describe, expect, it } from 'vitest';
import { armContrasts } from '../../../src/core/model/armContrast';
import { normalQuantile } from '../../../src/core/model/distributions';

const terms = [
  { kind: 'intercept' as const, arm: null },
  { kind: 'arm' as const, arm: 'B' },
  { kind: 'time' as const, arm: null },
  { kind: 'armTime' as const, arm: 'B' },
];
// Row-major 4 × 4 covariance; only the arm / arm × time block matters: Var 1 and 0.04, Cov −0.1.
const cov = [
  9, 0.5, 0.2, 0.3,
  0.5, 1, 0.1, -0.1,
  0.2, 0.1, 0.5, 0.05,
  0.3, -0.1, 0.05, 0.04,
];
const beta = [50, 2, -1, 0.5];

describe('armContrasts gives L\'β and √(L\'ΣL) for L = 1 on the arm term and t on its arm × time term', () => {
  it('at time 3 (day 4 in days): estimate 2 + 3 · 0.5, variance 1 + 9 · 0.04 + 2 · 3 · (−0.1) (exact identity)', () => {
    const [c] = armContrasts(terms, beta, cov, [{ label: 'V', day: 4 }], 'day', 0.95);
    expect(c!.time).toBe(3);
    expect(c!.estimate).toBeCloseTo(3.5, 12);
    expect(c!.se).toBeCloseTo(Math.sqrt(1 + 0.36 - 0.6), 12);
    const z = normalQuantile(0.975);
    expect(c!.lower).toBeCloseTo(3.5 - z * c!.se, 12);
    expect(c!.upper).toBeCloseTo(3.5 + z * c!.se, 12);
  });
  it('at study day 1 (time 0) it is the arm term itself (exact identity)', () => {
    const [c] = armContrasts(terms, beta, cov, [{ label: 'Start', day: 1 }], 'month', 0.9);
    expect(c!.estimate).toBe(2);
    expect(c!.se).toBe(1);
  });
  it('gives nothing without arm terms (blinded)', () => {
    expect(armContrasts(terms.filter((t) => t.arm === null), [50, -1], [9, 0.2, 0.2, 0.5], [{ label: 'V', day: 4 }], 'day', 0.95)).toEqual([]);
  });
});
