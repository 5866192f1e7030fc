/**
 * The repeated-measures likelihood on the pattern groups (groups.ts), for an unstructured covariance Σ (V × V) across
 * visits, and its derivatives in the element-wise parametrisation σ_jk (V linear in σ, so ∂V/∂σ_jk = E_jk + E_kj).
 *
 *   ML:   ℓ = −½ [N log 2π + Σ_i log|Σ_i| + Σ_i r_i'Σ_i⁻¹r_i]
 *   REML: ℓ = −½ [(N − p) log 2π + Σ_i log|Σ_i| + log|X'V⁻¹X| + Σ_i r_i'Σ_i⁻¹r_i]    (Patterson & Thompson 1971)
 * with Σ_i the rows and columns of Σ at participant i's observed visits (missing at random: the observed-data
 * likelihood), β̂ the generalised least-squares estimate and r_i = y_i − X_i β̂. Participants of one group share Σ_i,
 * so each group costs one m × m Cholesky factor plus O(m²) pooled products.
 *
 * Score and expected information (Harville 1977; Searle, Casella & McCulloch 1992, ch. 6), with P = V⁻¹ − V⁻¹XΦX'V⁻¹,
 * Φ = (X'V⁻¹X)⁻¹, V_r = ∂V/∂σ_r:
 *   s_r = −½ tr(P V_r) + ½ r'V⁻¹V_rV⁻¹r,   I_rs = ½ tr(P V_r P V_s)   (REML; ML with V⁻¹ in place of P)
 *   tr(P V_r P V_s) = Σ_i tr(W_i V_r W_i V_s) − 2 Σ_i tr(W_i V_r H_i V_s) + tr(Φ P_r Φ P_s),
 *   W_i = Σ_i⁻¹, H_i = W_i X_i Φ X_i' W_i, P_r = X'V⁻¹V_rV⁻¹X.
 * Cost per evaluation O(groups · m³ + p³); derivatives O(groups · R² + R p³ + R² p²), R = V(V + 1)/2.
 */
import { cholesky, cholInverse, cholLogDet, cholSolve, matMul, traceProduct } from '../dense';
import type { FitMethod } from '../types';
import type { Grouped } from './groups';
import { addXtMX, addXtWy, groupResidualSS, groupXCXt, mul, submatrix } from './pooled';

const LOG_2PI = Math.log(2 * Math.PI);

export interface Evaluation {
  readonly logLik: number;
  /** GLS estimate in the cell-means parametrisation (scaled units). */
  readonly theta: Float64Array;
  /** Φ = (X'V⁻¹X)⁻¹. */
  readonly C: Float64Array;
  /** Per group: Σ_g⁻¹ and the residual cross products Σ_i r_i r_i'. */
  readonly W: readonly Float64Array[];
  readonly S: readonly Float64Array[];
}

/** Covariance parameters: r ↔ (j, k), j ≤ k, row by row. */
export function paramPairs(V: number): { readonly j: Int32Array; readonly k: Int32Array; readonly index: Int32Array } {
  const R = (V * (V + 1)) / 2;
  const j = new Int32Array(R);
  const k = new Int32Array(R);
  const index = new Int32Array(V * V);
  let r = 0;
  for (let a = 0; a < V; a++) {
    for (let b = a; b < V; b++) {
      j[r] = a;
      k[r] = b;
      index[a * V + b] = r;
      index[b * V + a] = r;
      r++;
    }
  }
  return { j, k, index };
}

/** ℓ, β̂ and Φ at Σ (V × V, scaled units); null when Σ at some pattern or X'V⁻¹X is not positive definite. */
export function evaluate(gr: Grouped, sigma: Float64Array, method: FitMethod): Evaluation | null {
  const lay = gr.layout;
  const { p, nVisits: V } = lay;
  const xtwx = new Float64Array(p * p);
  const xtwy = new Float64Array(p);
  const Ws: Float64Array[] = [];
  let logDetV = 0;
  for (const g of gr.groups) {
    const m = g.obs.length;
    const L = cholesky(submatrix(sigma, V, g.obs), m);
    if (L === null) return null;
    const W = cholInverse(L, m);
    Ws.push(W);
    logDetV += g.n * cholLogDet(L, m);
    addXtMX(xtwx, lay, g, W);
    addXtWy(xtwy, lay, g, W);
  }
  const Lx = cholesky(xtwx, p);
  if (Lx === null) return null;
  const theta = cholSolve(Lx, p, xtwy);
  const C = cholInverse(Lx, p);
  const S: Float64Array[] = [];
  let quad = 0;
  gr.groups.forEach((g, gi) => {
    const Sg = groupResidualSS(lay, g, theta);
    S.push(Sg);
    quad += traceProduct(Ws[gi]!, Sg, g.obs.length);
  });
  const N = gr.nObs;
  const logLik = method === 'ml' ? -0.5 * (N * LOG_2PI + logDetV + quad) : -0.5 * ((N - p) * LOG_2PI + logDetV + cholLogDet(Lx, p) + quad);
  return { logLik, theta, C, W: Ws, S };
}

