/**
 * One participant's marginal log-likelihood in the random-intercept logistic model,
 * L_i = ∫ Π_j p(y_ij | η_ij + σz) φ(z) dz, by adaptive Gauss–Hermite quadrature (Liu & Pierce 1994; Pinheiro & Bates
 * 1995): the integrand h(z) = Σ_j log p(y_ij | η_ij + σz) − z²/2 is centred at its mode m and scaled by
 * τ = (−h''(m))^{−1/2}, so L_i ≈ √2 τ Σ_k w_k e^{x_k²} e^{h(m + √2 τ x_k)} / √(2π). One node is the Laplace
 * approximation τ e^{h(m)}. Cost O(n_i · (Newton steps + nodes)).
 */
import type { HermiteRule } from './hermite';

/** log p(y | η) for y ∈ {0, 1}, without overflow: −log(1 + e^{−η}) for y = 1, −log(1 + e^{η}) for y = 0. */
export function logBernoulli(y: number, eta: number): number {
  return -softplus(y === 1 ? -eta : eta);
}

/** log(1 + e^x) without overflow or loss of digits. Example: softplus(0) = log 2. */
export function softplus(x: number): number {
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

/** 1 / (1 + e^{−x}). */
export function expit(x: number): number {
  return x >= 0 ? 1 / (1 + Math.exp(-x)) : Math.exp(x) / (1 + Math.exp(x));
}

/** h(z) = Σ_j log p(y_j | η_j + σz) − z²/2 over rows idx[lo..hi). */
function h(z: number, eta: Float64Array, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number): number {
  let s = -0.5 * z * z;
  const shift = sigma * z;
  for (let t = lo; t < hi; t++) {
    const r = idx[t]!;
    s += logBernoulli(y[r]!, eta[r]! + shift);
  }
  return s;
}

export interface ModeResult {
  readonly mode: number;
  /** τ = (−h''(m))^{−1/2}. */
  readonly tau: number;
}

/**
 * The mode of h by Newton's method from `start` (h is strictly concave: h'' = −σ² Σ π(1 − π) − 1 < 0), halving a step
 * that lowers h by more than rounding can (`roundingSlack`). Converges to |step| < 1e-12.
 */
export function findMode(eta: Float64Array, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, start: number): ModeResult {
  let z = start;
  let hz = h(z, eta, y, idx, lo, hi, sigma);
  let curv = 1;
  for (let it = 0; it < 100; it++) {
    let g = -z;
    curv = 1;
    const shift = sigma * z;
    for (let t = lo; t < hi; t++) {
      const r = idx[t]!;
      const pr = expit(eta[r]! + shift);
      g += sigma * (y[r]! - pr);
      curv += sigma * sigma * pr * (1 - pr);
    }
    let step = g / curv;
    if (!(Math.abs(step) > 1e-12 * (1 + Math.abs(z)))) break;
    let next = z + step;
    let hn = h(next, eta, y, idx, lo, hi, sigma);
    let halvings = 0;
    const slack = roundingSlack(hi - lo, hz);
    while (!(hn >= hz - slack) && halvings < 60) {
      step /= 2;
      next = z + step;
      hn = h(next, eta, y, idx, lo, hi, sigma);
      halvings++;
    }
    if (halvings === 60) break;
    z = next;
    hz = hn;
  }
  // Curvature at the final z.
  curv = 1;
  const shift = sigma * z;
  for (let t = lo; t < hi; t++) {
    const pr = expit(eta[idx[t]!]! + shift);
    curv += sigma * sigma * pr * (1 - pr);
  }
  return { mode: z, tau: 1 / Math.sqrt(curv) };
}

/**
 * How far h may seem to fall through rounding alone: h is a sum of n + 1 terms that are all ≤ 0, so each evaluation is
 * within about (n + 1) ε |h| of the exact value. Near the mode a Newton step changes h by ~ h''·step²/2, far below
 * that, so comparing without this slack rejected good steps at random and halved them to nothing (up to 60 halvings,
 * then the same step again, for up to 100 iterations), leaving the mode short of its 1e-12 tolerance.
 */
export function roundingSlack(n: number, hz: number): number {
  return 4 * Number.EPSILON * (n + 2) * (1 + Math.abs(hz));
}

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/**
 * log L_i by adaptive Gauss–Hermite quadrature with the given rule, centred at `m` with scale `tau` (from findMode).
 * Example: no rows and σ = 0 -> log 1 = 0 for any rule (the rule integrates φ exactly).
 */
export function participantLogLik(eta: Float64Array, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, rule: HermiteRule, m: number, tau: number): number {
  const K = rule.nodes.length;
  const terms = new Float64Array(K);
  let top = -Infinity;
  for (let k = 0; k < K; k++) {
    const x = rule.nodes[k]!;
    const v = Math.log(rule.weights[k]!) + x * x + h(m + Math.SQRT2 * tau * x, eta, y, idx, lo, hi, sigma);
    terms[k] = v;
    if (v > top) top = v;
  }
  let s = 0;
  for (let k = 0; k < K; k++) s += Math.exp(terms[k]! - top);
  return top + Math.log(s) + Math.log(Math.SQRT2 * tau) - LOG_SQRT_2PI;
}
