/**
 * fitLogistic: the random-intercept logistic mixed model logit P(y_ij = 1 | u_i) = x_ij'β + u_i, u_i ~ N(0, σ²), with
 * the random-intercept model's fixed effects (design.ts), by maximum likelihood with adaptive Gauss–Hermite
 * quadrature (Liu & Pierce 1994; Pinheiro & Bates 1995; nodes by Golub & Welsch 1969; one node = Laplace).
 * Odds ratios exp(β) with Wald intervals; σ² on the logit scale; population-averaged probabilities by arm and visit.
 * Design columns are divided by their largest absolute value while fitting and the results mapped back.
 * Cost O(N · (nodes + Newton steps)) per likelihood evaluation, memory O(N p).
 */
import { offsetOfStudyDay } from '../../intake/dayOffset';
import { armContrasts } from '../armContrast';
import { buildDesign } from '../design';
import { boundedP, normalQuantile, normalUpperTail } from '../distributions';
import { DegenerateDataError, ModelInputError, RankDeficiencyError } from '../errors';
import { DAYS_PER_TIME_UNIT } from '../fit';
import { checkRank } from '../pivotedCholesky';
import type { ModelData } from '../types';
import { validateModelRows, validateModelShape } from '../validate';
import { hermiteRule } from './hermite';
import { makeObjective } from './objective';
import { maximise } from './optimise';
import { groupPatterns } from './patterns';
import { expit } from './participant';
import type { LogisticContrast, LogisticEffect, LogisticFit, LogisticOptions, MarginalProbability } from './types';

/** Below this σ̂ the between-participant variance is reported at its zero boundary. */
const SIGMA_BOUNDARY = 1e-4;

/**
 * Fits the model; data.y holds 0 (no) and 1 (yes). Misuse throws ModelInputError / RankDeficiencyError; one participant
 * or one answer throughout throws DegenerateDataError; separation and non-convergence are reported in `status`.
 * Example: see test/core/model/logistic/reference.test.ts (fixture by direct integration).
 */
