/**
 * fitGee: the marginal model value_ij = x_ij'β + e_ij with the random-intercept model's fixed effects (design.ts),
 * estimated by generalised estimating equations with an exchangeable (or independence) working correlation
 * (Liang & Zeger 1986; identity link, constant variance), the correlation and scale by moment estimates, and three
 * standard errors per term: robust sandwich, model-based, and the bias-corrected sandwich of Mancl & DeRouen 2001.
 * Wald z intervals and p-values from the robust SE (common practice for GEE).
 * Cost: one O(N p²) pass, O(sizes · p²) per iteration, one O(N p² + participants · p³) pass for the covariances.
 */
import { buildDesign } from '../design';
import { normalQuantile, normalUpperTail, boundedP } from '../distributions';
import { DegenerateDataError, ModelInputError, RankDeficiencyError } from '../errors';
import { checkRank } from '../pivotedCholesky';
import type { ModelData } from '../types';
import { validateModelRows, validateModelShape } from '../validate';
import { clusterSums } from './clusters';
import { solveExchangeable } from './exchangeable';
import { covariances } from './sandwich';
import { armContrasts } from '../armContrast';
import type { GeeEffect, GeeFit, GeeOptions } from './types';

/**
 * Fits the GEE. Misuse throws ModelInputError or RankDeficiencyError; one participant or values without variation
 * throw DegenerateDataError; a correlation outside its range or no convergence are reported in `status`.
 * Example: two participants with values [1, 2] and [3, 5] at times 0 and 1, blinded, independence -> intercept 2,
 * time 1.5, robust SEs √0.5 = 0.7071 and √0.125 = 0.3536.
 */
export function fitGee(data: ModelData, options: GeeOptions): GeeFit {
  validateModelShape(data, { method: 'reml', dfMethod: 'residual', level: options.level, timeUnit: options.timeUnit, contrastDays: [] });
  validateModelRows(data);
  const structure = options.structure ?? 'exchangeable';
  if (structure !== 'exchangeable' && structure !== 'independence') throw new ModelInputError(`unknown working correlation '${String(structure)}'.`);
  const maxIterations = options.maxIterations ?? 100;
  const N = data.y.length;
  let mean = 0;
  for (let r = 0; r < N; r++) mean += data.y[r]!;
  mean /= N;
  const y = data.y.map((v) => v - mean);
  const design = buildDesign(data, false);
  const p = design.p;
  const cs = clusterSums(y, data.subject, data.nSubjects, design);
  if (cs.nClusters < 2) throw new DegenerateDataError('one-subject', 'Only one participant has values; a GEE needs at least two.');
  if (N <= p) throw new ModelInputError(`${N} observations are too few for ${p} fixed effects.`);
  const rank = checkRank(cs.xtx, p);
  if (rank.dependent.length > 0) throw new RankDeficiencyError(rank.dependent.map((j) => design.terms[j]!.name));
  const sol = solveExchangeable(cs, structure === 'independence', maxIterations);
  if (sol === null) throw new RankDeficiencyError(design.terms.map((t) => t.name));
  if (!(sol.scale > 1e-20 * (cs.yty / N))) throw new DegenerateDataError('no-variation', 'The values lie on the fitted lines; there is no variation left to estimate.');
  const cov = covariances(cs, design, y, sol.beta, sol.alpha, sol.scale);
  if (cov === null) throw new RankDeficiencyError(design.terms.map((t) => t.name));
  const z = normalQuantile(0.5 + options.level / 2);
  const fixedEffects: GeeEffect[] = design.terms.map((term, j) => {
    const estimate = sol.beta[j]! + (j === 0 ? mean : 0);
    const se = Math.sqrt(cov.robust[j * p + j]!);
    const stat = estimate / se;
    return {
      term: term.name,
      kind: term.kind,
      arm: term.arm,
      estimate,
      se,
      seModel: Math.sqrt(cov.model[j * p + j]!),
      seSmallSample: cov.smallSample === null ? null : Math.sqrt(cov.smallSample[j * p + j]!),
      z: stat,
      lower: estimate - z * se,
      upper: estimate + z * se,
      p: boundedP(2 * normalUpperTail(Math.abs(stat))),
    };
  });
  return {
    kind: 'gee',
    status: sol.converged ? 'converged' : 'failed',
    message: sol.message,
    level: options.level,
    timeUnit: options.timeUnit,
    nSubjects: cs.nClusters,
    nObservations: N,
    terms: design.terms,
    arms: design.armCol >= 0 ? [...data.arms] : [],
    workingCorrelation: { structure, correlation: sol.alpha },
    scale: sol.scale,
    iterations: sol.iterations,
    fixedEffects,
    minParticipantsPerArm: minPerArm(data),
    covariance: { robust: Array.from(cov.robust), model: Array.from(cov.model), smallSample: cov.smallSample === null ? null : Array.from(cov.smallSample) },
    treatmentEffects: armContrasts(design.terms, fixedEffects.map((e) => e.estimate), Array.from(cov.robust), options.contrastDays ?? [], options.timeUnit, options.level),
  };
}

/** Participants per arm (by each participant's first row), the fewest; all participants with rows when blinded. */
function minPerArm(data: ModelData): number {
  const seen = new Uint8Array(data.nSubjects);
  const nArms = data.armIndex === null ? 1 : Math.max(1, data.arms.length);
  const counts = new Float64Array(nArms);
  for (let r = 0; r < data.y.length; r++) {
    const s = data.subject[r]!;
    if (seen[s] === 1) continue;
    seen[s] = 1;
    const a = data.armIndex === null ? 0 : data.armIndex[r]!;
    counts[a] = counts[a]! + 1;
  }
  return Math.min(...counts);
}

/** Below this many participants in an arm the robust SE tends to be too small (Mancl & DeRouen 2001). */
export const SMALL_SAMPLE_PARTICIPANTS = 40;
