/**
 * Brent's one-dimensional minimiser: golden-section search with parabolic interpolation, on a bracket [a, b]
 * (Brent 1973, Algorithms for Minimization without Derivatives).
 * It stops when the bracket around the best point is within 2·tol + ε|x| (default tol 1e-10, suited to a log-ratio of
 * order 1: the likelihood is then flat to ~1e-20 relative), or after maxIter (default 200) steps. Cost: one function
 * value per step.
 * Example: brentMinimise((x) => (x - 2) ** 2, 0, 5) -> { x: 2, iterations: ≤ 10, converged: true }.
 */
export interface MinimiseResult {
  readonly x: number;
  readonly fx: number;
  readonly iterations: number;
  readonly converged: boolean;
}

export function brentMinimise(f: (x: number) => number, lo: number, hi: number, tol = 1e-10, maxIter = 200): MinimiseResult {
  const golden = 0.381966011250105; // (3 − √5)/2
  const eps = 1.5e-8; // √(double epsilon), Brent's relative floor
  let a = Math.min(lo, hi);
  let b = Math.max(lo, hi);
  let x = a + golden * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let iter = 1; iter <= maxIter; iter++) {
    const m = 0.5 * (a + b);
    const tol1 = eps * Math.abs(x) + tol;
    const tol2 = 2 * tol1;
    if (Math.abs(x - m) <= tol2 - 0.5 * (b - a)) return { x, fx, iterations: iter - 1, converged: true };
    let useGolden = true;
    if (Math.abs(e) > tol1) {
      let r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let pp = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) pp = -pp;
      else q = -q;
      r = e;
      e = d;
      if (Math.abs(pp) < Math.abs(0.5 * q * r) && pp > q * (a - x) && pp < q * (b - x)) {
        d = pp / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = x < m ? tol1 : -tol1;
        useGolden = false;
      }
    }
    if (useGolden) {
      e = x < m ? b - x : a - x;
      d = golden * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d > 0 ? tol1 : -tol1);
    const fu = f(u);
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, fx, iterations: maxIter, converged: false };
}
