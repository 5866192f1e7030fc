/**
 * The checks every reported fit must pass, whatever the data: variances finite and ≥ 0 (the within-participant one > 0),
 * every interval ordered lower ≤ estimate ≤ upper with finite ends (a variance's upper limit may be +∞), standard errors finite and > 0, 0 < p ≤ 1, and a
 * finite log-likelihood. A fit that fails one is not reported: fitRandomIntercept throws DegenerateDataError with the
 * sentence returned here. Cost O(number of reported numbers).
 */
import type { ContrastResult, ModelFit } from './types';

const ok = (x: number): boolean => Number.isFinite(x);
const ordered = (lo: number, est: number, hi: number): boolean => ok(lo) && ok(est) && ok(hi) && lo <= est && est <= hi;
/** For variance limits an upper limit of +∞ is honest: when the likelihood does not fall enough, nothing above is ruled out. */
const orderedOpen = (lo: number, est: number, hi: number): boolean => ok(lo) && ok(est) && lo <= est && est <= hi;
const shown = (x: number): string => (Number.isFinite(x) ? String(Number(x.toPrecision(4))) : String(x));

/** The first problem with a contrast's numbers, or null. */
function contrastProblem(what: string, r: ContrastResult): string | null {
  if (!ok(r.estimate)) return `the estimate of ${what} is not a finite number`;
  if (!(ok(r.se) && r.se > 0)) return `the standard error of ${what} is ${shown(r.se)}, not a positive number`;
  if (!(r.df > 0)) return `the degrees of freedom of ${what} are ${shown(r.df)}`;
  if (!ordered(r.lower, r.estimate, r.upper)) return `the interval of ${what} (${shown(r.lower)} to ${shown(r.upper)}) does not hold its estimate ${shown(r.estimate)}`;
  if (!(r.p > 0 && r.p <= 1)) return `the p-value of ${what} is ${shown(r.p)}`;
  return null;
}

/**
 * Null when every number of the fit passes the checks above, else a plain sentence naming the first that does not.
 * Example: a fit whose within-participant variance came out −4.2e-14 -> "the within-participant variance is -4.2e-14, not a
 * positive number".
 */
export function soundnessProblem(fit: Omit<ModelFit, 'subjects'>): string | null {
  const v = fit.variance;
  if (!(ok(v.residual) && v.residual > 0)) return `the within-participant variance is ${shown(v.residual)}, not a positive number`;
  if (!(ok(v.subject) && v.subject >= 0)) return `the between-participant variance is ${shown(v.subject)}, not a number ≥ 0`;
  if (!orderedOpen(v.residualLower, v.residual, v.residualUpper)) return `the interval of the within-participant variance (${shown(v.residualLower)} to ${shown(v.residualUpper)}) does not hold its estimate`;
  if (!(orderedOpen(v.subjectLower, v.subject, v.subjectUpper) && v.subjectLower >= 0)) return `the interval of the between-participant variance (${shown(v.subjectLower)} to ${shown(v.subjectUpper)}) does not hold its estimate`;
  if (!(ordered(v.iccLower, v.icc, v.iccUpper) && v.iccLower >= 0 && v.iccUpper <= 1)) return `the interval of the intraclass correlation (${shown(v.iccLower)} to ${shown(v.iccUpper)}) does not hold its estimate ${shown(v.icc)}`;
  if (!ok(fit.logLik)) return `the log-likelihood is ${shown(fit.logLik)}`;
  for (const f of fit.fixedEffects) {
    const problem = contrastProblem(`"${f.term}"`, f);
    if (problem !== null) return problem;
  }
  for (const t of fit.treatmentEffects) {
    const problem = contrastProblem(`the difference of ${t.arm} at ${t.label}`, t);
    if (problem !== null) return problem;
  }
  for (const s of fit.slopeDifferences) {
    const problem = contrastProblem(`the slope difference of ${s.arm}`, s);
    if (problem !== null) return problem;
  }
  const j = fit.jointTest;
  if (j !== null && !(ok(j.F) && j.F >= 0 && j.p > 0 && j.p <= 1)) return `the joint test of the slopes gives F = ${shown(j.F)}, p = ${shown(j.p)}`;
  for (const tr of fit.trajectories) {
    for (let g = 0; g < tr.mean.length; g++) {
      if (!ordered(tr.lower[g]!, tr.mean[g]!, tr.upper[g]!)) return `the predicted mean at study day ${shown(tr.day[g]!)} has an interval (${shown(tr.lower[g]!)} to ${shown(tr.upper[g]!)}) that does not hold it`;
    }
  }
  return null;
}
