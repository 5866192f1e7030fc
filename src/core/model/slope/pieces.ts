/**
 * Sums over participants of B_i' S_i B_i (p × p) and B_i' v_i (p) for per-participant 2 × 2 matrices S_i and
 * 2-vectors v_i, and B_i β, where B_i = Z_i'X_i (sums.ts). In the grouped layout B_i = C_i E_a, so the sums keep
 * only Σ_{i in a} C_i S_i C_i and Σ_{i in a} C_i v_i per arm (O(1) per participant) and finish with E_a'(…)E_a;
 * in the general layout each participant costs O(p²). Every likelihood and Kenward–Roger piece of the slope model is
 * one of these sums.
 */
import { addSandwich, addTransposed, type SlopeSums } from './sums';

export class SandwichSum {
  private readonly acc: Float64Array;
  constructor(private readonly s: SlopeSums) {
    this.acc = new Float64Array(s.group !== null ? s.E.length * 4 : s.p * s.p);
  }

  /** Adds B_i' S B_i for S = [[s00, s01], [s10, s11]]. */
  add(i: number, s00: number, s01: number, s10: number, s11: number): void {
    const s = this.s;
    if (s.group !== null) {
      const n = s.n[i]!;
      const t = s.st[i]!;
      const tt = s.stt[i]!;
      // C S C with C = [[n, t], [t, tt]].
      const a00 = n * s00 + t * s10;
      const a01 = n * s01 + t * s11;
      const a10 = t * s00 + tt * s10;
      const a11 = t * s01 + tt * s11;
      const o = 4 * s.group[i]!;
      const acc = this.acc;
      acc[o] = acc[o]! + a00 * n + a01 * t;
      acc[o + 1] = acc[o + 1]! + a00 * t + a01 * tt;
      acc[o + 2] = acc[o + 2]! + a10 * n + a11 * t;
      acc[o + 3] = acc[o + 3]! + a10 * t + a11 * tt;
      return;
    }
    const p = s.p;
    const B = s.B!;
    const off = i * 2 * p;
    const acc = this.acc;
    for (let j = 0; j < p; j++) {
      const b0 = B[off + j]!;
      const b1 = B[off + p + j]!;
      if (b0 === 0 && b1 === 0) continue;
      const u0 = b0 * s00 + b1 * s10;
      const u1 = b0 * s01 + b1 * s11;
      const row = j * p;
      for (let k = 0; k < p; k++) acc[row + k] = acc[row + k]! + u0 * B[off + k]! + u1 * B[off + p + k]!;
    }
  }

  /** The p × p total. */
  result(): Float64Array {
    const s = this.s;
    if (s.group === null) return this.acc;
    const out = new Float64Array(s.p * s.p);
    for (let a = 0; a < s.E.length; a++) addSandwich(out, s.E[a]!, this.acc[4 * a]!, this.acc[4 * a + 1]!, this.acc[4 * a + 2]!, this.acc[4 * a + 3]!, s.p);
    return out;
  }
}

export class VectorSum {
  private readonly acc: Float64Array;
  constructor(private readonly s: SlopeSums) {
    this.acc = new Float64Array(s.group !== null ? s.E.length * 2 : s.p);
  }

  /** Adds B_i' v. */
  add(i: number, v0: number, v1: number): void {
    const s = this.s;
    const acc = this.acc;
    if (s.group !== null) {
      const t = s.st[i]!;
      const o = 2 * s.group[i]!;
      acc[o] = acc[o]! + s.n[i]! * v0 + t * v1;
      acc[o + 1] = acc[o + 1]! + t * v0 + s.stt[i]! * v1;
      return;
    }
    const p = s.p;
    const B = s.B!;
    const off = i * 2 * p;
    for (let j = 0; j < p; j++) acc[j] = acc[j]! + B[off + j]! * v0 + B[off + p + j]! * v1;
  }

