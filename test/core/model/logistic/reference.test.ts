/**
 * The random-intercept logistic model with 25 nodes against a fixture made by direct integration
 * (test/reference/logistic_quadrature.py: scipy integrate.quad per participant, maximum over (β, log σ) by BFGS and
 * Newton, SEs from a central-difference Hessian). Tolerances: estimates and σ² 1e-5 and log-likelihood 1e-7 (both
 * maxima are found from numerical gradients good to about 1e-8), SEs 1e-4 relative (both Hessians are central
 * differences with steps near 1e-4).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { ModelData } from '../../../../src/core/model';
import { fitLogistic } from '../../../../src/core/model/logistic';

interface Fixture {
  data: { subject: number[]; arm: number[]; time: number[]; y: number[] };
  estimates: number[];
  se: number[];
  variance: number;
  logLik: number;
  lastVisit: { day: number; time: number; estimate: number; se: number };
}
const fx = JSON.parse(readFileSync(new URL('../../../reference/logistic-quadrature.json', import.meta.url), 'utf8')) as Fixture;

function logisticFixtureData(): ModelData {
  return {
    y: Float64Array.from(fx.data.y),
    time: Float64Array.from(fx.data.time),
    subject: Int32Array.from(fx.data.subject),
    nSubjects: Math.max(...fx.data.subject) + 1,
    armIndex: Int32Array.from(fx.data.arm),
    arms: ['Placebo', 'Drug'],
    covariates: [],
  };
}

describe('fitLogistic with 25 nodes matches direct integration', () => {
  const fit = fitLogistic(logisticFixtureData(), { level: 0.95, timeUnit: 'month', nodes: 25, contrastDays: [{ label: 'Week 24', day: 169 }] });

  it('converges', () => {
    expect(fit.status).toBe('converged');
    expect(fit.nodes).toBe(25);
  });
  it('estimates, variance and log-likelihood', () => {
    fit.fixedEffects.forEach((e, j) => expect(Math.abs(e.estimate - fx.estimates[j]!)).toBeLessThan(1e-5));
    expect(Math.abs(fit.variance.subject - fx.variance)).toBeLessThan(1e-5);
    expect(Math.abs(fit.logLik - fx.logLik)).toBeLessThan(1e-7);
  });
  it('standard errors and odds ratios', () => {
    fit.fixedEffects.forEach((e, j) => {
      expect(Math.abs(e.se - fx.se[j]!)).toBeLessThan(1e-4 * fx.se[j]!);
      expect(e.oddsRatio).toBeCloseTo(Math.exp(e.estimate), 12);
      expect(e.oddsRatioLower).toBeCloseTo(Math.exp(e.estimate - 1.959963984540054 * e.se), 12);
    });
  });
  it('population-averaged probabilities lie between 0 and 1 and are closer to ½ than the participant-level ones', () => {
    expect(fit.marginalProbabilities).toHaveLength(2);
    for (const m of fit.marginalProbabilities) {
      const b = fit.fixedEffects.map((e) => e.estimate);
      const eta = b[0]! + b[2]! * m.time + (m.arm === 'Drug' ? b[1]! + b[3]! * m.time : 0);
      const conditional = 1 / (1 + Math.exp(-eta));
      expect(m.probability).toBeGreaterThan(0);
      expect(m.probability).toBeLessThan(1);
      expect(Math.abs(m.probability - 0.5)).toBeLessThan(Math.abs(conditional - 0.5));
    }
  });
  it('the arm difference at the last visit (arm + t × arm × time, log-odds) and its SE, with the odds ratio', () => {
    const last = fitLogistic(logisticFixtureData(), { level: 0.95, timeUnit: 'month', nodes: 25, contrastDays: [{ label: 'Week 36', day: fx.lastVisit.day }] });
    const [c] = last.treatmentEffects;
    expect(c!.arm).toBe('Drug');
    expect(Math.abs(c!.time - fx.lastVisit.time)).toBeLessThan(1e-12);
    // Same tolerances as the fixed effects above: estimate 1e-5, SE 1e-4 relative (central-difference Hessians).
    expect(Math.abs(c!.estimate - fx.lastVisit.estimate)).toBeLessThan(1e-5);
    expect(Math.abs(c!.se - fx.lastVisit.se)).toBeLessThan(1e-4 * fx.lastVisit.se);
    expect(c!.oddsRatio).toBeCloseTo(Math.exp(c!.estimate), 12);
    expect(c!.oddsRatioUpper).toBeCloseTo(Math.exp(c!.upper), 12);
  });
});

describe('fitLogistic: convergence in the number of nodes and misuse', () => {
  it('the distance to the direct-integration maximum shrinks as nodes grow (1 = Laplace, 5, 9, 15, 25)', () => {
    const dist = [1, 5, 9, 15, 25].map((nodes) => {
      const f = fitLogistic(logisticFixtureData(), { level: 0.95, timeUnit: 'month', nodes, contrastDays: [] });
      expect(f.status).toBe('converged');
      return Math.max(Math.abs(f.variance.subject - fx.variance), ...f.fixedEffects.map((e, j) => Math.abs(e.estimate - fx.estimates[j]!)));
    });
    for (let k = 1; k < dist.length; k++) expect(dist[k]!).toBeLessThan(dist[k - 1]!);
    expect(dist[0]!).toBeGreaterThan(1e-2); // the Laplace approximation is visibly biased here
  });

  it('refuses values other than 0 and 1, and a single answer throughout', () => {
    const d = logisticFixtureData();
    const bad = { ...d, y: Float64Array.from(d.y, (v, i) => (i === 3 ? 2 : v)) };
    expect(() => fitLogistic(bad, { level: 0.95, timeUnit: 'month', contrastDays: [] })).toThrow(/observation 4 is 2/);
    const allNo = { ...d, y: new Float64Array(d.y.length) };
    expect(() => fitLogistic(allNo, { level: 0.95, timeUnit: 'month', contrastDays: [] })).toThrow(/Every observation is no/);
    expect(() => fitLogistic(d, { level: 0.95, timeUnit: 'month', nodes: 0, contrastDays: [] })).toThrow(/nodes/);
  });

  it('reports separation instead of running away when one arm answers yes throughout', () => {
    const d = logisticFixtureData();
    const sep = { ...d, y: Float64Array.from(d.armIndex!, (a) => a) };
    const f = fitLogistic(sep, { level: 0.95, timeUnit: 'month', contrastDays: [] });
    expect(f.status).toBe('failed');
    expect(f.message).toMatch(/separated|settled/);
  });
});
