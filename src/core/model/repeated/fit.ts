/**
 * fitRepeated: the repeated-measures model with visit as a factor and an unstructured covariance across scheduled
 * visits. Mean: one level per arm × visit (reference-level coding: intercept, arm, visit, arm × visit) and, when given,
 * a baseline covariate with its own slope at each visit (baseline, baseline × visit). Covariance: an unstructured
 * Σ (V × V) shared by all participants; a participant with missing visits contributes the rows and columns of Σ at
 * the visits observed (missing at random). Estimation by REML (Patterson & Thompson 1971) or ML with Fisher scoring
 * on the Cholesky factor of Σ (scoring.ts); inference by Kenward–Roger (1997), Satterthwaite, between/within or
 * residual df (inference.ts).
 *
 * Cost: one pass over participants (O(participants · visits²)) to group them by arm and missingness pattern, then
 * O(groups · visits³ + R p³ + R² p²) per scoring step, R = V(V + 1)/2 and p the number of mean parameters.
 * Example: 2 arms × 3 visits, complete data -> 6 means equal to the observed arm × visit means and Σ̂ the pooled
 * within-arm sample covariance (test/core/model/repeated/identities.test.ts).
 */
import { ModelInputError } from '../errors';
import { DegenerateDataError } from '../errors';
import type { ContrastResult } from '../types';
import { groupByPattern, type Grouped } from './groups';
import { contrastOf, inferenceAt } from './inference';
import { derivatives } from './likelihood';
import { fisherScoring } from './scoring';
import type { MissingPattern, RepeatedData, RepeatedEffect, RepeatedFit, RepeatedOptions, RepeatedTermKind, VisitDifference, VisitMean } from './types';

interface TermSpec {
  readonly name: string;
  readonly kind: RepeatedTermKind;
  readonly arm: string | null;
  readonly visit: string | null;
  /** Contrast on the original-scale cell-means vector θ_o. */
  readonly l: Float64Array;
}

/** Fits the model (see the file comment). Throws ModelInputError for bad shapes or options and for an arm × visit
 * cell without any value, DegenerateDataError for data that cannot give a model. */
