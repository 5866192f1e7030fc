/**
 * The naive fit beside the mixed model: ordinary least squares with the same fixed effects, treating every value as
 * independent (no participant effect). β = (X'X)⁻¹X'y, s² = RSS/(N − p) with RSS = y'y − β'X'y, Cov(β) = s²(X'X)⁻¹
 * (the normal equations; e.g. Draper & Smith 1998, Applied Regression Analysis, ch. 5). Computed from the sums the
 * mixed model's one pass already holds (X'X, X'y, y'y), so it costs O(p³) and never touches the rows.
 */
import { cholesky, cholInverse, cholSolve } from './dense';
import type { Design } from './design';
import { contrast, type InferenceContext } from './inference';
import { toScaledContrast, unscaleContrast, type Scaling } from './scaling';
import type { SufficientStats } from './sufficient';
import type { FixedEffect, NaiveFit } from './types';

/**
 * The naive least-squares fit on the (centred, scaled) sums, mapped back to the original scale like the mixed model
 * (scaling.ts), with each term's naive SE divided by the mixed model's SE (`mixed`, same order as the terms) and
 * whether the term varies within participants (`between`, from containment.ts). Null when X'X is not positive definite
 * or the residual sum of squares is not positive (the values lie on the fitted lines).
 * Example: y = [1, 2, 2, 4] at time [0, 1, 0, 1] -> intercept 1.5, time 1.5, s² = 2.5 / 2 = 1.25.
 */
export function naiveFit(st: Pick<SufficientStats, 'p' | 'nObs' | 'xtx' | 'xty' | 'yty'>, design: Design, sc: Scaling, mixed: readonly FixedEffect[], between: readonly boolean[], level: number): NaiveFit | null {
  const p = st.p;
  const N = st.nObs;
  const df = N - p;
  if (df < 1) return null;
  const L = cholesky(st.xtx, p);
  if (L === null) return null;
  const beta = cholSolve(L, p, st.xty);
  let fitted = 0;
  for (let i = 0; i < p; i++) fitted += beta[i]! * st.xty[i]!;
  const rss = st.yty - fitted;
  // RSS is a difference of sums of size y'y, good to about ε·y'y; below RSS_FLOOR·y'y it is rounding.
  if (!(rss > RSS_FLOOR * st.yty)) return null;
  const s2 = rss / df;
  const cov = cholInverse(L, p).map((v) => v * s2);
  const shifted = Float64Array.from(beta);
  shifted[0] = shifted[0]! + sc.yCentre / sc.yScale;
  const none = new Float64Array(p * p);
  const ctx: InferenceContext = { p, beta: shifted, phi: cov, phiA: cov, M: [none, none], W: new Float64Array(4), dfMethod: 'residual', residualDf: df, level };
  const fixedEffects = design.terms.map((term, j) => {
    const l = new Float64Array(p);
    l[j] = 1;
    const r = unscaleContrast(contrast(ctx, toScaledContrast(l, design, sc)), sc);
    const mixedSe = mixed[j]?.se ?? NaN;
    return { term: term.name, kind: term.kind, arm: term.arm, between: between[j] ?? false, ...r, seRatio: r.se / mixedSe };
  });
  return { residualVariance: s2 * sc.yScale * sc.yScale, df, fixedEffects };
}

/** Relative residual sum of squares below which the values sit on the fitted lines to within rounding (as fit.ts). */
const RSS_FLOOR = 1e-10;