  result(): Float64Array {
    const s = this.s;
    if (s.group === null) return this.acc;
    const out = new Float64Array(s.p);
    for (let a = 0; a < s.E.length; a++) addTransposed(out, s.E[a]!, this.acc[2 * a]!, this.acc[2 * a + 1]!, s.p);
    return out;
  }
}

/**
 * B_i β for every participant as a function of i, writing into out[0], out[1]. In the grouped layout E_a β is computed
 * once per arm. Cost O(arms · p) to set up, then O(1) (grouped) or O(p) per call.
 */
export function timesBeta(s: SlopeSums, beta: Float64Array): (i: number, out: Float64Array) => void {
  const p = s.p;
  if (s.group !== null) {
    const eb = new Float64Array(2 * s.E.length);
    s.E.forEach((E, a) => {
      for (let j = 0; j < p; j++) {
        eb[2 * a] = eb[2 * a]! + E[j]! * beta[j]!;
        eb[2 * a + 1] = eb[2 * a + 1]! + E[p + j]! * beta[j]!;
      }
    });
    const g = s.group;
    return (i, out) => {
      const a = g[i]!;
      const t = s.st[i]!;
      out[0] = s.n[i]! * eb[2 * a]! + t * eb[2 * a + 1]!;
      out[1] = t * eb[2 * a]! + s.stt[i]! * eb[2 * a + 1]!;
    };
  }
  const B = s.B!;
  return (i, out) => {
    const off = i * 2 * p;
    let b0 = 0;
    let b1 = 0;
    for (let j = 0; j < p; j++) {
      b0 += B[off + j]! * beta[j]!;
      b1 += B[off + p + j]! * beta[j]!;
    }
    out[0] = b0;
    out[1] = b1;
  };
}

/**
 * The 2 × 2 matrix B_i H B_i' for a p × p matrix H, for every participant: in the grouped layout
 * C_i (E_a H E_a') C_i with E_a H E_a' computed once per arm. Writes [m00, m01, m10, m11] into out.
 */
export function bilinearB(s: SlopeSums, H: Float64Array): (i: number, out: Float64Array) => void {
  const p = s.p;
  if (s.group !== null) {
    const eh = new Float64Array(4 * s.E.length);
    s.E.forEach((E, a) => {
      for (let r = 0; r < 2; r++) {
        for (let c = 0; c < 2; c++) {
          let v = 0;
          for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) v += E[r * p + j]! * H[j * p + k]! * E[c * p + k]!;
          eh[4 * a + 2 * r + c] = v;
        }
      }
    });
    const g = s.group;
    return (i, out) => {
      const o = 4 * g[i]!;
      const n = s.n[i]!;
      const t = s.st[i]!;
      const tt = s.stt[i]!;
      const h00 = eh[o]!;
      const h01 = eh[o + 1]!;
      const h10 = eh[o + 2]!;
      const h11 = eh[o + 3]!;
      const a00 = n * h00 + t * h10;
      const a01 = n * h01 + t * h11;
      const a10 = t * h00 + tt * h10;
      const a11 = t * h01 + tt * h11;
      out[0] = a00 * n + a01 * t;
      out[1] = a00 * t + a01 * tt;
      out[2] = a10 * n + a11 * t;
      out[3] = a10 * t + a11 * tt;
    };
  }
  const B = s.B!;
  const hb = new Float64Array(2 * p);
  return (i, out) => {
    const off = i * 2 * p;
    for (let r = 0; r < 2; r++) {
      for (let j = 0; j < p; j++) {
        let v = 0;
        for (let k = 0; k < p; k++) v += H[j * p + k]! * B[off + r * p + k]!;
        hb[r * p + j] = v;
      }
    }
    for (let r = 0; r < 2; r++) {
      for (let c = 0; c < 2; c++) {
        let v = 0;
        for (let j = 0; j < p; j++) v += B[off + r * p + j]! * hb[c * p + j]!;
        out[2 * r + c] = v;
      }
    }
  };
}
