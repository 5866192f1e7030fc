/**
 * Profile-likelihood confidence intervals for the variance components of the random-intercept model and for the
 * variance ratio γ = σ²_u/σ² (hence the ICC = γ/(1 + γ)), from the same REML or ML likelihood the fit maximised
 * (profile likelihood intervals: Cox & Hinkley 1974, Theoretical Statistics, §9.3; for variance components e.g.
 * Pawitan 2001, In All Likelihood, ch. 17 — chapter from memory).
 *
 * The likelihood in both variances, with the fixed effects profiled out (REML: integrated out), is, from the pieces of
 * likelihood.ts at γ (R = σ² r'V⁻¹r, D = Σ log(1 + n_iγ), A = σ² X'V⁻¹X, m = N − p for REML, N for ML):
 *   ℓ(γ, σ²) = −½ [m log(2πσ²) + D + (log|A| for REML) + R/σ²]  =  ℓ_p(γ) − (m/2)[log(σ²/s²_γ) + s²_γ/σ² − 1],
 * s²_γ = R/m; profilePieces.ts evaluates both without allocating. The three profiles are
 *   ratio:    ℓ_p(γ) itself (σ² maximised out in closed form);
 *   σ²_u = τ: max over σ² of ℓ(τ/σ², σ²) (one-dimensional on log γ: the root of its analytic slope, bracketed);
 *   σ² = s:   max over γ ≥ 0 of ℓ(γ, s) (the same, with the end γ = 0 checked).
 * A limit is where the likelihood-ratio statistic LR(θ) = 2(ℓ̂ − ℓ_prof(θ)) equals the cut-off (χ²₁ at the level,
 * 3.84 at 95%): the search steps outwards from the estimate on log θ in doubling steps until LR passes the cut-off and
 * then Brent's root finder (brentRoot.ts) solves LR(θ) = cut-off inside that bracket to about 1e-13 in log θ. A
 * limit that does not appear within the search range (variances up to 10⁶ times the total variance, the ratio up to
 * 10⁸ times its estimate or 10⁸) is reported as unbounded (+∞ upper, 0 lower) with a plain reason.
 *
 * Cost: evaluations of O(K p² + p³) each — the ratio profile ~25 for both limits, each variance ~150–200 (about
 * 12 outer points × 12 inner evaluations), about 400 per fit (under 1 ms at p = 4). Everything is scale-free: the fit calls it on its centred and scaled data (scaling.ts).
 */
import { brentRoot } from './brentRoot';
import { piecesEvaluator, type PiecesEvaluator } from './profilePieces';
import type { SufficientStats } from './sufficient';
import type { FitMethod } from './types';

/** One profile interval; `note` says in plain words why a limit is unbounded (null when both limits were found). */
export interface ProfileInterval {
  readonly lower: number;
  readonly upper: number;
  readonly note: string | null;
}

/** The fit's maximum: the ratio, the within-participant variance and the maximised (RE)ML log-likelihood. */
export interface ProfileBase {
  readonly st: SufficientStats;
  readonly method: FitMethod;
  readonly gamma: number;
  readonly sigma2: number;
  readonly logLik: number;
}

/** Largest variance searched, as a multiple of the estimated total variance σ̂²_u + σ̂². */
export const VARIANCE_SEARCH_CAP = 1e6;
/** Largest ratio searched, as a multiple of max(1, γ̂). */
export const RATIO_SEARCH_CAP = 1e8;
/** Smallest within-participant variance searched, as a fraction of its estimate. */
const RESIDUAL_SEARCH_FLOOR = 1e-10;
/** Range of log γ for the inner maximisation; beyond it γ counts as 0 (below) or the fit as degenerate (above). */
const RHO_LO = -40;
const RHO_HI = 40;

/** ℓ(γ, σ²) (profilePieces.ts); −∞ where the likelihood cannot be evaluated. */
export function fullLogLik(base: Pick<ProfileBase, 'st' | 'method'>, gamma: number, sigma2: number): number {
  return evaluator(base).full(gamma, sigma2);
}

/** ℓ_p(γ), the log-likelihood with σ² maximised out; −∞ where it cannot be evaluated. */
export function ratioLogLik(base: Pick<ProfileBase, 'st' | 'method'>, gamma: number): number {
  return evaluator(base).ratio(gamma);
}

/** An evaluator (with its own small workspace) for the data set and method. Cost O(p²) to build. */
function evaluator(base: Pick<ProfileBase, 'st' | 'method'>): PiecesEvaluator {
  return piecesEvaluator(base.st, base.method);
}

/**
 * Likelihood-ratio statistic for σ²_u = 0 (equivalently γ = 0): 2(ℓ̂ − ℓ_p(0)), never below 0. Under σ²_u = 0 it
 * follows the 50:50 mixture of χ²₀ and χ²₁ (Self & Liang 1987), so its p-value is ½P(χ²₁ ≥ LR) = Q(√LR) for LR > 0
 * and 1 at LR = 0 (Q the standard normal upper tail).
 */
