/**
 * The pieces of Kenward–Roger and Satterthwaite inference for the random-intercept model, in the variance-components
 * parametrisation θ = (σ²_u, σ²): V = σ²_u ZZ' + σ² I is linear in θ, V_1 = blockdiag(J_i), V_2 = I
 * (Kenward & Roger 1997, Biometrics 53:983–997). Every piece pools by cluster size with a_n = 1/(1 + nγ):
 *   P_1 = X'V⁻¹V_1V⁻¹X = σ⁻⁴ Σ a² S_n               P_2 = X'V⁻²X = σ⁻⁴ [X'X + Σ (a²−1)/n S_n]
 *   Q_11 = σ⁻⁶ Σ n a³ S_n    Q_12 = Q_21 = σ⁻⁶ Σ a³ S_n    Q_22 = X'V⁻³X = σ⁻⁶ [X'X + Σ (a³−1)/n S_n]
 *   T_rs = tr(V⁻¹V_rV⁻¹V_s): T_11 = σ⁻⁴ Σ m n² a², T_12 = σ⁻⁴ Σ m n a², T_22 = σ⁻⁴ Σ m (n − 1 + a²)
 * (using (I − wJ)^k = I + (a^k − 1)/n J on a block of size n). Expected information:
 *   REML: I_rs = ½ tr(P V_r P V_s) = ½ [T_rs − 2 tr(Φ Q_rs) + tr(Φ P_r Φ P_s)],  P = V⁻¹ − V⁻¹XΦX'V⁻¹;
 *   ML:   I_rs = ½ T_rs.
 * Cost O(K p² + p³).
 */
import { matMul, traceProduct } from './dense';
import { pooledMatrix, type SufficientStats } from './sufficient';
import type { FitMethod } from './types';

export interface InformationPieces {
  readonly P: readonly [Float64Array, Float64Array];
  /** Q_11, Q_12 (= Q_21), Q_22. */
  readonly Q11: Float64Array;
  readonly Q12: Float64Array;
  readonly Q22: Float64Array;
  /** Expected information for (σ²_u, σ²), 2 x 2 row-major. */
  readonly information: Float64Array;
}

export function informationPieces(st: SufficientStats, gamma: number, sigma2: number, phi: Float64Array, method: FitMethod): InformationPieces {
  const p = st.p;
  const s4 = sigma2 * sigma2;
  const s6 = s4 * sigma2;
  const aOf = (n: number): number => 1 / (1 + n * gamma);
  const scale = (m: Float64Array, f: number): Float64Array => m.map((v) => v * f);
  const P1 = scale(pooledMatrix(st, 0, (n) => aOf(n) ** 2), 1 / s4);
  const P2 = scale(pooledMatrix(st, 1, (n) => (aOf(n) ** 2 - 1) / n), 1 / s4);
  const Q11 = scale(pooledMatrix(st, 0, (n) => n * aOf(n) ** 3), 1 / s6);
  const Q12 = scale(pooledMatrix(st, 0, (n) => aOf(n) ** 3), 1 / s6);
  const Q22 = scale(pooledMatrix(st, 1, (n) => (aOf(n) ** 3 - 1) / n), 1 / s6);
  let T11 = 0;
  let T12 = 0;
  let T22 = 0;
  for (let k = 0; k < st.sizes.length; k++) {
    const n = st.sizes[k]!;
    const m = st.m[k]!;
    const a2 = aOf(n) ** 2;
    T11 += m * n * n * a2;
    T12 += m * n * a2;
    T22 += m * (n - 1 + a2);
  }
  T11 /= s4;
  T12 /= s4;
  T22 /= s4;
  const information = new Float64Array(4);
  if (method === 'ml') {
    information.set([T11 / 2, T12 / 2, T12 / 2, T22 / 2]);
  } else {
    const PhiP1 = matMul(phi, P1, p);
    const PhiP2 = matMul(phi, P2, p);
    const i11 = 0.5 * (T11 - 2 * traceProduct(phi, Q11, p) + traceProduct(PhiP1, PhiP1, p));
    const i12 = 0.5 * (T12 - 2 * traceProduct(phi, Q12, p) + traceProduct(PhiP1, PhiP2, p));
    const i22 = 0.5 * (T22 - 2 * traceProduct(phi, Q22, p) + traceProduct(PhiP2, PhiP2, p));
    information.set([i11, i12, i12, i22]);
  }
  return { P: [P1, P2], Q11, Q12, Q22, information };
}

/**
 * W = inverse of the 2 x 2 expected information. At the boundary σ²_u = 0 the subject variance is held fixed at zero:
 * only the σ² entry is inverted (W = [[0, 0], [0, 1/I_22]]), so it contributes no uncertainty to the df.
 * Example: information [[2, 0], [0, 4]] -> W [[0.5, 0], [0, 0.25]].
 */
export function inverseInformation(info: Float64Array, atBoundary: boolean): Float64Array {
  const [i11, i12, , i22] = [info[0]!, info[1]!, info[2]!, info[3]!];
  if (atBoundary) return Float64Array.of(0, 0, 0, 1 / i22);
  const det = i11 * i22 - i12 * i12;
  return Float64Array.of(i22 / det, -i12 / det, -i12 / det, i11 / det);
}

/**
 * Kenward–Roger adjusted covariance Φ_A = Φ + 2Λ, Λ = Φ [Σ_r Σ_s W_rs (Q_rs − P_r Φ P_s)] Φ (Kenward & Roger 1997,
 * with R_rs = 0 since V is linear in θ). Cost O(p³).
 */
export function adjustedCovariance(phi: Float64Array, pieces: InformationPieces, W: Float64Array, p: number): Float64Array {
  const { P, Q11, Q12, Q22 } = pieces;
  const Q = [Q11, Q12, Q12, Q22];
  const inner = new Float64Array(p * p);
  for (let r = 0; r < 2; r++) {
    for (let s = 0; s < 2; s++) {
      const wrs = W[r * 2 + s]!;
      if (wrs === 0) continue;
      const PrPhiPs = matMul(matMul(P[r]!, phi, p), P[s]!, p);
      const Qrs = Q[r * 2 + s]!;
      for (let i = 0; i < p * p; i++) inner[i] = inner[i]! + wrs * (Qrs[i]! - PrPhiPs[i]!);
    }
  }
  const lambda = matMul(matMul(phi, inner, p), phi, p);
  const out = new Float64Array(p * p);
  for (let i = 0; i < p * p; i++) out[i] = phi[i]! + 2 * lambda[i]!;
  return out;
}
