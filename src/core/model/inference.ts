/**
 * Tests and intervals for linear combinations Lβ of the fixed effects, with degrees of freedom by Kenward–Roger,
 * Satterthwaite or the residual count.
 *
 * One row L (1 x p), with g_r = L Φ P_r Φ L' = ∂(LΦL')/∂θ_r and W the inverse expected information:
 *   Satterthwaite (Satterthwaite 1946; Giesbrecht & Burns 1985): SE² = LΦL', df = 2 (LΦL')² / (g'Wg).
 *   Kenward–Roger (1997): SE² = LΦ_AL'; for one row their A1 = A2 = g'Wg/(LΦL')², so λ = 1 and m = 2/A2, the same
 *   Satterthwaite-type df paired with the adjusted covariance.
 *   residual: SE² = LΦL', df = N − p.
 *   containment: SE² = LΦL', df given by the caller from the between/within split of the design (containment.ts).
 * Several rows (ℓ x p): Kenward–Roger's F approximation (1997) with Θ = L'(LΦL')⁻¹L,
 *   A1 = Σ W_rs tr(ΘΦP_rΦ) tr(ΘΦP_sΦ), A2 = Σ W_rs tr(ΘΦP_rΦΘΦP_sΦ), and the scale λ and denominator df m below;
 *   Satterthwaite uses Fai & Cornelius 1996 (Satterthwaite df per eigen-direction of LΦL', combined through
 *   E = Σ ν_k/(ν_k − 2)); residual uses F with (ℓ, N − p).
 * Cost O(ℓ p² + p³) per call.
 */
import { Matrix, EigenvalueDecomposition } from 'ml-matrix';
import { fUpper, tQuantile, tTwoSided } from './distributions';
import { quadForm, spdInverse } from './dense';
import type { ContrastResult, DfMethod, JointTest } from './types';

export interface InferenceContext {
  readonly p: number;
  readonly beta: Float64Array;
  /** Φ = (X'V⁻¹X)⁻¹. */
  readonly phi: Float64Array;
  /** Φ_A (Kenward–Roger) — equal to Φ for the other methods. */
  readonly phiA: Float64Array;
  /** M_r = Φ P_r Φ, one per covariance parameter (2 for the random-intercept model, 4 for the slope model). */
  readonly M: readonly Float64Array[];
  /** Inverse expected information (q x q, q = M.length). */
  readonly W: Float64Array;
  readonly dfMethod: DfMethod;
  readonly residualDf: number;
  readonly level: number;
}

function satterthwaiteDf(ctx: InferenceContext, l: ArrayLike<number>, v: number): number {
  const p = ctx.p;
  const q = ctx.M.length;
  const g = ctx.M.map((m) => quadForm(l, m, l, p));
  const W = ctx.W;
  let gwg = 0;
  for (let r = 0; r < q; r++) for (let s = 0; s < q; s++) gwg += W[r * q + s]! * g[r]! * g[s]!;
  if (!(gwg > 0)) return Infinity;
  return (2 * v * v) / gwg;
}

/**
 * Estimate, SE, df, t, two-sided p and interval of one contrast l'β.
 * Example: intercept-only rails fit, l = [1] -> estimate 66.5, se 10.171, df 5 (Devore 2000 data).
 */
export function contrast(ctx: InferenceContext, l: ArrayLike<number>, containmentDf = NaN): ContrastResult {
  const p = ctx.p;
  let estimate = 0;
  for (let i = 0; i < p; i++) estimate += l[i]! * ctx.beta[i]!;
  const v = quadForm(l, ctx.phi, l, p);
  const vUse = ctx.dfMethod === 'kenward-roger' ? quadForm(l, ctx.phiA, l, p) : v;
  const df = ctx.dfMethod === 'residual' ? ctx.residualDf : ctx.dfMethod === 'containment' ? containmentDf : satterthwaiteDf(ctx, l, v);
  const se = Math.sqrt(Math.max(vUse, 0));
  const t = estimate / se;
  const q = tQuantile(1 - (1 - ctx.level) / 2, df);
  return { estimate, se, df, t, lower: estimate - q * se, upper: estimate + q * se, p: tTwoSided(t, df) };
}

/** Joint F test of Lβ = 0 for several rows (see the file comment for each df method; containment: F with the given
 * denominator df). */
