/**
 * The JSON `model` section of the machine-readable results: the fit's numbers with non-finite values as null (JSON has
 * no NaN or Infinity).
 */
import type { ContrastResult, ModelFit, VarianceInterval } from '../model/types';
import { naiveJson } from './naiveReport';
import { modelKindOf } from '../model/slope/kind';
import { slopeVarianceJson } from './slopeReport';

const n = (x: number): number | null => (Number.isFinite(x) ? x : null);
const inf = (r: ContrastResult): Record<string, number | null> => ({ estimate: n(r.estimate), se: n(r.se), df: n(r.df), t: n(r.t), p: n(r.p), lower: n(r.lower), upper: n(r.upper) });

/** One variance or the ICC with its interval; an unbounded upper limit is null, its reason in `note`. */
const intervalJson = (estimate: number, i: VarianceInterval): Record<string, unknown> => ({ estimate: n(estimate), lower: n(i.lower), upper: n(i.upper), intervalMethod: i.method, note: i.note });

/** Example: modelJson(fit).fixedEffects[0] -> { term: 'Intercept', kind: 'intercept', arm: null, estimate: 66.5, ... }. */
export function modelJson(fit: ModelFit): Record<string, unknown> {
  const v = fit.variance;
  return {
    kind: modelKindOf(fit),
    method: fit.method,
    dfMethod: fit.dfMethod,
    level: fit.level,
    timeUnit: fit.timeUnit,
    nSubjects: fit.nSubjects,
    nObservations: fit.nObservations,
    logLik: n(fit.logLik),
    aic: n(fit.aic),
    bic: n(fit.bic),
    nParameters: fit.nParameters,
    bicN: n(fit.bicN),
    iterations: fit.iterations,
    converged: fit.converged,
    status: fit.status,
    message: fit.message,
    arms: [...fit.arms],
    fixedEffects: fit.fixedEffects.map((f) => ({ term: f.term, kind: f.kind, arm: f.arm, ...inf(f) })),
    variance: {
      subject: n(v.subject),
      residual: n(v.residual),
      icc: n(v.icc),
      subjectLower: n(v.subjectLower),
      subjectUpper: n(v.subjectUpper),
      residualLower: n(v.residualLower),
      residualUpper: n(v.residualUpper),
      iccLower: n(v.iccLower),
      iccUpper: n(v.iccUpper),
      intervalMethod: v.intervalMethod,
      ...slopeVarianceJson(fit),
      intervals: v.intervals === undefined ? null : {
        subject: intervalJson(v.subject, v.intervals.subject),
        residual: intervalJson(v.residual, v.intervals.residual),
        icc: intervalJson(v.icc, v.intervals.icc),
      },
      zeroTest: v.zeroTest === undefined ? null : { statistic: n(v.zeroTest.statistic), p: n(v.zeroTest.p) },
    },
    treatmentEffects: fit.treatmentEffects.map((t) => ({ arm: t.arm, label: t.label, day: t.day, time: n(t.time), ...inf(t) })),
    slopeDifferences: fit.slopeDifferences.map((s) => ({ arm: s.arm, ...inf(s) })),
    containmentDf: { between: fit.containment.betweenDf, within: fit.containment.withinDf },
    naive: naiveJson(fit),
    jointTest: fit.jointTest === null ? null : { numDf: fit.jointTest.numDf, denDf: n(fit.jointTest.denDf), F: n(fit.jointTest.F), p: n(fit.jointTest.p) },
  };
}
