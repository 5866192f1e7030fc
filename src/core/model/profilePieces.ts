/**
 * The two γ-dependent pieces of the random-intercept likelihood, for the many evaluations of the profile intervals
 * (profile.ts): R(γ) = σ² r'V⁻¹r at the GLS estimate and T(γ) = D + log|A| (REML) or D (ML), with
 * A = X'X − Σ_n w_n S_n, b = X'y − Σ_n w_n c_n, c = y'y − Σ_n w_n q_n, w_n = γ/(1 + nγ), D = Σ_n m_n log(1 + nγ)
 * (the same algebra as likelihood.ts, Harville 1977), so that
 *   ℓ(γ, σ²) = −½ [m log(2πσ²) + T + R/σ²],   ℓ_p(γ) = −½ [m (log(2π R/m) + 1) + T],   m = N − p (REML) or N (ML).
 * No allocation per call (workspace reused): R = c − |L⁻¹b|² with L the Cholesky factor of A. With the derivative
 * (`fullSlope`), a_n = 1/(1 + nγ) and β = A⁻¹b:
 *   R' = −Σ a_n² (q_n − 2c_n'β + β'S_nβ),  D' = Σ m_n n a_n,  (log|A|)' = −tr(A⁻¹ Σ a_n² S_n),
 *   ∂ℓ/∂γ = −½ [T' + R'/σ²],   ∂ℓ/∂σ² = −½ [m/σ² − R/σ⁴].
 * Cost O(K p² + p³) per call, K distinct cluster sizes.
 * Example: rails data (Devore 2000), REML, ℓ_p(38.05) from these pieces ≈ −61.0885 as in likelihood.ts.
 */
import type { SufficientStats } from './sufficient';
import type { FitMethod } from './types';

const LOG_2PI = Math.log(2 * Math.PI);

export interface PiecesEvaluator {
  /** m = N − p (REML) or N (ML). */
  readonly m: number;
  /** ℓ(γ, σ²); −∞ where A is not positive definite or R ≤ 0. */
  readonly full: (gamma: number, sigma2: number) => number;
  /** ℓ_p(γ) = max over σ² of ℓ(γ, σ²); −∞ as above. */
  readonly ratio: (gamma: number) => number;
  /**
   * ℓ(γ, σ²) and, in `slope`, ∂ℓ/∂γ and ∂ℓ/∂σ² at the same point (NaN when the value is −∞). The array is reused by
   * the next call.
   */
  readonly fullSlope: (gamma: number, sigma2: number) => number;
  readonly slope: Float64Array;
}