export function fitLogistic(data: ModelData, options: LogisticOptions): LogisticFit {
  validateModelShape(data, { method: 'ml', dfMethod: 'residual', level: options.level, timeUnit: options.timeUnit, contrastDays: options.contrastDays });
  validateModelRows(data);
  const nodes = options.nodes ?? 25;
  if (!Number.isInteger(nodes) || nodes < 1 || nodes > 100) throw new ModelInputError(`the number of quadrature nodes must be an integer from 1 to 100, got ${nodes}.`);
  const N = data.y.length;
  let nYes = 0;
  for (let r = 0; r < N; r++) {
    const v = data.y[r]!;
    if (v !== 0 && v !== 1) throw new ModelInputError(`the yes/no outcome at observation ${r + 1} is ${v}, not 0 or 1.`);
    nYes += v;
  }
  const design = buildDesign(data, false);
  const p = design.p;
  if (N <= p) throw new ModelInputError(`${N} observations are too few for ${p} fixed effects.`);
  const { x, colScale, xtx } = denseDesign(design.fillRow, N, p);
  const rank = checkRank(xtx, p);
  if (rank.dependent.length > 0) throw new RankDeficiencyError(rank.dependent.map((j) => design.terms[j]!.name));
  const { order, start, nClusters } = groupRows(data.subject, data.nSubjects);
  if (nClusters < 2) throw new DegenerateDataError('one-subject', 'Only one participant has values; the model needs at least two.');
  if (nYes === 0 || nYes === N) throw new DegenerateDataError('no-variation', `Every observation is ${nYes === 0 ? 'no' : 'yes'}; there is nothing to model.`);

  const patterns = groupPatterns({ p, x, y: data.y, order, start });
  const obj = makeObjective(patterns, hermiteRule(nodes));
  const startTheta = new Float64Array(p + 1);
  startTheta[0] = Math.log(nYes / (N - nYes));
  startTheta[p] = 1;
  const max = maximise(obj, startTheta);
  // Quadrature check: ℓ at the estimates with twice the nodes (one more evaluation).
  const checkNodes = Math.min(2 * nodes, 200);
  const quadratureCheck = { nodes: checkNodes, logLikChange: makeObjective(patterns, hermiteRule(checkNodes)).value(max.theta) - max.logLik };
  // Back to the original columns: β_j = β'_j / s_j, Cov_jk = Cov'_jk / (s_j s_k); σ ≥ 0 (ℓ is even in σ).
  const sigma = Math.abs(max.theta[p]!);
  const beta = Array.from({ length: p }, (_, j) => max.theta[j]! / colScale[j]!);
  const q = p + 1;
  const cov = max.covariance;
  const zq = normalQuantile(0.5 + options.level / 2);
  const fixedEffects: LogisticEffect[] = design.terms.map((term, j) => {
    const estimate = beta[j]!;
    const se = cov === null ? NaN : Math.sqrt(cov[j * q + j]!) / colScale[j]!;
    const z = estimate / se;
    const lower = estimate - zq * se;
    const upper = estimate + zq * se;
    return { term: term.name, kind: term.kind, arm: term.arm, estimate, se, z, lower, upper, p: boundedP(2 * normalUpperTail(Math.abs(z))), oddsRatio: Math.exp(estimate), oddsRatioLower: Math.exp(lower), oddsRatioUpper: Math.exp(upper) };
  });
  const boundary = sigma < SIGMA_BOUNDARY;
  const status = !max.converged || cov === null ? 'failed' : boundary ? 'boundary' : 'converged';
  const message = status === 'failed' ? (max.message !== '' && !max.converged ? max.message : 'The information matrix at the estimates is not positive definite; no standard errors.') : boundary ? 'The between-participant variance is estimated at zero (its boundary).' : max.message;
  const sigmaVar = cov === null ? NaN : cov[p * q + p]!;
  const nParameters = p + 1;
  return {
    kind: 'logistic',
    status,
    message,
    level: options.level,
    timeUnit: options.timeUnit,
    nodes,
    nSubjects: nClusters,
    nObservations: N,
    nYes,
    terms: design.terms,
    arms: design.armCol >= 0 ? [...data.arms] : [],
    fixedEffects,
    variance: { subject: sigma * sigma, subjectSe: boundary || !(sigmaVar >= 0) ? null : 2 * sigma * Math.sqrt(sigmaVar) },
    logLik: max.logLik,
    aic: -2 * max.logLik + 2 * nParameters,
    bic: -2 * max.logLik + nParameters * Math.log(N),
    nParameters,
    iterations: max.iterations,
    quadratureCheck,
    marginalProbabilities: marginal(data, design, x, colScale, beta, sigma, options),
    treatmentEffects: cov === null ? [] : oddsContrasts(design.terms, beta, cov, colScale, options),
  };
}

/** armContrasts on the original columns (Cov_jk = Cov'_jk / (s_j s_k), the σ row and column dropped), with odds ratios. */
function oddsContrasts(terms: ReturnType<typeof buildDesign>['terms'], beta: readonly number[], cov: ArrayLike<number>, colScale: Float64Array, options: LogisticOptions): LogisticContrast[] {
  const p = beta.length;
  const q = p + 1;
  const fixed = new Array<number>(p * p);
  for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) fixed[j * p + k] = cov[j * q + k]! / (colScale[j]! * colScale[k]!);
  return armContrasts(terms, beta, fixed, options.contrastDays, options.timeUnit, options.level).map((c) => ({ ...c, oddsRatio: Math.exp(c.estimate), oddsRatioLower: Math.exp(c.lower), oddsRatioUpper: Math.exp(c.upper) }));
}

