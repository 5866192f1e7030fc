/**
 * The fast data pass of the random-intercept model for the usual design with numeric covariates (intercept, arm
 * indicators, time, arm × time, then the covariates; or intercept, time and covariates when blinded).
 */
import { armCrossProducts } from './armSumsPass';
import type { Design } from './design';
import { poolBySize, type SufficientStats } from './sufficient';
import type { ModelData } from './types';

/**
 * The sufficient statistics in one loop over the rows, for numeric covariates only and rows grouped by subject (the
 * usual long format), each subject staying in one arm. X'X and X'y need, per arm, (n, Σt, Σt², Σy, Σty) and, per arm
 * and covariate, (Σc, Σct); over all rows, Σcy and the covariate products Σc_k c_l. So a row costs 5 + 3q + q(q+1)/2
 * additions for q covariates instead of the p(p+1)/2 products of a general pass (p = 5 with one covariate: 9 vs 15),
 * and nothing is allocated per row. Each subject's sums (n_i, Σy, Σt, Σc) are kept in locals and written out once, as
 * the subject's s_i, when the subject changes; the pooling by cluster size then follows (poolBySize).
 * Returns null — the caller then validates row by row and takes the general pass — when a subject's rows are not
 * contiguous, a subject appears in two arms, an index is out of range, or a sum is not finite (a missing value).
 * Cost O(n q² + subjects p²); memory O(subjects p).
 * Example: two subjects in arms 0 and 1, times [0, 1] each, covariate c = 2 on every row -> X'X row of c:
 * [8, 4, 2, 2, 16] (Σc, Σc·arm, Σct, Σct·arm, Σc²).
 */
export function sufficientStatsCovariates(data: ModelData, design: Design): SufficientStats | null {
  const q = data.covariates.length;
  const G = design.nArms;
  const p = design.p;
  if (design.timeCol < 0 || p !== 2 * G + q || q === 0) return null;
  const cov: Float64Array[] = [];
  for (const c of data.covariates) {
    if (c.kind !== 'numeric') return null;
    cov.push(c.values);
  }
  const { y, time, subject } = data;
  const armIndex = data.armIndex;
  const n = y.length;
  const nSub = data.nSubjects;
  const cCol = p - q; // first covariate column
  const g5 = new Float64Array(5 * G); // per arm: n, Σt, Σt², Σy, Σty
  const gc = new Float64Array(2 * G * q); // per arm and covariate: Σc, Σct
  const cy = new Float64Array(q); // Σ c_k y
  const cc = new Float64Array(q * q); // Σ c_k c_l, lower triangle
  const count = new Int32Array(nSub);
  const ysum = new Float64Array(nSub);
  const xsum = new Float64Array(nSub * p);
  const curC = new Float64Array(q); // this subject's Σc_k
  const curCT = new Float64Array(q); // this subject's Σc_k t
  const tc = design.timeCol;
  const armCol = design.armCol;
  const armTimeCol = design.armTimeCol;
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
  for (let r = 0; r <= n; r++) {
    const s = r < n ? subject[r]! : -1;
    const g = r < n && armIndex !== null ? armIndex[r]! : 0;
    if (s !== cur) {
      if (cur >= 0) {
        // Flush the finished subject: its s_i (n e_0 + T e_time [+ n e_arm + T e_armTime] + Σc e_cov), its Σy and
        // its share of the per-arm sums (written inline: a closure over these locals would keep them on the heap).
        if (count[cur]! !== 0) return null; // this subject's rows are not contiguous
        count[cur] = cn;
        ysum[cur] = cY;
        const off = cur * p;
        xsum[off] = cn;
        xsum[off + tc] = cT;
        if (curArm > 0 && armCol >= 0) {
          xsum[off + armCol + curArm - 1] = cn;
          xsum[off + armTimeCol + curArm - 1] = cT;
        }
        const o = 5 * curArm;
        g5[o] = g5[o]! + cn;
        g5[o + 1] = g5[o + 1]! + cT;
        g5[o + 2] = g5[o + 2]! + cTT;
        g5[o + 3] = g5[o + 3]! + cY;
        g5[o + 4] = g5[o + 4]! + cTY;
        const oc = 2 * q * curArm;
        for (let k = 0; k < q; k++) {
          xsum[off + cCol + k] = curC[k]!;
          gc[oc + 2 * k] = gc[oc + 2 * k]! + curC[k]!;
          gc[oc + 2 * k + 1] = gc[oc + 2 * k + 1]! + curCT[k]!;
          curC[k] = 0;
          curCT[k] = 0;
        }
      }
      if (r === n) break;
      if (!(s >= 0 && s < nSub) || !(g >= 0 && g < G)) return null;
      cur = s;
      curArm = g;
      cn = 0;
      cT = 0;
      cTT = 0;
      cY = 0;
      cTY = 0;
    } else if (g !== curArm) {
      return null;
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
    for (let k = 0; k < q; k++) {
      const c = cov[k]![r]!;
      curC[k] = curC[k]! + c;
      curCT[k] = curCT[k]! + c * t;
      cy[k] = cy[k]! + c * yr;
      for (let l = 0; l <= k; l++) cc[k * q + l] = cc[k * q + l]! + c * cov[l]![r]!;
    }
  }

  const { xtx, xty } = armCrossProducts(design, g5);
  const set = (i: number, j: number, v: number): void => {
    xtx[i * p + j] = v;
    xtx[j * p + i] = v;
  };
  for (let k = 0; k < q; k++) {
    const ck = cCol + k;
    let sc = 0;
    let sct = 0;
    for (let g = 0; g < G; g++) {
      const o = 2 * (q * g + k);
      sc += gc[o]!;
      sct += gc[o + 1]!;
      if (g > 0 && armCol >= 0) {
        set(ck, armCol + g - 1, gc[o]!);
        set(ck, armTimeCol + g - 1, gc[o + 1]!);
      }
    }
    set(ck, 0, sc);
    set(ck, tc, sct);
    for (let l = 0; l <= k; l++) set(ck, cCol + l, cc[k * q + l]!);
    xty[ck] = cy[k]!;
  }
  if (!Number.isFinite(yty) || !Number.isFinite(tMin) || !Number.isFinite(tMax)) return null;
  for (let i = 0; i < p * p; i++) if (!Number.isFinite(xtx[i]!)) return null;
  for (let i = 0; i < p; i++) if (!Number.isFinite(xty[i]!)) return null;
  return { p, nObs: n, xtx, xty, yty, tMin, tMax, count, ysum, ...poolBySize(p, count, ysum, xsum) };
}