/** Builds the evaluator for one data set and method; the returned functions share one workspace (not re-entrant). */
export function piecesEvaluator(st: SufficientStats, method: FitMethod): PiecesEvaluator {
  const p = st.p;
  const K = st.sizes.length;
  const A = new Float64Array(p * p);
  const z = new Float64Array(p);
  const m = method === 'reml' ? st.nObs - p : st.nObs;
  const beta = new Float64Array(p);
  const M = new Float64Array(p * p);
  const Y = new Float64Array(p * p);
  const slope = new Float64Array(2);
  let R = NaN;
  let T = NaN;
  let dR = NaN;
  let dT = NaN;
  /** Sets R and T (and with `deriv` their γ-derivatives) at γ; false when A is not positive definite or R ≤ 0. */
  const at = (gamma: number, deriv: boolean): boolean => {
    A.set(st.xtx);
    z.set(st.xty);
    let c = st.yty;
    let D = 0;
    let dD = 0;
    for (let k = 0; k < K; k++) {
      const n = st.sizes[k]!;
      const a = 1 / (1 + n * gamma);
      const w = gamma * a;
      if (w !== 0) {
        const off = k * p * p;
        for (let i = 0; i < p * p; i++) A[i] = A[i]! - w * st.S[off + i]!;
        for (let i = 0; i < p; i++) z[i] = z[i]! - w * st.c[k * p + i]!;
        c -= w * st.q[k]!;
      }
      D += st.m[k]! * Math.log1p(n * gamma);
      dD += st.m[k]! * n * a;
    }
    // In-place Cholesky of A (lower triangle) and forward substitution L z = b.
    let logDet = 0;
    for (let j = 0; j < p; j++) {
      let d = A[j * p + j]!;
      for (let k = 0; k < j; k++) d -= A[j * p + k]! * A[j * p + k]!;
      if (!(d > 0)) return false;
      const ljj = Math.sqrt(d);
      A[j * p + j] = ljj;
      logDet += Math.log(ljj);
      for (let i = j + 1; i < p; i++) {
        let s = A[i * p + j]!;
        for (let k = 0; k < j; k++) s -= A[i * p + k]! * A[j * p + k]!;
        A[i * p + j] = s / ljj;
      }
    }
    let zz = 0;
    for (let i = 0; i < p; i++) {
      let s = z[i]!;
      for (let k = 0; k < i; k++) s -= A[i * p + k]! * z[k]!;
      const v = s / A[i * p + i]!;
      z[i] = v;
      zz += v * v;
    }
    R = c - zz;
    T = method === 'reml' ? D + 2 * logDet : D;
    if (!(R > 0)) return false;
    if (!deriv) return true;
    // β = L⁻ᵀ z; R' and M = Σ a² S_n.
    for (let i = p - 1; i >= 0; i--) {
      let s = z[i]!;
      for (let k = i + 1; k < p; k++) s -= A[k * p + i]! * beta[k]!;
      beta[i] = s / A[i * p + i]!;
    }
    M.fill(0);
    let r = 0;
    for (let k = 0; k < K; k++) {
      const a = 1 / (1 + st.sizes[k]! * gamma);
      const a2 = a * a;
      const off = k * p * p;
      let cb = 0;
      let bsb = 0;
      for (let i = 0; i < p; i++) {
        cb += st.c[k * p + i]! * beta[i]!;
        let row = 0;
        for (let j = 0; j < p; j++) {
          const sij = st.S[off + i * p + j]!;
          row += sij * beta[j]!;
          M[i * p + j] = M[i * p + j]! + a2 * sij;
        }
        bsb += beta[i]! * row;
      }
      r += a2 * (st.q[k]! - 2 * cb + bsb);
    }
    dR = -r;
    // tr(A⁻¹M) = tr(L⁻¹ (L⁻¹ M)ᵀ): Y = L⁻¹M column by column, then the diagonal of L⁻¹Yᵀ.
    for (let col = 0; col < p; col++) {
      for (let i = 0; i < p; i++) {
        let s = M[i * p + col]!;
        for (let k = 0; k < i; k++) s -= A[i * p + k]! * Y[k * p + col]!;
        Y[i * p + col] = s / A[i * p + i]!;
      }
    }
    let tr = 0;
    for (let col = 0; col < p; col++) {
      // Column `col` of L⁻¹Yᵀ: solve L x = (row `col` of Y); only x[col] is needed, but it needs x[0..col−1].
      for (let i = 0; i <= col; i++) {
        let s = Y[col * p + i]!;
        for (let k = 0; k < i; k++) s -= A[i * p + k]! * z[k]!;
        z[i] = s / A[i * p + i]!;
      }
      tr += z[col]!;
    }
    dT = method === 'reml' ? dD - tr : dD;
    return true;
  };
  return {
    m,
    full: (gamma, sigma2) => (at(gamma, false) ? -0.5 * (m * (LOG_2PI + Math.log(sigma2)) + T + R / sigma2) : -Infinity),
    ratio: (gamma) => (at(gamma, false) ? -0.5 * (m * (LOG_2PI + Math.log(R / m) + 1) + T) : -Infinity),
    fullSlope: (gamma, sigma2) => {
      if (!at(gamma, true)) {
        slope[0] = NaN;
        slope[1] = NaN;
        return -Infinity;
      }
      slope[0] = -0.5 * (dT + dR / sigma2);
      slope[1] = -0.5 * (m / sigma2 - R / (sigma2 * sigma2));
      return -0.5 * (m * (LOG_2PI + Math.log(sigma2)) + T + R / sigma2);
    },
    slope,
  };
}
