/**
 * GEE against a committed fixture from an outside general-purpose library: Debian's python3-statsmodels GEE
 * (Gaussian, identity link) on invented data, made by test/reference/gee_exchangeable.py. Both use scale Σr²/(N − p)
 * and the (pairs − p) denominator for the correlation; the fixture's bias-reduced covariance is Mancl & DeRouen 2001.
 * Tolerances: estimates 1e-6 and SEs 1e-5 relative (the bar; both sides iterate to ~1e-10 steps).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitGee } from '../../../../src/core/model/gee';
import type { ModelData } from '../../../../src/core/model';

interface Side { params: number[]; seRobust: number[]; seModel: number[]; seBiasReduced: number[]; scale: number; correlation: number; lastVisit: { day: number; time: number; estimate: number; se: number } }
interface Fixture {
  data: { subject: number[]; arm: number[]; time: number[]; baseline: number[]; y: number[] };
  exchangeable: Side;
  independence: Side;
}

const fixture = JSON.parse(readFileSync(new URL('../../../reference/gee-exchangeable.json', import.meta.url), 'utf8')) as Fixture;

function fixtureData(f: Fixture): ModelData {
  const d = f.data;
  return {
    y: Float64Array.from(d.y),
    time: Float64Array.from(d.time),
    subject: Int32Array.from(d.subject),
    nSubjects: Math.max(...d.subject) + 1,
    armIndex: Int32Array.from(d.arm),
    arms: ['Placebo', 'Drug'],
    covariates: [{ name: 'baseline', kind: 'numeric', values: Float64Array.from(d.baseline) }],
  };
}

function close(actual: number, expected: number, rel: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(expected)));
}

describe.each(['exchangeable', 'independence'] as const)('GEE (%s) matches the statsmodels fixture', (structure) => {
  const ref = fixture[structure];
  const fit = fitGee(fixtureData(fixture), { level: 0.95, timeUnit: 'month', structure, contrastDays: [{ label: 'Week 48', day: ref.lastVisit.day }] });

  it('converges, with the design the fixture used', () => {
    expect(fit.status).toBe('converged');
    expect(fit.terms.map((t) => t.kind)).toEqual(['intercept', 'arm', 'time', 'armTime', 'covariate']);
  });
  it('estimates to 1e-6', () => {
    fit.fixedEffects.forEach((e, j) => close(e.estimate, ref.params[j]!, 1e-6));
    close(fit.workingCorrelation.correlation, ref.correlation, 1e-6);
    close(fit.scale, ref.scale, 1e-6);
  });
  it('robust, model-based and bias-corrected SEs to 1e-5', () => {
    fit.fixedEffects.forEach((e, j) => {
      close(e.se, ref.seRobust[j]!, 1e-5);
      close(e.seModel, ref.seModel[j]!, 1e-5);
      close(e.seSmallSample!, ref.seBiasReduced[j]!, 1e-5);
    });
  });
  it('the difference at the last visit (arm + t × arm × time) and its robust SE match statsmodels\' t_test to 1e-6 and 1e-5', () => {
    const [c] = fit.treatmentEffects;
    expect(c!.arm).toBe('Drug');
    close(c!.time, ref.lastVisit.time, 1e-12);
    close(c!.estimate, ref.lastVisit.estimate, 1e-6);
    close(c!.se, ref.lastVisit.se, 1e-5);
  });
});