export function zeroStatistic(base: ProfileBase): number {
  if (!(base.gamma > 0)) return 0;
  return Math.max(0, 2 * (base.logLik - ratioLogLik(base, 0)));
}

/** Profile of the between-participant variance τ: max over σ² of ℓ(τ/σ², σ²); at τ = 0 it is ℓ_p(0). */
export function subjectProfile(base: ProfileBase): (tau: number) => number {
  const ev = evaluator(base);
  let warm = Math.log(Math.max(base.gamma, 1e-8));
  // On ρ = log γ with σ² = τ e^−ρ: d/dρ = γ ∂ℓ/∂γ − σ² ∂ℓ/∂σ².
  let tau = 0;
  const vs = (rho: number, out: Float64Array): void => {
    const g = Math.exp(rho);
    const s2 = tau / g;
    out[0] = ev.fullSlope(g, s2);
    out[1] = g * ev.slope[0]! - s2 * ev.slope[1]!;
  };
  return (t: number): number => {
    if (t === 0) return ev.ratio(0);
    tau = t;
    const guess = Math.log(t / base.sigma2);
    const best = maximiseBySlope(vs, guess, warm, guess - 200, guess + 200);
    warm = best.x;
    return best.fx;
  };
}

/** Profile of the within-participant variance s: max over γ ≥ 0 of ℓ(γ, s). */
export function residualProfile(base: ProfileBase): (s: number) => number {
  // Two starts: the fit's ratio and the previous point's; far from the estimate the likelihood is flat in γ (large
  // γ gives every participant's mean weight 1), so a start left there alone could stop on the plateau.
  const home = base.gamma > 0 ? Math.log(base.gamma) : RHO_LO;
  let warm = home;
  const ev = evaluator(base);
  let s2 = 1;
  const vs = (rho: number, out: Float64Array): void => {
    const g = Math.exp(rho);
    out[0] = ev.fullSlope(g, s2);
    out[1] = g * ev.slope[0]!;
  };
  return (s: number): number => {
    s2 = s;
    const best = maximiseBySlope(vs, home, warm, RHO_LO, RHO_HI);
    warm = best.x;
    if (best.x <= RHO_LO) return Math.max(best.fx, ev.full(0, s));
    return best.fx;
  };
}

/**
 * Maximises a smooth g on [lo, hi] from the better of two starts, using its slope: steps uphill in doubling steps
 * until the slope changes sign (or g cannot be evaluated), then Brent's root finder on the slope inside that bracket
 * (to 1e-10, so g is within ~g''·1e-20 of its maximum). Returns the end when the slope keeps its sign up to it.
 * `vs(x, out)` writes g(x) to out[0] and g'(x) to out[1]. Cost: ~3 evaluations to bracket, ~8 for the root.
 */
function maximiseBySlope(vs: (x: number, out: Float64Array) => void, guess: number, warm: number, lo: number, hi: number): { x: number; fx: number } {
  const out = new Float64Array(2);
  const clamp = (x: number): number => Math.min(hi, Math.max(lo, x));
  let x0 = clamp(guess);
  vs(x0, out);
  let f0 = out[0]!;
  let s0 = out[1]!;
  if (warm !== guess) {
    const xw = clamp(warm);
    vs(xw, out);
    if (out[0]! > f0 || !Number.isFinite(f0)) {
      x0 = xw;
      f0 = out[0]!;
      s0 = out[1]!;
    }
  }
  if (!Number.isFinite(f0) || !Number.isFinite(s0)) return { x: x0, fx: f0 };
  if (s0 === 0) return { x: x0, fx: f0 };
  const dir = s0 > 0 ? 1 : -1;
  // The slope towards the maximum, with −∞ (no likelihood) read as "turn back".
  const slopeAt = (x: number): number => {
    vs(x, out);
    return Number.isFinite(out[0]!) && Number.isFinite(out[1]!) ? out[1]! : -dir * 1e300;
  };
  let prev = x0;
  let sPrev = s0;
  let h = 0.25;
  for (;;) {
    const next = clamp(prev + dir * h);
    const sNext = slopeAt(next);
    if (Math.sign(sNext) !== dir) {
      const root = brentRoot(slopeAt, prev, next, 1e-10, 200, sPrev, sNext);
      const x = root.converged ? root.x : prev;
      vs(x, out);
      return { x, fx: out[0]! };
    }
    if (next === lo || next === hi) return { x: next, fx: out[0]! };
    prev = next;
    sPrev = sNext;
    h *= 2;
  }
}

/**
 * Finds where LR(e^x) = cut crosses, stepping from x0 (where LR < cut) towards `end` in doubling steps, then Brent's
 * root finder inside the bracket. Returns null when LR stays below the cut-off up to `end`.
 */