export function jointTest(ctx: InferenceContext, rows: readonly (readonly number[])[], containmentDf = NaN): JointTest {
  const p = ctx.p;
  const ell = rows.length;
  const Lb = rows.map((r) => r.reduce((s, v, i) => s + v * ctx.beta[i]!, 0));
  const lml = (m: Float64Array): Float64Array => {
    const out = new Float64Array(ell * ell);
    for (let i = 0; i < ell; i++) for (let j = 0; j < ell; j++) out[i * ell + j] = quadForm(rows[i]!, m, rows[j]!, p);
    return out;
  };
  const LPhiL = lml(ctx.phi);
  if (ctx.dfMethod === 'residual' || ctx.dfMethod === 'containment' || ctx.dfMethod === 'kenward-roger') {
    const inv = spdInverse(ctx.dfMethod === 'kenward-roger' ? lml(ctx.phiA) : LPhiL, ell);
    if (inv === null) return { numDf: ell, denDf: NaN, F: NaN, p: NaN };
    const F = quadForm(Lb, inv, Lb, ell) / ell;
    if (ctx.dfMethod !== 'kenward-roger') {
      const denDf = ctx.dfMethod === 'residual' ? ctx.residualDf : containmentDf;
      return { numDf: ell, denDf, F, p: fUpper(F, ell, denDf) };
    }
    const { lambda, m } = krScale(ctx, LPhiL, ctx.M.map(lml), ell);
    const Fs = lambda * F;
    return { numDf: ell, denDf: m, F: Fs, p: fUpper(Fs, ell, m) };
  }
  // Satterthwaite for several rows: Fai & Cornelius 1996, via the eigen-directions of LΦL'.
  const eig = new EigenvalueDecomposition(new Matrix(Array.from({ length: ell }, (_, i) => Array.from(LPhiL.slice(i * ell, (i + 1) * ell)))), { assumeSymmetric: true });
  const d = eig.realEigenvalues;
  const U = eig.eigenvectorMatrix;
  let F = 0;
  let E = 0;
  for (let k = 0; k < ell; k++) {
    const lk = new Float64Array(p);
    for (let i = 0; i < ell; i++) {
      const u = U.get(i, k);
      for (let j = 0; j < p; j++) lk[j] = lk[j]! + u * rows[i]![j]!;
    }
    let est = 0;
    for (let j = 0; j < p; j++) est += lk[j]! * ctx.beta[j]!;
    const dk = d[k]!;
    F += (est * est) / dk;
    const nu = satterthwaiteDf(ctx, lk, dk);
    if (nu > 2) E += nu / (nu - 2);
  }
  F /= ell;
  const denDf = E > ell ? (2 * E) / (E - ell) : NaN;
  return { numDf: ell, denDf, F, p: fUpper(F, ell, denDf) };
}

/**
 * Kenward–Roger scale λ and denominator df m for ℓ rows (Kenward & Roger 1997):
 * B = (A1 + 6A2)/(2ℓ), g = ((ℓ+1)A1 − (ℓ+4)A2)/((ℓ+2)A2), c1 = g/(3ℓ+2(1−g)), c2 = (ℓ−g)/(3ℓ+2(1−g)),
 * c3 = (ℓ+2−g)/(3ℓ+2(1−g)), E = 1/(1 − A2/ℓ), V = (2/ℓ)(1 + c1B)/((1 − c2B)²(1 − c3B)), ρ = V/(2E²),
 * m = 4 + (ℓ+2)/(ℓρ − 1), λ = m/(E(m − 2)).
 * Here the traces are taken in the ℓ-dimensional space: tr(ΘΦP_rΦ) = tr((LΦL')⁻¹ L M_r L').
 */
export function krScale(ctx: InferenceContext, LPhiL: Float64Array, LML: readonly Float64Array[], ell: number): { lambda: number; m: number } {
  const inv = spdInverse(LPhiL, ell);
  if (inv === null) return { lambda: NaN, m: NaN };
  const mul = (a: Float64Array, b: Float64Array): Float64Array => {
    const c = new Float64Array(ell * ell);
    for (let i = 0; i < ell; i++) for (let k = 0; k < ell; k++) for (let j = 0; j < ell; j++) c[i * ell + j] = c[i * ell + j]! + a[i * ell + k]! * b[k * ell + j]!;
    return c;
  };
  const tr = (a: Float64Array): number => {
    let s = 0;
    for (let i = 0; i < ell; i++) s += a[i * ell + i]!;
    return s;
  };
  const Bs = LML.map((m) => mul(inv, m));
  const t = Bs.map(tr);
  const q = Bs.length;
  const W = ctx.W;
  let A1 = 0;
  let A2 = 0;
  for (let r = 0; r < q; r++) {
    for (let s = 0; s < q; s++) {
      const w = W[r * q + s]!;
      if (w === 0) continue;
      A1 += w * t[r]! * t[s]!;
      A2 += w * tr(mul(Bs[r]!, Bs[s]!));
    }
  }
  if (!(A2 > 0)) return { lambda: 1, m: Infinity };
  const B = (A1 + 6 * A2) / (2 * ell);
  const g = ((ell + 1) * A1 - (ell + 4) * A2) / ((ell + 2) * A2);
  const den = 3 * ell + 2 * (1 - g);
  const c1 = g / den;
  const c2 = (ell - g) / den;
  const c3 = (ell + 2 - g) / den;
  const Estar = 1 / (1 - A2 / ell);
  const Vstar = (2 / ell) * ((1 + c1 * B) / ((1 - c2 * B) ** 2 * (1 - c3 * B)));
  const rho = Vstar / (2 * Estar * Estar);
  const m = 4 + (ell + 2) / (ell * rho - 1);
  const lambda = m / (Estar * (m - 2));
  return { lambda, m };
}
