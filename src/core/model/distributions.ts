/**
 * Quantiles and tail probabilities of the t, F and chi-square distributions, through jstat's incomplete beta and gamma
 * functions. Non-finite or non-positive degrees of freedom give NaN rather than a throw (a numerical outcome). An
 * infinite df gives the normal limit.
 */
import * as jstatModule from 'jstat';

type JStat = typeof jstatModule.jStat;
/**
 * jstat is a CommonJS module: bundlers expose `jStat` as a named export, while Node's native ESM loader only offers the
 * module object as `default`. Take whichever is there, so the same code runs under vitest, the CLI bundle and tsx.
 */
const jStat: JStat = (jstatModule as { jStat?: JStat }).jStat ?? (jstatModule as unknown as { default: { jStat: JStat } }).default.jStat;

/** Upper quantile t(prob; df), e.g. tQuantile(0.975, 10) = 2.2281 (Abramowitz & Stegun 1964, Table 26.10). */
export function tQuantile(prob: number, df: number): number {
  if (df === Infinity) return jStat.normal.inv(prob, 0, 1);
  if (!(df > 0) || !Number.isFinite(df)) return NaN;
  return jStat.studentt.inv(prob, df);
}

/**
 * The rule for reported p-values: never 0 and never above 1. A tail probability that underflows to 0 in double
 * precision is reported as the smallest positive double, 2^-1074 ≈ 4.9e-324 (IEEE 754), which then reads "at most
 * this"; rounding above 1 is clipped to 1. NaN stays NaN. Example: bounded(0) = 5e-324, bounded(1.0000001) = 1.
 */
export const P_FLOOR = Number.MIN_VALUE;
export function boundedP(p: number): number {
  if (Number.isNaN(p)) return NaN;
  return Math.min(1, Math.max(P_FLOOR, p));
}

/**
 * Two-sided p-value of a t statistic: 2 P(T_df > |t|) = I_{df/(df+t²)}(df/2, 1/2); for df = ∞ twice the normal upper
 * tail (normalUpperTail, which keeps its precision far into the tail). Bounded by boundedP.
 * Example: t = 2.2281, df = 10 -> 0.05.
 */
export function tTwoSided(t: number, df: number): number {
  if (Number.isNaN(t)) return NaN;
  if (df === Infinity) return boundedP(2 * normalUpperTail(Math.abs(t)));
  if (!(df > 0) || !Number.isFinite(df)) return NaN;
  if (!Number.isFinite(t)) return P_FLOOR;
  return boundedP(jStat.ibeta(df / (df + t * t), df / 2, 0.5));
}

/** Upper tail P(F_{d1,d2} > f) = I_{d2/(d2+d1 f)}(d2/2, d1/2), bounded by boundedP. Example: fUpper(4.103, 2, 10) = 0.0500. */
export function fUpper(f: number, d1: number, d2: number): number {
  if (Number.isNaN(f) || !(d1 > 0) || !(d2 > 0)) return NaN;
  if (f <= 0) return 1;
  if (d2 === Infinity) return boundedP(1 - jStat.chisquare.cdf(f * d1, d1));
  return boundedP(jStat.ibeta(d2 / (d2 + d1 * f), d2 / 2, d1 / 2));
}

/** Quantile of F(d1, d2) at probability prob, e.g. fQuantile(0.95, 3, 20) = 3.0984 (Abramowitz & Stegun 1964, Table 26.9). */
export function fQuantile(prob: number, d1: number, d2: number): number {
  if (!(d1 > 0) || !(d2 > 0) || !Number.isFinite(d1) || !Number.isFinite(d2)) return NaN;
  // F = (d2/d1) x / (1 - x) with x ~ Beta(d1/2, d2/2).
  const x = jStat.ibetainv(prob, d1 / 2, d2 / 2);
  return (d2 / d1) * (x / (1 - x));
}

/**
 * Quantile of chi-square(df), e.g. chiSquareQuantile(0.95, 1) = 3.8415 (Abramowitz & Stegun 1964, Table 26.8).
 * Above 10,000 df the Wilson–Hilferty cube-root normal approximation is used (Wilson & Hilferty 1931):
 * its relative error there is below 1e-7, while jstat's incomplete-gamma inversion
 * takes milliseconds per call at such df. Cost O(1) above that, an iterative inversion below.
 */
export function chiSquareQuantile(prob: number, df: number): number {
  if (!(df > 0) || !Number.isFinite(df)) return NaN;
  if (df > 1e4) {
    const z = jStat.normal.inv(prob, 0, 1);
    const h = 2 / (9 * df);
    return df * (1 - h + z * Math.sqrt(h)) ** 3;
  }
  return jStat.chisquare.inv(prob, df);
}

/**
 * Standard normal upper tail Q(z) = P(Z > z). Below z = 3, 1 − Φ(z) (at least 1.3e-3 there, so the subtraction loses
 * nothing that matters); from z = 3, Laplace's continued fraction Q(z) = φ(z)/(z + 1/(z + 2/(z + 3/(z + …)))),
 * evaluated from 200 terms backwards, which keeps full relative precision where 1 − Φ(z) is 0 (from z ≈ 8.3) until
 * φ(z) itself underflows (z ≈ 38.6). Example: normalUpperTail(10) = 7.6199e-24.
 */
export function normalUpperTail(z: number): number {
  if (Number.isNaN(z)) return NaN;
  if (z < 3) return 1 - jStat.normal.cdf(z, 0, 1);
  let f = z;
  for (let k = 200; k >= 1; k--) f = z + k / f;
  return Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI) / f;
}

/** Standard normal quantile, e.g. normalQuantile(0.975) = 1.95996. */
export function normalQuantile(prob: number): number {
  return jStat.normal.inv(prob, 0, 1);
}
