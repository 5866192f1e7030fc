/**
 * The fixed-effects design of the random-intercept model (SPEC §5): intercept, k-1 arm indicators against the
 * reference arm, time, k-1 arm-by-time terms, then covariates (numeric as is, categorical as indicators against the
 * first level). Blinded data (no arm column) give intercept, time and covariates; 'intercept-only' gives the intercept.
 */
import { ModelInputError } from './errors';
import type { ModelData, Term } from './types';

export interface Design {
  readonly p: number;
  readonly terms: readonly Term[];
  /** Number of arms in the design (1 when blinded or intercept-only). */
  readonly nArms: number;
  /** Column of the time term, or -1. */
  readonly timeCol: number;
  /** Column of the first arm indicator (arm 1), or -1; arm a > 0 is at armCol + a - 1. */
  readonly armCol: number;
  /** Column of the first arm-by-time term, or -1. */
  readonly armTimeCol: number;
  /** Fills x (length p) with row r of the design. Cost O(p). */
  readonly fillRow: (r: number, x: Float64Array) => void;
}

/**
 * Builds the design description and a row filler; validates covariate values (missing values throw, naming the row).
 * Cost O(n) for categorical covariates (one level-index column each), O(1) otherwise.
 * Example: two arms ["Placebo", "Drug"], no covariates -> terms Intercept, Arm Drug, Time, Arm Drug × time (p = 4).
 */
export function buildDesign(data: ModelData, interceptOnly: boolean): Design {
  const n = data.y.length;
  if (interceptOnly) {
    return {
      p: 1,
      terms: [{ name: 'Intercept', kind: 'intercept', arm: null }],
      nArms: 1,
      timeCol: -1,
      armCol: -1,
      armTimeCol: -1,
      fillRow: (_r, x) => {
        x[0] = 1;
      },
    };
  }
  const terms: Term[] = [{ name: 'Intercept', kind: 'intercept', arm: null }];
  const armIndex = data.armIndex;
  const nArms = armIndex === null ? 1 : data.arms.length;
  let armCol = -1;
  if (armIndex !== null && nArms > 1) {
    armCol = terms.length;
    for (let a = 1; a < nArms; a++) terms.push({ name: `Arm ${data.arms[a]!} vs ${data.arms[0]!}`, kind: 'arm', arm: data.arms[a]! });
  }
  const timeCol = terms.length;
  terms.push({ name: 'Time', kind: 'time', arm: null });
  let armTimeCol = -1;
  if (armCol >= 0) {
    armTimeCol = terms.length;
    for (let a = 1; a < nArms; a++) terms.push({ name: `Time × arm ${data.arms[a]!}`, kind: 'armTime', arm: data.arms[a]! });
  }
  const numeric: { col: number; values: Float64Array }[] = [];
  const categorical: { col: number; nLevels: number; level: Int32Array }[] = [];
  for (const cov of data.covariates) {
    if (cov.values.length !== n) throw new ModelInputError(`covariate "${cov.name}" has ${cov.values.length} values for ${n} observations.`);
    if (cov.kind === 'numeric') {
      for (let r = 0; r < n; r++) {
        if (!Number.isFinite(cov.values[r]!)) throw new ModelInputError(`covariate "${cov.name}" is missing or not finite at observation ${r + 1}.`);
      }
      numeric.push({ col: terms.length, values: cov.values });
      terms.push({ name: cov.name, kind: 'covariate', arm: null });
    } else {
      const index = new Map<string, number>();
      cov.levels.forEach((lv, i) => index.set(lv, i));
      const level = new Int32Array(n);
      for (let r = 0; r < n; r++) {
        const li = index.get(cov.values[r]!);
        if (li === undefined) throw new ModelInputError(`covariate "${cov.name}" has value "${cov.values[r] ?? ''}" at observation ${r + 1}, which is not one of its levels.`);
        level[r] = li;
      }
      categorical.push({ col: terms.length, nLevels: cov.levels.length, level });
      for (let li = 1; li < cov.levels.length; li++) terms.push({ name: `${cov.name}: ${cov.levels[li]!} vs ${cov.levels[0]!}`, kind: 'covariate', arm: null });
    }
  }
  const p = terms.length;
  const time = data.time;
  const numCols = Int32Array.from(numeric, (c) => c.col);
  const numVals = numeric.map((c) => c.values);
  const catCols = Int32Array.from(categorical, (c) => c.col);
  const catLevels = Int32Array.from(categorical, (c) => c.nLevels);
  const catIndex = categorical.map((c) => c.level);
  const nNum = numCols.length;
  const nCat = catCols.length;
  const armed = armCol >= 0;
  const fillRow = (r: number, x: Float64Array): void => {
    x[0] = 1;
    const t = time[r]!;
    x[timeCol] = t;
    if (armed) {
      for (let a = 1; a < nArms; a++) {
        x[armCol + a - 1] = 0;
        x[armTimeCol + a - 1] = 0;
      }
      const a = armIndex![r]!;
      if (a > 0) {
        x[armCol + a - 1] = 1;
        x[armTimeCol + a - 1] = t;
      }
    }
    for (let k = 0; k < nNum; k++) x[numCols[k]!] = numVals[k]![r]!;
    for (let k = 0; k < nCat; k++) {
      const c0 = catCols[k]!;
      const nl = catLevels[k]!;
      for (let li = 1; li < nl; li++) x[c0 + li - 1] = 0;
      const li = catIndex[k]![r]!;
      if (li > 0) x[c0 + li - 1] = 1;
    }
  };
  return { p, terms, nArms, timeCol, armCol, armTimeCol, fillRow };
}
