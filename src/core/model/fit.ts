/**
 * fitRandomIntercept: the random-intercept linear mixed model of SPEC §5 (Laird & Ware 1982, Biometrics 38:963–974),
 * value_ij = b0 + b1·arm_i + b2·time_ij + b3·arm_i·time_ij [+ covariates] + u_i + e_ij, by REML or ML, with
 * Kenward–Roger, Satterthwaite, residual or containment (between/within) degrees of freedom, the naive least-squares
 * fit beside it (naive.ts), treatment contrasts, variance components with intervals,
 * the ICC, BLUPs and predicted trajectories.
 * Cost: one O(n p²) pass over the observations, then O(K p² + p³) per likelihood evaluation (K distinct cluster
 * sizes); no n x n matrix is ever formed.
 */
import { offsetOfStudyDay } from '../intake/dayOffset';
import { buildDesign, type Design } from './design';
import { DegenerateDataError, RankDeficiencyError, ModelInputError } from './errors';
import { estimateRatio } from './estimateRatio';
import { contrast, jointTest, type InferenceContext } from './inference';
import { adjustedCovariance, informationPieces, inverseInformation } from './information';
import { matMul } from './dense';
import { checkRank } from './pivotedCholesky';
import { conditionalResiduals, subjectEffects } from './subjects';
import { sufficientStatsFast } from './armSumsPass';
import { sufficientStatsCovariates } from './covariatePass';
import { sufficientStats, type SufficientStats } from './sufficient';
import { trajectories } from './trajectories';
import { validateModelRows, validateModelShape } from './validate';
import { varianceIntervals } from './varianceIntervals';
import { logLikShift, scaleModelData, toScaledContrast, unscaleContrast } from './scaling';
import { soundnessProblem } from './soundness';
import { containmentDf } from './containment';
import { naiveFit } from './naive';
import type { ContrastResult, FitOptions, JointTest, ModelData, ModelFit, SlopeDifference, SubjectEffect, TimeUnit, TreatmentEffect } from './types';

/** Days per model time unit: a month is 365.25/12 = 30.4375 days (common practice), a week 7, a day 1. */
export const DAYS_PER_TIME_UNIT: Readonly<Record<TimeUnit, number>> = { month: 30.4375, week: 7, day: 1 };

/**
 * Fits the model on the centred and scaled response and time (scaling.ts) and reports every number on the original
 * scale. Misuse (bad shapes, missing values, a rank-deficient design) throws ModelInputError or RankDeficiencyError;
 * data that cannot give a trustworthy model (one participant, one measurement each, no variation or variation below the
 * resolution of the values, a spread outside 1e±150, values on the fitted lines to within rounding, or numbers that
 * fail soundness.ts) throw DegenerateDataError with a plain reason; non-convergence and the zero boundary are reported
 * in `status` and `message`.
 * Example: the rails data of Devore (2000) with design 'intercept-only' and REML -> fixedEffects[0].estimate 66.5,
 * se 10.171; variance.subject 615.31 (SD 24.805), variance.residual 16.167 (SD 4.0208); logLik −61.0885.
 */
