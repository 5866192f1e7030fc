/**
 * Intervals for the variance components and the intraclass correlation, from the likelihood the fit maximised
 * (REML, or ML when the fit is ML):
 * - σ²_u, σ² and the ICC: profile-likelihood intervals (profile.ts). A limit θ satisfies 2(ℓ̂ − ℓ_prof(θ)) = χ²₁(level)
 *   (3.8415 at 95%), the other variance and the fixed effects held at their best values given θ. The ICC is a
 *   monotone function of γ = σ²_u/σ², so its limits are the ICC of the limits of the profile over γ (the profile
 *   over γ with σ² maximised out is the likelihood the optimiser already uses).
 *   Why these and not the Wald or Satterthwaite ones: the likelihood of a variance is skewed and, near zero, cut off
 *   by the boundary, so symmetric or moment-matched intervals under-cover (bench/coverage.ts) and can run to absurd
 *   limits when the Satterthwaite df is near 0; a profile interval follows the likelihood's own shape.
 * - At and near σ²_u = 0 the test of σ²_u = 0 is referred to the 50:50 mixture of χ²₀ and χ²₁ (Self & Liang 1987,
 *   J. Am. Stat. Assoc. 82:605–610): zero is inside the interval of σ²_u and of the ICC when the likelihood-ratio
 *   statistic at zero is below χ²₁(1 − 2α) (2.71 at 95%), i.e. a one-sided cut-off at zero. When it lies between
 *   that and χ²₁(1 − α) (3.84), every small positive value is still inside while zero itself is not, and the lower
 *   limit is given as 0 with a note; above 3.84 the lower limit is the profile root.
 * - Balanced one-way data (intercept only, equal cluster sizes), where exact intervals exist, keep them:
 *   σ²: SSW/χ²(1 − α/2; N − a) to SSW/χ²(α/2; N − a) (Searle 1971, Linear Models, ch. 9, exact identity);
 *   ICC: the exact F-based interval (Searle 1971): F = MSB/MSW, F_L = F / F(1−α/2; a−1, a(n−1)),
 *   F_U = F / F(α/2; a−1, a(n−1)), ICC_L = (F_L − 1)/(F_L + n − 1), ICC_U = (F_U − 1)/(F_U + n − 1), clipped to [0, 1].
 * A limit that cannot be found is reported unbounded (variance upper +∞, ICC upper 1, lower 0) with its reason.
 * Cost: O(K p² + p³) per likelihood evaluation, a few thousand evaluations (K distinct cluster sizes), independent of N.
 */
import { chiSquareQuantile, fQuantile, normalQuantile, normalUpperTail } from './distributions';
import { ratioInterval, residualInterval, subjectInterval, zeroStatistic, type ProfileBase } from './profile';
import type { SufficientStats } from './sufficient';
import type { FitMethod, VarianceInterval, VarianceResult } from './types';

/**
 * The intervals on the fit's (scaled) data, mapped to the original scale by multiplying variances by `scale` (s_y²;
 * ratios, the ICC and likelihood differences are unchanged by the scaling).
 * Example: the rails data of Devore (2000), REML, 95% -> residual interval the exact 8.313 to 44.05, ICC interval the
 * exact 0.9051 to 0.9960, between-participant interval the profile one.
 */