/** Dense design divided by each column's largest |value| (1 for an all-zero column), and X'X of the divided columns. */
function denseDesign(fill: (r: number, x: Float64Array) => void, N: number, p: number): { x: Float64Array; colScale: Float64Array; xtx: Float64Array } {
  const x = new Float64Array(N * p);
  const row = new Float64Array(p);
  const colScale = new Float64Array(p);
  for (let r = 0; r < N; r++) {
    fill(r, row);
    for (let j = 0; j < p; j++) {
      x[r * p + j] = row[j]!;
      colScale[j] = Math.max(colScale[j]!, Math.abs(row[j]!));
    }
  }
  for (let j = 0; j < p; j++) if (colScale[j] === 0) colScale[j] = 1;
  const xtx = new Float64Array(p * p);
  for (let r = 0; r < N; r++) {
    for (let j = 0; j < p; j++) x[r * p + j] = x[r * p + j]! / colScale[j]!;
    for (let a = 0; a < p; a++) for (let b = 0; b <= a; b++) xtx[a * p + b] = xtx[a * p + b]! + x[r * p + a]! * x[r * p + b]!;
  }
  for (let a = 0; a < p; a++) for (let b = 0; b < a; b++) xtx[b * p + a] = xtx[a * p + b]!;
  return { x, colScale, xtx };
}

/** Rows grouped by participant by a counting sort. Cost O(N + participants). */
export function groupRows(subject: Int32Array, nSubjects: number): { order: Int32Array; start: Int32Array; nClusters: number } {
  const N = subject.length;
  const start = new Int32Array(nSubjects + 1);
  for (let r = 0; r < N; r++) start[subject[r]! + 1] = start[subject[r]! + 1]! + 1;
  let nClusters = 0;
  for (let g = 0; g < nSubjects; g++) {
    if (start[g + 1]! > 0) nClusters++;
    start[g + 1] = start[g + 1]! + start[g]!;
  }
  const order = new Int32Array(N);
  const at = Int32Array.from(start.subarray(0, nSubjects));
  for (let r = 0; r < N; r++) {
    const s = subject[r]!;
    order[at[s]!] = r;
    at[s] = at[s]! + 1;
  }
  return { order, start, nClusters };
}

/** Nodes for the population-averaged probabilities (the integrand expit(a + σ√2 x) is smooth; 40 nodes is ample). */
const MARGINAL_NODES = 40;

/**
 * P(yes) averaged over participants at each visit's time and arm: Σ_k (w_k/√π) expit(x'β + σ√2 x_k), with covariate
 * columns at their mean over the rows (numeric covariates at their mean, categorical ones at their shares).
 */
function marginal(data: ModelData, design: ReturnType<typeof buildDesign>, x: Float64Array, colScale: Float64Array, beta: number[], sigma: number, options: LogisticOptions): MarginalProbability[] {
  const p = design.p;
  const N = data.y.length;
  const means = new Float64Array(p);
  for (let r = 0; r < N; r++) for (let j = 0; j < p; j++) means[j] = means[j]! + x[r * p + j]!;
  for (let j = 0; j < p; j++) means[j] = (means[j]! / N) * colScale[j]!;
  const rule = hermiteRule(MARGINAL_NODES);
  const unit = DAYS_PER_TIME_UNIT[options.timeUnit];
  const arms: (string | null)[] = design.armCol >= 0 ? [...data.arms] : [null];
  const out: MarginalProbability[] = [];
  for (const cd of options.contrastDays) {
    const time = offsetOfStudyDay(cd.day) / unit;
    arms.forEach((arm, a) => {
      const row = Float64Array.from(means);
      row[0] = 1;
      row[design.timeCol] = time;
      if (design.armCol >= 0) {
        for (let b = 1; b < design.nArms; b++) {
          row[design.armCol + b - 1] = b === a ? 1 : 0;
          row[design.armTimeCol + b - 1] = b === a ? time : 0;
        }
      }
      let eta = 0;
      for (let j = 0; j < p; j++) eta += row[j]! * beta[j]!;
      let prob = 0;
      for (let k = 0; k < MARGINAL_NODES; k++) prob += (rule.weights[k]! / Math.sqrt(Math.PI)) * expit(eta + sigma * Math.SQRT2 * rule.nodes[k]!);
      out.push({ arm, label: cd.label, day: cd.day, time, probability: prob });
    });
  }
  return out;
}
