/**
 * The gradient and the exact Hessian of the profiled log-likelihood of the slope model (profile.ts) in D = G/σ², from
 * one more pass over the participants at a point already evaluated (β̂, A⁻¹ and σ̂² of `slopeProfile`).
 *
 * With H = V/σ² = I + Z(I⊗D)Z' linear in D (H_k = Z E_k Z', no second derivatives), R = y'Py and
 * P = H⁻¹ − H⁻¹XA⁻¹X'H⁻¹ (Harville 1977, J. Am. Stat. Assoc. 72:320–338, for the derivatives of P and log|A|):
 *   R_k = −y'PH_kPy,  R_kl = 2 y'PH_kPH_lPy,  d(L + log|A|)/dD_k = tr(PH_k),  d²(L + log|A|)/dD_k dD_l = −tr(PH_kPH_l),
 *   REML ℓ_kl = −½[ν(R_kl/R − R_kR_l/R²) − tr(PH_kPH_l)],  ML ℓ_kl = −½[N(R_kl/R − R_kR_l/R²) − tr(H⁻¹H_kH⁻¹H_l)].
 * Per participant, with F = (I + CD)⁻¹, K = FC = Z'H⁻¹Z, v = F(r − Bβ̂) = Z'Py, N = F(BA⁻¹B')F':
 *   y'PH_kPH_lPy = Σ v'E_kKE_lv − u_k'A⁻¹u_l,  u_k = Σ B'F'E_kv,
 *   tr(PH_kPH_l) = Σ tr(KE_kKE_l) − 2 Σ tr(E_kKE_lN) + tr(A⁻¹P̃_kA⁻¹P̃_l),  P̃_k = Σ B'F'E_kFB.
 * In the grouped layout (B = CE_a) B'F' = E_a'K, so u_k and P̃_k are per-arm sums of Kw and KE_kK: O(1) per
 * participant. Cost O(participants) (grouped) or O(participants · p²), plus O(p³).
 */
import type { FitMethod } from '../types';
import { bilinearB, SandwichSum, timesBeta, VectorSum } from './pieces';
import { inverseOfIPlusCD, type RelativeG, type SlopeProfile } from './profile';
import { addSandwich, addTransposed, type SlopeSums } from './sums';

export interface SlopeCurvature {
  /** dℓ/d(D11, D12, D22) (D12 the symmetric off-diagonal pair). */
  readonly gradient: [number, number, number];
  /** d²ℓ/dD_k dD_l, 3 × 3 row-major. */
  readonly hessian: Float64Array;
}

/** Sums the participants give, before the p × p finish. */
interface CurvatureSums {
  /** Σ v'E_kv, Σ tr(E_kK), Σ tr(E_kN) (k = 11, 12, 22). */
  readonly sv: Float64Array;
  readonly sk: Float64Array;
  readonly sq: Float64Array;
  /** Σ v'E_kKE_lv, Σ tr(KE_kKE_l), Σ tr(E_kKE_lN): 3 × 3 row-major. */
  readonly vkv: Float64Array;
  readonly t: Float64Array;
  readonly qa: Float64Array;
  /** u_k (3 p-vectors) and P̃_k (3 p × p matrices). */
  readonly u: readonly Float64Array[];
  readonly pt: readonly Float64Array[];
}

/**
 * The gradient and Hessian of the profiled REML or ML log-likelihood at D, given the evaluation `at` of slopeProfile
 * at the same D and method. Example: at the optimum the gradient is 0 to rounding and the Hessian negative definite.
 */
export function slopeCurvature(s: SlopeSums, D: RelativeG, method: FitMethod, at: SlopeProfile): SlopeCurvature {
  const sums = s.group !== null ? groupedSums(s, D, at) : generalSums(s, D, at);
  return finish(s, sums, method, at);
}

/** The same sums through the general helpers (pieces.ts), for either layout: the reference the grouped loop is checked against. */
export function slopeCurvatureGeneral(s: SlopeSums, D: RelativeG, method: FitMethod, at: SlopeProfile): SlopeCurvature {
  return finish(s, generalSums(s, D, at), method, at);
}

