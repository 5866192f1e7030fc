/**
 * Kenward–Roger and Satterthwaite pieces of the random intercept and slope model in the parametrisation where V is
 * linear in the covariance parameters, θ = (G11, G12, G22, σ²) (Kenward & Roger 1997, Biometrics 53:983–997; their
 * 2009 note, Comput. Stat. Data Anal. 53:2583–2595, on choosing that parametrisation): V_i = Z_i G Z_i' + σ² I, so
 * V_r = Z E_r Z' for r = 11, 12, 22 (E_12 = [[0, 1], [1, 0]]) and V_σ² = I, and the second derivatives vanish.
 * Per participant, with H = V/σ², F = (I + CD)⁻¹, M = DF, K = FC = Z'H⁻¹Z (profile.ts):
 *   Z'H⁻¹X = FB,  Z'H⁻²X = F²B,  Z'H⁻²Z = FCF',  X'H⁻²X = X'X + B'(−2M + MCM)B,
 *   X'H⁻³X = X'X + B'(−2M + MCM − F'MF)B,  tr H⁻² = n − 2 tr(MC) + tr(MCMC);
 * hence (σ powers from V⁻¹ = H⁻¹/σ²), for r, s among the G entries:
 *   P_r = σ⁻⁴ Σ B'F'E_rFB,  P_σ² = σ⁻⁴ X'H⁻²X,
 *   Q_rs = σ⁻⁶ Σ B'F'E_r K E_sFB,  Q_rσ² = σ⁻⁶ Σ B'F'E_rF²B (Q_σ²r its transpose),  Q_σ²σ² = σ⁻⁶ X'H⁻³X,
 *   T_rs = σ⁻⁴ Σ tr(KE_rKE_s),  T_rσ² = σ⁻⁴ Σ tr(E_rFCF'),  T_σ²σ² = σ⁻⁴ Σ tr H⁻²,
 * and the expected information REML I_rs = ½[T_rs − 2 tr(ΦQ_rs) + tr(ΦP_rΦP_s)], ML I_rs = ½T_rs, as in the
 * random-intercept model (information.ts). Cost O(participants) per piece in the grouped layout (14 pieces).
 */
import { matMul, traceProduct } from '../dense';
import type { FitMethod } from '../types';
import { SandwichSum } from './pieces';
import { inverseOfIPlusCD, type RelativeG } from './profile';
import type { SlopeSums } from './sums';

export interface SlopeInformation {
  /** P_r, one per covariance parameter: the basis directions of G, then σ². */
  readonly P: readonly Float64Array[];
  /** Q_rs (q × q of p × p matrices, row-major list). */
  readonly Q: readonly Float64Array[];
  /** Expected information for θ, q × q row-major. */
  readonly information: Float64Array;
}

/** A symmetric 2 × 2 matrix [a00, a01, a10, a11]. */
export type M2 = [number, number, number, number];
const mul = (a: M2, b: M2): M2 => [a[0] * b[0] + a[1] * b[2], a[0] * b[1] + a[1] * b[3], a[2] * b[0] + a[3] * b[2], a[2] * b[1] + a[3] * b[3]];
const tr = (a: M2): number => a[0] + a[3];
const tp = (a: M2): M2 => [a[0], a[2], a[1], a[3]];
const add = (a: M2, b: M2, k = 1): M2 => [a[0] + k * b[0], a[1] + k * b[1], a[2] + k * b[2], a[3] + k * b[3]];
/** G = G11 E11 + G12 E12 + G22 E22: the basis of the unstructured G (θ = (G11, G12, G22, σ²)). */
export const FULL_BASIS: readonly M2[] = [
  [1, 0, 0, 0],
  [0, 1, 1, 0],
  [0, 0, 0, 1],
];

/**
 * The pieces at D (relative G) and σ² on the scaled data; `phi` = Φ = σ²A⁻¹. `basis` lists the directions in which G
 * is free (V_r = Z E_r Z'): FULL_BASIS for an interior fit, one matrix ww' at a rank-one boundary (G = g ww', its
 * direction held), none when G = 0; σ² is always the last parameter. q = basis.length + 1.
 */
