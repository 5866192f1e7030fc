/**
 * Inference for contrasts l'θ of the repeated-measures model, with W = I⁻¹ the inverse expected information of σ
 * (element-wise parametrisation, V linear in σ so the second-derivative terms R_rs of Kenward & Roger vanish):
 *   Satterthwaite (1946; Giesbrecht & Burns 1985): SE² = l'Φl, df = 2 (l'Φl)² / (g'Wg), g_r = l'Φ P_r Φ l.
 *   Kenward–Roger (1997): SE² = l'Φ_A l with Φ_A = Φ + 2Φ [Σ_rs W_rs (Q_rs − P_r Φ P_s)] Φ,
 *     Q_rs = X'V⁻¹V_rV⁻¹V_sV⁻¹X; for one row their λ = 1 and the df equal the Satterthwaite df above.
 *   containment: SE² = l'Φl, the between/within df of the terms the contrast touches (given by the caller).
 *   residual: SE² = l'Φl, df = observations − p.
 * Σ_rs W_rs Q_rs is pooled per group as X_g' W B W X_g with B = Σ_rs W_rs S_r W S_s, so no n × n matrix is formed.
 * Cost O(groups · (R² + m³) + R² p² + R p³) once; O(R p²) per contrast.
 */
import { cholesky, cholInverse, matMul, quadForm } from '../dense';
import { tQuantile, tTwoSided } from '../distributions';
import type { ContrastResult, DfMethod } from '../types';
import type { Grouped } from './groups';
import { paramPairs, type Derivatives, type Evaluation } from './likelihood';
import { addXtMX, mul } from './pooled';

export interface Inference {
  readonly p: number;
  readonly phi: Float64Array;
  readonly phiA: Float64Array;
  /** M_r = Φ P_r Φ. */
  readonly M: readonly Float64Array[];
  /** Inverse expected information of σ, or null when singular. */
  readonly W: Float64Array | null;
}

/** Builds Φ, Φ_A, M_r and W at the estimate. */
export function inferenceAt(gr: Grouped, ev: Evaluation, d: Derivatives): Inference {
  const lay = gr.layout;
  const { p, nVisits: V } = lay;
  const R = d.grad.length;
  const Li = cholesky(d.info, R);
  const W = Li === null ? null : cholInverse(Li, R);
  const C = ev.C;
  const M = d.P.map((Pr) => matMul(matMul(C, Pr, p), C, p));
  if (W === null) return { p, phi: C, phiA: C, M, W };
  const pairs = paramPairs(V);
  // Σ_rs W_rs Q_rs, pooled per group.
  const Qsum = new Float64Array(p * p);
  gr.groups.forEach((g, gi) => {
    const m = g.obs.length;
    const Wg = ev.W[gi]!;
    const B = new Float64Array(m * m);
    const addPair = (a: number, b: number, c: number, e: number, w: number): void => {
      // E_ab W E_ce = W_bc E_ae
      B[a * m + e] = B[a * m + e]! + w * Wg[b * m + c]!;
    };
    for (let a = 0; a < m; a++) {
      for (let b = a; b < m; b++) {
        const r = pairs.index[g.obs[a]! * V + g.obs[b]!]!;
        for (let c = 0; c < m; c++) {
          for (let e = c; e < m; e++) {
            const s = pairs.index[g.obs[c]! * V + g.obs[e]!]!;
            const w = W[r * R + s]!;
            if (w === 0) continue;
            const rs: [number, number][] = a === b ? [[a, b]] : [[a, b], [b, a]];
            const ss: [number, number][] = c === e ? [[c, e]] : [[c, e], [e, c]];
            for (const [x, y] of rs) for (const [u, v] of ss) addPair(x, y, u, v, w);
          }
        }
      }
    }
    addXtMX(Qsum, lay, g, mul(mul(Wg, B, m), Wg, m));
  });
  // Σ_rs W_rs P_r Φ P_s = Σ_r P_r Φ (Σ_s W_rs P_s)
  const inner = new Float64Array(p * p);
  for (let r = 0; r < R; r++) {
    const Z = new Float64Array(p * p);
    for (let s = 0; s < R; s++) {
      const w = W[r * R + s]!;
      if (w === 0) continue;
      const Ps = d.P[s]!;
      for (let x = 0; x < p * p; x++) Z[x] = Z[x]! + w * Ps[x]!;
    }
    const term = matMul(matMul(d.P[r]!, C, p), Z, p);
    for (let x = 0; x < p * p; x++) inner[x] = inner[x]! + term[x]!;
  }
  for (let x = 0; x < p * p; x++) inner[x] = Qsum[x]! - inner[x]!;
  const adj = matMul(matMul(C, inner, p), C, p);
  const phiA = Float64Array.from(C, (c, x) => c + 2 * adj[x]!);
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) phiA[a * p + b] = phiA[b * p + a] = 0.5 * (phiA[a * p + b]! + phiA[b * p + a]!);
  return { p, phi: C, phiA, M, W };
}

/** Satterthwaite df of l'θ: 2 (l'Φl)² / (g'Wg). */
export function satterthwaiteDf(inf: Inference, l: ArrayLike<number>): number {
  if (inf.W === null) return NaN;
  const p = inf.p;
  const R = inf.M.length;
  const v = quadForm(l, inf.phi, l, p);
  const g = inf.M.map((Mr) => quadForm(l, Mr, l, p));
  let gwg = 0;
  for (let r = 0; r < R; r++) for (let s = 0; s < R; s++) gwg += g[r]! * inf.W[r * R + s]! * g[s]!;
  return gwg > 0 ? (2 * v * v) / gwg : Infinity;
}

/** Estimate (offset + l'θ), SE, df, t, p and interval of one contrast. */
export function contrastOf(
  inf: Inference,
  theta: Float64Array,
  l: ArrayLike<number>,
  offset: number,
  dfMethod: DfMethod,
  level: number,
  otherDf: { readonly residual: number; readonly containment: number },
): ContrastResult {
  const p = inf.p;
  let estimate = offset;
  for (let i = 0; i < p; i++) estimate += l[i]! * theta[i]!;
  const v = quadForm(l, dfMethod === 'kenward-roger' ? inf.phiA : inf.phi, l, p);
  const df = dfMethod === 'residual' ? otherDf.residual : dfMethod === 'containment' ? otherDf.containment : satterthwaiteDf(inf, l);
  const se = Math.sqrt(Math.max(v, 0));
  const t = estimate / se;
  const q = tQuantile(1 - (1 - level) / 2, df);
  return { estimate, se, df, t, lower: estimate - q * se, upper: estimate + q * se, p: tTwoSided(t, df) };
}
