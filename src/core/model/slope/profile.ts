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
import { addSandwich, addTransposed, type SlopeSums } from './sums';
import { bilinearB, SandwichSum, timesBeta, VectorSum } from './pieces';

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
  if (s.group !== null) return groupedProfile(s, D, method, gradient);
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

/**
 * The same evaluation for the grouped layout (B_i = C_i E_a), written out with scalars: per participant only the 2 × 2
 * algebra and per-arm sums of C M C and C M r, so an evaluation costs a few dozen operations per participant.
 * Checked against the general route and the dense evaluation in the tests.
 */
function groupedProfile(s: SlopeSums, D: RelativeG, method: FitMethod, gradient: boolean): SlopeProfile | null {
  const [d11, d12, d22] = D;
  const p = s.p;
  const N = s.nObs;
  const nA = s.E.length;
  const cn = s.n;
  const ct = s.st;
  const ctt = s.stt;
  const ry = s.sy;
  const rty = s.sty;
  const cmc = new Float64Array(4 * nA);
  const cmr = new Float64Array(2 * nA);
  const starts = s.armStart!;
  // state: [rMr, Σ log det so far, the running product of determinants not yet logged] (valueBlock).
  // Σ log det(I + C_i D) as the log of running products (one logarithm per few hundred participants instead of one
  // each); det ≥ 1 for positive semi-definite D, a huge one is taken alone, and a non-positive or NaN one makes the sum
  // non-finite as before.
  const state = new Float64Array([0, 0, 1]);
  const armSums = new Float64Array(5);
  for (let a = 0; a < nA; a++) {
    // Arm a's participants are stored together (sums.ts): its totals in armSums (C M C: 00, 01, 11; C M r: 0, 1).
    armSums.fill(0);
    const end = starts[a + 1]!;
    for (let from = starts[a]!; from < end; from += VALUE_BLOCK) {
      valueBlock(state, armSums, cn, ct, ctt, ry, rty, from, Math.min(end, from + VALUE_BLOCK), d11, d12, d22);
    }
    cmc[4 * a] = armSums[0]!;
    cmc[4 * a + 1] = armSums[1]!;
    cmc[4 * a + 3] = armSums[2]!;
    cmr[2 * a] = armSums[3]!;
    cmr[2 * a + 1] = armSums[4]!;
  }
  const rMr = state[0]!;
  let logDetH = state[1]!;
  const detProduct = state[2]!;
  logDetH += Math.log(detProduct);
  const BMB = new Float64Array(p * p);
  const BMr = new Float64Array(p);
  for (let a = 0; a < nA; a++) {
    addSandwich(BMB, s.E[a]!, cmc[4 * a]!, cmc[4 * a + 1]!, cmc[4 * a + 1]!, cmc[4 * a + 3]!, p);
    addTransposed(BMr, s.E[a]!, cmr[2 * a]!, cmr[2 * a + 1]!, p);
  }
  const A = new Float64Array(p * p);
  const b = new Float64Array(p);
  for (let k = 0; k < p * p; k++) A[k] = s.xtx[k]! - BMB[k]!;
  for (let j = 0; j < p; j++) b[j] = s.xty[j]! - BMr[j]!;
  const l = cholesky(A, p);
  if (l === null) return null;
  const beta = cholSolve(l, p, b);
  let R = s.yty - rMr;
  for (let j = 0; j < p; j++) R -= b[j]! * beta[j]!;
  if (!(R > 0) || !Number.isFinite(logDetH)) return null;
  const aInv = cholInverse(l, p);
  const nu = method === 'reml' ? N - p : N;
  const logLik =
    method === 'ml'
      ? -0.5 * (N * LOG_2PI + N * Math.log(R / N) + logDetH + N)
      : -0.5 * (nu * (LOG_2PI + Math.log(R / nu) + 1) + logDetH + cholLogDet(l, p));
  if (!gradient) return { logLik, gradient: null, beta, sigma2: R / nu, aInv };

  // Per arm: E_a β (2) and E_a A⁻¹ E_a' (2 × 2).
  const eb = new Float64Array(2 * nA);
  const eh = new Float64Array(4 * nA);
  for (let a = 0; a < nA; a++) {
    const E = s.E[a]!;
    for (let j = 0; j < p; j++) {
      eb[2 * a] = eb[2 * a]! + E[j]! * beta[j]!;
      eb[2 * a + 1] = eb[2 * a + 1]! + E[p + j]! * beta[j]!;
    }
    for (let r = 0; r < 2; r++) {
      for (let c = 0; c < 2; c++) {
        let v = 0;
        for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) v += E[r * p + j]! * aInv[j * p + k]! * E[c * p + k]!;
        eh[4 * a + 2 * r + c] = v;
      }
    }
  }
  const reml = method === 'reml';
  let sv0 = 0;
  let sv1 = 0;
  let sv2 = 0;
  let sk0 = 0;
  let sk1 = 0;
  let sk2 = 0;
  let sq0 = 0;
  let sq1 = 0;
  let sq2 = 0;
  for (let a = 0; a < nA; a++) {
    const e0b = eb[2 * a]!;
    const e1b = eb[2 * a + 1]!;
    const h00 = eh[4 * a]!;
    const h01 = eh[4 * a + 1]!;
    const h10 = eh[4 * a + 2]!;
    const h11 = eh[4 * a + 3]!;
    const end = starts[a + 1]!;
    for (let i = starts[a]!; i < end; i++) {
      const n = cn[i]!;
      const t = ct[i]!;
      const tt = ctt[i]!;
      const m00 = 1 + n * d11 + t * d12;
      const m01 = n * d12 + t * d22;
      const m10 = t * d11 + tt * d12;
      const m11 = 1 + t * d12 + tt * d22;
      const inv = 1 / (m00 * m11 - m01 * m10);
      const f00 = m11 * inv;
      const f01 = -m01 * inv;
      const f10 = -m10 * inv;
      const f11 = m00 * inv;
      const e0 = ry[i]! - (n * e0b + t * e1b);
      const e1 = rty[i]! - (t * e0b + tt * e1b);
      const v0 = f00 * e0 + f01 * e1;
      const v1 = f10 * e0 + f11 * e1;
      sv0 += v0 * v0;
      sv1 += 2 * v0 * v1;
      sv2 += v1 * v1;
      // K = F C.
      const k00 = f00 * n + f01 * t;
      const k01 = f00 * t + f01 * tt;
      const k10 = f10 * n + f11 * t;
      const k11 = f10 * t + f11 * tt;
      sk0 += k00;
      sk1 += k01 + k10;
      sk2 += k11;
      if (reml) {
        // Q = K H K' with H = E_a A⁻¹ E_a' (F B = F C E_a = K E_a).
        const a00 = k00 * h00 + k01 * h10;
        const a01 = k00 * h01 + k01 * h11;
        const a10 = k10 * h00 + k11 * h10;
        const a11 = k10 * h01 + k11 * h11;
        sq0 += a00 * k00 + a01 * k01;
        sq1 += a00 * k10 + a01 * k11 + a10 * k00 + a11 * k01;
        sq2 += a10 * k10 + a11 * k11;
      }
    }
  }
  const gr = (sv: number, sk: number, sq: number): number => -0.5 * ((nu * -sv) / R + sk - sq);
  return { logLik, gradient: [gr(sv0, sk0, sq0), gr(sv1, sk1, sq1), gr(sv2, sk2, sq2)], beta, sigma2: R / nu, aInv };
}

