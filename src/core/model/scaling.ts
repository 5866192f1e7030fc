/**
 * Centring and scaling of the response and of time before the fit, and the way back to the original scale.
 * The fit runs on y' = (y − c_y)/s_y and t' = (t − c_t)/s_t (c = mean, s = largest distance from the mean), so the
 * sums it accumulates are of order one whatever the magnitude of the data; every reported number is mapped back.
 * With X = X'M (M the identity except M[0][time] = c_t, M[time][time] = s_t, and likewise for each arm × time column
 * with the arm column in place of the intercept), β = M⁻¹(s_y β' + c_y e₀), so a contrast l'β equals
 * s_y · l*'(β' + (c_y/s_y) e₀) with l* = M⁻ᵀl: estimates, SEs and limits scale by s_y, while t, df and p are unchanged
 * (the Kenward–Roger and Satterthwaite df are invariant under this reparametrisation). Variances scale by s_y².
 * The log-likelihood gains the Jacobian of the map: ML −N log s_y; REML −(N − p) log s_y − log|det M|, with
 * log|det M| = (number of time columns) · log s_t, since the restricted likelihood's log|X'V⁻¹X| term is not invariant
 * under a change of the fixed-effects basis (Harville 1977, J. Am. Stat. Assoc. 72:320–338, the REML form without
 * log|X'X|). Before scaling, the response is refused — DegenerateDataError, no model — when it does not vary, when its
 * variation is below the floating-point resolution of the values, or when its spread is so large or so small that
 * variances (its square) would leave the range of double precision.
 * Cost O(n): one pass to measure, one to write the two scaled columns.
 */
import { DegenerateDataError } from './errors';
import type { Design } from './design';
import type { ContrastResult, ModelData } from './types';
import { validateModelRows } from './validate';

/**
 * Smallest spread of the values, relative to their largest magnitude, that the fit accepts: a double carries about
 * 16 significant decimal digits, so at 1e-12 about 4 digits of the variation survive; below it the "variation" is
 * mostly rounding of the stored values.
 */
export const RESOLUTION = 1e-12;

/**
 * Largest and smallest spread of the values the fit accepts: variances (about the spread squared) must stay within
 * double precision (about 1.8e308 down to 2.2e-308, IEEE 754) with room for their confidence limits.
 */
export const SPREAD_MAX = 1e150;
export const SPREAD_MIN = 1e-150;

export interface Scaling {
  readonly yCentre: number;
  readonly yScale: number;
  readonly tCentre: number;
  readonly tScale: number;
  /** Smallest and largest time in the data, as given (the trajectory grid starts and ends there). */
  readonly tMin: number;
  readonly tMax: number;
}

/** A number for a sentence: up to 6 significant digits. */
const shown = (x: number): string => String(Number(x.toPrecision(6)));

/**
 * Measures the response and time and returns the scaled copy of the data, or throws DegenerateDataError with a plain
 * reason; a value or time that is not finite is misuse (ModelInputError, from validateModelRows). Never mutates data.
 * Example: y = [10, 12, 14], time = [0, 1, 2] -> yCentre 12, yScale 2, y' = [−1, 0, 1]; tCentre 1, tScale 1.
 */
export function scaleModelData(data: ModelData): { data: ModelData; scaling: Scaling } {
  if (data.y.length === 0) return { data, scaling: measureScaling(data) };
  const scaling = measureScaling(data);
  return { data: applyScaling(data, scaling), scaling };
}

/**
 * The measuring half of scaleModelData: the centres and scales, with the same refusals, without the scaled copy (the
 * slope model applies them row by row in its one pass, sums.ts). Cost O(n), nothing written.
 */
