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
import { addSandwich } from './sums';
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

/** True when `basis` is FULL_BASIS entry for entry (fit.ts passes a copy). */
function isFullBasis(basis: readonly M2[]): boolean {
  return basis.length === 3 && basis.every((b, r) => b.every((v, k) => v === FULL_BASIS[r]![k]));
}

/**
 * The pieces at D (relative G) and σ² on the scaled data; `phi` = Φ = σ²A⁻¹. `basis` lists the directions in which G
 * is free (V_r = Z E_r Z'): FULL_BASIS for an interior fit, one matrix ww' at a rank-one boundary (G = g ww', its
 * direction held), none when G = 0; σ² is always the last parameter. q = basis.length + 1.
 */
export function slopeInformation(s: SlopeSums, D: RelativeG, sigma2: number, phi: Float64Array, method: FitMethod, basis: readonly M2[] = FULL_BASIS): SlopeInformation {
  const [d11, d12, d22] = D;
  const Dm: M2 = [d11, d12, d12, d22];
  const E = basis;
  const nb = E.length;
  const q = nb + 1;
  if (s.group !== null) {
    const pieces = isFullBasis(basis) && s.armStart !== null ? fullBasisPieces(s, D) : groupedPieces(s, D, E);
    return finishInformation(s, pieces, sigma2, phi, method, q, false);
  }
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
  const Qsums = new Array<Float64Array>(q * q);
  for (let r = 0; r < q; r++) for (let c = r; c < q; c++) Qsums[r * q + c] = Q[r * q + c]!.result();
  return finishInformation(s, { P: P.map((acc) => acc.result()), Q: Qsums, T }, sigma2, phi, method, q, true);
}

/** The sums before the powers of σ²: P_r and Q_rs (upper triangle, c ≥ r) as p × p totals, and T (upper triangle). */
interface PieceSums {
  readonly P: readonly Float64Array[];
  readonly Q: readonly Float64Array[];
  readonly T: Float64Array;
}

/**
 * Scales the sums by the powers of σ², fills the lower triangles (Q_sr = Q_rs', T symmetric) and forms the expected
 * information. `withXtx`: the σ² pieces P_σ² and Q_σ²σ² still lack X'X (the general route's sums are B'(…)B only).
 */