function finish(s: SlopeSums, c: CurvatureSums, method: FitMethod, at: SlopeProfile): SlopeCurvature {
  const p = s.p;
  const aInv = at.aInv;
  const reml = method === 'reml';
  const nu = reml ? s.nObs - p : s.nObs;
  const R = at.sigma2 * nu;
  // A⁻¹u_k and A⁻¹P̃_k.
  const au = c.u.map((u) => {
    const out = new Float64Array(p);
    for (let j = 0; j < p; j++) {
      let v = 0;
      for (let k = 0; k < p; k++) v += aInv[j * p + k]! * u[k]!;
      out[j] = v;
    }
    return out;
  });
  const ap = reml ? c.pt.map((m) => product(aInv, m, p)) : [];
  const gradient: [number, number, number] = [0, 0, 0];
  const hessian = new Float64Array(9);
  for (let k = 0; k < 3; k++) {
    const Rk = -c.sv[k]!;
    gradient[k] = -0.5 * ((nu * Rk) / R + c.sk[k]! - (reml ? c.sq[k]! : 0));
    for (let l = k; l < 3; l++) {
      const Rl = -c.sv[l]!;
      let uAu = 0;
      for (let j = 0; j < p; j++) uAu += c.u[k]![j]! * au[l]![j]!;
      const Rkl = 2 * (c.vkv[3 * k + l]! - uAu);
      let tr = c.t[3 * k + l]!;
      if (reml) tr += -2 * c.qa[3 * k + l]! + traceOfProduct(ap[k]!, ap[l]!, p);
      const h = -0.5 * (nu * (Rkl / R - (Rk * Rl) / (R * R)) - tr);
      hessian[3 * k + l] = h;
      hessian[3 * l + k] = h;
    }
  }
  return { gradient, hessian };
}

function product(a: Float64Array, b: Float64Array, p: number): Float64Array {
  const out = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < p; k++) {
      const aik = a[i * p + k]!;
      if (aik === 0) continue;
      for (let j = 0; j < p; j++) out[i * p + j] = out[i * p + j]! + aik * b[k * p + j]!;
    }
  }
  return out;
}

/** tr(XY) for p × p matrices. */
function traceOfProduct(x: Float64Array, y: Float64Array, p: number): number {
  let t = 0;
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) t += x[i * p + j]! * y[j * p + i]!;
  return t;
}

/**
 * The per-participant terms from symmetric K = (k00, k01, k11), N = (n00, n01, n11) and v, added into the scalar
 * sums (vkv, t, qa upper triangles, sv, sk, sq). E_11 v = (v0, 0), E_12 v = (v1, v0), E_22 v = (0, v1).
 */
function addScalars(c: CurvatureSums, k00: number, k01: number, k11: number, n00: number, n01: number, n11: number, v0: number, v1: number): void {
  c.sv[0] = c.sv[0]! + v0 * v0;
  c.sv[1] = c.sv[1]! + 2 * v0 * v1;
  c.sv[2] = c.sv[2]! + v1 * v1;
  c.sk[0] = c.sk[0]! + k00;
  c.sk[1] = c.sk[1]! + 2 * k01;
  c.sk[2] = c.sk[2]! + k11;
  c.sq[0] = c.sq[0]! + n00;
  c.sq[1] = c.sq[1]! + 2 * n01;
  c.sq[2] = c.sq[2]! + n11;
  // K w_k.
  const a0 = k00 * v0;
  const b0 = k00 * v1 + k01 * v0;
  const b1 = k01 * v1 + k11 * v0;
  const c0 = k01 * v1;
  const c1 = k11 * v1;
  const vkv = c.vkv;
  vkv[0] = vkv[0]! + v0 * a0;
  vkv[1] = vkv[1]! + v0 * b0;
  vkv[2] = vkv[2]! + v0 * c0;
  vkv[4] = vkv[4]! + v1 * b0 + v0 * b1;
  vkv[5] = vkv[5]! + v1 * c0 + v0 * c1;
  vkv[8] = vkv[8]! + v1 * c1;
  const t = c.t;
  t[0] = t[0]! + k00 * k00;
  t[1] = t[1]! + 2 * k00 * k01;
  t[2] = t[2]! + k01 * k01;
  t[4] = t[4]! + 2 * (k01 * k01 + k00 * k11);
  t[5] = t[5]! + 2 * k01 * k11;
  t[8] = t[8]! + k11 * k11;
  const qa = c.qa;
  qa[0] = qa[0]! + k00 * n00;
  qa[1] = qa[1]! + k00 * n01 + k01 * n00;
  qa[2] = qa[2]! + k01 * n01;
  qa[4] = qa[4]! + k00 * n11 + 2 * k01 * n01 + k11 * n00;
  qa[5] = qa[5]! + k01 * n11 + k11 * n01;
  qa[8] = qa[8]! + k11 * n11;
}