export function varianceIntervals(
  st: SufficientStats,
  method: FitMethod,
  gamma: number,
  s2: number,
  logLik: number,
  level: number,
  scale = 1,
): VarianceResult {
  const alpha = 1 - level;
  const zTwo = normalQuantile(1 - alpha / 2);
  const zOne = normalQuantile(1 - alpha);
  const cut = zTwo * zTwo; // χ²₁(level) = z²(1 − α/2), exact identity
  const zeroCut = zOne * zOne; // χ²₁(1 − 2α) = z²(1 − α)
  const base: ProfileBase = { st, method, gamma, sigma2: s2, logLik };
  const statistic = zeroStatistic(base);
  const zeroP = statistic > 0 ? normalUpperTail(Math.sqrt(statistic)) : 1;
  const zeroInside = statistic < zeroCut;
  const nearZero = statistic < cut; // every small positive σ²_u is inside
  const zeroNote = nearZero && !zeroInside ? ZERO_EXCLUDED : null;

  const su = subjectInterval(base, cut, nearZero);
  const subject: VarianceInterval = { lower: scale * su.lower, upper: scale * su.upper, method: 'profile-likelihood', note: joinNotes(zeroNote, su.note) };

  const balanced = st.p === 1 && st.sizes.length === 1 && st.sizes[0]! > 1 && st.nSubjects > 1;
  let residual: VarianceInterval;
  let icc: VarianceInterval;
  if (balanced) {
    const n = st.sizes[0]!;
    const a = st.nSubjects;
    const N = st.nObs;
    const ssb = st.q[0]! / n - (st.xty[0]! * st.xty[0]!) / N;
    const ssw = st.yty - st.q[0]! / n;
    const dfw = N - a;
    residual = { lower: (scale * ssw) / chiSquareQuantile(1 - alpha / 2, dfw), upper: (scale * ssw) / chiSquareQuantile(alpha / 2, dfw), method: 'exact-chi-square', note: null };
    const F = ssb / (a - 1) / (ssw / dfw);
    const fl = F / fQuantile(1 - alpha / 2, a - 1, dfw);
    const fu = F / fQuantile(alpha / 2, a - 1, dfw);
    const clip = (v: number): number => Math.min(1, Math.max(0, v));
    icc = { lower: clip((fl - 1) / (fl + n - 1)), upper: clip((fu - 1) / (fu + n - 1)), method: 'exact-f', note: null };
  } else {
    const re = residualInterval(base, cut);
    residual = { lower: scale * re.lower, upper: scale * re.upper, method: 'profile-likelihood', note: re.note };
    const ra = ratioInterval(base, cut, nearZero);
    const toIcc = (g: number): number => (g === Infinity ? 1 : g / (1 + g));
    icc = { lower: toIcc(ra.lower), upper: toIcc(ra.upper), method: 'profile-likelihood', note: joinNotes(zeroNote, ra.note) };
  }
  return {
    subject: scale * gamma * s2,
    residual: scale * s2,
    icc: gamma / (1 + gamma),
    subjectLower: subject.lower,
    subjectUpper: subject.upper,
    residualLower: residual.lower,
    residualUpper: residual.upper,
    iccLower: icc.lower,
    iccUpper: icc.upper,
    intervalMethod: methodWords(method, level, cut, zeroCut, balanced, [subject.note, residual.note, icc.note]),
    intervals: { subject, residual, icc },
    zeroTest: { statistic, p: zeroP },
  };
}

/** Said with σ²_u and the ICC when zero itself is rejected at the level but every small positive value is not. */
export const ZERO_EXCLUDED =
  'the test of no between-participant variation rejects zero at the chosen level, but the likelihood does not rule out any small positive value, so the lower limit is given as 0 (zero itself excluded)';

/**
 * How the profile ICC interval compares with the exact one where both apply: measured by
 * test/core/model/iccInterval.test.ts on the balanced rail (Devore 2000) and dyestuff (Davies 1947) data. Shown to
 * users, so it names no data set: only what was found.
 */
export const PROFILE_VS_EXACT =
  'on published balanced data with 6 participants, where the exact interval is known, the profile interval lay within 0.03 of the exact F-based interval in each limit (a little lower), so with few participants read it as approximate';

function joinNotes(a: string | null, b: string | null): string | null {
  if (a === null) return b;
  if (b === null) return a;
  return `${a}; ${b}`;
}

const fixed = (x: number): string => x.toFixed(2);

/** The technical record's plain account of how the intervals were computed. */
function methodWords(method: FitMethod, level: number, cut: number, zeroCut: number, balanced: boolean, notes: readonly (string | null)[]): string {
  const lik = method === 'reml' ? 'restricted (REML) likelihood' : 'maximum likelihood (ML)';
  const pct = `${Number((100 * level).toPrecision(6))}%`;
  const parts = [
    `Profile-likelihood intervals from the ${lik}: a limit is the value at which twice the fall in the log-likelihood, ` +
      `with the other variance and the fixed effects at their best values for it, reaches the ${pct} point of the chi-square distribution with 1 degree of freedom (${fixed(cut)}).`,
    `Between-participant variance${balanced ? '' : ' and intraclass correlation (through the ratio of the two variances)'}: the test of no between-participant variation compares the fall in the log-likelihood at zero with a 50:50 mixture of chi-square distributions with 0 and 1 degrees of freedom (Self & Liang 1987); ` +
      `the lower limit is 0 when that test does not reject (twice the fall below ${fixed(zeroCut)}).`,
  ];
  if (balanced) {
    parts.push('The data are balanced one-way data, so the within-participant variance has its exact chi-square interval and the intraclass correlation its exact F-based interval (Searle 1971).');
  } else {
    parts.push(`Within-participant variance: profile-likelihood interval as above. For the intraclass correlation, ${PROFILE_VS_EXACT}.`);
  }
  for (const n of notes) if (n !== null && !parts.some((p) => p.includes(n))) parts.push(`Note: ${n}.`);
  return parts.join(' ');
}
