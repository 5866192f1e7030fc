/**
 * The same quantities as participant.ts (h(z), its mode and scale, log L_i by adaptive Gauss–Hermite quadrature),
 * with fewer calls to exp and log; participant.ts stays as the plain reference these are tested against.
 *
 * With x_r = η_r + σz, log p(y_r | x_r) = −max(∓x_r, 0) − log(1 + e^{−|x_r|}) (minus sign for yes, plus for no), so
 *   h(z) = −z²/2 − Σ_r max(∓x_r, 0) − log Π_r (1 + e^{−|x_r|}):
 * one log per node instead of one log1p per row. And e^{−|x_r|} = e^{−η_r} e^{−σz} (x_r > 0) or e^{η_r} e^{σz}
 * (x_r ≤ 0), with e^{±η_r} computed once per evaluation (`fillRowExp`) and e^{σz} once per node: one exp per node
 * instead of one per row. Rows with |η_r| > SAFE, and nodes with |σz| > SAFE, take e^{−|x|} directly, so no factor
 * overflows or underflows. The product is folded into the log whenever it passes 1e280 (each factor is ≤ 2).
 * Rounding differs from the per-row form by a few units in the last place of each e^{−|x|} (relative), i.e. ≲ 1e-15
 * absolute per row in log L_i.
 */
import type { HermiteRule } from './hermite';
import { roundingSlack } from './participant';

/** Largest |η| or |σz| whose exponential is used as a factor: e^{±300} and their products stay normal doubles. */
const SAFE = 300;
const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** Per-row constants for one evaluation: η, e^{η}, e^{−η} (both 0 when |η| > SAFE: those rows take the direct path). */
export interface RowExp {
  readonly eta: Float64Array;
  readonly up: Float64Array;
  readonly down: Float64Array;
}

/** Fills up/down from eta (in place; allocated once per objective). Cost O(N) exp calls. */
export function fillRowExpInPlace(rows: RowExp): void {
  const { eta, up, down } = rows;
  for (let r = 0; r < eta.length; r++) {
    const e = eta[r]!;
    if (Math.abs(e) <= SAFE) {
      const u = Math.exp(e);
      up[r] = u;
      down[r] = 1 / u;
    } else {
      up[r] = 0;
      down[r] = 0;
    }
  }
}

/**
 * h(z) = Σ_j log p(y_j | η_j + σz) − z²/2 over rows idx[lo..hi). Example: no rows -> −z²/2.
 */
export function hFast(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, z: number): number {
  const { eta, up, down } = rows;
  const s = sigma * z;
  const factored = Math.abs(s) <= SAFE;
  const ps = factored ? Math.exp(s) : 0;
  const qs = factored ? 1 / ps : 0;
  let lin = -0.5 * z * z;
  let prod = 1;
  let logs = 0;
  for (let t = lo; t < hi; t++) {
    const r = idx[t]!;
    const x = eta[r]! + s;
    const u = up[r]!;
    const e = factored && u !== 0 ? (x > 0 ? down[r]! * qs : u * ps) : Math.exp(-Math.abs(x));
    prod *= 1 + e;
    if (y[r] === 1) {
      if (x < 0) lin += x;
    } else if (x > 0) lin -= x;
    if (prod > 1e280) {
      logs += Math.log(prod);
      prod = 1;
    }
  }
  return lin - (logs + Math.log(prod));
}

/**
 * h(z) as `hFast`, and π_r = expit(η_r + σz) of each row written to pr[at + (t − lo)].
 */
export function hAndProbabilities(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, z: number, pr: Float64Array, at: number): number {
  const { eta, up, down } = rows;
  const s = sigma * z;
  const factored = Math.abs(s) <= SAFE;
  const ps = factored ? Math.exp(s) : 0;
  const qs = factored ? 1 / ps : 0;
  let lin = -0.5 * z * z;
  let prod = 1;
  let logs = 0;
  for (let t = lo; t < hi; t++) {
    const r = idx[t]!;
    const x = eta[r]! + s;
    const u = up[r]!;
    const e = factored && u !== 0 ? (x > 0 ? down[r]! * qs : u * ps) : Math.exp(-Math.abs(x));
    prod *= 1 + e;
    pr[at + t - lo] = x >= 0 ? 1 / (1 + e) : e / (1 + e);
    if (y[r] === 1) {
      if (x < 0) lin += x;
    } else if (x > 0) lin -= x;
    if (prod > 1e280) {
      logs += Math.log(prod);
      prod = 1;
    }
  }
  return lin - (logs + Math.log(prod));
}

/**
 * The mode m of h, τ = (−h''(m))^{−1/2} and h(m), written to out[0], out[1], out[2]: the same Newton iteration as `findMode`
 * (participant.ts) from `start`, halving a step that does not increase h, to |step| < 1e-12 (1 + |z|).
 */
