/**
 * The likelihood-ratio test of the random slope: random intercept and slope against random intercept only, both fitted
 * by the same method (REML or ML; the fixed effects are the same, so REML likelihoods are comparable). Under the null
 * the slope variance lies on the boundary of its space, so the statistic is referred to the 50:50 mixture of χ²₁ and
 * χ²₂ (Self & Liang 1987, J. Am. Stat. Assoc. 82:605–610; Stram & Lee 1994, Biometrics 50:1171–1177), not to χ²₂.
 * Tails in closed form: P(χ²₁ > x) = 2 Φ̄(√x), P(χ²₂ > x) = e^(−x/2).
 */
import { boundedP, normalUpperTail } from '../distributions';

export interface SlopeTest {
  /** 2 (ℓ_slope − ℓ_intercept), never below 0. */
  readonly statistic: number;
  readonly df: 'mixture 1:2';
  readonly p: number;
  /** True when p < 1 − level: participants differ in their rate of change at the chosen level. */
  readonly differ: boolean;
  /** The plain sentence. */
  readonly sentence: string;
}

/** P(X > x) for X the 50:50 mixture of χ²₁ and χ²₂. Example: x = 5.138 -> 0.05 (Stram & Lee 1994 table, 5.14). */
export function mixtureUpperTail(x: number): number {
  if (!(x > 0)) return 1;
  return 0.5 * (2 * normalUpperTail(Math.sqrt(x))) + 0.5 * Math.exp(-x / 2);
}

/**
 * The test from the two fits' log-likelihoods. A statistic a hair below 0 (the larger model fitted to rounding) counts
 * as 0. Example: logLik −120 (slope) vs −125 (intercept) -> statistic 10, p ≈ 0.0043, differ at 95%.
 */
export function slopeTest(logLikSlope: number, logLikIntercept: number, level: number): SlopeTest {
  const statistic = Math.max(0, 2 * (logLikSlope - logLikIntercept));
  const p = boundedP(mixtureUpperTail(statistic));
  const differ = p < 1 - level;
  const pct = `${Number((100 * level).toPrecision(4))}%`;
  const sentence = `Participants differ in their rate of change: ${differ ? 'yes' : 'no'} at the ${pct} level (likelihood-ratio test of the random slope, p = ${Number(p.toPrecision(3))}).`;
  return { statistic, df: 'mixture 1:2', p, differ, sentence };
}
