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
 * Computes the sufficient statistics in one pass over the rows and one over the subjects. The row loop allocates
 * nothing and accumulates only the lower triangle of X'X, skipping zero entries (arm indicators).
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
  for (let r = 0; r < n; r++) {
    fill(r, x);
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

  let tMin = Infinity;
  let tMax = -Infinity;
  if (time !== undefined) {
    for (let r = 0; r < n; r++) {
      const t = time[r]!;
      if (t < tMin) tMin = t;
      if (t > tMax) tMax = t;
    }
  }
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
  return { p, nObs: n, nSubjects, xtx, xty, yty, tMin, tMax, count, ysum, xbSum, sizes, m, S, c, q };
}

/**
 * The fast data pass for the usual design without covariates (intercept, arm indicators, time, arm × time; or
 * intercept and time when blinded), when each subject stays in one arm. With 0/1 arm indicators, X'X and X'y follow
 * from five sums per arm (n, Σt, Σt², Σy, Σty) and each subject's s_i from (n_i, Σ_j t_ij, arm), so the row loop does
 * a handful of additions and no p x p work. When each subject's rows are contiguous (the usual long format) the
 * sums run in local variables and are flushed once per subject; otherwise per-subject arrays are updated row by row.
 * Returns null when a subject appears in two arms or an index is out of range (the caller then validates and takes
 * the general pass). Cost O(n + subjects p²).
 * Example: two subjects in arms 0 and 1, times [0, 1] each -> X'X = [[4,2,2,1],[2,2,1,1],[2,1,2,1],[1,1,1,1]].
 */
export function sufficientStatsFast(
  y: Float64Array,
  time: Float64Array,
  subject: Int32Array,
  nSubjectsIn: number,
  armIndex: Int32Array | null,
  design: Design,
): SufficientStats | null {
  const G = design.nArms;
  const g5 = new Float64Array(5 * G); // per arm: n, Σt, Σt², Σy, Σty
  const count = new Int32Array(nSubjectsIn);
  const ysum = new Float64Array(nSubjectsIn);
  const tsum = new Float64Array(nSubjectsIn);
  const subjArm = new Int32Array(nSubjectsIn).fill(-1);
  const pass = contiguousPass(y, time, subject, armIndex, G, g5, count, ysum, tsum, subjArm);
  if (pass === 'invalid') return null;
  let yty: number;
  let tMin: number;
  let tMax: number;
  if (pass === 'interleaved') {
    g5.fill(0);
    count.fill(0);
    ysum.fill(0);
    tsum.fill(0);
    subjArm.fill(-1);
    const r = scatteredPass(y, time, subject, armIndex, G, g5, count, ysum, tsum, subjArm);
    if (r === null) return null;
    ({ yty, tMin, tMax } = r);
  } else {
    ({ yty, tMin, tMax } = pass);
  }
  return assembleFromArmSums(design, y.length, g5, yty, tMin, tMax, count, ysum, tsum, subjArm);
}

type PassTotals = { yty: number; tMin: number; tMax: number };

