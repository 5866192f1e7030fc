/**
 * One pass over the observations collecting the sufficient statistics of the random-intercept model, then pooling the
 * per-subject pieces by cluster size (SPEC §7): with V_i⁻¹ = (I − w_i J)/σ², w_i = γ/(1 + n_i γ) (Sherman–Morrison),
 * every quantity the likelihood and the Kenward–Roger pieces need is a global cross product minus Σ_n f(n, γ) S_n.
 */
import type { Design } from './design';

export interface SufficientStats {
  readonly p: number;
  /** Number of observations. */
  readonly nObs: number;
  /** Number of subjects with at least one observation. */
  readonly nSubjects: number;
  /** X'X (full symmetric, row-major), X'y, y'y. */
  readonly xtx: Float64Array;
  readonly xty: Float64Array;
  readonly yty: number;
  /** Smallest and largest time among the observations (±Infinity when not tracked). */
  readonly tMin: number;
  readonly tMax: number;
  /** Per subject (indexed by subject): n_i and t_i = 1'y_i. */
  readonly count: Int32Array;
  readonly ysum: Float64Array;
  /** s_i'β for subject i (= Σ_j x_ij'β), from whatever per-subject sums the pass kept. Cost O(p). */
  readonly xbSum: (subject: number, beta: Float64Array) => number;
  /** Distinct cluster sizes, and per size k: m_k subjects, S_k = Σ s_i s_i' (p x p), c_k = Σ s_i t_i, q_k = Σ t_i². */
  readonly sizes: Float64Array;
  readonly m: Float64Array;
  readonly S: Float64Array;
  readonly c: Float64Array;
  readonly q: Float64Array;
}

/**
 * Computes the sufficient statistics in one pass over the rows (any design, rows in any order) and one over the
 * subjects. The row loop allocates nothing, tracks the time range and accumulates only the lower triangle of X'X,
 * skipping zero entries (arm and level indicators).
 * Cost O(n p²) for the rows, O(subjects p²) for the pooling; memory O(subjects p).
 * Example: y = [1, 2, 3], one subject, intercept only -> xtx [3], xty [6], yty 14, sizes [3], S [9], c [18], q [36].
 */
export function sufficientStats(y: Float64Array, subject: Int32Array, nSubjectsIn: number, design: Design, time?: Float64Array): SufficientStats {
  const p = design.p;
  const n = y.length;
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  const count = new Int32Array(nSubjectsIn);
  const ysum = new Float64Array(nSubjectsIn);
  const xsum = new Float64Array(nSubjectsIn * p);
  const x = new Float64Array(p);
  const fill = design.fillRow;
  let yty = 0;
  let tMin = Infinity;
  let tMax = -Infinity;
  for (let r = 0; r < n; r++) {
    fill(r, x);
    if (time !== undefined) {
      const t = time[r]!;
      if (t < tMin) tMin = t;
      if (t > tMax) tMax = t;
    }
    const yr = y[r]!;
    const s = subject[r]!;
    const off = s * p;
    yty += yr * yr;
    count[s] = count[s]! + 1;
    ysum[s] = ysum[s]! + yr;
    for (let i = 0; i < p; i++) {
      const xi = x[i]!;
      if (xi === 0) continue;
      xty[i] = xty[i]! + xi * yr;
      xsum[off + i] = xsum[off + i]! + xi;
      const row = i * p;
      for (let j = 0; j <= i; j++) xtx[row + j] = xtx[row + j]! + xi * x[j]!;
    }
  }
  for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) xtx[j * p + i] = xtx[i * p + j]!;

  return { p, nObs: n, xtx, xty, yty, tMin, tMax, count, ysum, ...poolBySize(p, count, ysum, xsum) };
}