function emptySums(p: number): CurvatureSums {
  return {
    sv: new Float64Array(3),
    sk: new Float64Array(3),
    sq: new Float64Array(3),
    vkv: new Float64Array(9),
    t: new Float64Array(9),
    qa: new Float64Array(9),
    u: [new Float64Array(p), new Float64Array(p), new Float64Array(p)],
    pt: [new Float64Array(p * p), new Float64Array(p * p), new Float64Array(p * p)],
  };
}

/** Either layout through SandwichSum, VectorSum, timesBeta and bilinearB: O(p²) per participant (general layout). */
function generalSums(s: SlopeSums, D: RelativeG, at: SlopeProfile): CurvatureSums {
  const [d11, d12, d22] = D;
  const c = emptySums(s.p);
  const bBeta = timesBeta(s, at.beta);
  const bAb = bilinearB(s, at.aInv);
  const pt = [new SandwichSum(s), new SandwichSum(s), new SandwichSum(s)];
  const u = [new VectorSum(s), new VectorSum(s), new VectorSum(s)];
  const f = new Float64Array(4);
  const bb = new Float64Array(2);
  const h = new Float64Array(4);
  for (let i = 0; i < s.nP; i++) {
    const n = s.n[i]!;
    const t = s.st[i]!;
    const tt = s.stt[i]!;
    inverseOfIPlusCD(n, t, tt, d11, d12, d22, f);
    const f00 = f[0]!;
    const f01 = f[1]!;
    const f10 = f[2]!;
    const f11 = f[3]!;
    const k00 = f00 * n + f01 * t;
    const k01 = 0.5 * (f00 * t + f01 * tt + f10 * n + f11 * t);
    const k11 = f10 * t + f11 * tt;
    bBeta(i, bb);
    const e0 = s.sy[i]! - bb[0]!;
    const e1 = s.sty[i]! - bb[1]!;
    const v0 = f00 * e0 + f01 * e1;
    const v1 = f10 * e0 + f11 * e1;
    // N = F h F'.
    bAb(i, h);
    const a00 = f00 * h[0]! + f01 * h[2]!;
    const a01 = f00 * h[1]! + f01 * h[3]!;
    const a10 = f10 * h[0]! + f11 * h[2]!;
    const a11 = f10 * h[1]! + f11 * h[3]!;
    const n00 = a00 * f00 + a01 * f01;
    const n01 = 0.5 * (a00 * f10 + a01 * f11 + a10 * f00 + a11 * f01);
    const n11 = a10 * f10 + a11 * f11;
    addScalars(c, k00, k01, k11, n00, n01, n11, v0, v1);
    // u_k += B'(F'E_kv); P̃_k += B'(F'E_kF)B.
    u[0]!.add(i, f00 * v0, f01 * v0);
    u[1]!.add(i, f00 * v1 + f10 * v0, f01 * v1 + f11 * v0);
    u[2]!.add(i, f10 * v1, f11 * v1);
    pt[0]!.add(i, f00 * f00, f00 * f01, f01 * f00, f01 * f01);
    pt[1]!.add(i, 2 * f00 * f10, f00 * f11 + f10 * f01, f01 * f10 + f11 * f00, 2 * f01 * f11);
    pt[2]!.add(i, f10 * f10, f10 * f11, f11 * f10, f11 * f11);
  }
  return { ...c, u: u.map((x) => x.result()), pt: pt.map((x) => x.result()) };
}

/**
 * The grouped layout written out with scalars: per arm a, b_a = E_aβ̂ and H_a = E_aA⁻¹E_a', so Bβ̂ = Cb_a,
 * N = KH_aK, B'F'E_kv = E_a'(Kw_k), B'F'E_kFB = E_a'(KE_kK)E_a; the per-arm 2-vectors and 2 × 2 totals are finished
 * with E_a after the pass.
 */