export function fitRandomIntercept(data: ModelData, options: FitOptions): ModelFit {
  validateModelShape(data, options);
  const scaled = scaleModelData(data);
  const sc = scaled.scaling;
  const design = buildDesign(scaled.data, options.design === 'intercept-only');
  const st = dataPass(scaled.data, design);
  const p = design.p;
  const N = st.nObs;
  if (st.nSubjects < 2) throw new DegenerateDataError('one-subject', ONE_SUBJECT);
  if (N === st.nSubjects) throw new DegenerateDataError('one-measurement-each', ONE_MEASUREMENT_EACH);
  if (N <= p) throw new ModelInputError(`${N} observations are too few for ${p} fixed effects.`);
  const rank = checkRank(st.xtx, p);
  if (rank.dependent.length > 0) throw new RankDeficiencyError(rank.dependent.map((j) => design.terms[j]!.name));

  const cont = containmentDf(st);
  const est = estimateRatio(st, options.method);
  const base = {
    method: options.method,
    dfMethod: options.dfMethod,
    level: options.level,
    timeUnit: options.timeUnit,
    nSubjects: st.nSubjects,
    nObservations: N,
    terms: design.terms,
    arms: design.armCol >= 0 ? [...data.arms] : [],
    iterations: est.iterations,
    containment: { betweenDf: cont.betweenDf, withinDf: cont.withinDf },
  };
  if (est.point === null) return failedFit(base, est.message, design);

  const pt = est.point;
  const atBoundary = est.status === 'boundary';
  const gamma = pt.gamma;
  // The residual sum R = c − b'β̂ is a difference of sums of size y'y, so its rounding error is about ε·y'y: a σ̂² below
  // WITHIN_FLOOR of the mean square of the (centred, scaled) values is mostly rounding, the values sit on the fitted lines.
  if (!(pt.sigma2 >= (WITHIN_FLOOR * st.yty) / N)) throw new DegenerateDataError('no-variation', NO_WITHIN_VARIATION);
  // Everything below is computed on the scaled data and mapped back (scaling.ts); s2, phi, W are on the scaled scale.
  const s2 = pt.sigma2;
  const phi = pt.aInv.map((v) => v * s2);
  const pieces = informationPieces(st, gamma, s2, phi, options.method);
  const W = inverseInformation(pieces.information, atBoundary);
  const phiA = options.dfMethod === 'kenward-roger' ? adjustedCovariance(phi, pieces, W, p) : phi;
  const shifted = Float64Array.from(pt.beta);
  shifted[0] = shifted[0]! + sc.yCentre / sc.yScale;
  const ctx: InferenceContext = {
    p,
    beta: shifted,
    phi,
    phiA,
    M: [matMul(matMul(phi, pieces.P[0], p), phi, p), matMul(matMul(phi, pieces.P[1], p), phi, p)],
    W,
    dfMethod: options.dfMethod,
    residualDf: N - p,
    level: options.level,
  };
  // The containment df is read from the contrast in original coordinates: the scaled one mixes the intercept into time.
  const contrastOf = (l: ArrayLike<number>): ContrastResult => unscaleContrast(contrast(ctx, toScaledContrast(l, design, sc), cont.dfOf(l)), sc);

  const fixedEffects = design.terms.map((term, j) => {
    const l = new Float64Array(p);
    l[j] = 1;
    return { term: term.name, kind: term.kind, arm: term.arm, ...contrastOf(l) };
  });
  const unit = DAYS_PER_TIME_UNIT[options.timeUnit];
  const treatmentEffects: TreatmentEffect[] = [];
  const slopeDifferences: SlopeDifference[] = [];
  let joint: JointTest | null = null;
  if (design.armCol >= 0) {
    for (let a = 1; a < design.nArms; a++) {
      const arm = data.arms[a]!;
      for (const cd of options.contrastDays) {
        const time = offsetOfStudyDay(cd.day) / unit;
        const l = new Float64Array(p);
        l[design.armCol + a - 1] = 1;
        l[design.armTimeCol + a - 1] = time;
        treatmentEffects.push({ arm, label: cd.label, day: cd.day, time, ...contrastOf(l) });
      }
      const l = new Float64Array(p);
      l[design.armTimeCol + a - 1] = 1;
      slopeDifferences.push({ arm, ...contrastOf(l) });
    }
    if (design.nArms > 2) {
      const rows: number[][] = [];
      let denDf = Infinity;
      for (let a = 1; a < design.nArms; a++) {
        const row = new Float64Array(p);
        row[design.armTimeCol + a - 1] = 1;
        denDf = Math.min(denDf, cont.dfOf(row));
        rows.push(Array.from(toScaledContrast(row, design, sc)));
      }
      // F and p are invariant under the scaling (scaling.ts), so the joint test runs on the scaled contrasts as is.
      joint = jointTest(ctx, rows, denDf);
    }
  }

  const y2 = sc.yScale * sc.yScale;
  const variance = varianceIntervals(st, options.method, gamma, s2, pt.logLik, options.level, y2);
  const k = p + 2;
  const bicN = options.method === 'reml' ? N - p : N;
  const logLik = pt.logLik + logLikShift(sc, design, N, options.method);
  let tMax = sc.tMax;
  for (const cd of options.contrastDays) tMax = Math.max(tMax, offsetOfStudyDay(cd.day) / unit);
  const tMin = Math.min(sc.tMin, 0);
  // Per-subject BLUPs are produced on first access (SPEC §5: "on request") and then kept; the getter is enumerable,
  // so spreading, JSON and structured cloning see an ordinary array. They are computed on the scaled data (β', whose
  // sums match the scaled statistics) and multiplied by s_y.
  let subjectsCache: SubjectEffect[] | null = null;
  const beta = pt.beta;
  let message = est.message;
  if (atBoundary && options.dfMethod !== 'residual' && options.dfMethod !== 'containment') {
    message += ' For the degrees of freedom the between-participant variance is held fixed at zero; only the within-participant variance is treated as estimated.';
  }
  const numbers: Omit<ModelFit, 'subjects'> = {
    ...base,
    status: est.status,
    message,
    fixedEffects,
    variance,
    logLik,
    aic: -2 * logLik + 2 * k,
    bic: -2 * logLik + k * Math.log(bicN),
    bicN,
    nParameters: k,
    converged: est.status !== 'failed',
    treatmentEffects,
    slopeDifferences,
    jointTest: joint,
    trajectories: trajectories(design, st, contrastOf, data.arms, tMin, tMax, unit, options.gridPoints ?? 25),
    naive: naiveFit(st, design, sc, fixedEffects, cont.between, options.level),
  };
  // A fit that did not converge keeps its status and message; any other must pass every check before it is reported.
  if (est.status !== 'failed') {
    const problem = soundnessProblem(numbers);
    if (problem !== null) throw new DegenerateDataError('unsound-result', `${UNSOUND} (${problem})`);
  }
  const fit: ModelFit = {
    ...numbers,
    get subjects(): SubjectEffect[] {
      subjectsCache ??= subjectEffects(st, beta, gamma, data.subjectIds).map((s) => ({ ...s, blup: sc.yScale * s.blup, meanResidual: sc.yScale * s.meanResidual }));
      return subjectsCache;
    },
  };
  if (options.residuals === true) {
    const blups = blupArray(st, fit.subjects);
    for (let i = 0; i < blups.length; i++) blups[i] = blups[i]! / sc.yScale;
    const residuals = conditionalResiduals(scaled.data.y, data.subject, design.fillRow, pt.beta, blups);
    for (let i = 0; i < residuals.length; i++) residuals[i] = sc.yScale * residuals[i]!;
    return { ...fit, residuals };
  }
  return fit;
}