function finishInformation(s: SlopeSums, sums: PieceSums, sigma2: number, phi: Float64Array, method: FitMethod, q: number, withXtx: boolean): SlopeInformation {
  const p = s.p;
  const nb = q - 1;
  const T = sums.T;
  const s4 = sigma2 * sigma2;
  const s6 = s4 * sigma2;
  const finish = (m: Float64Array, addXtx: boolean, scale: number): Float64Array => {
    const out = new Float64Array(p * p);
    for (let k = 0; k < p * p; k++) out[k] = ((addXtx ? s.xtx[k]! : 0) + m[k]!) * scale;
    return out;
  };
  const Pm = sums.P.map((m, r) => finish(m, withXtx && r === nb, 1 / s4));
  const Qm: Float64Array[] = new Array<Float64Array>(q * q);
  for (let r = 0; r < q; r++) {
    for (let c = r; c < q; c++) {
      const qm = finish(sums.Q[r * q + c]!, withXtx && r === nb && c === nb, 1 / s6);
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

/**
 * The grouped layout's sums (B_i = C_i E_a, sums.ts), written with K = FC = Z'H⁻¹Z, which is symmetric, so that
 * C F' = K and every sandwich C S C is a product of K, F and the basis: per arm the 2 × 2 totals
 *   P_r: K E_r K,  P_σ²: F C F' = FK (= Z'H⁻²Z, so X'H⁻²X = Σ E_a'(FK)E_a without X'X),
 *   Q_rs: K E_r K E_s K,  Q_rσ²: K E_r F K,  Q_σ²σ²: F K F' (= Z'H⁻³Z),
 * and T as in the general route (tr(KE_rKE_s), tr(E_rFCF'), n − 2 tr(DK) + tr(DKDK)); each participant costs a few
 * hundred operations, then each piece is E_a'(…)E_a per arm. Checked against the dense n × n formulas in the tests.
 */
function groupedPieces(s: SlopeSums, D: RelativeG, basis: readonly M2[]): PieceSums {
  const [d11, d12, d22] = D;
  const nb = basis.length;
  const q = nb + 1;
  const nA = s.E.length;
  const g = s.group!;
  const accP = new Float64Array(q * nA * 4);
  const accQ = new Float64Array(q * q * nA * 4);
  const T = new Float64Array(q * q);
  const E = Float64Array.from(basis.flat());
  const ke = new Float64Array(4 * nb);
  const pk = new Float64Array(4 * nb);
  const cn = s.n;
  const ct = s.st;
  const ctt = s.stt;
  const add = (acc: Float64Array, o: number, v0: number, v1: number, v2: number, v3: number): void => {
    acc[o] = acc[o]! + v0;
    acc[o + 1] = acc[o + 1]! + v1;
    acc[o + 2] = acc[o + 2]! + v2;
    acc[o + 3] = acc[o + 3]! + v3;
  };
  for (let i = 0; i < s.nP; i++) {
    const n = cn[i]!;
    const t = ct[i]!;
    const tt = ctt[i]!;
    const a = g[i]!;
    const m00 = 1 + n * d11 + t * d12;
    const m01 = n * d12 + t * d22;
    const m10 = t * d11 + tt * d12;
    const m11 = 1 + t * d12 + tt * d22;
    const det = m00 * m11 - m01 * m10;
    const f00 = m11 / det;
    const f01 = -m01 / det;
    const f10 = -m10 / det;
    const f11 = m00 / det;
    // K = FC (symmetric; the off-diagonal averaged), G = FK = FCF' (symmetric), Hm = FKF' = F G'.
    const k00 = f00 * n + f01 * t;
    const k01 = 0.5 * (f00 * t + f01 * tt + f10 * n + f11 * t);
    const k11 = f10 * t + f11 * tt;
    const g00 = f00 * k00 + f01 * k01;
    const g01 = 0.5 * (f00 * k01 + f01 * k11 + f10 * k00 + f11 * k01);
    const g11 = f10 * k01 + f11 * k11;
    const h00 = f00 * g00 + f01 * g01;
    const h01 = 0.5 * (f00 * g01 + f01 * g11 + f10 * g00 + f11 * g01);
    const h11 = f10 * g01 + f11 * g11;
    for (let r = 0; r < nb; r++) {
      const e = 4 * r;
      const e0 = E[e]!;
      const e1 = E[e + 1]!;
      const e2 = E[e + 2]!;
      const e3 = E[e + 3]!;
      const ke00 = k00 * e0 + k01 * e2;
      const ke01 = k00 * e1 + k01 * e3;
      const ke10 = k01 * e0 + k11 * e2;
      const ke11 = k01 * e1 + k11 * e3;
      ke[e] = ke00;
      ke[e + 1] = ke01;
      ke[e + 2] = ke10;
      ke[e + 3] = ke11;
      const p00 = ke00 * k00 + ke01 * k01;
      const p01 = ke00 * k01 + ke01 * k11;
      const p10 = ke10 * k00 + ke11 * k01;
      const p11 = ke10 * k01 + ke11 * k11;
      pk[e] = p00;
      pk[e + 1] = p01;
      pk[e + 2] = p10;
      pk[e + 3] = p11;
      add(accP, (r * nA + a) * 4, p00, p01, p10, p11);
      // Q_rσ² = (K E_r) G.
      add(accQ, ((r * q + nb) * nA + a) * 4, ke00 * g00 + ke01 * g01, ke00 * g01 + ke01 * g11, ke10 * g00 + ke11 * g01, ke10 * g01 + ke11 * g11);
      T[r * q + nb] = T[r * q + nb]! + e0 * g00 + (e1 + e2) * g01 + e3 * g11;
    }
    for (let r = 0; r < nb; r++) {
      const e = 4 * r;
      const p00 = pk[e]!;
      const p01 = pk[e + 1]!;
      const p10 = pk[e + 2]!;
      const p11 = pk[e + 3]!;
      for (let c = r; c < nb; c++) {
        // Q_rs = (K E_r K)(E_s K), E_s K = (K E_s)'.
        const f = 4 * c;
        const s00 = ke[f]!;
        const s01 = ke[f + 1]!;
        const s10 = ke[f + 2]!;
        const s11 = ke[f + 3]!;
        add(accQ, ((r * q + c) * nA + a) * 4, p00 * s00 + p01 * s01, p00 * s10 + p01 * s11, p10 * s00 + p11 * s01, p10 * s10 + p11 * s11);
        T[r * q + c] = T[r * q + c]! + ke[e]! * s00 + ke[e + 1]! * s10 + ke[e + 2]! * s01 + ke[e + 3]! * s11;
      }
    }
    add(accP, (nb * nA + a) * 4, g00, g01, g01, g11);
    add(accQ, ((q * q - 1) * nA + a) * 4, h00, h01, h01, h11);
    // tr H⁻² = n − 2 tr(MC) + tr(MCMC) with MC = DFC = DK.
    const dk00 = d11 * k00 + d12 * k01;
    const dk01 = d11 * k01 + d12 * k11;
    const dk10 = d12 * k00 + d22 * k01;
    const dk11 = d12 * k01 + d22 * k11;
    T[q * q - 1] = T[q * q - 1]! + n - 2 * (dk00 + dk11) + dk00 * dk00 + 2 * dk01 * dk10 + dk11 * dk11;
  }
  return piecesFromArms(s, accP, accQ, T, q);
}

/**
 * groupedPieces for the full basis (E_11, E_12, E_22; an interior fit), unrolled: each arm's participants are stored
 * together (sums.ts), so its 2 × 2 totals stay in local variables through the arm's loop. Same sums as
 * groupedPieces (checked against the dense n × n formulas and against groupedPieces in the tests).
 */
function fullBasisPieces(s: SlopeSums, D: RelativeG): PieceSums {
  const [d11, d12, d22] = D;
  const q = 4;
  const nA = s.E.length;
  const starts = s.armStart!;
  const accP = new Float64Array(q * nA * 4);
  const accQ = new Float64Array(q * q * nA * 4);
  const cn = s.n;
  const ct = s.st;
  const ctt = s.stt;
  // T's upper triangle (t00, t01, t02, t03, t11, t12, t13, t22, t23, t33) summed block by block (kenwardBlock).
  const tAcc = new Float64Array(10);
  for (let a = 0; a < nA; a++) {
    const end = starts[a + 1]!;
    for (let from = starts[a]!; from < end; from += KR_BLOCK) {
      kenwardBlock(tAcc, accP, accQ, a, nA, cn, ct, ctt, from, Math.min(end, from + KR_BLOCK), d11, d12, d22);
    }
  }
  const [t00, t01, t02, t03, t11, t12, t13, t22, t23, t33] = tAcc;
  const T = new Float64Array(q * q);
  T.set([t00!, t01!, t02!, t03!], 0);
  T.set([t11!, t12!, t13!], 5);
  T.set([t22!, t23!], 10);
  T[15] = t33!;
  return piecesFromArms(s, accP, accQ, T, q);
}

/** Participants per call of kenwardBlock (see curvature.ts: small calls are optimised early in a process's first fit). */
const KR_BLOCK = 4096;

/** The Kenward–Roger pieces of fullBasisPieces for participants [from, to) of arm a: adds T's upper triangle to tAcc
 * and the arm's P and Q sums to accP, accQ (slot-major, then arm, then 4 entries). */
function kenwardBlock(
  tAcc: Float64Array, accP: Float64Array, accQ: Float64Array, a: number, nA: number,
  cn: Float64Array, ct: Float64Array, ctt: Float64Array, from: number, to: number, d11: number, d12: number, d22: number,
): void {
  let t00 = 0, t01 = 0, t02 = 0, t03 = 0, t11 = 0, t12 = 0, t13 = 0, t22 = 0, t23 = 0, t33 = 0;
  let aP00 = 0, aP01 = 0, aP02 = 0, aP03 = 0, aP10 = 0, aP11 = 0, aP12 = 0, aP13 = 0, aP20 = 0, aP21 = 0, aP22 = 0, aP23 = 0, aP30 = 0, aP31 = 0, aP32 = 0, aP33 = 0, aQ000 = 0, aQ001 = 0, aQ002 = 0, aQ003 = 0, aQ010 = 0, aQ011 = 0, aQ012 = 0, aQ013 = 0, aQ020 = 0, aQ021 = 0, aQ022 = 0, aQ023 = 0, aQ030 = 0, aQ031 = 0, aQ032 = 0, aQ033 = 0, aQ110 = 0, aQ111 = 0, aQ112 = 0, aQ113 = 0, aQ120 = 0, aQ121 = 0, aQ122 = 0, aQ123 = 0, aQ130 = 0, aQ131 = 0, aQ132 = 0, aQ133 = 0, aQ220 = 0, aQ221 = 0, aQ222 = 0, aQ223 = 0, aQ230 = 0, aQ231 = 0, aQ232 = 0, aQ233 = 0, aQ330 = 0, aQ331 = 0, aQ332 = 0, aQ333 = 0;
  for (let i = from; i < to; i++) {
    const n = cn[i]!;
    const t = ct[i]!;
    const tt = ctt[i]!;
    const m00 = 1 + n * d11 + t * d12;
    const m01 = n * d12 + t * d22;
    const m10 = t * d11 + tt * d12;
    const m11 = 1 + t * d12 + tt * d22;
    const det = m00 * m11 - m01 * m10;
    const f00 = m11 / det;
    const f01 = -m01 / det;
    const f10 = -m10 / det;
    const f11 = m00 / det;
    // K = FC (symmetric; the off-diagonal averaged), G = FK = FCF' (symmetric), Hm = FKF' = F G'.
    const k00 = f00 * n + f01 * t;
    const k01 = 0.5 * (f00 * t + f01 * tt + f10 * n + f11 * t);
    const k11 = f10 * t + f11 * tt;
    const g00 = f00 * k00 + f01 * k01;
    const g01 = 0.5 * (f00 * k01 + f01 * k11 + f10 * k00 + f11 * k01);
    const g11 = f10 * k01 + f11 * k11;
    const h00 = f00 * g00 + f01 * g01;
    const h01 = 0.5 * (f00 * g01 + f01 * g11 + f10 * g00 + f11 * g01);
    const h11 = f10 * g01 + f11 * g11;
    // P_0 = K E_0 K.
    const p0_0 = k00 * k00;
    const p0_1 = k00 * k01;
    const p0_2 = k01 * k00;
    const p0_3 = k01 * k01;
    // P_1 = K E_1 K.
    const p1_0 = 2 * k00 * k01;
    const p1_1 = k01 * k01 + k00 * k11;
    const p1_2 = k00 * k11 + k01 * k01;
    const p1_3 = 2 * k01 * k11;
    // P_2 = K E_2 K.
    const p2_0 = k01 * k01;
    const p2_1 = k01 * k11;
    const p2_2 = k11 * k01;
    const p2_3 = k11 * k11;
    // T: tr(KE_rKE_s), tr(E_rG), and tr H⁻² = n − 2 tr(DK) + tr(DKDK).
    t00 += p0_0;
    t01 += 2 * p0_1;
    t02 += p0_3;
    t11 += 2 * (k01 * k01 + k00 * k11);
    t12 += p1_3;
    t22 += p2_3;
    t03 += g00;
    t13 += 2 * g01;
    t23 += g11;
    const dk00 = d11 * k00 + d12 * k01;
    const dk01 = d11 * k01 + d12 * k11;
    const dk10 = d12 * k00 + d22 * k01;
    const dk11 = d12 * k01 + d22 * k11;
    t33 += n - 2 * (dk00 + dk11) + dk00 * dk00 + 2 * dk01 * dk10 + dk11 * dk11;
    // Per arm: P_r, P_σ² = G, Q_rs = (KE_rK)(E_sK), Q_rσ² = (KE_r)G, Q_σ²σ² = Hm.
    aP00 += p0_0;
    aP01 += p0_1;
    aP02 += p0_2;
    aP03 += p0_3;
    aP10 += p1_0;
    aP11 += p1_1;
    aP12 += p1_2;
    aP13 += p1_3;
    aP20 += p2_0;
    aP21 += p2_1;
    aP22 += p2_2;
    aP23 += p2_3;
    aP30 += g00;
    aP31 += g01;
    aP32 += g01;
    aP33 += g11;
    aQ000 += p0_0 * k00;
    aQ001 += p0_0 * k01;
    aQ002 += p0_2 * k00;
    aQ003 += p0_2 * k01;
    aQ010 += p0_0 * k01 + p0_1 * k00;
    aQ011 += p0_0 * k11 + p0_1 * k01;
    aQ012 += p0_2 * k01 + p0_3 * k00;
    aQ013 += p0_2 * k11 + p0_3 * k01;
    aQ020 += p0_1 * k01;
    aQ021 += p0_1 * k11;
    aQ022 += p0_3 * k01;
    aQ023 += p0_3 * k11;
    aQ030 += k00 * g00;
    aQ031 += k00 * g01;
    aQ032 += k01 * g00;
    aQ033 += k01 * g01;
    aQ110 += p1_0 * k01 + p1_1 * k00;
    aQ111 += p1_0 * k11 + p1_1 * k01;
    aQ112 += p1_2 * k01 + p1_3 * k00;
    aQ113 += p1_2 * k11 + p1_3 * k01;
    aQ120 += p1_1 * k01;
    aQ121 += p1_1 * k11;
    aQ122 += p1_3 * k01;
    aQ123 += p1_3 * k11;
    aQ130 += k01 * g00 + k00 * g01;
    aQ131 += k01 * g01 + k00 * g11;
    aQ132 += k11 * g00 + k01 * g01;
    aQ133 += k11 * g01 + k01 * g11;
    aQ220 += p2_1 * k01;
    aQ221 += p2_1 * k11;
    aQ222 += p2_3 * k01;
    aQ223 += p2_3 * k11;
    aQ230 += k01 * g01;
    aQ231 += k01 * g11;
    aQ232 += k11 * g01;
    aQ233 += k11 * g11;
    aQ330 += h00;
    aQ331 += h01;
    aQ332 += h01;
    aQ333 += h11;
  }
  const tv = [t00, t01, t02, t03, t11, t12, t13, t22, t23, t33];
  for (let k = 0; k < 10; k++) tAcc[k] = tAcc[k]! + tv[k]!;
  accP[(0 * nA + a) * 4 + 0] = accP[(0 * nA + a) * 4 + 0]! + aP00;
  accP[(0 * nA + a) * 4 + 1] = accP[(0 * nA + a) * 4 + 1]! + aP01;
  accP[(0 * nA + a) * 4 + 2] = accP[(0 * nA + a) * 4 + 2]! + aP02;
  accP[(0 * nA + a) * 4 + 3] = accP[(0 * nA + a) * 4 + 3]! + aP03;
  accP[(1 * nA + a) * 4 + 0] = accP[(1 * nA + a) * 4 + 0]! + aP10;
  accP[(1 * nA + a) * 4 + 1] = accP[(1 * nA + a) * 4 + 1]! + aP11;
  accP[(1 * nA + a) * 4 + 2] = accP[(1 * nA + a) * 4 + 2]! + aP12;
  accP[(1 * nA + a) * 4 + 3] = accP[(1 * nA + a) * 4 + 3]! + aP13;
  accP[(2 * nA + a) * 4 + 0] = accP[(2 * nA + a) * 4 + 0]! + aP20;
  accP[(2 * nA + a) * 4 + 1] = accP[(2 * nA + a) * 4 + 1]! + aP21;
  accP[(2 * nA + a) * 4 + 2] = accP[(2 * nA + a) * 4 + 2]! + aP22;
  accP[(2 * nA + a) * 4 + 3] = accP[(2 * nA + a) * 4 + 3]! + aP23;
  accP[(3 * nA + a) * 4 + 0] = accP[(3 * nA + a) * 4 + 0]! + aP30;
  accP[(3 * nA + a) * 4 + 1] = accP[(3 * nA + a) * 4 + 1]! + aP31;
  accP[(3 * nA + a) * 4 + 2] = accP[(3 * nA + a) * 4 + 2]! + aP32;
  accP[(3 * nA + a) * 4 + 3] = accP[(3 * nA + a) * 4 + 3]! + aP33;
  accQ[((0 * 4 + 0) * nA + a) * 4 + 0] = accQ[((0 * 4 + 0) * nA + a) * 4 + 0]! + aQ000;
  accQ[((0 * 4 + 0) * nA + a) * 4 + 1] = accQ[((0 * 4 + 0) * nA + a) * 4 + 1]! + aQ001;
  accQ[((0 * 4 + 0) * nA + a) * 4 + 2] = accQ[((0 * 4 + 0) * nA + a) * 4 + 2]! + aQ002;
  accQ[((0 * 4 + 0) * nA + a) * 4 + 3] = accQ[((0 * 4 + 0) * nA + a) * 4 + 3]! + aQ003;
  accQ[((0 * 4 + 1) * nA + a) * 4 + 0] = accQ[((0 * 4 + 1) * nA + a) * 4 + 0]! + aQ010;
  accQ[((0 * 4 + 1) * nA + a) * 4 + 1] = accQ[((0 * 4 + 1) * nA + a) * 4 + 1]! + aQ011;
  accQ[((0 * 4 + 1) * nA + a) * 4 + 2] = accQ[((0 * 4 + 1) * nA + a) * 4 + 2]! + aQ012;
  accQ[((0 * 4 + 1) * nA + a) * 4 + 3] = accQ[((0 * 4 + 1) * nA + a) * 4 + 3]! + aQ013;
  accQ[((0 * 4 + 2) * nA + a) * 4 + 0] = accQ[((0 * 4 + 2) * nA + a) * 4 + 0]! + aQ020;
  accQ[((0 * 4 + 2) * nA + a) * 4 + 1] = accQ[((0 * 4 + 2) * nA + a) * 4 + 1]! + aQ021;
  accQ[((0 * 4 + 2) * nA + a) * 4 + 2] = accQ[((0 * 4 + 2) * nA + a) * 4 + 2]! + aQ022;
  accQ[((0 * 4 + 2) * nA + a) * 4 + 3] = accQ[((0 * 4 + 2) * nA + a) * 4 + 3]! + aQ023;
  accQ[((0 * 4 + 3) * nA + a) * 4 + 0] = accQ[((0 * 4 + 3) * nA + a) * 4 + 0]! + aQ030;
  accQ[((0 * 4 + 3) * nA + a) * 4 + 1] = accQ[((0 * 4 + 3) * nA + a) * 4 + 1]! + aQ031;
  accQ[((0 * 4 + 3) * nA + a) * 4 + 2] = accQ[((0 * 4 + 3) * nA + a) * 4 + 2]! + aQ032;
  accQ[((0 * 4 + 3) * nA + a) * 4 + 3] = accQ[((0 * 4 + 3) * nA + a) * 4 + 3]! + aQ033;
  accQ[((1 * 4 + 1) * nA + a) * 4 + 0] = accQ[((1 * 4 + 1) * nA + a) * 4 + 0]! + aQ110;
  accQ[((1 * 4 + 1) * nA + a) * 4 + 1] = accQ[((1 * 4 + 1) * nA + a) * 4 + 1]! + aQ111;
  accQ[((1 * 4 + 1) * nA + a) * 4 + 2] = accQ[((1 * 4 + 1) * nA + a) * 4 + 2]! + aQ112;
  accQ[((1 * 4 + 1) * nA + a) * 4 + 3] = accQ[((1 * 4 + 1) * nA + a) * 4 + 3]! + aQ113;
  accQ[((1 * 4 + 2) * nA + a) * 4 + 0] = accQ[((1 * 4 + 2) * nA + a) * 4 + 0]! + aQ120;
  accQ[((1 * 4 + 2) * nA + a) * 4 + 1] = accQ[((1 * 4 + 2) * nA + a) * 4 + 1]! + aQ121;
  accQ[((1 * 4 + 2) * nA + a) * 4 + 2] = accQ[((1 * 4 + 2) * nA + a) * 4 + 2]! + aQ122;
  accQ[((1 * 4 + 2) * nA + a) * 4 + 3] = accQ[((1 * 4 + 2) * nA + a) * 4 + 3]! + aQ123;
  accQ[((1 * 4 + 3) * nA + a) * 4 + 0] = accQ[((1 * 4 + 3) * nA + a) * 4 + 0]! + aQ130;
  accQ[((1 * 4 + 3) * nA + a) * 4 + 1] = accQ[((1 * 4 + 3) * nA + a) * 4 + 1]! + aQ131;
  accQ[((1 * 4 + 3) * nA + a) * 4 + 2] = accQ[((1 * 4 + 3) * nA + a) * 4 + 2]! + aQ132;
  accQ[((1 * 4 + 3) * nA + a) * 4 + 3] = accQ[((1 * 4 + 3) * nA + a) * 4 + 3]! + aQ133;
  accQ[((2 * 4 + 2) * nA + a) * 4 + 0] = accQ[((2 * 4 + 2) * nA + a) * 4 + 0]! + aQ220;
  accQ[((2 * 4 + 2) * nA + a) * 4 + 1] = accQ[((2 * 4 + 2) * nA + a) * 4 + 1]! + aQ221;
  accQ[((2 * 4 + 2) * nA + a) * 4 + 2] = accQ[((2 * 4 + 2) * nA + a) * 4 + 2]! + aQ222;
  accQ[((2 * 4 + 2) * nA + a) * 4 + 3] = accQ[((2 * 4 + 2) * nA + a) * 4 + 3]! + aQ223;
  accQ[((2 * 4 + 3) * nA + a) * 4 + 0] = accQ[((2 * 4 + 3) * nA + a) * 4 + 0]! + aQ230;
  accQ[((2 * 4 + 3) * nA + a) * 4 + 1] = accQ[((2 * 4 + 3) * nA + a) * 4 + 1]! + aQ231;
  accQ[((2 * 4 + 3) * nA + a) * 4 + 2] = accQ[((2 * 4 + 3) * nA + a) * 4 + 2]! + aQ232;
  accQ[((2 * 4 + 3) * nA + a) * 4 + 3] = accQ[((2 * 4 + 3) * nA + a) * 4 + 3]! + aQ233;
  accQ[((3 * 4 + 3) * nA + a) * 4 + 0] = accQ[((3 * 4 + 3) * nA + a) * 4 + 0]! + aQ330;
  accQ[((3 * 4 + 3) * nA + a) * 4 + 1] = accQ[((3 * 4 + 3) * nA + a) * 4 + 1]! + aQ331;
  accQ[((3 * 4 + 3) * nA + a) * 4 + 2] = accQ[((3 * 4 + 3) * nA + a) * 4 + 2]! + aQ332;
  accQ[((3 * 4 + 3) * nA + a) * 4 + 3] = accQ[((3 * 4 + 3) * nA + a) * 4 + 3]! + aQ333;
}

/** The p × p totals E_a'(…)E_a of the per-arm 2 × 2 sums (slot-major, then arm, then 4 entries). */
function piecesFromArms(s: SlopeSums, accP: Float64Array, accQ: Float64Array, T: Float64Array, q: number): PieceSums {
  const p = s.p;
  const nA = s.E.length;
  const total = (acc: Float64Array, slot: number): Float64Array => {
    const out = new Float64Array(p * p);
    for (let a = 0; a < nA; a++) {
      const o = (slot * nA + a) * 4;
      addSandwich(out, s.E[a]!, acc[o]!, acc[o + 1]!, acc[o + 2]!, acc[o + 3]!, p);
    }
    return out;
  };
  const P = Array.from({ length: q }, (_, r) => total(accP, r));
  const Q = new Array<Float64Array>(q * q);
  for (let r = 0; r < q; r++) for (let c = r; c < q; c++) Q[r * q + c] = total(accQ, r * q + c);
  return { P, Q, T };
}