/** Rows grouped by subject: sums in locals, flushed at each change of subject. 'interleaved' if a subject recurs. */
function contiguousPass(
  y: Float64Array,
  time: Float64Array,
  subject: Int32Array,
  armIndex: Int32Array | null,
  G: number,
  g5: Float64Array,
  count: Int32Array,
  ysum: Float64Array,
  tsum: Float64Array,
  subjArm: Int32Array,
): PassTotals | 'interleaved' | 'invalid' {
  const n = y.length;
  const nSub = count.length;
  let yty = 0;
  let tMin = Infinity;
  let tMax = -Infinity;
  let cur = -1;
  let curArm = 0;
  let cn = 0;
  let cT = 0;
  let cTT = 0;
  let cY = 0;
  let cTY = 0;
  for (let r = 0; r < n; r++) {
    const s = subject[r]!;
    const g = armIndex === null ? 0 : armIndex[r]!;
    if (s !== cur) {
      // Flush the finished subject (written inline: a closure over these locals would keep them on the heap).
      if (cur >= 0) {
        if (count[cur]! !== 0) return 'interleaved';
        count[cur] = cn;
        ysum[cur] = cY;
        tsum[cur] = cT;
        subjArm[cur] = curArm;
        const o = 5 * curArm;
        g5[o] = g5[o]! + cn;
        g5[o + 1] = g5[o + 1]! + cT;
        g5[o + 2] = g5[o + 2]! + cTT;
        g5[o + 3] = g5[o + 3]! + cY;
        g5[o + 4] = g5[o + 4]! + cTY;
      }
      if (!(s >= 0 && s < nSub) || !(g >= 0 && g < G)) return 'invalid';
      cur = s;
      curArm = g;
      cn = 0;
      cT = 0;
      cTT = 0;
      cY = 0;
      cTY = 0;
    } else if (g !== curArm) {
      return 'invalid';
    }
    const t = time[r]!;
    const yr = y[r]!;
    cn++;
    cT += t;
    cTT += t * t;
    cY += yr;
    cTY += t * yr;
    yty += yr * yr;
    if (t < tMin) tMin = t;
    if (t > tMax) tMax = t;
  }
  if (cur >= 0) {
    if (count[cur]! !== 0) return 'interleaved';
    count[cur] = cn;
    ysum[cur] = cY;
    tsum[cur] = cT;
    subjArm[cur] = curArm;
    const o = 5 * curArm;
    g5[o] = g5[o]! + cn;
    g5[o + 1] = g5[o + 1]! + cT;
    g5[o + 2] = g5[o + 2]! + cTT;
    g5[o + 3] = g5[o + 3]! + cY;
    g5[o + 4] = g5[o + 4]! + cTY;
  }
  return { yty, tMin, tMax };
}

/** Rows in any order: per-subject arrays updated row by row. Null when a subject is in two arms or an index is bad. */
function scatteredPass(
  y: Float64Array,
  time: Float64Array,
  subject: Int32Array,
  armIndex: Int32Array | null,
  G: number,
  g5: Float64Array,
  count: Int32Array,
  ysum: Float64Array,
  tsum: Float64Array,
  subjArm: Int32Array,
): PassTotals | null {
  const n = y.length;
  const nSub = count.length;
  let yty = 0;
  let tMin = Infinity;
  let tMax = -Infinity;
  for (let r = 0; r < n; r++) {
    const g = armIndex === null ? 0 : armIndex[r]!;
    const s = subject[r]!;
    if (!(s >= 0 && s < nSub) || !(g >= 0 && g < G)) return null;
    const sa = subjArm[s]!;
    if (sa !== g) {
      if (sa !== -1) return null;
      subjArm[s] = g;
    }
    const t = time[r]!;
    const yr = y[r]!;
    const o = 5 * g;
    g5[o] = g5[o]! + 1;
    g5[o + 1] = g5[o + 1]! + t;
    g5[o + 2] = g5[o + 2]! + t * t;
    g5[o + 3] = g5[o + 3]! + yr;
    g5[o + 4] = g5[o + 4]! + t * yr;
    yty += yr * yr;
    count[s] = count[s]! + 1;
    ysum[s] = ysum[s]! + yr;
    tsum[s] = tsum[s]! + t;
    if (t < tMin) tMin = t;
    if (t > tMax) tMax = t;
  }
  return { yty, tMin, tMax };
}

