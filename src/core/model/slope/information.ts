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

/** A 2 × 2 matrix [a00, a01, a10, a11]. */
export type M2 = [number, number, number, number];

/** out = a b for 2 × 2 matrices (out must not be a or b). */
function mulInto(a: ArrayLike<number>, b: ArrayLike<number>, out: Float64Array): void {
  out[0] = a[0]! * b[0]! + a[1]! * b[2]!;
  out[1] = a[0]! * b[1]! + a[1]! * b[3]!;
  out[2] = a[2]! * b[0]! + a[3]! * b[2]!;
  out[3] = a[2]! * b[1]! + a[3]! * b[3]!;
}

function transposeInto(a: Float64Array, out: Float64Array): void {
  out[0] = a[0]!;
  out[1] = a[2]!;
  out[2] = a[1]!;
  out[3] = a[3]!;
}
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
  // Scratch 2 × 2 matrices (row-major), reused for every participant: no allocation in the loop.
  const F = new Float64Array(4);
  const Ft = new Float64Array(4);
  const C = new Float64Array(4);
  const M = new Float64Array(4);
  const K = new Float64Array(4);
  const MC = new Float64Array(4);
  const MCM = new Float64Array(4);
  const FCFt = new Float64Array(4);
  const w1 = new Float64Array(4);
  const w2 = new Float64Array(4);
  const w3 = new Float64Array(4);
  const Eb = E.map((e) => Float64Array.from(e));
  const FtErF = E.map(() => new Float64Array(4));
  const KE = E.map(() => new Float64Array(4));
  const FtEr = E.map(() => new Float64Array(4));
  const D4 = Float64Array.from(Dm);
  for (let i = 0; i < s.nP; i++) {
    const n = s.n[i]!;
    const t = s.st[i]!;
    const tt = s.stt[i]!;
    inverseOfIPlusCD(n, t, tt, d11, d12, d22, F);
    transposeInto(F, Ft);
    C[0] = n;
    C[1] = t;
    C[2] = t;
    C[3] = tt;
    mulInto(D4, F, M);
    mulInto(F, C, K);
    mulInto(M, C, MC);
    mulInto(MC, M, MCM);
    mulInto(F, C, w1);
    mulInto(w1, Ft, FCFt);
    for (let r = 0; r < nb; r++) {
      mulInto(Ft, Eb[r]!, FtEr[r]!);
      mulInto(FtEr[r]!, F, FtErF[r]!);
      mulInto(K, Eb[r]!, KE[r]!);
    }
    for (let r = 0; r < nb; r++) {
      const a = FtErF[r]!;
      P[r]!.add(i, a[0]!, a[1]!, a[2]!, a[3]!);
      for (let c = r; c < nb; c++) {
        // F'E_r K E_c F
        mulInto(FtEr[r]!, KE[c]!, w2);
        mulInto(w2, F, w3);
        Q[r * q + c]!.add(i, w3[0]!, w3[1]!, w3[2]!, w3[3]!);
        mulInto(KE[r]!, KE[c]!, w2);
        T[r * q + c] = T[r * q + c]! + w2[0]! + w2[3]!;
      }
      mulInto(a, F, w3); // F'E_rF·F
      Q[r * q + nb]!.add(i, w3[0]!, w3[1]!, w3[2]!, w3[3]!);
      mulInto(Eb[r]!, FCFt, w2);
      T[r * q + nb] = T[r * q + nb]! + w2[0]! + w2[3]!;
    }
    // X'H⁻²X piece −2M + MCM, X'H⁻³X piece −2M + MCM − F'MF.
    for (let k = 0; k < 4; k++) w1[k] = MCM[k]! - 2 * M[k]!;
    P[nb]!.add(i, w1[0]!, w1[1]!, w1[2]!, w1[3]!);
    mulInto(Ft, M, w2);
    mulInto(w2, F, w3);
    Q[q * q - 1]!.add(i, w1[0]! - w3[0]!, w1[1]! - w3[1]!, w1[2]! - w3[2]!, w1[3]! - w3[3]!);
    mulInto(MC, MC, w2);
    T[q * q - 1] = T[q * q - 1]! + n - 2 * (MC[0]! + MC[3]!) + w2[0]! + w2[3]!;
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