export function fitRepeated(data: RepeatedData, options: RepeatedOptions): RepeatedFit {
  if (!(options.level > 0 && options.level < 1)) throw new ModelInputError(`level must be between 0 and 1, got ${options.level}.`);
  const gr = groupByPattern(data);
  const { nArms: A, nVisits: V, hasBaseline, p } = gr.layout;
  const armNames = data.armIndex === null ? [] : data.arms;
  for (let a = 0; a < A; a++) {
    for (let v = 0; v < V; v++) {
      if (gr.cellCounts[a * V + v] === 0) {
        const who = armNames.length > 0 ? `of arm "${armNames[a]!}" ` : '';
        throw new ModelInputError(`no participant ${who}has a value at visit "${data.visits[v]!}", so that mean cannot be estimated.`);
      }
    }
  }
  if (gr.nObs <= p) throw new DegenerateDataError('one-measurement-each', `the model has ${p} means to estimate and only ${gr.nObs} values.`);
  const res = fisherScoring(gr, startSigma(gr), options.method, options.maxIterations ?? 200);
  const base = baseResult(data, gr, options);
  if (res === null) return failed(base, 'the starting covariance or the design is not positive definite.');
  if (!res.converged) return failed(base, res.message);
  const d = derivatives(gr, res.ev, options.method);
  const inf = inferenceAt(gr, res.ev, d);
  if (inf.W === null) return failed(base, 'the information matrix of the covariance is singular.');
  const sy = gr.sy;
  const ratio = sy / gr.sb;
  const toScaled = (lo: Float64Array): { ls: Float64Array; offset: number } => {
    const ls = new Float64Array(p);
    let offset = 0;
    for (let v = 0; v < V; v++) {
      let sumMu = 0;
      for (let a = 0; a < A; a++) {
        const x = lo[a * V + v]!;
        ls[a * V + v] = sy * x;
        sumMu += x;
      }
      offset += gr.cy * sumMu;
      if (hasBaseline) ls[A * V + v] = ratio * (lo[A * V + v]! - gr.cb * sumMu);
    }
    return { ls, offset };
  };
  const nBetween = A + (hasBaseline ? 1 : 0);
  const betweenDf = gr.nSubjects - nBetween;
  const withinDf = gr.nObs - gr.nSubjects - (p - nBetween);
  const containmentOf = (lo: Float64Array): number => {
    // Coefficients on the reported terms: each cell mean μ(a, v) = intercept + arm a + visit v + arm a × visit v and
    // each slope γ(v) = baseline + baseline × visit v; intercept, arm and baseline are between-participant terms.
    const between = new Float64Array(A + 1);
    const within = new Float64Array(p);
    for (let x = 0; x < p; x++) {
      const c = lo[x]!;
      if (c === 0) continue;
      if (x < A * V) {
        const a = Math.floor(x / V);
        const v = x % V;
        between[a] = between[a]! + c; // a = 0: the intercept
        if (a > 0) between[0] = between[0]! + c;
        if (v > 0) within[v] = within[v]! + c;
        if (a > 0 && v > 0) within[x] = within[x]! + c;
      } else {
        const v = x - A * V;
        between[A] = between[A]! + c;
        if (v > 0) within[x] = within[x]! + c;
      }
    }
    const usesBetween = between.some((c) => Math.abs(c) > 1e-12);
    const usesWithin = within.some((c) => Math.abs(c) > 1e-12);
    if (usesBetween && usesWithin) return Math.min(betweenDf, withinDf);
    return usesWithin ? withinDf : betweenDf;
  };
  const infer = (lo: Float64Array): ContrastResult => {
    const { ls, offset } = toScaled(lo);
    return contrastOf(inf, res.ev.theta, ls, offset, options.dfMethod, options.level, { residual: gr.nObs - p, containment: containmentOf(lo) });
  };
  const fixedEffects: RepeatedEffect[] = termSpecs(data, gr).map((t) => ({ term: t.name, kind: t.kind, arm: t.arm, visit: t.visit, ...infer(t.l) }));
  const treatmentEffects: VisitDifference[] = [];
  for (let v = 0; v < V; v++) {
    for (let a = 1; a < A; a++) {
      const l = new Float64Array(p);
      l[a * V + v] = 1;
      l[v] = -1;
      treatmentEffects.push({ arm: armNames[a]!, visit: data.visits[v]!, day: data.visitDays?.[v] ?? null, last: v === V - 1, ...infer(l) });
    }
  }
  const means: VisitMean[] = [];
  for (let v = 0; v < V; v++) {
    for (let a = 0; a < A; a++) {
      const l = new Float64Array(p);
      l[a * V + v] = 1;
      if (hasBaseline) l[A * V + v] = gr.cb;
      means.push({ arm: armNames.length > 0 ? armNames[a]! : null, visit: data.visits[v]!, n: gr.cellCounts[a * V + v]!, ...infer(l) });
    }
  }
  const s2 = sy * sy;
  const covariance = Array.from({ length: V }, (_, a) => Array.from({ length: V }, (_, b) => s2 * res.sigma[a * V + b]!));
  const correlation = covariance.map((row, a) => row.map((c, b) => (a === b ? 1 : c / Math.sqrt(covariance[a]![a]! * covariance[b]![b]!))));
  const N = gr.nObs;
  let logLik = res.ev.logLik - (options.method === 'ml' ? N : N - p) * Math.log(sy);
  if (options.method === 'reml' && hasBaseline) logLik -= V * Math.log(gr.sb);
  const k = p + (V * (V + 1)) / 2;
  const bicN = options.method === 'ml' ? N : N - p;
  const near = nearSingular(res.sigma, V);
  return {
    ...base,
    status: near === null ? 'converged' : 'boundary',
    message: near === null ? res.message : `${res.message} ${near}`,
    iterations: res.iterations,
    converged: true,
    fixedEffects,
    treatmentEffects,
    means,
    covariance,
    correlation,
    logLik,
    aic: -2 * logLik + 2 * k,
    bic: -2 * logLik + k * Math.log(bicN),
    bicN,
    nParameters: k,
    containment: { betweenDf, withinDf },
  };
}

/** The reported terms as contrasts of the cell means (reference arm 0, reference visit 0). */
function termSpecs(data: RepeatedData, gr: Grouped): TermSpec[] {
  const { nArms: A, nVisits: V, hasBaseline, p } = gr.layout;
  const arms = data.armIndex === null ? [] : data.arms;
  const mu = (a: number, v: number): number => a * V + v;
  const vec = (entries: [number, number][]): Float64Array => {
    const l = new Float64Array(p);
    for (const [i, c] of entries) l[i] = l[i]! + c;
    return l;
  };
  const out: TermSpec[] = [{ name: 'Intercept', kind: 'intercept', arm: null, visit: null, l: vec([[mu(0, 0), 1]]) }];
  for (let a = 1; a < A; a++) out.push({ name: `Arm ${arms[a]!} vs ${arms[0]!}`, kind: 'arm', arm: arms[a]!, visit: null, l: vec([[mu(a, 0), 1], [mu(0, 0), -1]]) });
  for (let v = 1; v < V; v++) out.push({ name: `Visit ${data.visits[v]!} vs ${data.visits[0]!}`, kind: 'visit', arm: null, visit: data.visits[v]!, l: vec([[mu(0, v), 1], [mu(0, 0), -1]]) });
  for (let a = 1; a < A; a++) {
    for (let v = 1; v < V; v++) {
      out.push({ name: `Arm ${arms[a]!} × visit ${data.visits[v]!}`, kind: 'armVisit', arm: arms[a]!, visit: data.visits[v]!, l: vec([[mu(a, v), 1], [mu(a, 0), -1], [mu(0, v), -1], [mu(0, 0), 1]]) });
    }
  }
  if (hasBaseline) {
    const name = data.baseline!.name;
    out.push({ name, kind: 'baseline', arm: null, visit: null, l: vec([[A * V, 1]]) });
    for (let v = 1; v < V; v++) out.push({ name: `${name} × visit ${data.visits[v]!}`, kind: 'baselineVisit', arm: null, visit: data.visits[v]!, l: vec([[A * V + v, 1], [A * V, -1]]) });
  }
  return out;
}