export function slopeInformation(s: SlopeSums, D: RelativeG, sigma2: number, phi: Float64Array, method: FitMethod, basis: readonly M2[] = FULL_BASIS): SlopeInformation {
  const p = s.p;
  const [d11, d12, d22] = D;
  const Dm: M2 = [d11, d12, d12, d22];
  const E = basis;
  const nb = E.length;
  const q = nb + 1;
  const P = Array.from({ length: q }, () => new SandwichSum(s));
  const Q = Array.from({ length: q * q }, () => new SandwichSum(s));
  const T = new Float64Array(q * q);
  const f = new Float64Array(4);
  for (let i = 0; i < s.nP; i++) {
    const n = s.n[i]!;
    const t = s.st[i]!;
    const tt = s.stt[i]!;
    inverseOfIPlusCD(n, t, tt, d11, d12, d22, f);
    const F: M2 = [f[0]!, f[1]!, f[2]!, f[3]!];
    const Ft = tp(F);
    const C: M2 = [n, t, t, tt];
    const M = mul(Dm, F);
    const K = mul(F, C);
    const MC = mul(M, C);
    const MCM = mul(MC, M);
    const FtErF = E.map((Er) => mul(mul(Ft, Er), F));
    const KE = E.map((Er) => mul(K, Er));
    for (let r = 0; r < nb; r++) {
      const a = FtErF[r]!;
      P[r]!.add(i, a[0], a[1], a[2], a[3]);
      for (let c = r; c < nb; c++) {
        const qm = mul(mul(mul(Ft, E[r]!), mul(K, E[c]!)), F);
        Q[r * q + c]!.add(i, qm[0], qm[1], qm[2], qm[3]);
        T[r * q + c] = T[r * q + c]! + tr(mul(KE[r]!, KE[c]!));
      }
      const q3 = mul(a, F); // F'E_rF·F
      Q[r * q + nb]!.add(i, q3[0], q3[1], q3[2], q3[3]);
      T[r * q + nb] = T[r * q + nb]! + tr(mul(E[r]!, mul(mul(F, C), Ft)));
    }
    const h2 = add(MCM, M, -2);
    P[nb]!.add(i, h2[0], h2[1], h2[2], h2[3]);
    const h3 = add(h2, mul(mul(Ft, M), F), -1);
    Q[q * q - 1]!.add(i, h3[0], h3[1], h3[2], h3[3]);
    T[q * q - 1] = T[q * q - 1]! + n - 2 * tr(MC) + tr(mul(MC, MC));
  }
  const s4 = sigma2 * sigma2;
  const s6 = s4 * sigma2;
  const finish = (acc: SandwichSum, withXtx: boolean, scale: number): Float64Array => {
    const m = acc.result();
    const out = new Float64Array(p * p);
    for (let k = 0; k < p * p; k++) out[k] = ((withXtx ? s.xtx[k]! : 0) + m[k]!) * scale;
    return out;
  };
  const Pm = P.map((acc, r) => finish(acc, r === nb, 1 / s4));
  const Qm: Float64Array[] = new Array<Float64Array>(q * q);
  for (let r = 0; r < q; r++) {
    for (let c = r; c < q; c++) {
      const qm = finish(Q[r * q + c]!, r === nb && c === nb, 1 / s6);
      Qm[r * q + c] = qm;
      // Q_cr = Q_rc'.
      const qt = new Float64Array(p * p);
      for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) qt[a * p + b] = qm[b * p + a]!;
      Qm[c * q + r] = qt;
      T[c * q + r] = T[r * q + c]!;
    }
  }
  const information = new Float64Array(q * q);
  const PhiP = Pm.map((m) => matMul(phi, m, p));
  for (let r = 0; r < q; r++) {
    for (let c = 0; c < q; c++) {
      const Trc = T[r * q + c]! / s4;
      information[r * q + c] = method === 'ml' ? 0.5 * Trc : 0.5 * (Trc - 2 * traceProduct(phi, Qm[r * q + c]!, p) + traceProduct(PhiP[r]!, PhiP[c]!, p));
    }
  }
  return { P: Pm, Q: Qm, information };
}

/**
 * Φ_A = Φ + 2Φ[Σ_r Σ_s W_rs (Q_rs − P_rΦP_s)]Φ (Kenward & Roger 1997; R_rs = 0 since V is linear in θ). Cost O(q² p³).
 */
export function slopeAdjustedCovariance(phi: Float64Array, info: SlopeInformation, W: Float64Array, p: number): Float64Array {
  const q = info.P.length;
  const inner = new Float64Array(p * p);
  for (let r = 0; r < q; r++) {
    for (let c = 0; c < q; c++) {
      const w = W[r * q + c]!;
      if (w === 0) continue;
      const PrPhiPs = matMul(matMul(info.P[r]!, phi, p), info.P[c]!, p);
      const Qrc = info.Q[r * q + c]!;
      for (let k = 0; k < p * p; k++) inner[k] = inner[k]! + w * (Qrc[k]! - PrPhiPs[k]!);
    }
  }
  const lam = matMul(matMul(phi, inner, p), phi, p);
  return phi.map((v, k) => v + 2 * lam[k]!);
}