/** X'X, X'y and each subject's s_i from the per-arm sums (arm indicators are 0/1, so a² = a and cross-arm terms vanish). */
function assembleFromArmSums(
  design: Design,
  nObs: number,
  g5: Float64Array,
  yty: number,
  tMin: number,
  tMax: number,
  count: Int32Array,
  ysum: Float64Array,
  tsum: Float64Array,
  subjArm: Int32Array,
): SufficientStats {
  const p = design.p;
  const G = design.nArms;
  const nSubjectsIn = count.length;
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  const set = (i: number, j: number, v: number): void => {
    xtx[i * p + j] = v;
    xtx[j * p + i] = v;
  };
  const tc = design.timeCol;
  const tot = new Float64Array(5);
  for (let g = 0; g < G; g++) for (let k = 0; k < 5; k++) tot[k] = tot[k]! + g5[5 * g + k]!;
  set(0, 0, tot[0]!);
  set(0, tc, tot[1]!);
  set(tc, tc, tot[2]!);
  xty[0] = tot[3]!;
  xty[tc] = tot[4]!;
  if (design.armCol >= 0) {
    for (let g = 1; g < G; g++) {
      const a = design.armCol + g - 1;
      const at = design.armTimeCol + g - 1;
      const o = 5 * g;
      set(a, 0, g5[o]!);
      set(a, a, g5[o]!);
      set(a, tc, g5[o + 1]!);
      set(a, at, g5[o + 1]!);
      set(at, 0, g5[o + 1]!);
      set(at, tc, g5[o + 2]!);
      set(at, at, g5[o + 2]!);
      xty[a] = g5[o + 3]!;
      xty[at] = g5[o + 4]!;
    }
  }
  // Pool by (cluster size k, arm g): s_i = n_i e_0 + T_i e_time (+ n_i e_arm + T_i e_armTime for g > 0), so S_k, c_k
  // need only Σn², ΣnT, ΣT², Σn t, ΣT t, Σt² and the count per (k, g).
  const { slot, sizes, nSubjects } = sizeSlots(count);
  const K = sizes.length;
  const acc = new Float64Array(K * G * 7);
  for (let s = 0; s < nSubjectsIn; s++) {
    const ni = count[s]!;
    if (ni === 0) continue;
    const o = (slot[ni]! * G + subjArm[s]!) * 7;
    const T = tsum[s]!;
    const t = ysum[s]!;
    acc[o] = acc[o]! + ni * ni;
    acc[o + 1] = acc[o + 1]! + ni * T;
    acc[o + 2] = acc[o + 2]! + T * T;
    acc[o + 3] = acc[o + 3]! + ni * t;
    acc[o + 4] = acc[o + 4]! + T * t;
    acc[o + 5] = acc[o + 5]! + t * t;
    acc[o + 6] = acc[o + 6]! + 1;
  }
  const m = new Float64Array(K);
  const S = new Float64Array(K * p * p);
  const c = new Float64Array(K * p);
  const q = new Float64Array(K);
  for (let k = 0; k < K; k++) {
    const so = k * p * p;
    const add = (i: number, j: number, v: number): void => {
      S[so + i * p + j] = S[so + i * p + j]! + v;
      if (i !== j) S[so + j * p + i] = S[so + j * p + i]! + v;
    };
    for (let g = 0; g < G; g++) {
      const o = (k * G + g) * 7;
      const [nn, nT, TT, nt, Tt, tt, cnt] = [acc[o]!, acc[o + 1]!, acc[o + 2]!, acc[o + 3]!, acc[o + 4]!, acc[o + 5]!, acc[o + 6]!];
      add(0, 0, nn);
      add(0, tc, nT);
      add(tc, tc, TT);
      c[k * p] = c[k * p]! + nt;
      c[k * p + tc] = c[k * p + tc]! + Tt;
      if (g > 0 && design.armCol >= 0) {
        const a = design.armCol + g - 1;
        const at = design.armTimeCol + g - 1;
        add(0, a, nn);
        add(a, a, nn);
        add(0, at, nT);
        add(a, tc, nT);
        add(a, at, nT);
        add(tc, at, TT);
        add(at, at, TT);
        c[k * p + a] = c[k * p + a]! + nt;
        c[k * p + at] = c[k * p + at]! + Tt;
      }
      q[k] = q[k]! + tt;
      m[k] = m[k]! + cnt;
    }
  }
  const armCol = design.armCol;
  const armTimeCol = design.armTimeCol;
  const xbSum = (s: number, beta: Float64Array): number => {
    const g = subjArm[s]!;
    let level = beta[0]!;
    let slope = beta[tc]!;
    if (g > 0 && armCol >= 0) {
      level += beta[armCol + g - 1]!;
      slope += beta[armTimeCol + g - 1]!;
    }
    return count[s]! * level + tsum[s]! * slope;
  };
  return { p, nObs, nSubjects, xtx, xty, yty, tMin, tMax, count, ysum, xbSum, sizes, m, S, c, q };
}

/** Distinct cluster sizes in order of first appearance, a size → slot table, and the number of non-empty subjects. */
function sizeSlots(count: Int32Array): { slot: Int32Array; sizes: Float64Array; nSubjects: number } {
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