/**
 * Smallest within-participant variance, relative to the mean square of the centred values, that is reported: the
 * residual sum carries a rounding error of about ε·y'y (ε = 2.2e-16), so at 1e-10 the variance is still good to ~1e-6
 * relative; below it the values lie on the fitted lines to within rounding.
 */
export const WITHIN_FLOOR = 1e-10;

/** What the model can and cannot do with one participant (issue: say it plainly, and report no fit). */
export const ONE_SUBJECT =
  'only one participant has measurements the model can use. With one participant the model could draw a line through that participant\'s values, but it cannot estimate how participants differ from one another (there is no between-participant variance to estimate), so it cannot separate the two sources of variation or give intervals that apply to other participants; no model is reported';

const ONE_MEASUREMENT_EACH =
  'no participant has more than one measurement, so the variation between participants cannot be told apart from the variation within a participant, which is what a random-intercept model estimates; no model is reported';

const NO_WITHIN_VARIATION =
  'the values lie on the fitted lines to within the floating-point resolution of the data, so there is no within-participant variation left to estimate and no model is reported';

const UNSOUND = 'the fit gave numbers that cannot be reported, so no model is reported';

/**
 * The one pass over the rows: the fast pass when the design has no covariates, or numeric covariates only with each
 * subject's rows together (their sanity checks — every row counted in a valid arm, every subject in one arm, finite
 * totals — stand in for a row-by-row validation); otherwise a row-by-row validation and the general pass.
 */
function dataPass(data: ModelData, design: Design): SufficientStats {
  if (design.timeCol >= 0 && design.p === 2 * design.nArms) {
    const fast = sufficientStatsFast(data.y, data.time, data.subject, data.nSubjects, data.armIndex, design);
    if (fast !== null && finiteStats(fast)) return fast;
  } else if (design.timeCol >= 0) {
    const fast = sufficientStatsCovariates(data, design);
    if (fast !== null) return fast;
  }
  validateModelRows(data);
  return sufficientStats(data.y, data.subject, data.nSubjects, design, data.time);
}

function finiteStats(st: SufficientStats): boolean {
  if (!Number.isFinite(st.yty) || !Number.isFinite(st.tMin) || !Number.isFinite(st.tMax)) return false;
  for (let i = 0; i < st.xtx.length; i++) if (!Number.isFinite(st.xtx[i]!)) return false;
  for (let i = 0; i < st.xty.length; i++) if (!Number.isFinite(st.xty[i]!)) return false;
  return true;
}

function blupArray(st: SufficientStats, subjects: readonly { blup: number }[]): Float64Array {
  const out = new Float64Array(st.count.length);
  let k = 0;
  for (let s = 0; s < st.count.length; s++) if (st.count[s]! > 0) out[s] = subjects[k++]!.blup;
  return out;
}

function failedFit(
  base: Pick<ModelFit, 'method' | 'dfMethod' | 'level' | 'timeUnit' | 'nSubjects' | 'nObservations' | 'terms' | 'arms' | 'iterations' | 'containment'>,
  message: string,
  design: Design,
): ModelFit {
  const nan = { estimate: NaN, se: NaN, df: NaN, t: NaN, lower: NaN, upper: NaN, p: NaN };
  return {
    ...base,
    status: 'failed',
    message,
    fixedEffects: design.terms.map((t) => ({ term: t.name, kind: t.kind, arm: t.arm, ...nan })),
    variance: {
      subject: NaN,
      residual: NaN,
      icc: NaN,
      subjectLower: NaN,
      subjectUpper: NaN,
      residualLower: NaN,
      residualUpper: NaN,
      iccLower: NaN,
      iccUpper: NaN,
      intervalMethod: 'Not computed: the fit failed.',
    },
    logLik: NaN,
    aic: NaN,
    bic: NaN,
    bicN: NaN,
    nParameters: design.p + 2,
    converged: false,
    treatmentEffects: [],
    slopeDifferences: [],
    jointTest: null,
    trajectories: [],
    subjects: [],
    naive: null,
  };
}
