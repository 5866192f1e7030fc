/**
 * fitRandomSlope: the random intercept and slope linear mixed model (Laird & Ware 1982, Biometrics 38:963–974),
 * value_ij = fixed effects as in the random-intercept model (design.ts) + u0_i + u1_i·time_ij + e_ij,
 * (u0_i, u1_i) ~ N(0, G) with G an unstructured 2 × 2 matrix, e_ij ~ N(0, σ²), by REML or ML, with Kenward–Roger,
 * Satterthwaite, residual or between/within degrees of freedom, contrasts at the scheduled days, trajectories, the
 * naive least-squares fit beside it, and per-participant predictions.
 * Same centring and scaling as the random-intercept model (scaling.ts): the fit runs on y' = (y − c_y)/s_y and
 * t' = (t − c_t)/s_t; with G unstructured the model is the same on either time scale (u0 + u1 t = (u0 + u1 c_t) +
 * u1 s_t t'), so G = s_y² T G' T' with T = [[1, −c_t/s_t], [0, 1/s_t]], and the log-likelihood gains the same
 * Jacobian term as the random-intercept model.
 * Cost: one pass over the rows (sums.ts), O(participants) per likelihood evaluation (grouped layout), one more pass
 * over the participants for the Kenward–Roger pieces; no n × n matrix.
 */
import { offsetOfStudyDay } from '../../intake/dayOffset';
import type { ContainmentDf } from '../containment';
import { cholesky, matMul, spdInverse } from '../dense';
import { buildDesign } from '../design';
import { chiSquareQuantile, normalQuantile } from '../distributions';
import { DegenerateDataError, ModelInputError, RankDeficiencyError } from '../errors';
import { DAYS_PER_TIME_UNIT, ONE_SUBJECT, WITHIN_FLOOR } from '../fit';
import { contrast, jointTest, type InferenceContext } from '../inference';
import { naiveFit } from '../naive';
import { checkRank } from '../pivotedCholesky';
import { applyScaling, logLikShift, measureScaling, toScaledContrast, unscaleContrast } from '../scaling';
import { soundnessProblem } from '../soundness';
import { trajectories } from '../trajectories';
import type { ContrastResult, FitOptions, JointTest, ModelData, SlopeDifference, SlopeFit, SlopeSubjectEffect, SlopeVariance, TreatmentEffect, VarianceResult } from '../types';
import { validateModelRows, validateModelShape } from '../validate';
import { FULL_BASIS, slopeAdjustedCovariance, slopeInformation, type M2 } from './information';
import { estimateSlopeG, type SlopeShape } from './optimise';
import { inverseOfIPlusCD, type RelativeG } from './profile';
import { timesBeta } from './pieces';
import { slopeSums, type SlopeSums } from './sums';

const NO_TWO_TIMES =
  'no participant has measurements at two different times, so how participants differ in their rate of change cannot be estimated; no random-slope model is reported';

const ONE_EACH =
  'no participant has more than one measurement, so the variation between participants cannot be told apart from the variation within a participant; no model is reported';

const UNSOUND = 'the fit gave numbers that cannot be reported, so no model is reported';

/**
 * Fits the model; misuse throws ModelInputError or RankDeficiencyError, data that cannot give a trustworthy model throw
 * DegenerateDataError (as fitRandomIntercept), non-convergence and a singular G are reported in `status`.
 */