function groupedSums(s: SlopeSums, D: RelativeG, at: SlopeProfile): CurvatureSums {
  const [d11, d12, d22] = D;
  const p = s.p;
  const nA = s.E.length;
  const beta = at.beta;
  const aInv = at.aInv;
  const eb = new Float64Array(2 * nA);
  const eh = new Float64Array(3 * nA);
  for (let a = 0; a < nA; a++) {
    const E = s.E[a]!;
    for (let j = 0; j < p; j++) {
      eb[2 * a] = eb[2 * a]! + E[j]! * beta[j]!;
      eb[2 * a + 1] = eb[2 * a + 1]! + E[p + j]! * beta[j]!;
    }
    const h = [0, 0, 0];
    for (let j = 0; j < p; j++) {
      for (let k = 0; k < p; k++) {
        const w = aInv[j * p + k]!;
        h[0] = h[0]! + E[j]! * w * E[k]!;
        h[1] = h[1]! + E[j]! * w * E[p + k]!;
        h[2] = h[2]! + E[p + j]! * w * E[p + k]!;
      }
    }
    eh.set(h, 3 * a);
  }
  const c = emptySums(p);
  const starts = s.armStart!;
  const cn = s.n;
  const ct = s.st;
  const ctt = s.stt;
  const ry = s.sy;
  const rty = s.sty;
  // Totals over all participants (tot[0..20]) and over one arm (arm[0..11]), summed block by block (curvatureBlock).
  const tot = new Float64Array(21);
  const arm = new Float64Array(12);
  for (let a = 0; a < nA; a++) {
    const b0 = eb[2 * a]!;
    const b1 = eb[2 * a + 1]!;
    const h00 = eh[3 * a]!;
    const h01 = eh[3 * a + 1]!;
    const h11 = eh[3 * a + 2]!;
    // Arm a's participants are stored together (sums.ts): u_k (Σ Kw_k) and Σ KE_kK per arm.
    arm.fill(0);
    const end = starts[a + 1]!;
    for (let from = starts[a]!; from < end; from += BLOCK) {
      curvatureBlock(tot, arm, cn, ct, ctt, ry, rty, from, Math.min(end, from + BLOCK), d11, d12, d22, b0, b1, h00, h01, h11);
    }
    const u00 = arm[0]!, u01 = arm[1]!, u10 = arm[2]!, u11 = arm[3]!, u20 = arm[4]!, u21 = arm[5]!;
    const kk00 = arm[6]!, kk01 = arm[7]!, kk11 = arm[8]!, kkx = arm[9]!, kk1 = arm[10]!, kk22 = arm[11]!;
    const E = s.E[a]!;
    addTransposed(c.u[0]!, E, u00, u01, p);
    addTransposed(c.u[1]!, E, u10, u11, p);
    addTransposed(c.u[2]!, E, u20, u21, p);
    addSandwich(c.pt[0]!, E, kk00, kk01, kk01, kk11, p);
    addSandwich(c.pt[1]!, E, 2 * kk01, kkx + kk11, kkx + kk11, 2 * kk1, p);
    // T_kl = tr(KE_kKE_l): the entries of the same sums.
    const t = c.t;
    t[0] = t[0]! + kk00;
    t[1] = t[1]! + 2 * kk01;
    t[2] = t[2]! + kk11;
    t[4] = t[4]! + 2 * (kk11 + kkx);
    t[5] = t[5]! + 2 * kk1;
    t[8] = t[8]! + kk22;
    addSandwich(c.pt[2]!, E, kk11, kk1, kk1, kk22, p);
  }
  c.sv.set([tot[0]!, tot[1]!, tot[2]!]);
  c.sk.set([tot[3]!, tot[4]!, tot[5]!]);
  c.sq.set([tot[6]!, tot[7]!, tot[8]!]);
  c.vkv.set([tot[9]!, tot[10]!, tot[11]!, 0, tot[12]!, tot[13]!, 0, 0, tot[14]!]);
  c.qa.set([tot[15]!, tot[16]!, tot[17]!, 0, tot[18]!, tot[19]!, 0, 0, tot[20]!]);
  return c;
}

/** Participants per call of curvatureBlock: small calls let the engine optimise the loop early (a process's first fit
 * otherwise runs most of one long loop before it is optimised); the sums are the same up to the order of additions. */
const BLOCK = 4096;

/**
 * The per-participant loop of groupedSums over participants [from, to) of one arm: adds Σ v², Σ K, Σ N, V'KV and
 * Q-pieces to `tot` (21 entries: sv 0–2, sk 3–5, sq 6–8, w 9–14, q 15–20) and the arm's u_k and Σ KE_kK to `arm`
 * (12 entries). Pure arithmetic on local variables.
 */