/** Participants per call of valueBlock (see curvature.ts: small calls are optimised early in a process's first fit). */
const VALUE_BLOCK = 4096;

/** The value pass of groupedProfile over participants [from, to) of one arm: adds r'Mr to state[0], log-determinants
 * to state[1] through the running product state[2], and C M C, C M r to the arm's sums (00, 01, 11, 0, 1). */
function valueBlock(
  state: Float64Array, armSums: Float64Array,
  cn: Float64Array, ct: Float64Array, ctt: Float64Array, ry: Float64Array, rty: Float64Array,
  from: number, to: number, d11: number, d12: number, d22: number,
): void {
  let rMr = 0;
  let logDetH = state[1]!;
  let detProduct = state[2]!;
  let c00 = 0;
  let c01 = 0;
  let c11 = 0;
  let q0 = 0;
  let q1 = 0;
  for (let i = from; i < to; i++) {
    const n = cn[i]!;
    const t = ct[i]!;
    const tt = ctt[i]!;
    const m00 = 1 + n * d11 + t * d12;
    const m01 = n * d12 + t * d22;
    const m10 = t * d11 + tt * d12;
    const m11 = 1 + t * d12 + tt * d22;
    const det = m00 * m11 - m01 * m10;
    if (det > 1e100) logDetH += Math.log(det);
    else {
      detProduct *= det;
      if (!(detProduct < 1e200 && detProduct > 1e-200)) {
        logDetH += Math.log(detProduct);
        detProduct = 1;
      }
    }
    const inv = 1 / det;
    const f00 = m11 * inv;
    const f01 = -m01 * inv;
    const f10 = -m10 * inv;
    const f11 = m00 * inv;
    const M00 = d11 * f00 + d12 * f10;
    const M01 = 0.5 * (d11 * f01 + d12 * f11 + d12 * f00 + d22 * f10);
    const M11 = d12 * f01 + d22 * f11;
    const r0 = ry[i]!;
    const r1 = rty[i]!;
    const mr0 = M00 * r0 + M01 * r1;
    const mr1 = M01 * r0 + M11 * r1;
    rMr += r0 * mr0 + r1 * mr1;
    // C M (C symmetric), then C M C, symmetric: its (1, 0) entry is the (0, 1) one.
    const a00 = n * M00 + t * M01;
    const a01 = n * M01 + t * M11;
    const a11 = t * M01 + tt * M11;
    c00 += a00 * n + a01 * t;
    c01 += a00 * t + a01 * tt;
    c11 += (t * M00 + tt * M01) * t + a11 * tt;
    q0 += n * mr0 + t * mr1;
    q1 += t * mr0 + tt * mr1;
  }
  state[0] = state[0]! + rMr;
  state[1] = logDetH;
  state[2] = detProduct;
  armSums[0] = armSums[0]! + c00;
  armSums[1] = armSums[1]! + c01;
  armSums[2] = armSums[2]! + c11;
  armSums[3] = armSums[3]! + q0;
  armSums[4] = armSums[4]! + q1;
}
