/**
 * The estimating equations of the GEE with an exchangeable working correlation (Liang & Zeger 1986), solved by
 * alternating: β from generalised least squares at the current correlation α, then α and the scale φ from moment
 * estimates of the residuals at β. Everything runs on the pooled sums of clusters.ts, O(sizes · p²) per step.
 * For the identity link and constant variance the β step is exact, so the alternation is a fixed-point iteration.
 */
import { cholesky, cholSolve } from '../dense';
import type { ClusterSums } from './clusters';

/** Sherman–Morrison weight of a cluster of size n: (I + γJ)⁻¹ = I − wJ with γ = α/(1 − α), w = α/(1 + (n − 1)α). */
export function exchangeableWeight(alpha: number, n: number): number {
  return alpha / (1 + (n - 1) * alpha);
}

/**
 * Ã(α) = Σ_i X_i'(I − w_i J)X_i = (1 − α) Σ_i X_i'R_i⁻¹X_i and b̃ = Σ_i X_i'(I − w_i J)y_i from the pooled sums.
 * Example: one cluster y = [1, 3], intercept only, α = 0.5 -> w = 1/3, Ã = 2 − 4/3 = 2/3, b̃ = 4 − 8/3 = 4/3.
 */
export function weightedSums(cs: ClusterSums, alpha: number): { a: Float64Array; b: Float64Array } {
  const p = cs.p;
  const a = Float64Array.from(cs.xtx);
  const b = Float64Array.from(cs.xty);
  if (alpha !== 0) {
    for (let k = 0; k < cs.sizes.length; k++) {
      const w = exchangeableWeight(alpha, cs.sizes[k]!);
      for (let i = 0; i < p * p; i++) a[i] = a[i]! - w * cs.S[k * p * p + i]!;
      for (let i = 0; i < p; i++) b[i] = b[i]! - w * cs.c[k * p + i]!;
    }
  }
  return { a, b };
}

/** β(α) by generalised least squares, or null when Ã(α) is not positive definite. Cost O(sizes · p² + p³). */
export function glsBeta(cs: ClusterSums, alpha: number): Float64Array | null {
  const { a, b } = weightedSums(cs, alpha);
  const l = cholesky(a, cs.p);
  return l === null ? null : cholSolve(l, cs.p, b);
}

export interface Moments {
  /** φ = Σ r² / (N − p). */
  readonly scale: number;
  /** α = Σ_i Σ_{j<k} r_ij r_ik / (φ · (pairs − p)) (Liang & Zeger 1986, with the p degrees-of-freedom correction). */
  readonly alpha: number;
  readonly pairs: number;
}

/**
 * Moment estimates at β from the pooled sums: Σ r² = y'y − 2β'X'y + β'X'Xβ and Σ_i (1'r_i)² = Σ_k (q_k − 2β'c_k + β'S_kβ),
 * so the sum over pairs is (Σ_i (1'r_i)² − Σ r²)/2. The rows must be centred (the caller does it) so these
 * differences keep their digits. Example: one cluster r = [1, −1, 2] (β = 0) -> Σr² = 6, pairs 3, pair sum (4 − 6)/2 = −1.
 */
export function moments(cs: ClusterSums, beta: Float64Array): Moments {
  const p = cs.p;
  const rss = cs.yty - 2 * dot(beta, cs.xty, p) + quad(beta, cs.xtx, 0, p);
  let clusterSq = 0;
  let pairs = 0;
  for (let k = 0; k < cs.sizes.length; k++) {
    const n = cs.sizes[k]!;
    pairs += (cs.count[k]! * n * (n - 1)) / 2;
    clusterSq += cs.q[k]! - 2 * dot(beta, cs.c.subarray(k * p, (k + 1) * p), p) + quad(beta, cs.S, k * p * p, p);
  }
  const scale = rss / (cs.nObs - p);
  const pairSum = (clusterSq - rss) / 2;
  return { scale, alpha: pairSum / scale / (pairs - p), pairs };
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>, p: number): number {
  let s = 0;
  for (let i = 0; i < p; i++) s += a[i]! * b[i]!;
  return s;
}

function quad(x: Float64Array, m: Float64Array, off: number, p: number): number {
  let s = 0;
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) s += x[i]! * m[off + i * p + j]! * x[j]!;
  return s;
}

export interface Solution {
  readonly beta: Float64Array;
  readonly alpha: number;
  readonly scale: number;
  readonly iterations: number;
  readonly converged: boolean;
  readonly message: string;
}

/** Relative change of β and absolute change of α below which the alternation has settled (near rounding). */
const STEP_TOL = 1e-11;

/**
 * Alternates β and α from the least-squares start (α = 0) until both settle. α must stay inside
 * (−1/(n_max − 1), 1), where the working correlation is positive definite; otherwise the result says so.
 * Example: for 'independence' it returns the least-squares β after one step.
 */
export function solveExchangeable(cs: ClusterSums, independence: boolean, maxIterations: number): Solution | null {
  let beta = glsBeta(cs, 0);
  if (beta === null) return null;
  if (independence) return { beta, alpha: 0, scale: moments(cs, beta).scale, iterations: 1, converged: true, message: 'Independence working correlation: least squares.' };
  const nMax = cs.sizes[cs.sizes.length - 1] ?? 1;
  const lowest = nMax > 1 ? -1 / (nMax - 1) : -Infinity;
  let m = moments(cs, beta);
  if (!(m.pairs > cs.p)) {
    return { beta, alpha: 0, scale: m.scale, iterations: 1, converged: false, message: `Too few pairs of values within participants (${m.pairs}) to estimate a within-participant correlation.` };
  }
  for (let it = 1; it <= maxIterations; it++) {
    if (!(m.alpha > lowest && m.alpha < 1)) {
      return { beta, alpha: m.alpha, scale: m.scale, iterations: it, converged: false, message: `The estimated within-participant correlation ${m.alpha.toPrecision(4)} is outside the range the working correlation allows.` };
    }
    const next = glsBeta(cs, m.alpha);
    if (next === null) return null;
    const nm = moments(cs, next);
    let size = 0;
    let step = 0;
    for (let j = 0; j < cs.p; j++) {
      size = Math.max(size, Math.abs(next[j]!));
      step = Math.max(step, Math.abs(next[j]! - beta[j]!));
    }
    const settled = step <= STEP_TOL * (1 + size) && Math.abs(nm.alpha - m.alpha) <= STEP_TOL;
    beta = next;
    m = nm;
    if (settled) return { beta, alpha: m.alpha, scale: m.scale, iterations: it, converged: true, message: `Converged in ${it} steps.` };
  }
  return { beta, alpha: m.alpha, scale: m.scale, iterations: maxIterations, converged: false, message: `The estimates had not settled after ${maxIterations} steps.` };
}
