import { describe, expect, it } from 'vitest';
import { brentRoot } from '../../../src/core/model/brentRoot';

describe('brentRoot (Brent 1973, ch. 4)', () => {
  it('finds √2 as the root of x² − 2 on [0, 2] to rounding (exact identity)', () => {
    const r = brentRoot((x) => x * x - 2, 0, 2);
    expect(r.converged).toBe(true);
    // 5e-14 absolute: the stopping rule leaves the root within 2ε|x| + tol/2 (tol 1e-13) of the returned point.
    expect(Math.abs(r.x - Math.SQRT2)).toBeLessThan(5e-14);
  });
  it('keeps the root bracketed for a function that is flat away from it (bisection fallback): tanh(50(x − 0.3))', () => {
    const r = brentRoot((x) => Math.tanh(50 * (x - 0.3)), -10, 10);
    expect(r.converged).toBe(true);
    expect(Math.abs(r.x - 0.3)).toBeLessThan(1e-12); // the same stopping rule, with slack for the steep slope
  });
  it('reports no convergence (x NaN) when the ends do not bracket a sign change, instead of wandering off', () => {
    const r = brentRoot((x) => x * x + 1, -1, 1);
    expect(r.converged).toBe(false);
    expect(Number.isNaN(r.x)).toBe(true);
  });
  it('uses the end values when given, and returns an end that is itself a root', () => {
    let calls = 0;
    const f = (x: number): number => {
      calls++;
      return x - 1;
    };
    expect(brentRoot(f, 1, 3, 1e-13, 200, 0, 2)).toEqual({ x: 1, fx: 0, iterations: 0, converged: true });
    expect(calls).toBe(0);
  });
});
