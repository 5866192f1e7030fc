/**
 * The profiled REML and ML log-likelihoods of the random intercept and slope model and their gradient, as functions
 * of D = G/σ² (2 × 2, positive semi-definite), from the per-participant sums (sums.ts); no n × n matrix.
 *
 * With H_i = V_i/σ² = I + Z_i D Z_i', C_i = Z_i'Z_i, F_i = (I + C_i D)⁻¹ and M_i = D F_i (symmetric):
 *   H_i⁻¹ = I − Z_i M_i Z_i',  log|H_i| = log det(I + C_i D),  Z_i'H_i⁻¹ = F_i Z_i'  (valid for singular D too),
 *   A = X'H⁻¹X = X'X − Σ B_i'M_iB_i,  b = X'y − Σ B_i'M_i r_i,  c = y'y − Σ r_i'M_i r_i   (r_i = Z_i'y_i),
 *   β̂ = A⁻¹b,  R = c − b'β̂,  L = Σ log det(I + C_i D);
 *   ML:   ℓ = −½ [N log 2π + N log(R/N) + L + N],                    σ̂² = R/N
 *   REML: ℓ = −½ [(N−p)(log 2π + log(R/(N−p)) + 1) + L + log|A|],    σ̂² = R/(N−p)
 * (Harville 1977; the REML form without log|X'X|, as the random-intercept model, likelihood.ts).
 * Gradient in D_k (k = 11, 12, 22; E_k the symmetric unit matrices, tr(E_12 S) = 2 S_12), with
 * v_i = F_i(r_i − B_iβ̂), K_i = Z_i'H_i⁻¹Z_i = F_iC_i, Q_i = F_iB_i A⁻¹ B_i'F_i':
 *   dR/dD_k = −Σ v_i'E_k v_i,  dL/dD_k = Σ tr(E_k K_i),  d log|A|/dD_k = −Σ tr(E_k Q_i)
 *   ML: dℓ/dD_k = −½ [N dR_k/R + dL_k];  REML: −½ [(N−p) dR_k/R + dL_k − Σ tr(E_k Q_i)].
 * Cost O(participants) per evaluation in the grouped layout, O(participants · p²) otherwise, plus O(p³).
 */
import { cholesky, cholInverse, cholLogDet, cholSolve } from '../dense';
import type { FitMethod } from '../types';
import { bilinearB, SandwichSum, timesBeta, VectorSum } from './pieces';
import type { SlopeSums } from './sums';

/** D as (d11, d12, d22). */
export type RelativeG = readonly [number, number, number];

export interface SlopeProfile {
  readonly logLik: number;
  /** dℓ/d(d11, d12, d22); present when asked for. */
  readonly gradient: readonly [number, number, number] | null;
  readonly beta: Float64Array;
  readonly sigma2: number;
  /** A⁻¹ (so Φ = σ̂² A⁻¹). */
  readonly aInv: Float64Array;
}

const LOG_2PI = Math.log(2 * Math.PI);

/** F = (I + C D)⁻¹ and its determinant's inverse, for C = [[n, t], [t, tt]]. Writes [f00, f01, f10, f11] into out; returns det(I + CD). */
export function inverseOfIPlusCD(n: number, t: number, tt: number, d11: number, d12: number, d22: number, out: Float64Array): number {
  const m00 = 1 + n * d11 + t * d12;
  const m01 = n * d12 + t * d22;
  const m10 = t * d11 + tt * d12;
  const m11 = 1 + t * d12 + tt * d22;
  const det = m00 * m11 - m01 * m10;
  out[0] = m11 / det;
  out[1] = -m01 / det;
  out[2] = -m10 / det;
  out[3] = m00 / det;
  return det;
}

/**
 * Evaluates the profiled log-likelihood at D (and its gradient when `gradient` is true). Null when A is not positive
 * definite or R is not positive (no within-participant variation left). Never mutates the sums.
 * Example: with D = [[γ, 0], [0, 0]] it equals the random-intercept model's profileAt(γ) (checked in the tests).
 */
