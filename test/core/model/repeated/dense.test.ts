/**
 * The pooled-by-pattern engine against an independent dense fit (helpers.ts: full n × n V, direct REML/ML, Fisher
 * scoring in σ_jk, Kenward–Roger from the published formulas of Kenward & Roger 1997) on invented unbalanced data with
 * dropout and intermittently missed visits.
 * Tolerances: both fits stop when their parameters move less than 1e-10 (engine, scaled units) or 1e-12 (dense,
 * relative); the log-likelihood is flat at the optimum, so it agrees to rounding (1e-10 relative); estimates and Σ̂
 * agree to 1e-8 relative, the accuracy both optimisers reach; SE and df are smooth functions of Σ̂ and agree to 1e-7.
 */
import { describe, expect, it } from 'vitest';
import { fitRepeated, type RepeatedData, type RepeatedFit } from '../../../../src/core/model/repeated';
import { denseFit, inventedTrial } from './helpers';

function close(a: number, b: number, rel: number): void {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));
}

function compare(d: RepeatedData, method: 'reml' | 'ml'): { fit: RepeatedFit; dense: ReturnType<typeof denseFit> } {
  const fit = fitRepeated(d, { method, dfMethod: 'kenward-roger', level: 0.95 });
  const dense = denseFit(d, method);
  expect(fit.status).toBe('converged');
  close(fit.logLik, dense.logLik, 1e-10);
  expect(fit.fixedEffects.length).toBe(dense.beta.length);
  fit.fixedEffects.forEach((e, k) => close(e.estimate, dense.beta[k]!, 1e-8));
  const V = d.visits.length;
  for (let j = 0; j < V; j++) for (let k = 0; k < V; k++) close(fit.covariance[j]![k]!, dense.sigma[j]![k]!, 1e-8);
  return { fit, dense };
}

describe('repeated-measures model: pooled engine equals a dense n × n fit', () => {
  it('REML with a baseline covariate, dropout and missed visits: logLik, estimates, Σ̂, KR SE and df', () => {
    const d = inventedTrial(36, 4, 11, 0.15, 0.1, true);
    const { fit, dense } = compare(d, 'reml');
    expect(fit.patterns.length).toBeGreaterThan(3);
    const p = fit.fixedEffects.length;
    // Kenward–Roger SE and df of every fixed effect (one-row contrasts of β).
    fit.fixedEffects.forEach((e, k) => {
      const l = Array.from({ length: p }, (_, i) => (i === k ? 1 : 0));
      const ref = dense.kr(l);
      close(e.se, ref.se, 1e-7);
      close(e.df, ref.df, 1e-7);
    });
    // The treatment difference at the last visit = arm + arm × last visit in reference-level coding.
    const last = fit.treatmentEffects.find((t) => t.last)!;
    const l: number[] = fit.fixedEffects.map((e) => (e.kind === 'arm' || (e.kind === 'armVisit' && e.visit === last.visit) ? 1 : 0));
    const ref = dense.kr(l);
    close(last.se, ref.se, 1e-7);
    close(last.df, ref.df, 1e-7);
    close(last.estimate, l.reduce((s, c, i) => s + c * dense.beta[i]!, 0), 1e-8);
  });

  it('ML without a covariate, five visits and heavier dropout', () => {
    const d = inventedTrial(28, 5, 5, 0.25, 0.05, false);
    compare(d, 'ml');
  });
});
