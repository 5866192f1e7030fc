/**
 * The JSON `model` section of the repeated-measures model (`model.kind: "repeated"`): its numbers with non-finite
 * values as null (JSON has no NaN or Infinity). Keys are listed in the README ("Results JSON").
 */
import type { ContrastResult } from '../model/types';
import type { RepeatedFit } from '../model/repeated';

/** A usable record left out of the visit-by-visit model because it is not matched to a scheduled visit. */
export interface LeftOutRecord {
  /** 1-based worksheet row. */
  readonly row: number;
  readonly participant: string;
  readonly status: 'extra' | 'repeat';
}

/** At most this many left-out records are listed one by one (their count is always given). */
export const LEFT_OUT_LISTED = 1000;

const n = (x: number): number | null => (Number.isFinite(x) ? x : null);
const inf = (r: ContrastResult): Record<string, number | null> => ({ estimate: n(r.estimate), se: n(r.se), df: n(r.df), t: n(r.t), p: n(r.p), lower: n(r.lower), upper: n(r.upper) });
const matrix = (m: readonly (readonly number[])[]): (number | null)[][] => m.map((row) => row.map(n));

/** Example: repeatedJson(fit, …).treatmentEffects[0] -> { arm: 'Drug', label: 'Week 0', day: 1, last: false, estimate: …, … }. */
export function repeatedJson(fit: RepeatedFit | null, extra: { readonly note: string | null; readonly notes: readonly string[]; readonly leftOut: readonly LeftOutRecord[] }): Record<string, unknown> {
  const leftOut = {
    unscheduled: extra.leftOut.filter((r) => r.status === 'extra').length,
    repeat: extra.leftOut.filter((r) => r.status === 'repeat').length,
    records: extra.leftOut.slice(0, LEFT_OUT_LISTED).map((r) => ({ row: r.row, participant: r.participant, status: r.status })),
  };
  if (fit === null) return { kind: 'repeated', fitted: false, note: extra.note, notes: [...extra.notes], leftOut };
  return {
    kind: 'repeated',
    fitted: true,
    note: null,
    notes: [...extra.notes],
    method: fit.method,
    dfMethod: fit.dfMethod,
    level: fit.level,
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
    visits: [...fit.visits],
    fixedEffects: fit.fixedEffects.map((f) => ({ term: f.term, kind: f.kind, arm: f.arm, visit: f.visit, ...inf(f) })),
    treatmentEffects: fit.treatmentEffects.map((t) => ({ arm: t.arm, label: t.visit, day: t.day, last: t.last, ...inf(t) })),
    means: fit.means.map((m) => ({ arm: m.arm, label: m.visit, n: m.n, ...inf(m) })),
    covariance: matrix(fit.covariance),
    correlation: matrix(fit.correlation),
    patterns: fit.patterns.map((p) => ({ visits: [...p.visits], n: p.n })),
    containmentDf: { between: n(fit.containment.betweenDf), within: n(fit.containment.withinDf) },
    leftOut,
  };
}