/** Diagonal start: each visit's variance about its arm means (scaled units), 1 where it cannot be computed. */
function startSigma(gr: Grouped): Float64Array {
  const { nArms: A, nVisits: V } = gr.layout;
  const sum = new Float64Array(A * V);
  const ss = new Float64Array(V);
  for (const g of gr.groups) {
    const m = g.obs.length;
    for (let k = 0; k < m; k++) {
      sum[g.arm * V + g.obs[k]!] = sum[g.arm * V + g.obs[k]!]! + g.sy[k]!;
      ss[g.obs[k]!] = ss[g.obs[k]!]! + g.syy[k * m + k]!;
    }
  }
  const sigma = new Float64Array(V * V);
  for (let v = 0; v < V; v++) {
    let between = 0;
    let n = 0;
    let cells = 0;
    for (let a = 0; a < A; a++) {
      const c = gr.cellCounts[a * V + v]!;
      if (c === 0) continue;
      between += (sum[a * V + v]! * sum[a * V + v]!) / c;
      n += c;
      cells++;
    }
    const s = (ss[v]! - between) / Math.max(1, n - cells);
    sigma[v * V + v] = s > 1e-8 ? s : 1;
  }
  return sigma;
}

/** A plain sentence when Σ is nearly singular (a visit almost a linear function of the earlier ones), else null. */
function nearSingular(sigma: Float64Array, V: number): string | null {
  // Conditional variance of visit j given visits < j, relative to its variance: L_jj² / Σ_jj.
  const L = new Float64Array(V * V);
  for (let j = 0; j < V; j++) {
    let d = sigma[j * V + j]!;
    for (let k = 0; k < j; k++) d -= L[j * V + k]! * L[j * V + k]!;
    if (d / sigma[j * V + j]! < 1e-8) return 'The estimated covariance is close to singular (one visit is almost a linear function of the others).';
    L[j * V + j] = Math.sqrt(d);
    for (let i = j + 1; i < V; i++) {
      let s = sigma[i * V + j]!;
      for (let k = 0; k < j; k++) s -= L[i * V + k]! * L[j * V + k]!;
      L[i * V + j] = s / L[j * V + j]!;
    }
  }
  return null;
}

function baseResult(data: RepeatedData, gr: Grouped, options: RepeatedOptions): Omit<RepeatedFit, 'status' | 'message' | 'iterations' | 'converged'> {
  const byVisits = new Map<string, { visits: string[]; n: number }>();
  for (const g of gr.groups) {
    const key = Array.from(g.obs).join(',');
    const e = byVisits.get(key);
    if (e === undefined) byVisits.set(key, { visits: Array.from(g.obs, (v) => data.visits[v]!), n: g.n });
    else e.n += g.n;
  }
  const patterns: MissingPattern[] = [...byVisits.values()].sort((a, b) => b.n - a.n);
  return {
    kind: 'repeated',
    method: options.method,
    dfMethod: options.dfMethod,
    level: options.level,
    nSubjects: gr.nSubjects,
    nObservations: gr.nObs,
    visits: [...data.visits],
    arms: data.armIndex === null ? [] : [...data.arms],
    patterns,
    fixedEffects: [],
    treatmentEffects: [],
    means: [],
    covariance: [],
    correlation: [],
    logLik: NaN,
    aic: NaN,
    bic: NaN,
    bicN: NaN,
    nParameters: NaN,
    containment: { betweenDf: NaN, withinDf: NaN },
  };
}

function failed(base: ReturnType<typeof baseResult>, message: string): RepeatedFit {
  return { ...base, status: 'failed', message, iterations: 0, converged: false };
}
