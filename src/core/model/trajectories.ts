/**
 * Predicted mean trajectories by arm on an even time grid with pointwise intervals, using the same df method as the
 * fixed effects. Covariates are held at their observed means (categorical covariates at their observed proportions),
 * so the curve is the population-average prediction for an "average" participant of each arm. `contrastOf` gives the
 * inference of a contrast in the coordinates of the design (st's covariate columns are used as they are).
 * Cost O(arms · grid · p²).
 */
import { studyDayOfOffset } from '../intake/dayOffset';
import type { Design } from './design';
import type { SufficientStats } from './sufficient';
import type { ContrastResult, Trajectory } from './types';

export function trajectories(
  design: Design,
  st: Pick<SufficientStats, 'xtx' | 'nObs'>,
  contrastOf: (l: Float64Array) => ContrastResult,
  arms: readonly string[],
  tMin: number,
  tMax: number,
  daysPerUnit: number,
  points: number,
): Trajectory[] {
  if (design.timeCol < 0) return [];
  const p = design.p;
  const xbar = new Float64Array(p);
  for (let j = 0; j < p; j++) xbar[j] = st.xtx[j]! / st.nObs; // first row of X'X is X'1 (intercept column of ones)
  const out: Trajectory[] = [];
  for (let a = 0; a < design.nArms; a++) {
    const tr: Trajectory = { arm: design.armCol >= 0 ? arms[a]! : null, time: [], day: [], mean: [], lower: [], upper: [] };
    for (let g = 0; g < points; g++) {
      const t = tMin + ((tMax - tMin) * g) / (points - 1);
      const l = Float64Array.from(xbar);
      l[0] = 1;
      l[design.timeCol] = t;
      if (design.armCol >= 0) {
        for (let k = 1; k < design.nArms; k++) {
          l[design.armCol + k - 1] = k === a ? 1 : 0;
          l[design.armTimeCol + k - 1] = k === a ? t : 0;
        }
      }
      const c = contrastOf(l);
      tr.time.push(t);
      tr.day.push(studyDayOfOffset(t * daysPerUnit));
      tr.mean.push(c.estimate);
      tr.lower.push(c.lower);
      tr.upper.push(c.upper);
    }
    out.push(tr);
  }
  return out;
}
