/**
 * One participant's log L_i with its gradient and Hessian in θ = (β, σ), the adaptive nodes held fixed (objective.ts):
 * with v_rk = (x_r, z_k), π_rk = expit(x_r'β + σ z_k), posterior node weights P_k ∝ w_k e^{x_k²} e^{h(z_k)},
 *   g_k = Σ_r (y_r − π_rk) v_rk,   H_k = −Σ_r π_rk (1 − π_rk) v_rk v_rk',
 *   ∇ log L_i = Σ_k P_k g_k = ḡ,   ∇² log L_i = Σ_k P_k (H_k + g_k g_k') − ḡ ḡ'.
 * Σ_k P_k H_k is summed rows-outer: with W_r = Σ_k P_k π_rk(1 − π_rk) (and the z_k, z_k² weighted sums) its β block
 * is −Σ_r W_r x_r x_r', so a participant costs O(n K p + n p² + K q²) instead of O(n K q²). Same sums, reordered.
 */
import { hAndProbabilities, type RowExp } from './kernel';

/** Scratch for one objective: K nodes, at most maxRows rows per participant, q = p + 1. */
export interface DerivativeScratch {
  readonly pr: Float64Array;
  readonly logw: Float64Array;
  readonly post: Float64Array;
  readonly zs: Float64Array;
  readonly gk: Float64Array;
  readonly gi: Float64Array;
}

export function derivativeScratch(K: number, maxRows: number, q: number): DerivativeScratch {
  return { pr: new Float64Array(K * maxRows), logw: new Float64Array(K), post: new Float64Array(K), zs: new Float64Array(K), gk: new Float64Array(K * q), gi: new Float64Array(q) };
}

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/**
 * Adds c × (∇ log L_i, ∇² log L_i, lower triangle) of participant rows idx[lo..hi) into grad and hess and returns
 * log L_i. `nodes`/`consts` the rule's nodes and log w_k + x_k²; m, τ the adaptive centre and scale.
 */
export function addParticipantDerivatives(rows: RowExp, x: Float64Array, p: number, y: Float64Array, idx: Int32Array, lo: number, hi: number, sigma: number, nodes: Float64Array, consts: Float64Array, m: number, tau: number, c: number, grad: Float64Array, hess: Float64Array, w: DerivativeScratch): number {
  const K = nodes.length;
  const q = p + 1;
  const n = hi - lo;
  const { pr, logw, post, zs, gk, gi } = w;
  let top = -Infinity;
  for (let k = 0; k < K; k++) {
    const z = m + Math.SQRT2 * tau * nodes[k]!;
    zs[k] = z;
    const f = consts[k]! + hAndProbabilities(rows, y, idx, lo, hi, sigma, z, pr, k * n);
    logw[k] = f;
    if (f > top) top = f;
    // g_k: Σ_r (y_r − π_rk) x_r, and z_k Σ_r (y_r − π_rk).
    for (let a = 0; a < q; a++) gk[k * q + a] = 0;
    let rs = 0;
    for (let t = lo; t < hi; t++) {
      const r = idx[t]!;
      const resid = y[r]! - pr[k * n + t - lo]!;
      rs += resid;
      for (let a = 0; a < p; a++) gk[k * q + a] = gk[k * q + a]! + resid * x[r * p + a]!;
    }
    gk[k * q + p] = rs * z;
  }
  let s = 0;
  for (let k = 0; k < K; k++) {
    post[k] = Math.exp(logw[k]! - top);
    s += post[k]!;
  }
  const logLik = top + Math.log(s) + Math.log(Math.SQRT2 * tau) - LOG_SQRT_2PI;
  gi.fill(0);
  for (let k = 0; k < K; k++) {
    post[k] = post[k]! / s;
    for (let a = 0; a < q; a++) gi[a] = gi[a]! + post[k]! * gk[k * q + a]!;
  }
  for (let a = 0; a < q; a++) grad[a] = grad[a]! + c * gi[a]!;
  // Σ_k P_k H_k, rows outer.
  let wzzAll = 0;
  for (let t = lo; t < hi; t++) {
    const r = idx[t]!;
    let wr = 0;
    let wz = 0;
    for (let k = 0; k < K; k++) {
      const pk = pr[k * n + t - lo]!;
      const v = post[k]! * pk * (1 - pk);
      wr += v;
      wz += v * zs[k]!;
      wzzAll += v * zs[k]! * zs[k]!;
    }
    for (let a = 0; a < p; a++) {
      const xa = x[r * p + a]!;
      if (xa === 0) continue;
      for (let b = 0; b <= a; b++) hess[a * q + b] = hess[a * q + b]! - c * wr * xa * x[r * p + b]!;
      hess[p * q + a] = hess[p * q + a]! - c * wz * xa;
    }
  }
  hess[p * q + p] = hess[p * q + p]! - c * wzzAll;
  // Σ_k P_k g_k g_k' − ḡ ḡ'.
  for (let a = 0; a < q; a++) {
    for (let b = 0; b <= a; b++) {
      let v = 0;
      for (let k = 0; k < K; k++) v += post[k]! * gk[k * q + a]! * gk[k * q + b]!;
      hess[a * q + b] = hess[a * q + b]! + c * (v - gi[a]! * gi[b]!);
    }
  }
  return logLik;
}