function crossing(lr: (x: number) => number, cut: number, x0: number, end: number): number | null {
  const dir = end > x0 ? 1 : -1;
  let prev = x0;
  let step = 0.5;
  for (;;) {
    const next = dir > 0 ? Math.min(prev + step, end) : Math.max(prev - step, end);
    const v = lr(next);
    if (v >= cut) {
      const root = brentRoot((x) => lr(x) - cut, prev, next);
      return root.converged ? root.x : null;
    }
    if (next === end) return null;
    prev = next;
    step *= 2;
  }
}

/**
 * Profile interval for a parameter θ ≥ 0 with profile log-likelihood prof(θ) and estimate θ̂, at cut-off `cut`.
 * The lower limit is 0 when `zeroInside` (the caller's test at zero does not reject) or when LR stays below the cut
 * down to θ = 0; the upper limit is +∞ when LR stays below the cut up to `cap`.
 */
function profileInterval(
  prof: (theta: number) => number,
  logLik: number,
  estimate: number,
  cut: number,
  lowerIsZero: boolean,
  floor: number,
  cap: number,
  words: { readonly what: string; readonly capWords: string; readonly floorWords: string; readonly upperGiven: string },
): ProfileInterval {
  const lr = (x: number): number => 2 * (logLik - prof(Math.exp(x)));
  const notes: string[] = [];
  const start = Math.log(estimate > 0 ? estimate : floor);
  let lower = 0;
  if (!lowerIsZero && estimate > 0) {
    const x = crossing(lr, cut, start, Math.log(floor));
    if (x !== null) lower = Math.exp(x);
    else {
      // Between 0 and the floor: solve on the linear scale, where LR(0) is defined.
      const lin = (t: number): number => 2 * (logLik - prof(t)) - cut;
      const r = lin(0) >= 0 ? brentRoot(lin, 0, floor, floor * 1e-13) : null;
      if (r !== null && r.converged) lower = r.x;
      else notes.push(`the data do not bound the ${words.what} away from zero (${words.floorWords}), so its lower limit is given as 0`);
    }
  }
  const x = crossing(lr, cut, start, Math.log(cap));
  let upper = Infinity;
  if (x !== null) upper = Math.exp(x);
  else notes.push(`the data do not bound the ${words.what} from above: the likelihood falls by less than the cut-off even at ${words.capWords}, so its upper limit is ${words.upperGiven}`);
  return { lower, upper, note: notes.length === 0 ? null : notes.join('; ') };
}

/**
 * The profile interval of γ (cut-off `cut`, e.g. χ²₁(0.95) = 3.8415); lower limit 0 when `lowerIsZero`.
 * Example: balanced data where the ratio is well determined -> { lower: 0 < γ_L < γ̂, upper: γ̂ < γ_U < ∞, note: null }.
 */
export function ratioInterval(base: ProfileBase, cut: number, lowerIsZero: boolean): ProfileInterval {
  const ev = evaluator(base);
  return profileInterval((g) => ev.ratio(g), base.logLik, base.gamma, cut, lowerIsZero, 1e-12 * Math.max(1, base.gamma), RATIO_SEARCH_CAP * Math.max(1, base.gamma), {
    what: 'intraclass correlation',
    capWords: `a ratio of the two variances ${RATIO_SEARCH_CAP.toExponential(0)} times its estimate`,
    floorWords: 'down to a ratio of the two variances of 1e-12',
    upperGiven: 'given as 1',
  });
}

/** The profile interval of σ²_u; lower limit 0 when `lowerIsZero`. */
export function subjectInterval(base: ProfileBase, cut: number, lowerIsZero: boolean): ProfileInterval {
  const total = base.gamma * base.sigma2 + base.sigma2;
  return profileInterval(subjectProfile(base), base.logLik, base.gamma * base.sigma2, cut, lowerIsZero, 1e-12 * total, VARIANCE_SEARCH_CAP * total, {
    what: 'between-participant variance',
    capWords: `${VARIANCE_SEARCH_CAP.toExponential(0)} times the total variance`,
    floorWords: 'down to 1e-12 of the total variance',
    upperGiven: 'unbounded',
  });
}

/** The profile interval of σ². */
export function residualInterval(base: ProfileBase, cut: number): ProfileInterval {
  const total = base.gamma * base.sigma2 + base.sigma2;
  return profileInterval(residualProfile(base), base.logLik, base.sigma2, cut, false, RESIDUAL_SEARCH_FLOOR * base.sigma2, VARIANCE_SEARCH_CAP * total, {
    what: 'within-participant variance',
    capWords: `${VARIANCE_SEARCH_CAP.toExponential(0)} times the total variance`,
    floorWords: `down to ${RESIDUAL_SEARCH_FLOOR.toExponential(0)} of its estimate`,
    upperGiven: 'unbounded',
  });
}