export function fitRandomSlope(data: ModelData, options: FitOptions): SlopeFit {
  validateModelShape(data, options);
  if (options.design === 'intercept-only') throw new ModelInputError("the random intercept and slope model needs time in the design; design 'intercept-only' is for the random-intercept model.");
  // Without covariates the sums pass scales each row as it reads it (no scaled copy of the columns); with covariates,
  // or for the residuals, the scaled copy is made.
  const sc = measureScaling(data);
  const rowwise = data.covariates.length === 0;
  let scaledCopy: ModelData | null = rowwise ? null : applyScaling(data, sc);
  const scaledData = (): ModelData => (scaledCopy ??= applyScaling(data, sc));
  const design = buildDesign(rowwise ? data : scaledData(), false);
  // Values and times are finite (scaleModelData refuses others). Subject indices out of range would be dropped by the
  // typed arrays, so the participants' counts must add up to the rows; otherwise, or with arm indices out of range
  // (the general layout), the row-by-row validation names the row.
  if (design.armCol >= 0 && data.covariates.length === 0) validateArms(data, design.nArms);
  const sums = rowwise ? slopeSums(data, design, sc) : slopeSums(scaledData(), design);
  if (countTotal(sums) !== data.y.length || (design.armCol >= 0 && sums.group === null)) validateModelRows(data);
  const p = design.p;
  const N = sums.nObs;
  if (sums.nP < 2) throw new DegenerateDataError('one-subject', ONE_SUBJECT);
  if (N === sums.nP) throw new DegenerateDataError('one-measurement-each', ONE_EACH);
  if (!hasTwoTimes(sums)) throw new DegenerateDataError('one-measurement-each', NO_TWO_TIMES);
  if (N <= p) throw new ModelInputError(`${N} observations are too few for ${p} fixed effects.`);
  const rank = checkRank(sums.xtx, p);
  if (rank.dependent.length > 0) throw new RankDeficiencyError(rank.dependent.map((j) => design.terms[j]!.name));

  const cont = slopeContainment(sums);
  const est = estimateSlopeG(sums, options.method);
  const base = {
    kind: 'slope' as const,
    method: options.method,
    dfMethod: options.dfMethod,
    level: options.level,
    timeUnit: options.timeUnit,
    nSubjects: sums.nP,
    nObservations: N,
    terms: design.terms,
    arms: design.armCol >= 0 ? [...data.arms] : [],
    iterations: est.iterations,
    containment: { betweenDf: cont.betweenDf, withinDf: cont.withinDf },
  };
  if (est.point === null || !est.converged) {
    const message = est.point === null ? 'the likelihood could not be evaluated at any starting value.' : `the optimiser did not converge in ${est.iterations} iterations.`;
    return failedSlopeFit(base, message, design.terms, p);
  }
  const pt = est.point;
  const s2 = pt.sigma2;
  if (!(s2 >= (WITHIN_FLOOR * sums.yty) / N)) {
    throw new DegenerateDataError('no-variation', 'the values lie on the fitted lines to within the floating-point resolution of the data, so there is no within-participant variation left to estimate and no model is reported');
  }
  const D = est.D;
  const atBoundary = est.shape !== 'full';
  const phi = pt.aInv.map((v) => v * s2);
  const basis = freeBasis(D, est.shape);
  const info = slopeInformation(sums, D, s2, phi, options.method, basis);
  const W = inverseInformation(info.information, basis.length + 1);
  const phiA = options.dfMethod === 'kenward-roger' ? slopeAdjustedCovariance(phi, info, W.matrix, p) : phi;
  const shifted = Float64Array.from(pt.beta);
  shifted[0] = shifted[0]! + sc.yCentre / sc.yScale;
  const ctx: InferenceContext = {
    p,
    beta: shifted,
    phi,
    phiA,
    M: info.P.map((P) => matMul(matMul(phi, P, p), phi, p)),
    W: W.matrix,
    dfMethod: options.dfMethod,
    residualDf: N - p,
    level: options.level,
  };
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
      joint = jointTest(ctx, rows, denDf);
    }
  }

  const { variance, randomEffects } = slopeVariances(D, s2, fullCovariance(W.matrix, basis), sc, options.level, atBoundary);
  const k = p + 4;
  const bicN = options.method === 'reml' ? N - p : N;
  const logLik = pt.logLik + logLikShift(sc, design, N, options.method);
  let tMax = sc.tMax;
  for (const cd of options.contrastDays) tMax = Math.max(tMax, offsetOfStudyDay(cd.day) / unit);
  const tMin = Math.min(sc.tMin, 0);
  let message = est.shape === 'full' ? 'The fit converged.' : est.shape === 'rank-one' ? RANK_ONE : ZERO_G;
  const dfFromInformation = options.dfMethod !== 'residual' && options.dfMethod !== 'containment';
  if (est.shape === 'rank-one' && dfFromInformation) {
    message += ' For the degrees of freedom the covariance matrix keeps its direction; its size and the within-participant variance are treated as estimated.';
  }
  if (est.shape === 'zero' && dfFromInformation) message += ' For the degrees of freedom only the within-participant variance is treated as estimated.';
  if (W.fallback && dfFromInformation) message += ' The information matrix of the variance parameters was singular, so for the degrees of freedom only the within-participant variance is treated as estimated.';
  const numbers = {
    ...base,
    status: atBoundary ? ('boundary' as const) : ('converged' as const),
    message,
    fixedEffects,
    variance,
    randomEffects,
    covarianceShape: est.shape,
    logLik,
    aic: -2 * logLik + 2 * k,
    bic: -2 * logLik + k * Math.log(bicN),
    bicN,
    nParameters: k,
    converged: true,
    treatmentEffects,
    slopeDifferences,
    jointTest: joint,
    trajectories: trajectories(design, sums, contrastOf, data.arms, tMin, tMax, unit, options.gridPoints ?? 25),
    naive: naiveFit({ p, nObs: N, xtx: sums.xtx, xty: sums.xty, yty: sums.yty }, design, sc, fixedEffects, cont.between, options.level),
  };
  // The ICC of the slope model is the share at time 0; its interval is the logit-Wald one, checked like the rest.
  const problem = soundnessProblem(numbers) ?? slopeVarianceProblem(randomEffects);
  if (problem !== null) throw new DegenerateDataError('unsound-result', `${UNSOUND} (${problem})`);
  let subjectsCache: SlopeSubjectEffect[] | null = null;
  const beta = pt.beta;
  // Per-participant predictions are made on first access (as the random-intercept model's BLUPs) and then kept.
  return {
    ...numbers,
    ...(options.residuals === true ? { residuals: slopeResiduals(data, scaledData(), sums, D, beta, sc.yScale) } : {}),
    get subjects(): SlopeSubjectEffect[] {
      subjectsCache ??= slopeSubjects(sums, D, beta, sc, data.subjectIds);
      return subjectsCache;
    },
  };
}