export function measureScaling(data: ModelData): Scaling {
  const { y, time } = data;
  const n = y.length;
  if (n === 0) return { yCentre: 0, yScale: 1, tCentre: 0, tScale: 1, tMin: Infinity, tMax: -Infinity };
  const ym = measure(y);
  const tm = measure(time);
  if (ym === null || tm === null) {
    validateModelRows(data);
    throw new Error('unreachable: a non-finite value passed validation');
  }
  const magnitude = Math.max(Math.abs(ym.min), Math.abs(ym.max));
  if (ym.spread === 0) {
    throw new DegenerateDataError('no-variation', `all ${n} values are equal (${shown(ym.min)}), so there is no variation for the model to describe`);
  }
  if (ym.spread < RESOLUTION * magnitude) {
    throw new DegenerateDataError(
      'below-resolution',
      `the values vary by at most ${shown(ym.spread)} around ${shown(ym.centre)}, less than ${RESOLUTION} of their size; at double precision (about 16 significant digits) that variation is mostly rounding, so no model is fitted (subtract a common offset from the values first)`,
    );
  }
  if (!(ym.spread <= SPREAD_MAX) || ym.spread < SPREAD_MIN) {
    throw new DegenerateDataError(
      'out-of-range',
      `the values spread over about ${shown(ym.spread)}; their variances, about that spread squared, would lie outside what double precision holds reliably (the spread must lie between 1e-150 and 1e150), so no model is fitted (rescale the values, e.g. change the unit)`,
    );
  }
  const tScale = tm.spread > 0 && Number.isFinite(tm.spread) ? tm.spread : 1;
  return { yCentre: ym.centre, yScale: ym.spread, tCentre: tm.centre, tScale, tMin: tm.min, tMax: tm.max };
}

/** The scaled copy y' = (y − c_y)/s_y, t' = (t − c_t)/s_t of the data (covariates as they are). Cost O(n). */
export function applyScaling(data: ModelData, scaling: Scaling): ModelData {
  const { y, time } = data;
  const n = y.length;
  const ys = new Float64Array(n);
  const ts = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    ys[i] = (y[i]! - scaling.yCentre) / scaling.yScale;
    ts[i] = (time[i]! - scaling.tCentre) / scaling.tScale;
  }
  return { ...data, y: ys, time: ts };
}

/**
 * Mean, min, max and the largest distance from the mean; null if any value is not finite. The mean is a plain sum / n,
 * or, when that sum overflows (values near the top of the double range), a running mean, which cannot overflow.
 */
function measure(v: Float64Array): { centre: number; min: number; max: number; spread: number } | null {
  let sum = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < v.length; i++) {
    const x = v[i]!;
    sum += x;
    if (x < min) min = x;
    if (x > max) max = x;
  }
  let mean = sum / v.length;
  if (!Number.isFinite(sum)) {
    // A NaN or an infinity makes the sum non-finite; so does overflow of finite values, which the running mean survives.
    mean = 0;
    for (let i = 0; i < v.length; i++) {
      const x = v[i]!;
      if (!Number.isFinite(x)) return null;
      mean += (x - mean) / (i + 1);
    }
  }
  // Rounding can put the mean a hair outside [min, max]; keep it inside.
  const centre = Math.min(max, Math.max(min, mean));
  return { centre, min, max, spread: Math.max(max - centre, centre - min) };
}

/**
 * The contrast l (original coordinates) in the scaled coordinates: l* = M⁻ᵀl, i.e. l*_time = (l_time − c_t l₀)/s_t and
 * l*_armTime = (l_armTime − c_t l_arm)/s_t; every other entry is unchanged. Cost O(p).
 */
export function toScaledContrast(l: ArrayLike<number>, design: Design, s: Scaling): Float64Array {
  const out = Float64Array.from(l as ArrayLike<number>);
  if (design.timeCol < 0) return out;
  out[design.timeCol] = (out[design.timeCol]! - s.tCentre * out[0]!) / s.tScale;
  if (design.armCol >= 0) {
    for (let a = 1; a < design.nArms; a++) {
      const at = design.armTimeCol + a - 1;
      out[at] = (out[at]! - s.tCentre * out[design.armCol + a - 1]!) / s.tScale;
    }
  }
  return out;
}

/** A contrast computed on the scaled data (with β' shifted by c_y/s_y e₀) back on the original scale. */
export function unscaleContrast(r: ContrastResult, s: Scaling): ContrastResult {
  const k = s.yScale;
  return { estimate: k * r.estimate, se: k * r.se, df: r.df, t: r.t, lower: k * r.lower, upper: k * r.upper, p: r.p };
}

/**
 * The Jacobian term added to the scaled fit's log-likelihood: ML −N log s_y; REML −(N − p) log s_y − k log s_t, with k
 * the number of time columns (time and each arm × time term). Example: N = 10, p = 2, REML, s_y = e, s_t = 1 -> −8.
 */
export function logLikShift(s: Scaling, design: Design, nObs: number, method: 'reml' | 'ml'): number {
  if (method === 'ml') return -nObs * Math.log(s.yScale);
  const timeCols = design.timeCol < 0 ? 0 : 1 + (design.armCol >= 0 ? design.nArms - 1 : 0);
  return -(nObs - design.p) * Math.log(s.yScale) - timeCols * Math.log(s.tScale);
}
