import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept } from '../../../src/core/model';
import { balancedAnova, oneWay, oneWayOptions } from './helpers';

const opts = oneWayOptions();

describe('balanced one-way REML equals the ANOVA estimators (Searle, Casella & McCulloch 1992)', () => {
  it('exact identity: σ²_u = (MSB − MSW)/n and σ² = MSW when MSB > MSW, otherwise the boundary σ²_u = 0', () => {
    const groupsArb = fc
      .record({ a: fc.integer({ min: 2, max: 8 }), n: fc.integer({ min: 2, max: 6 }) })
      .chain(({ a, n }) => fc.array(fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { minLength: n, maxLength: n }), { minLength: a, maxLength: a }));
    fc.assert(
      fc.property(groupsArb, (groups) => {
        const { msb, msw, n } = balancedAnova(groups);
        fc.pre(msw > 1e-6 && Math.abs(msb - msw) > 1e-6 * msw);
        const f = fitRandomIntercept(oneWay(groups), opts);
        // Tolerance 1e-6 relative to the total variance: the optimiser stops when log γ is known to ~1e-10, and the
        // sufficient-statistic sums lose a few digits to cancellation for values of ±100.
        const scale = msb + msw;
        if (msb > msw) {
          expect(f.status).toBe('converged');
          expect(Math.abs(f.variance.subject - (msb - msw) / n)).toBeLessThan(1e-6 * scale);
          expect(Math.abs(f.variance.residual - msw)).toBeLessThan(1e-6 * scale);
        } else {
          expect(f.status).toBe('boundary');
          expect(f.variance.subject).toBe(0);
        }
      }),
      { numRuns: 150, seed: 20261202 },
    );
  });
  it('a layout whose ANOVA between estimate is negative gives status "boundary" with σ²_u = 0 and σ² = total mean square', () => {
    // Invented data with equal group means (MSB = 0 < MSW): exact identity, at γ = 0 the REML σ² is SS_total/(N − 1).
    const groups = [[1, 10], [2, 9], [3, 8], [4, 7]];
    const f = fitRandomIntercept(oneWay(groups), opts);
    expect(f.status).toBe('boundary');
    expect(f.converged).toBe(true);
    expect(f.variance.subject).toBe(0);
    const all = groups.flat();
    const mean = all.reduce((s, v) => s + v, 0) / all.length;
    const ss = all.reduce((s, v) => s + (v - mean) ** 2, 0);
    expect(f.variance.residual).toBeCloseTo(ss / (all.length - 1), 10); // closed form, rounding only
    expect(f.message).toMatch(/zero/);
    expect(f.variance.subjectLower).toBe(0);
  });
});