export function modeInPlace(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, start: number, out: Float64Array): void {
  let z = start;
  let hz = hFast(rows, y, idx, lo, hi, sigma, z);
  let curv = slopeAndCurvature(rows, y, idx, lo, hi, sigma, z, out);
  let curvAtZ = true;
  for (let it = 0; it < 100; it++) {
    if (!curvAtZ) curv = slopeAndCurvature(rows, y, idx, lo, hi, sigma, z, out);
    curvAtZ = true;
    let step = out[0]! / curv;
    if (!(Math.abs(step) > 1e-12 * (1 + Math.abs(z)))) break;
    let next = z + step;
    let hn = hFast(rows, y, idx, lo, hi, sigma, next);
    let halvings = 0;
    const slack = roundingSlack(hi - lo, hz);
    while (!(hn >= hz - slack) && halvings < 60) {
      step /= 2;
      next = z + step;
      hn = hFast(rows, y, idx, lo, hi, sigma, next);
      halvings++;
    }
    if (halvings === 60) break;
    z = next;
    hz = hn;
    curvAtZ = false;
  }
  if (!curvAtZ) curv = slopeAndCurvature(rows, y, idx, lo, hi, sigma, z, out);
  out[0] = z;
  out[1] = 1 / Math.sqrt(curv);
  out[2] = hz;
}

/** h'(z) into out[0]; returns −h''(z) = 1 + σ² Σ π(1 − π), π = expit(η + σz). */
function slopeAndCurvature(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, z: number, out: Float64Array): number {
  const { eta, up, down } = rows;
  const s = sigma * z;
  const factored = Math.abs(s) <= SAFE;
  const ps = factored ? Math.exp(s) : 0;
  const qs = factored ? 1 / ps : 0;
  let g = -z;
  let curv = 1;
  for (let t = lo; t < hi; t++) {
    const r = idx[t]!;
    const x = eta[r]! + s;
    const u = up[r]!;
    // e = e^{−|x|}; expit(x) = 1/(1 + e) for x ≥ 0, e/(1 + e) below.
    const e = factored && u !== 0 ? (x > 0 ? down[r]! * qs : u * ps) : Math.exp(-Math.abs(x));
    const pr = x >= 0 ? 1 / (1 + e) : e / (1 + e);
    g += sigma * (y[r]! - pr);
    curv += sigma * sigma * pr * (1 - pr);
  }
  out[0] = g;
  return curv;
}

/** log w_k + x_k² per node of a rule (the adaptive rule's node constants). */
export function nodeConstants(rule: HermiteRule): Float64Array {
  return Float64Array.from(rule.nodes, (x, k) => Math.log(rule.weights[k]!) + x * x);
}

/**
 * e^{h(z) − hm} = e^{lin − hm} / Π_r (1 + e^{−|x_r|}) with lin = −z²/2 − Σ_r max(∓x_r, 0), without a log; NaN when
 * the product would need folding (then the caller takes the log path).
 */
function relativeDensity(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, z: number, hm: number): number {
  const { eta, up, down } = rows;
  const s = sigma * z;
  const factored = Math.abs(s) <= SAFE;
  const ps = factored ? Math.exp(s) : 0;
  const qs = factored ? 1 / ps : 0;
  let lin = -0.5 * z * z;
  let prod = 1;
  for (let t = lo; t < hi; t++) {
    const r = idx[t]!;
    const x = eta[r]! + s;
    const u = up[r]!;
    const e = factored && u !== 0 ? (x > 0 ? down[r]! * qs : u * ps) : Math.exp(-Math.abs(x));
    prod *= 1 + e;
    if (y[r] === 1) {
      if (x < 0) lin += x;
    } else if (x > 0) lin -= x;
  }
  return prod > 1e280 ? NaN : Math.exp(lin - hm) / prod;
}

/** w_k e^{x_k²} per node (the adaptive rule's weights for e^{h − h(m)}). */
export function nodeWeights(rule: HermiteRule): Float64Array {
  return Float64Array.from(rule.nodes, (x, k) => rule.weights[k]! * Math.exp(x * x));
}

/**
 * log L_i as `logLikFast`, summing Σ_k w_k e^{x_k²} e^{h(z_k) − h(m)} directly (one exp per node, no log): each term is
 * at most w_k e^{x_k²} since m maximises h. Falls back to `logLikFast` when a term is not finite or the sum is not
 * positive (a mode far from converged, or more than ~900 rows).
 */
export function logLikAtMode(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, nodes: Float64Array, consts: Float64Array, weights: Float64Array, m: number, tau: number, hm: number, terms: Float64Array): number {
  const K = nodes.length;
  const scale = Math.SQRT2 * tau;
  let s = 0;
  for (let k = 0; k < K; k++) s += weights[k]! * relativeDensity(rows, y, idx, lo, hi, sigma, m + scale * nodes[k]!, hm);
  if (s > 0 && s < Infinity) return hm + Math.log(s) + Math.log(scale) - LOG_SQRT_2PI;
  return logLikFast(rows, y, idx, lo, hi, sigma, nodes, consts, m, tau, terms);
}

/**
 * log L_i by adaptive Gauss–Hermite quadrature centred at m with scale τ, as `participantLogLik` (participant.ts);
 * `consts` from nodeConstants(rule), `terms` scratch of the rule's length.
 */
export function logLikFast(rows: RowExp, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, nodes: Float64Array, consts: Float64Array, m: number, tau: number, terms: Float64Array): number {
  const K = nodes.length;
  let top = -Infinity;
  const scale = Math.SQRT2 * tau;
  for (let k = 0; k < K; k++) {
    const v = consts[k]! + hFast(rows, y, idx, lo, hi, sigma, m + scale * nodes[k]!);
    terms[k] = v;
    if (v > top) top = v;
  }
  let s = 0;
  for (let k = 0; k < K; k++) s += Math.exp(terms[k]! - top);
  return top + Math.log(s) + Math.log(scale) - LOG_SQRT_2PI;
}