export function slopeProfile(s: SlopeSums, D: RelativeG, method: FitMethod, gradient: boolean): SlopeProfile | null {
  const [d11, d12, d22] = D;
  const p = s.p;
  const N = s.nObs;
  const nP = s.nP;
  const f = new Float64Array(4);
  const sand = new SandwichSum(s);
  const vec = new VectorSum(s);
  let rMr = 0;
  let logDetH = 0;
  for (let i = 0; i < nP; i++) {
    const n = s.n[i]!;
    const t = s.st[i]!;
    const tt = s.stt[i]!;
    const det = inverseOfIPlusCD(n, t, tt, d11, d12, d22, f);
    logDetH += Math.log(det);
    // M = D F, symmetric in exact arithmetic; its off-diagonal is averaged.
    const m00 = d11 * f[0]! + d12 * f[2]!;
    const m01 = 0.5 * (d11 * f[1]! + d12 * f[3]! + d12 * f[0]! + d22 * f[2]!);
    const m11 = d12 * f[1]! + d22 * f[3]!;
    const r0 = s.sy[i]!;
    const r1 = s.sty[i]!;
    const mr0 = m00 * r0 + m01 * r1;
    const mr1 = m01 * r0 + m11 * r1;
    rMr += r0 * mr0 + r1 * mr1;
    sand.add(i, m00, m01, m01, m11);
    vec.add(i, mr0, mr1);
  }
  const BMB = sand.result();
  const BMr = vec.result();
  const A = new Float64Array(p * p);
  const b = new Float64Array(p);
  for (let k = 0; k < p * p; k++) A[k] = s.xtx[k]! - BMB[k]!;
  for (let j = 0; j < p; j++) b[j] = s.xty[j]! - BMr[j]!;
  const c = s.yty - rMr;
  const l = cholesky(A, p);
  if (l === null) return null;
  const beta = cholSolve(l, p, b);
  let R = c;
  for (let j = 0; j < p; j++) R -= b[j]! * beta[j]!;
  if (!(R > 0) || !Number.isFinite(logDetH)) return null;
  const aInv = cholInverse(l, p);
  const nu = method === 'reml' ? N - p : N;
  const logLik =
    method === 'ml'
      ? -0.5 * (N * LOG_2PI + N * Math.log(R / N) + logDetH + N)
      : -0.5 * (nu * (LOG_2PI + Math.log(R / nu) + 1) + logDetH + cholLogDet(l, p));
  if (!gradient) return { logLik, gradient: null, beta, sigma2: R / nu, aInv };

  const bBeta = timesBeta(s, beta);
  const bAb = method === 'reml' ? bilinearB(s, aInv) : null;
  const bb = new Float64Array(2);
  const h = new Float64Array(4);
  let sv0 = 0;
  let sv1 = 0;
  let sv2 = 0;
  let sk0 = 0;
  let sk1 = 0;
  let sk2 = 0;
  let sq0 = 0;
  let sq1 = 0;
  let sq2 = 0;
  for (let i = 0; i < nP; i++) {
    const n = s.n[i]!;
    const t = s.st[i]!;
    const tt = s.stt[i]!;
    inverseOfIPlusCD(n, t, tt, d11, d12, d22, f);
    const f00 = f[0]!;
    const f01 = f[1]!;
    const f10 = f[2]!;
    const f11 = f[3]!;
    bBeta(i, bb);
    const e0 = s.sy[i]! - bb[0]!;
    const e1 = s.sty[i]! - bb[1]!;
    const v0 = f00 * e0 + f01 * e1;
    const v1 = f10 * e0 + f11 * e1;
    sv0 += v0 * v0;
    sv1 += 2 * v0 * v1;
    sv2 += v1 * v1;
    // K = F C.
    sk0 += f00 * n + f01 * t;
    sk1 += f00 * t + f01 * tt + f10 * n + f11 * t; // 2 K_01 as K_01 + K_10 (K symmetric)
    sk2 += f10 * t + f11 * tt;
    if (bAb !== null) {
      // Q = F (B A⁻¹ B') F'.
      bAb(i, h);
      const a00 = f00 * h[0]! + f01 * h[2]!;
      const a01 = f00 * h[1]! + f01 * h[3]!;
      const a10 = f10 * h[0]! + f11 * h[2]!;
      const a11 = f10 * h[1]! + f11 * h[3]!;
      sq0 += a00 * f00 + a01 * f01;
      sq1 += a00 * f10 + a01 * f11 + a10 * f00 + a11 * f01;
      sq2 += a10 * f10 + a11 * f11;
    }
  }
  const g = (sv: number, sk: number, sq: number): number => -0.5 * ((nu * -sv) / R + sk - sq);
  return { logLik, gradient: [g(sv0, sk0, sq0), g(sv1, sk1, sq1), g(sv2, sk2, sq2)], beta, sigma2: R / nu, aInv };
}