/** tr(X S_r Y S_s) for m × m symmetric X, Y and the unit matrices S_r of (a, b), S_s of (c, d) (local indices). */
function trPair(X: Float64Array, Y: Float64Array, m: number, a: number, b: number, c: number, d: number): number {
  // tr(X E_uv Y E_wz) = X_zu Y_vw; S_ab = E_ab + E_ba (a ≠ b) or E_aa.
  const t = (u: number, v: number, w: number, z: number): number => X[z * m + u]! * Y[v * m + w]!;
  let s = t(a, b, c, d);
  if (c !== d) s += t(a, b, d, c);
  if (a !== b) {
    s += t(b, a, c, d);
    if (c !== d) s += t(b, a, d, c);
  }
  return s;
}

export interface Derivatives {
  readonly grad: Float64Array;
  /** Expected information, R × R. */
  readonly info: Float64Array;
  /** P_r = X'V⁻¹V_rV⁻¹X per parameter (p × p). */
  readonly P: readonly Float64Array[];
}

/** Score and expected information in σ_jk at an evaluation (see the file comment). */
export function derivatives(gr: Grouped, ev: Evaluation, method: FitMethod): Derivatives {
  const lay = gr.layout;
  const { p, nVisits: V } = lay;
  const pairs = paramPairs(V);
  const R = pairs.j.length;
  const gradM = new Float64Array(V * V);
  const info = new Float64Array(R * R);
  const P = Array.from({ length: R }, () => new Float64Array(p * p));
  const reml = method === 'reml';
  gr.groups.forEach((g, gi) => {
    const m = g.obs.length;
    const W = ev.W[gi]!;
    const H = reml ? mul(mul(W, groupXCXt(lay, g, ev.C), m), W, m) : null;
    const B = mul(mul(W, ev.S[gi]!, m), W, m);
    const Y = new Float64Array(m * m);
    for (let x = 0; x < m; x++) {
      for (let y = 0; y < m; y++) {
        const nW = g.n * W[x * m + y]!;
        const h = H === null ? 0 : H[x * m + y]!;
        Y[x * m + y] = nW - 2 * h;
        const gv = g.obs[x]! * V + g.obs[y]!;
        gradM[gv] = gradM[gv]! + B[x * m + y]! - nW + h;
      }
    }
    const M = new Float64Array(m * m);
    for (let a = 0; a < m; a++) {
      for (let b = a; b < m; b++) {
        const r = pairs.index[g.obs[a]! * V + g.obs[b]!]!;
        for (let c = 0; c < m; c++) {
          for (let d = c; d < m; d++) {
            const s = pairs.index[g.obs[c]! * V + g.obs[d]!]!;
            if (s < r) continue;
            info[r * R + s] = info[r * R + s]! + 0.5 * trPair(W, Y, m, a, b, c, d);
          }
        }
        // W S_r W = w_a w_b' + w_b w_a' (a ≠ b) or w_a w_a'.
        for (let x = 0; x < m; x++) {
          for (let y = 0; y < m; y++) {
            M[x * m + y] = a === b ? W[x * m + a]! * W[a * m + y]! : W[x * m + a]! * W[b * m + y]! + W[x * m + b]! * W[a * m + y]!;
          }
        }
        addXtMX(P[r]!, lay, g, M);
      }
    }
  });
  const grad = new Float64Array(R);
  for (let r = 0; r < R; r++) {
    const a = pairs.j[r]!;
    const b = pairs.k[r]!;
    grad[r] = a === b ? 0.5 * gradM[a * V + a]! : 0.5 * (gradM[a * V + b]! + gradM[b * V + a]!);
  }
  if (reml) {
    const CP = P.map((Pr) => matMul(ev.C, Pr, p));
    for (let r = 0; r < R; r++) for (let s = r; s < R; s++) info[r * R + s] = info[r * R + s]! + 0.5 * traceProduct(CP[r]!, CP[s]!, p);
  }
  for (let r = 0; r < R; r++) for (let s = 0; s < r; s++) info[r * R + s] = info[s * R + r]!;
  return { grad, info, P };
}

/** The REML/ML score in σ_jk alone (no information): O(groups · m³). Used for the Newton polish (scoring.ts). */
export function gradientOnly(gr: Grouped, ev: Evaluation, method: FitMethod): Float64Array {
  const lay = gr.layout;
  const V = lay.nVisits;
  const pairs = paramPairs(V);
  const gradM = new Float64Array(V * V);
  gr.groups.forEach((g, gi) => {
    const m = g.obs.length;
    const W = ev.W[gi]!;
    const H = method === 'reml' ? mul(mul(W, groupXCXt(lay, g, ev.C), m), W, m) : null;
    const B = mul(mul(W, ev.S[gi]!, m), W, m);
    for (let x = 0; x < m; x++) {
      for (let y = 0; y < m; y++) {
        const gv = g.obs[x]! * V + g.obs[y]!;
        gradM[gv] = gradM[gv]! + B[x * m + y]! - g.n * W[x * m + y]! + (H === null ? 0 : H[x * m + y]!);
      }
    }
  });
  return Float64Array.from(pairs.j, (a, r) => {
    const b = pairs.k[r]!;
    return a === b ? 0.5 * gradM[a * V + a]! : 0.5 * (gradM[a * V + b]! + gradM[b * V + a]!);
  });
}