/** Conditional residuals y − Xβ̂ − û0 − û1·t per observation, on the original scale (one more pass over the rows). */
function slopeResiduals(data: ModelData, scaledData: ModelData, sums: SlopeSums, D: RelativeG, beta: Float64Array, yScale: number): Float64Array {
  const design = buildDesign(scaledData, false);
  const p = design.p;
  const u0 = new Float64Array(data.nSubjects);
  const u1 = new Float64Array(data.nSubjects);
  predictedEffects(sums, D, beta, (i, a, b) => {
    u0[sums.subjectOf[i]!] = a;
    u1[sums.subjectOf[i]!] = b;
  });
  const x = new Float64Array(p);
  const ys = scaledData.y;
  const ts = scaledData.time;
  const residuals = new Float64Array(ys.length);
  for (let r = 0; r < ys.length; r++) {
    design.fillRow(r, x);
    let f = 0;
    for (let j = 0; j < p; j++) f += x[j]! * beta[j]!;
    const s = data.subject[r]!;
    residuals[r] = yScale * (ys[r]! - f - u0[s]! - u1[s]! * ts[r]!);
  }
  return residuals;
}

/**
 * The between/within degrees of freedom of the design (containment.ts, same rule): a column is between-participant
 * when its within-participant sum of squares X'X_jj − Σ_i (1'X_i)_j²/n_i is zero to rounding. The per-participant
 * column sums are row 0 of B_i = Z_i'X_i. Cost O(participants · p).
 */
function slopeContainment(s: SlopeSums): ContainmentDf {
  const p = s.p;
  if (s.group !== null) {
    // Grouped layout: a column is between-participant exactly when it takes nothing from time (row 1 of every E_a),
    // given that some participant has two different times (checked before).
    const between: boolean[] = [];
    for (let j = 0; j < p; j++) between.push(s.E.every((E) => E[p + j] === 0));
    return containmentOf(s, between);
  }
  const pooled = new Float64Array(p);
  const row = new Float64Array(p);
  for (let i = 0; i < s.nP; i++) {
    const n = s.n[i]!;
    if (s.group !== null) {
      const E = s.E[s.group[i]!]!;
      for (let j = 0; j < p; j++) row[j] = n * E[j]! + s.st[i]! * E[p + j]!;
    } else {
      row.set(s.B!.subarray(i * 2 * p, i * 2 * p + p));
    }
    for (let j = 0; j < p; j++) pooled[j] = pooled[j]! + (row[j]! * row[j]!) / n;
  }
  const between: boolean[] = [];
  for (let j = 0; j < p; j++) {
    const total = s.xtx[j * p + j]!;
    between.push(total - pooled[j]! <= 1e-12 * total);
  }
  return containmentOf(s, between);
}

