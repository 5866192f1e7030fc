import { describe, expect, it } from 'vitest';
import { chiSquareQuantile, fQuantile, fUpper, tQuantile, tTwoSided } from '../../../src/core/model';

// Handbook values are printed to 3 decimals, so each check allows half a unit in the last printed place (5e-4).
describe('distribution quantiles match printed handbook tables', () => {
  it('t(0.975; df) matches Abramowitz & Stegun 1964 Table 26.10 / NIST e-Handbook', () => {
    const table: [number, number][] = [[1, 12.706], [2, 4.303], [5, 2.571], [10, 2.228], [30, 2.042]];
    for (const [df, q] of table) expect(Math.abs(tQuantile(0.975, df) - q)).toBeLessThan(5e-4);
  });
  it('chi-square(0.95; df) matches Abramowitz & Stegun 1964 Table 26.8', () => {
    expect(Math.abs(chiSquareQuantile(0.95, 1) - 3.841)).toBeLessThan(5e-4);
    expect(Math.abs(chiSquareQuantile(0.95, 2) - 5.991)).toBeLessThan(5e-4);
  });
  it('F(0.95; d1, d2) matches Abramowitz & Stegun 1964 Table 26.9', () => {
    expect(Math.abs(fQuantile(0.95, 2, 10) - 4.103)).toBeLessThan(5e-4);
    expect(Math.abs(fQuantile(0.95, 3, 20) - 3.098)).toBeLessThan(5e-4);
  });
  it('the lower and upper chi-square points used by the variance intervals: χ²(0.025; 10) = 3.247, χ²(0.975; 10) = 20.483', () => {
    // Abramowitz & Stegun 1964 Table 26.8 (values from memory), 3 decimals printed: tolerance half a unit, 5e-4.
    expect(Math.abs(chiSquareQuantile(0.025, 10) - 3.247)).toBeLessThan(5e-4);
    expect(Math.abs(chiSquareQuantile(0.975, 10) - 20.483)).toBeLessThan(5e-4);
  });
  it('exact identity used by the balanced ICC interval: the lower F point is the reciprocal of the swapped upper one', () => {
    // F(α; d1, d2) = 1/F(1 − α; d2, d1); 1e-9 allows for the iterative inverse of the incomplete beta.
    expect(fQuantile(0.025, 5, 12)).toBeCloseTo(1 / fQuantile(0.975, 12, 5), 9);
  });
  it('tail probabilities invert the quantiles (exact identity; 1e-9 allows for the iterative inverse)', () => {
    expect(tTwoSided(tQuantile(0.975, 7), 7)).toBeCloseTo(0.05, 9);
    expect(fUpper(fQuantile(0.95, 3, 20), 3, 20)).toBeCloseTo(0.05, 9);
  });
  it('exact identity: t² with df ν is F(1, ν), so the two-sided t p-value equals the F upper tail', () => {
    expect(tTwoSided(2.5, 9)).toBeCloseTo(fUpper(6.25, 1, 9), 12);
  });
  it('an infinite df gives the normal limit and an impossible df gives NaN, not a throw', () => {
    // 6 digits: the quantile is quoted to 6 decimals, so half a unit in the last place.
    expect(tQuantile(0.975, Infinity)).toBeCloseTo(1.959964, 6); // normal quantile, from memory
    expect(tQuantile(0.975, 0)).toBeNaN();
    expect(tTwoSided(1, -1)).toBeNaN();
  });
});

describe('chi-square quantiles at large df', () => {
  it('the Wilson–Hilferty branch above 10,000 df agrees with the exact inversion to 1e-7 relative', async () => {
    const { jStat } = (await import('jstat')) as unknown as { jStat: { chisquare: { inv(p: number, d: number): number } } };
    for (const df of [10_001, 50_000, 400_000]) {
      for (const prob of [0.025, 0.975]) {
        const exact = jStat.chisquare.inv(prob, df);
        // Wilson & Hilferty 1931 approximation (from memory); the reference is jStat's exact inversion; the error size is from memory and checked here.
        // 1e-7: the approximation's relative error at 10^4 df is ~4e-8 and shrinks like 1/df.
        expect(Math.abs(chiSquareQuantile(prob, df) - exact) / exact).toBeLessThan(1e-7);
      }
    }
  });
});
