/**
 * The fast data pass of the random-intercept model for the usual design without covariates: X'X, X'y and the
 * pooled-by-size pieces follow from a few sums per arm and per subject (see sufficientStatsFast).
 */
import type { Design } from './design';
import { sizeSlots, type SufficientStats } from './sufficient';

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
  // One step past the last row (r === n) flushes the last subject through the same code as every other.
  for (let r = 0; r <= n; r++) {
    const s = r < n ? subject[r]! : -1;
    const g = r < n && armIndex !== null ? armIndex[r]! : 0;
    if (s !== cur || r === n) {
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
      if (r === n) break;
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
  const { xtx, xty } = armCrossProducts(design, g5);
  const tc = design.timeCol;
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

/**
 * The intercept / arm / time / arm × time block of X'X and X'y from the per-arm sums g5 = (n, Σt, Σt², Σy, Σty) per
 * arm (0/1 arm indicators, so a² = a and products of different arms' indicators vanish). Other columns stay zero.
 * Cost O(arms + p²). Example: one arm (blinded) with sums (2, 1, 1, 5, 3) -> X'X = [[2, 1], [1, 1]], X'y = [5, 3].
 */
export function armCrossProducts(design: Design, g5: Float64Array): { xtx: Float64Array; xty: Float64Array } {
  const p = design.p;
  const G = design.nArms;
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
  return { xtx, xty };
}