function containmentOf(s: SlopeSums, between: readonly boolean[]): ContainmentDf {
  const p = s.p;
  const nBetween = between.filter((b) => b).length;
  const betweenDf = s.nP - nBetween;
  const withinDf = s.nObs - s.nP - (p - nBetween);
  const dfOf = (l: ArrayLike<number>): number => {
    let usesBetween = false;
    let usesWithin = false;
    for (let j = 0; j < p; j++) {
      if (l[j] === 0) continue;
      if (between[j]) usesBetween = true;
      else usesWithin = true;
    }
    if (usesBetween && usesWithin) return Math.min(betweenDf, withinDf);
    return usesWithin ? withinDf : betweenDf;
  };
  return { between, betweenDf, withinDf, dfOf };
}

const RANK_ONE =
  'The between-participant covariance matrix is at its boundary (singular): the intercepts and slopes are perfectly correlated, or one of them does not vary, so the fit has one random effect fewer than the model allows.';
const ZERO_G = 'The between-participant covariance matrix is zero: participants differ neither in level nor in rate of change beyond the within-participant variation.';

function countTotal(s: SlopeSums): number {
  let total = 0;
  for (let i = 0; i < s.nP; i++) total += s.n[i]!;
  return total;
}

/** Throws (through validateModelRows, naming the row) when an arm index is out of range. Cost O(n). */
function validateArms(data: ModelData, nArms: number): void {
  const arm = data.armIndex;
  if (arm === null) return;
  for (let r = 0; r < arm.length; r++) {
    const a = arm[r]!;
    if (!(a >= 0 && a < nArms)) {
      validateModelRows(data);
      return;
    }
  }
}

/** True when some participant has two different times (within-participant time spread above rounding). */
function hasTwoTimes(s: SlopeSums): boolean {
  for (let i = 0; i < s.nP; i++) {
    const n = s.n[i]!;
    const ss = s.stt[i]! - (s.st[i]! * s.st[i]!) / n;
    if (n > 1 && ss > 1e-12 * Math.max(s.stt[i]!, 1e-300)) return true;
  }
  return false;
}

/**
 * The directions in which G is free: all three entries inside; at a rank-one boundary G = g ww' with w its unit
 * eigenvector, so V stays linear in (g, σ²) and only the direction is held; none when G = 0.
 */
function freeBasis(D: RelativeG, shape: SlopeShape): M2[] {
  if (shape === 'full') return [...FULL_BASIS];
  if (shape === 'zero') return [];
  const norm = Math.hypot(D[0], D[1]) > 0 ? Math.hypot(D[0], D[1]) : 1;
  // For a rank-one D = λ ww', the first row (D11, D12) is λ w0 w; when it is zero, w = (0, 1).
  const w0 = D[0] / norm;
  const w1 = D[1] / norm;
  const w = w0 === 0 && w1 === 0 ? [0, 1] : [w0, w1];
  return [[w[0]! * w[0]!, w[0]! * w[1]!, w[0]! * w[1]!, w[1]! * w[1]!]];
}

/**
 * W = inverse of the q × q expected information. When it is not positive definite, the G directions are held fixed:
 * only σ² (the last parameter) is inverted, as the random-intercept model at σ²_u = 0.
 */
function inverseInformation(info: Float64Array, q: number): { matrix: Float64Array; fallback: boolean } {
  const inv = cholesky(info, q) === null ? null : spdInverse(info, q);
  if (inv !== null) return { matrix: inv, fallback: false };
  const w = new Float64Array(q * q);
  w[q * q - 1] = 1 / info[q * q - 1]!;
  return { matrix: w, fallback: q > 1 };
}

/** The covariance of (G11, G12, G22, σ²) implied by W of the free parameters (basis directions, then σ²). */
function fullCovariance(W: Float64Array, basis: readonly M2[]): Float64Array {
  const q = basis.length + 1;
  // Columns of Bm: each basis direction as (G11, G12, G22, 0), then σ² as (0, 0, 0, 1).
  const Bm = [...basis.map((b) => [b[0], b[1], b[3], 0]), [0, 0, 0, 1]];
  const out = new Float64Array(16);
  for (let a = 0; a < 4; a++) {
    for (let c = 0; c < 4; c++) {
      let v = 0;
      for (let r = 0; r < q; r++) for (let k = 0; k < q; k++) v += Bm[r]![a]! * W[r * q + k]! * Bm[k]![c]!;
      out[a * 4 + c] = v;
    }
  }
  return out;
}

