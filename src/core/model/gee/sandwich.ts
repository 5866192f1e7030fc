/**
 * The covariances of the GEE estimate: the robust sandwich (Liang & Zeger 1986), the model-based one, and the
 * bias-corrected sandwich of Mancl & DeRouen 2001, in one pass over the participants.
 *
 * With R̃_i⁻¹ = I − w_i J (= (1 − α) R_i⁻¹), Ã = Σ X_i'R̃_i⁻¹X_i and u_i = X_i'R̃_i⁻¹r_i, the robust covariance is
 * Ã⁻¹ (Σ u_i u_i') Ã⁻¹ (the factor 1 − α cancels). Mancl & DeRouen replace r_i by (I − H_i)⁻¹ r_i with the cluster
 * leverage H_i = X_i Ã⁻¹ X_i' R̃_i⁻¹ (n_i × n_i). By the Woodbury identity
 * (I − X B X'R⁻¹)⁻¹ = I + X (B⁻¹ − X'R⁻¹X)⁻¹ X'R⁻¹, so X_i'R̃_i⁻¹(I − H_i)⁻¹ r_i = Ã (Ã − M_i)⁻¹ u_i with
 * M_i = X_i'R̃_i⁻¹X_i, and the bias-corrected covariance is Σ_i (Ã − M_i)⁻¹ u_i u_i' (Ã − M_i)⁻¹: p × p work per
 * participant, never an n_i × n_i matrix. Cost O(N p² + participants · p³).
 */
import { cholesky, cholInverse, cholSolve, matMul } from '../dense';
import type { Design } from '../design';
import type { ClusterSums } from './clusters';
import { symmetrise } from './clusters';
import { exchangeableWeight, weightedSums } from './exchangeable';

export interface Covariances {
  readonly robust: Float64Array;
  readonly model: Float64Array;
  /** Null when Ã − M_i is not positive definite for some participant (that participant alone carries a direction). */
  readonly smallSample: Float64Array | null;
}

/**
 * The three covariances at (β, α, φ); y must be the values the sums were built from.
 * Example: independence (α = 0) gives (X'X)⁻¹ Σ X_i'r_i r_i'X_i (X'X)⁻¹, the cluster-robust least-squares covariance.
 */
export function covariances(cs: ClusterSums, design: Design, y: Float64Array, beta: Float64Array, alpha: number, scale: number): Covariances | null {
  const p = cs.p;
  const { a } = weightedSums(cs, alpha);
  const la = cholesky(a, p);
  if (la === null) return null;
  const aInv = cholInverse(la, p);
  const model = aInv.map((v) => v * scale * (1 - alpha));
  const meat = new Float64Array(p * p);
  const md = new Float64Array(p * p);
  let mdOk = true;
  const x = new Float64Array(p);
  const s = new Float64Array(p);
  const xr = new Float64Array(p);
  const xtx = new Float64Array(p * p);
  const u = new Float64Array(p);
  const bmat = new Float64Array(p * p);
  const nG = cs.start.length - 1;
  for (let g = 0; g < nG; g++) {
    const lo = cs.start[g]!;
    const hi = cs.start[g + 1]!;
    if (hi === lo) continue;
    s.fill(0);
    xr.fill(0);
    xtx.fill(0);
    let rsum = 0;
    for (let t = lo; t < hi; t++) {
      const r = cs.order[t]!;
      design.fillRow(r, x);
      let fit = 0;
      for (let i = 0; i < p; i++) fit += x[i]! * beta[i]!;
      const res = y[r]! - fit;
      rsum += res;
      for (let i = 0; i < p; i++) {
        const xi = x[i]!;
        if (xi === 0) continue;
        s[i] = s[i]! + xi;
        xr[i] = xr[i]! + xi * res;
        for (let j = 0; j <= i; j++) xtx[i * p + j] = xtx[i * p + j]! + xi * x[j]!;
      }
    }
    const w = exchangeableWeight(alpha, hi - lo);
    for (let i = 0; i < p; i++) u[i] = xr[i]! - w * s[i]! * rsum;
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) meat[i * p + j] = meat[i * p + j]! + u[i]! * u[j]!;
    if (!mdOk) continue;
    symmetrise(xtx, p);
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) bmat[i * p + j] = a[i * p + j]! - (xtx[i * p + j]! - w * s[i]! * s[j]!);
    const lb = cholesky(bmat, p);
    if (lb === null) {
      mdOk = false;
      continue;
    }
    const v = cholSolve(lb, p, u);
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) md[i * p + j] = md[i * p + j]! + v[i]! * v[j]!;
  }
  const robust = matMul(matMul(aInv, meat, p), aInv, p);
  return { robust, model, smallSample: mdOk ? md : null };
}