/**
 * Pools the per-subject sums by cluster size: from n_i (count), t_i (ysum) and s_i (xsum, subject-major, p per
 * subject) it forms, per distinct size k, m_k, S_k = Σ s_i s_i', c_k = Σ s_i t_i and q_k = Σ t_i², plus s_i'β on demand.
 * Only the lower triangle is accumulated, skipping zero entries of s_i (arm indicators). Cost O(subjects p²).
 * Example: one subject with n = 3, t = 6, s = [3] -> sizes [3], m [1], S [9], c [18], q [36].
 */
export function poolBySize(
  p: number,
  count: Int32Array,
  ysum: Float64Array,
  xsum: Float64Array,
): Pick<SufficientStats, 'nSubjects' | 'sizes' | 'm' | 'S' | 'c' | 'q' | 'xbSum'> {
  const nSubjectsIn = count.length;
  const { slot, sizes, nSubjects } = sizeSlots(count);
  const K = sizes.length;
  const m = new Float64Array(K);
  const S = new Float64Array(K * p * p);
  const c = new Float64Array(K * p);
  const q = new Float64Array(K);
  for (let s = 0; s < nSubjectsIn; s++) {
    const ni = count[s]!;
    if (ni === 0) continue;
    const k = slot[ni]!;
    const t = ysum[s]!;
    const off = s * p;
    const sOff = k * p * p;
    m[k] = m[k]! + 1;
    q[k] = q[k]! + t * t;
    for (let i = 0; i < p; i++) {
      const si = xsum[off + i]!;
      if (si === 0) continue;
      c[k * p + i] = c[k * p + i]! + si * t;
      const row = sOff + i * p;
      for (let j = 0; j <= i; j++) S[row + j] = S[row + j]! + si * xsum[off + j]!;
    }
  }
  symmetrise(S, K, p);
  const xbSum = (s: number, beta: Float64Array): number => {
    let f = 0;
    for (let j = 0; j < p; j++) f += xsum[s * p + j]! * beta[j]!;
    return f;
  };
  return { nSubjects, sizes, m, S, c, q, xbSum };
}

/** Distinct cluster sizes in order of first appearance, a size → slot table, and the number of non-empty subjects. */
export function sizeSlots(count: Int32Array): { slot: Int32Array; sizes: Float64Array; nSubjects: number } {
  let maxN = 0;
  let nSubjects = 0;
  for (let s = 0; s < count.length; s++) {
    const ni = count[s]!;
    if (ni > 0) nSubjects++;
    if (ni > maxN) maxN = ni;
  }
  const slot = new Int32Array(maxN + 1).fill(-1);
  const sizeList: number[] = [];
  for (let s = 0; s < count.length; s++) {
    const ni = count[s]!;
    if (ni > 0 && slot[ni] === -1) {
      slot[ni] = sizeList.length;
      sizeList.push(ni);
    }
  }
  return { slot, sizes: Float64Array.from(sizeList), nSubjects };
}

/** Copies the lower triangle of each of the K p x p blocks to the upper. */
function symmetrise(S: Float64Array, K: number, p: number): void {
  for (let k = 0; k < K; k++) {
    const sOff = k * p * p;
    for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) S[sOff + j * p + i] = S[sOff + i * p + j]!;
  }
}

/**
 * Σ_k f_k S_k added to base·X'X: returns base·X'X + Σ_k f(n_k) S_k as a new p x p matrix. This one form gives
 * X'V⁻ᵏX·σ^{2k} = X'X + Σ_n ((a_n^k − 1)/n) S_n with a_n = 1/(1 + nγ), and the J-weighted pieces (base = 0).
 * Cost O(K p²).
 */
export function pooledMatrix(st: SufficientStats, base: number, f: (n: number) => number): Float64Array {
  const p = st.p;
  const out = new Float64Array(p * p);
  if (base !== 0) for (let i = 0; i < p * p; i++) out[i] = base * st.xtx[i]!;
  for (let k = 0; k < st.sizes.length; k++) {
    const fk = f(st.sizes[k]!);
    if (fk === 0) continue;
    const off = k * p * p;
    for (let i = 0; i < p * p; i++) out[i] = out[i]! + fk * st.S[off + i]!;
  }
  return out;
}
