/**
 * One pass over the participants of the repeated-measures model: participants with the same arm and the same set of
 * observed visits form a group, and each group keeps only the sums its likelihood needs (count, Σb, Σb², Σy, Σb·y and
 * Σyy' over its observed visits, with b the baseline covariate). Every later step works on the groups, so a likelihood
 * evaluation costs O(groups · visits³) whatever the number of participants. Values are centred and scaled first
 * (y' = (y − c_y)/s_y, b' = (b − c_b)/s_b with the mean and standard deviation) so the sums stay of order one.
 * Cost O(participants · visits²).
 */
import { DegenerateDataError, ModelInputError } from '../errors';
import type { RepeatedData } from './types';

export interface PatternGroup {
  readonly arm: number;
  /** Observed visit indices, increasing. */
  readonly obs: Int32Array;
  n: number;
  sb: number;
  sbb: number;
  readonly sy: Float64Array;
  readonly sby: Float64Array;
  /** Σ y y' over the group's observed visits, m × m row-major. */
  readonly syy: Float64Array;
}

/** Sizes of the internal cell-means parametrisation: θ = [μ(a, v) for arm a, visit v; γ(v) for visit v if baseline]. */
export interface Layout {
  readonly nArms: number;
  readonly nVisits: number;
  readonly hasBaseline: boolean;
  readonly p: number;
}

export interface Grouped {
  readonly layout: Layout;
  readonly groups: readonly PatternGroup[];
  readonly nSubjects: number;
  readonly nObs: number;
  /** Per arm and visit: participants with a value (arm-major). */
  readonly cellCounts: Int32Array;
  readonly cy: number;
  readonly sy: number;
  readonly cb: number;
  readonly sb: number;
}

/** Groups the participants of `data` (see the file comment). Throws ModelInputError on wrong shapes,
 * DegenerateDataError when fewer than two participants have a value or the values do not vary. */
export function groupByPattern(data: RepeatedData): Grouped {
  const V = data.visits.length;
  const S = data.nSubjects;
  if (V < 1) throw new ModelInputError('the schedule has no visit.');
  if (data.y.length !== S * V) throw new ModelInputError(`y has ${data.y.length} entries; expected participants × visits = ${S * V}.`);
  const A = data.armIndex === null ? 1 : Math.max(1, data.arms.length);
  if (data.armIndex !== null && data.armIndex.length !== S) throw new ModelInputError('armIndex needs one entry per participant.');
  const base = data.baseline?.values ?? null;
  if (base !== null && base.length !== S) throw new ModelInputError('the baseline covariate needs one value per participant.');
  // Centre and scale: Welford (1962) running mean and sum of squares.
  let n = 0;
  let mean = 0;
  let m2 = 0;
  let bn = 0;
  let bmean = 0;
  let bm2 = 0;
  for (let i = 0; i < S; i++) {
    let any = false;
    for (let v = 0; v < V; v++) {
      const x = data.y[i * V + v]!;
      if (Number.isNaN(x)) continue;
      if (!Number.isFinite(x)) throw new ModelInputError(`participant ${i + 1} has a value that is not finite.`);
      any = true;
      n++;
      const d = x - mean;
      mean += d / n;
      m2 += d * (x - mean);
    }
    if (any && base !== null) {
      const b = base[i]!;
      if (!Number.isFinite(b)) throw new ModelInputError(`participant ${i + 1} has no finite baseline value.`);
      bn++;
      const d = b - bmean;
      bmean += d / bn;
      bm2 += d * (b - bmean);
    }
    if (any && data.armIndex !== null) {
      const a = data.armIndex[i]!;
      if (!(a >= 0 && a < A)) throw new ModelInputError(`participant ${i + 1} has arm index ${a}, outside 0..${A - 1}.`);
    }
  }
  const sdY = n > 1 ? Math.sqrt(m2 / (n - 1)) : 0;
  if (!(sdY > 0) || !(sdY > Math.abs(mean) * 1e-13)) throw new DegenerateDataError('no-variation', 'the values do not vary (or vary below their floating-point resolution).');
  const sdB = base !== null && bn > 1 ? Math.sqrt(bm2 / (bn - 1)) : 1;
  if (base !== null && !(sdB > Math.abs(bmean) * 1e-13)) throw new DegenerateDataError('no-variation', `the baseline covariate "${data.baseline!.name}" does not vary.`);
  const byKey = new Map<string, PatternGroup>();
  const groups: PatternGroup[] = [];
  const cellCounts = new Int32Array(A * V);
  const yi = new Float64Array(V);
  const idx = new Int32Array(V);
  let nSubjects = 0;
  let nObs = 0;
  for (let i = 0; i < S; i++) {
    let m = 0;
    let key = '';
    for (let v = 0; v < V; v++) {
      const x = data.y[i * V + v]!;
      if (Number.isNaN(x)) continue;
      idx[m] = v;
      yi[m] = (x - mean) / sdY;
      m++;
      key += `${v},`;
    }
    if (m === 0) continue;
    const a = data.armIndex === null ? 0 : data.armIndex[i]!;
    key += `|${a}`;
    let g = byKey.get(key);
    if (g === undefined) {
      g = { arm: a, obs: idx.slice(0, m), n: 0, sb: 0, sbb: 0, sy: new Float64Array(m), sby: new Float64Array(m), syy: new Float64Array(m * m) };
      byKey.set(key, g);
      groups.push(g);
    }
    const b = base === null ? 0 : (base[i]! - bmean) / sdB;
    g.n++;
    g.sb += b;
    g.sbb += b * b;
    for (let k = 0; k < m; k++) {
      const yk = yi[k]!;
      g.sy[k] = g.sy[k]! + yk;
      g.sby[k] = g.sby[k]! + b * yk;
      for (let l = 0; l < m; l++) g.syy[k * m + l] = g.syy[k * m + l]! + yk * yi[l]!;
      cellCounts[a * V + idx[k]!] = cellCounts[a * V + idx[k]!]! + 1;
    }
    nSubjects++;
    nObs += m;
  }
  if (nSubjects < 2) throw new DegenerateDataError('one-subject', 'fewer than two participants have a value at a scheduled visit.');
  const hasBaseline = base !== null;
  const layout: Layout = { nArms: A, nVisits: V, hasBaseline, p: A * V + (hasBaseline ? V : 0) };
  return { layout, groups, nSubjects, nObs, cellCounts, cy: mean, sy: sdY, cb: base === null ? 0 : bmean, sb: sdB };
}