/** The predicted (û0, û1) of every participant on the scaled data: û = M_i(r_i − B_iβ). */
function predictedEffects(s: SlopeSums, D: RelativeG, beta: Float64Array, out: (i: number, u0: number, u1: number) => void): void {
  const [d11, d12, d22] = D;
  const f = new Float64Array(4);
  const bb = new Float64Array(2);
  const bBeta = timesBeta(s, beta);
  for (let i = 0; i < s.nP; i++) {
    inverseOfIPlusCD(s.n[i]!, s.st[i]!, s.stt[i]!, d11, d12, d22, f);
    const m00 = d11 * f[0]! + d12 * f[2]!;
    const m01 = d11 * f[1]! + d12 * f[3]!;
    const m10 = d12 * f[0]! + d22 * f[2]!;
    const m11 = d12 * f[1]! + d22 * f[3]!;
    bBeta(i, bb);
    const e0 = s.sy[i]! - bb[0]!;
    const e1 = s.sty[i]! - bb[1]!;
    out(i, m00 * e0 + m01 * e1, m10 * e0 + m11 * e1);
  }
}

function slopeSubjects(s: SlopeSums, D: RelativeG, beta: Float64Array, sc: { yScale: number; tCentre: number; tScale: number }, ids: readonly string[] | undefined): SlopeSubjectEffect[] {
  const out: SlopeSubjectEffect[] = [];
  const bBeta = timesBeta(s, beta);
  const bb = new Float64Array(2);
  predictedEffects(s, D, beta, (i, u0, u1) => {
    const n = s.n[i]!;
    bBeta(i, bb);
    const meanResidual = (s.sy[i]! - bb[0]! - n * u0 - s.st[i]! * u1) / n;
    const subject = s.subjectOf[i]!;
    out.push({
      id: ids?.[subject] ?? String(subject + 1),
      n,
      blup: sc.yScale * (u0 - (u1 * sc.tCentre) / sc.tScale),
      slopeBlup: (sc.yScale * u1) / sc.tScale,
      meanResidual: sc.yScale * meanResidual,
    });
  });
  if (s.armStart === null) return out;
  // The grouped layout stores participants arm by arm (sums.ts); the list is in subject order.
  let nS = 0;
  for (let i = 0; i < s.nP; i++) nS = Math.max(nS, s.subjectOf[i]! + 1);
  const at = new Int32Array(nS).fill(-1);
  for (let i = 0; i < s.nP; i++) at[s.subjectOf[i]!] = i;
  const ordered: SlopeSubjectEffect[] = [];
  for (let k = 0; k < nS; k++) if (at[k]! >= 0) ordered.push(out[at[k]!]!);
  return ordered;
}

/**
 * G and σ² on the original scale with intervals: Satterthwaite's scaled chi-square interval for each variance
 * (ν = 2θ²/Var θ, Var from W mapped through the linear change of scale; Satterthwaite 1946), the share of the variation
 * between participants at time 0 with a logit-Wald interval (delta method). At the boundary the G intervals run
 * from 0 to a normal-theory upper limit.
 */