function curvatureBlock(
  tot: Float64Array, arm: Float64Array,
  cn: Float64Array, ct: Float64Array, ctt: Float64Array, ry: Float64Array, rty: Float64Array,
  from: number, to: number, d11: number, d12: number, d22: number, b0: number, b1: number, h00: number, h01: number, h11: number,
): void {
  let sv0 = 0, sv1 = 0, sv2 = 0, sk0 = 0, sk1 = 0, sk2 = 0, sq0 = 0, sq1 = 0, sq2 = 0;
  let w00 = 0, w01 = 0, w02 = 0, w11 = 0, w12 = 0, w22 = 0;
  let q00 = 0, q01 = 0, q02 = 0, q11 = 0, q12 = 0, q22 = 0;
  let u00 = 0, u01 = 0, u10 = 0, u11 = 0, u20 = 0, u21 = 0;
  let kk00 = 0, kk01 = 0, kk11 = 0, kkx = 0, kk1 = 0, kk22 = 0;
  for (let i = from; i < to; i++) {
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
    const k00 = f00 * n + f01 * t;
    const k01 = 0.5 * (f00 * t + f01 * tt + f10 * n + f11 * t);
    const k11 = f10 * t + f11 * tt;
    const e0 = ry[i]! - (n * b0 + t * b1);
    const e1 = rty[i]! - (t * b0 + tt * b1);
    const v0 = f00 * e0 + f01 * e1;
    const v1 = f10 * e0 + f11 * e1;
    // N = K H_a K.
    const x00 = k00 * h00 + k01 * h01;
    const x01 = k00 * h01 + k01 * h11;
    const x10 = k01 * h00 + k11 * h01;
    const x11 = k01 * h01 + k11 * h11;
    const n00 = x00 * k00 + x01 * k01;
    const n01 = 0.5 * (x00 * k01 + x01 * k11 + x10 * k00 + x11 * k01);
    const n11 = x10 * k01 + x11 * k11;
    sv0 += v0 * v0;
    sv1 += 2 * v0 * v1;
    sv2 += v1 * v1;
    sk0 += k00;
    sk1 += 2 * k01;
    sk2 += k11;
    sq0 += n00;
    sq1 += 2 * n01;
    sq2 += n11;
    // K w_k with E_11 v = (v0, 0), E_12 v = (v1, v0), E_22 v = (0, v1).
    const kw00 = k00 * v0;
    const kw01 = k01 * v0;
    const kw10 = k00 * v1 + k01 * v0;
    const kw11 = k01 * v1 + k11 * v0;
    const kw20 = k01 * v1;
    const kw21 = k11 * v1;
    w00 += v0 * kw00;
    w01 += v0 * kw10;
    w02 += v0 * kw20;
    w11 += v1 * kw10 + v0 * kw11;
    w12 += v1 * kw20 + v0 * kw21;
    w22 += v1 * kw21;
    q00 += k00 * n00;
    q01 += k00 * n01 + k01 * n00;
    q02 += k01 * n01;
    q11 += k00 * n11 + 2 * k01 * n01 + k11 * n00;
    q12 += k01 * n11 + k11 * n01;
    q22 += k11 * n11;
    u00 += kw00;
    u01 += kw01;
    u10 += kw10;
    u11 += kw11;
    u20 += kw20;
    u21 += kw21;
    // KE_11K = (k00², k00k01, k01²), KE_22K = (k01², k01k11, k11²), KE_12K = (2k00k01, k00k11 + k01², 2k01k11).
    kk00 += k00 * k00;
    kk01 += k00 * k01;
    kk11 += k01 * k01;
    kkx += k00 * k11;
    kk1 += k01 * k11;
    kk22 += k11 * k11;
  }
  tot[0] = tot[0]! + sv0; tot[1] = tot[1]! + sv1; tot[2] = tot[2]! + sv2; tot[3] = tot[3]! + sk0; tot[4] = tot[4]! + sk1; tot[5] = tot[5]! + sk2; tot[6] = tot[6]! + sq0; tot[7] = tot[7]! + sq1; tot[8] = tot[8]! + sq2;
  tot[9] = tot[9]! + w00; tot[10] = tot[10]! + w01; tot[11] = tot[11]! + w02; tot[12] = tot[12]! + w11; tot[13] = tot[13]! + w12; tot[14] = tot[14]! + w22;
  tot[15] = tot[15]! + q00; tot[16] = tot[16]! + q01; tot[17] = tot[17]! + q02; tot[18] = tot[18]! + q11; tot[19] = tot[19]! + q12; tot[20] = tot[20]! + q22;
  arm[0] = arm[0]! + u00; arm[1] = arm[1]! + u01; arm[2] = arm[2]! + u10; arm[3] = arm[3]! + u11; arm[4] = arm[4]! + u20; arm[5] = arm[5]! + u21;
  arm[6] = arm[6]! + kk00; arm[7] = arm[7]! + kk01; arm[8] = arm[8]! + kk11; arm[9] = arm[9]! + kkx; arm[10] = arm[10]! + kk1; arm[11] = arm[11]! + kk22;
}
