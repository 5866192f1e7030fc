/**
 * Brent's root finder on a bracket: bisection safeguarded inverse quadratic and secant steps (Brent 1973, Algorithms for
 * Minimization without Derivatives, ch. 4). Needs f(a) and f(b) of opposite signs (or one of them zero); every step
 * keeps the root bracketed, so it cannot wander off or diverge. It stops when the bracket is within 2·(ε|x| + tol)
 * (default tol 1e-13, for arguments of order 1 such as a log-variance), when f is exactly zero, or after maxIter steps.
 * f(lo) and f(hi) may be passed when known (fLo, fHi). Cost: one function value per step, at most about (log₂ of the bracket over tol)² and usually ~10.
 * Example: brentRoot((x) => x * x - 2, 0, 2) -> { x: 1.41421356237…, converged: true }.
 */
export interface RootResult {
  readonly x: number;
  readonly fx: number;
  readonly iterations: number;
  readonly converged: boolean;
}

export function brentRoot(f: (x: number) => number, lo: number, hi: number, tol = 1e-13, maxIter = 200, fLo?: number, fHi?: number): RootResult {
  const eps = 2.220446049250313e-16;
  let a = lo;
  let b = hi;
  let fa = fLo ?? f(a);
  let fb = fHi ?? f(b);
  if (fa === 0) return { x: a, fx: 0, iterations: 0, converged: true };
  if (fb === 0) return { x: b, fx: 0, iterations: 0, converged: true };
  if (!(Math.sign(fa) !== Math.sign(fb)) || Number.isNaN(fa) || Number.isNaN(fb)) return { x: NaN, fx: NaN, iterations: 0, converged: false };
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  for (let iter = 1; iter <= maxIter; iter++) {
    if (Math.sign(fb) === Math.sign(fc)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * eps * Math.abs(b) + 0.5 * tol;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0) return { x: b, fx: fb, iterations: iter, converged: true };
    if (Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qq = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qq * (qq - r) - (b - a) * (r - 1));
        q = (qq - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1;
    fb = f(b);
    if (Number.isNaN(fb)) return { x: NaN, fx: NaN, iterations: iter, converged: false };
  }
  return { x: b, fx: fb, iterations: maxIter, converged: false };
}