function slopeVariances(
  D: RelativeG,
  s2: number,
  W: Float64Array,
  sc: { yScale: number; tCentre: number; tScale: number },
  level: number,
  atBoundary: boolean,
): { variance: VarianceResult; randomEffects: SlopeVariance } {
  const y2 = sc.yScale * sc.yScale;
  const b = -sc.tCentre / sc.tScale;
  const st = sc.tScale;
  // Rows: G11, G12, G22 as linear functions of the scaled (G'11, G'12, G'22); σ² scales by s_y².
  const J = [
    [1, 2 * b, b * b, 0],
    [0, 1 / st, b / st, 0],
    [0, 0, 1 / (st * st), 0],
    [0, 0, 0, 1],
  ].map((row) => row.map((v) => v * y2));
  const theta = [D[0] * s2, D[1] * s2, D[2] * s2, s2];
  const orig = J.map((row) => row.reduce((t, v, k) => t + v * theta[k]!, 0));
  const cov = J.map((ri) => J.map((rj) => {
    let v = 0;
    for (let a = 0; a < 4; a++) for (let c = 0; c < 4; c++) v += ri[a]! * W[a * 4 + c]! * rj[c]!;
    return v;
  }));
  const alpha = 1 - level;
  const z = normalQuantile(1 - alpha / 2);
  const chi = (th: number, v: number, boundary: boolean): [number, number] => {
    if (boundary || !(v > 0) || !(th > 0)) return [0, th > 0 && v > 0 ? th + z * Math.sqrt(v) : th];
    const nu = (2 * th * th) / v;
    const lo = (nu * th) / chiSquareQuantile(1 - alpha / 2, nu);
    const hi = (nu * th) / chiSquareQuantile(alpha / 2, nu);
    if (!(lo <= th && th <= hi)) return [0, Number.isNaN(hi) ? Infinity : Math.max(hi, th)];
    return [lo, hi];
  };
  const [g11, g12, g22, sig] = orig as [number, number, number, number];
  const [iLo, iHi] = chi(g11, cov[0]![0]!, atBoundary);
  const [sLo, sHi] = chi(g22, cov[2]![2]!, atBoundary);
  const [rLo, rHi] = chi(sig, cov[3]![3]!, false);
  const icc = g11 / (g11 + sig);
  let iccLower: number;
  let iccUpper: number;
  if (g11 > 0 && !atBoundary) {
    const v = cov[0]![0]! / (g11 * g11) + cov[3]![3]! / (sig * sig) - (2 * cov[0]![3]!) / (g11 * sig);
    const lg = Math.log(g11 / sig);
    const se = Math.sqrt(Math.max(v, 0));
    const inv = (x: number): number => 1 / (1 + Math.exp(-x));
    [iccLower, iccUpper] = [Math.min(inv(lg - z * se), icc), Math.max(inv(lg + z * se), icc)];
  } else {
    iccLower = 0;
    iccUpper = iHi / (iHi + sig);
  }
  const correlation = g11 > 0 && g22 > 0 ? Math.max(-1, Math.min(1, g12 / Math.sqrt(g11 * g22))) : NaN;
  return {
    variance: {
      subject: g11,
      residual: sig,
      icc,
      subjectLower: iLo,
      subjectUpper: iHi,
      residualLower: rLo,
      residualUpper: rHi,
      iccLower,
      iccUpper,
      intervalMethod:
        'Random intercept and slope model: the between-participant variance is that of the intercepts at time 0 (study day 1), and the intraclass correlation is the share of the variation between participants at time 0. ' +
        `Variances: scaled chi-square intervals with Satterthwaite degrees of freedom from the inverse expected information${atBoundary ? ' (the covariance matrix is singular, so its variances get a lower limit of 0 and a normal-theory upper limit)' : ''}. ` +
        'Intraclass correlation: Wald interval on the logit scale (delta method).',
    },
    randomEffects: { intercept: g11, slope: g22, covariance: g12, correlation, interceptLower: iLo, interceptUpper: iHi, slopeLower: sLo, slopeUpper: sHi },
  };
}

function slopeVarianceProblem(r: SlopeVariance): string | null {
  if (!(Number.isFinite(r.slope) && r.slope >= 0)) return `the variance of the slopes is ${r.slope}, not a number ≥ 0`;
  if (!(r.slopeLower <= r.slope && r.slope <= r.slopeUpper)) return 'the interval of the variance of the slopes does not hold its estimate';
  if (!(Number.isNaN(r.correlation) || Math.abs(r.correlation) <= 1)) return `the intercept–slope correlation is ${r.correlation}`;
  return null;
}

function failedSlopeFit(
  base: Omit<SlopeFit, 'status' | 'message' | 'fixedEffects' | 'variance' | 'randomEffects' | 'covarianceShape' | 'logLik' | 'aic' | 'bic' | 'bicN' | 'nParameters' | 'converged' | 'treatmentEffects' | 'slopeDifferences' | 'jointTest' | 'trajectories' | 'subjects' | 'naive'>,
  message: string,
  terms: SlopeFit['terms'],
  p: number,
): SlopeFit {
  const nan = { estimate: NaN, se: NaN, df: NaN, t: NaN, lower: NaN, upper: NaN, p: NaN };
  return {
    ...base,
    status: 'failed',
    message,
    fixedEffects: terms.map((t) => ({ term: t.name, kind: t.kind, arm: t.arm, ...nan })),
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
    randomEffects: { intercept: NaN, slope: NaN, covariance: NaN, correlation: NaN, interceptLower: NaN, interceptUpper: NaN, slopeLower: NaN, slopeUpper: NaN },
    covarianceShape: 'full',
    logLik: NaN,
    aic: NaN,
    bic: NaN,
    bicN: NaN,
    nParameters: p + 4,
    converged: false,
    treatmentEffects: [],
    slopeDifferences: [],
    jointTest: null,
    trajectories: [],
    subjects: [],
    naive: null,
  };
}

export type { SlopeShape };
