/**
 * Pooled products over a group of participants who share arm a and observed visits o (m of them). Participant i's
 * design rows are x_ik = [e(a, o_k) | b_i e(o_k)] in the cell-means parametrisation (groups.ts), so for any m × m
 * matrix M, Σ_i X_i' M X_i has the blocks n·M (means), Σb·M (means × slopes) and Σb²·M (slopes), placed at the
 * group's arm and visits. Each helper costs O(m²).
 */
import type { Layout, PatternGroup } from './groups';

/** out += Σ_i X_i' M X_i (p × p) for the group g; M is m × m. */
export function addXtMX(out: Float64Array, lay: Layout, g: PatternGroup, M: Float64Array): void {
  const { p, nVisits: V, nArms: A, hasBaseline } = lay;
  const m = g.obs.length;
  const base = g.arm * V;
  for (let k = 0; k < m; k++) {
    const ck = base + g.obs[k]!;
    const gk = A * V + g.obs[k]!;
    for (let l = 0; l < m; l++) {
      const val = M[k * m + l]!;
      if (val === 0) continue;
      const cl = base + g.obs[l]!;
      out[ck * p + cl] = out[ck * p + cl]! + g.n * val;
      if (hasBaseline) {
        const gl = A * V + g.obs[l]!;
        out[ck * p + gl] = out[ck * p + gl]! + g.sb * val;
        out[gk * p + cl] = out[gk * p + cl]! + g.sb * val;
        out[gk * p + gl] = out[gk * p + gl]! + g.sbb * val;
      }
    }
  }
}

/** out += Σ_i X_i' (W y_i) for the group (p), from the pooled Σy and Σb·y. */
export function addXtWy(out: Float64Array, lay: Layout, g: PatternGroup, W: Float64Array): void {
  const { nVisits: V, nArms: A, hasBaseline } = lay;
  const m = g.obs.length;
  for (let k = 0; k < m; k++) {
    let a = 0;
    let b = 0;
    for (let l = 0; l < m; l++) {
      a += W[k * m + l]! * g.sy[l]!;
      b += W[k * m + l]! * g.sby[l]!;
    }
    const ck = g.arm * V + g.obs[k]!;
    out[ck] = out[ck]! + a;
    if (hasBaseline) out[A * V + g.obs[k]!] = out[A * V + g.obs[k]!]! + b;
  }
}

/** Σ_i X_i C X_i' over the group (m × m), for a p × p matrix C. */
export function groupXCXt(lay: Layout, g: PatternGroup, C: Float64Array): Float64Array {
  const { p, nVisits: V, nArms: A, hasBaseline } = lay;
  const m = g.obs.length;
  const out = new Float64Array(m * m);
  for (let k = 0; k < m; k++) {
    const ck = g.arm * V + g.obs[k]!;
    const gk = A * V + g.obs[k]!;
    for (let l = 0; l < m; l++) {
      const cl = g.arm * V + g.obs[l]!;
      let s = g.n * C[ck * p + cl]!;
      if (hasBaseline) {
        const gl = A * V + g.obs[l]!;
        s += g.sb * (C[ck * p + gl]! + C[gk * p + cl]!) + g.sbb * C[gk * p + gl]!;
      }
      out[k * m + l] = s;
    }
  }
  return out;
}

/** Σ_i r_i r_i' over the group (m × m), with r_i = y_i − X_i θ, from the pooled sums. */
export function groupResidualSS(lay: Layout, g: PatternGroup, theta: Float64Array): Float64Array {
  const { nVisits: V, nArms: A, hasBaseline } = lay;
  const m = g.obs.length;
  const mu = new Float64Array(m);
  const ga = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    mu[k] = theta[g.arm * V + g.obs[k]!]!;
    ga[k] = hasBaseline ? theta[A * V + g.obs[k]!]! : 0;
  }
  const out = new Float64Array(m * m);
  for (let k = 0; k < m; k++) {
    for (let l = 0; l < m; l++) {
      out[k * m + l] =
        g.syy[k * m + l]! -
        g.sy[k]! * mu[l]! -
        mu[k]! * g.sy[l]! -
        g.sby[k]! * ga[l]! -
        ga[k]! * g.sby[l]! +
        g.n * mu[k]! * mu[l]! +
        g.sb * (mu[k]! * ga[l]! + ga[k]! * mu[l]!) +
        g.sbb * ga[k]! * ga[l]!;
    }
  }
  return out;
}

/** The m × m submatrix Σ[o, o] of a V × V matrix. */
export function submatrix(sigma: Float64Array, V: number, obs: Int32Array): Float64Array {
  const m = obs.length;
  const out = new Float64Array(m * m);
  for (let k = 0; k < m; k++) for (let l = 0; l < m; l++) out[k * m + l] = sigma[obs[k]! * V + obs[l]!]!;
  return out;
}

/** a · b for m × m matrices. */
export function mul(a: Float64Array, b: Float64Array, m: number): Float64Array {
  const c = new Float64Array(m * m);
  for (let i = 0; i < m; i++) {
    for (let k = 0; k < m; k++) {
      const aik = a[i * m + k]!;
      if (aik === 0) continue;
      for (let j = 0; j < m; j++) c[i * m + j] = c[i * m + j]! + aik * b[k * m + j]!;
    }
  }
  return c;
}
