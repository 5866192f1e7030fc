import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type FitOptions } from '../../../src/core/model';
import { DYESTUFF, oneWay, RAILS } from './helpers';

const opts = (method: 'reml' | 'ml'): FitOptions => ({
  method,
  dfMethod: 'kenward-roger',
  level: 0.95,
  timeUnit: 'month',
  contrastDays: [],
  design: 'intercept-only',
});

// Reference values are printed to 3–5 significant figures; each tolerance is half a unit in the last printed place.
// Where they come from: the data are Devore (2000) and Davies (1947). The REML fits of the rail data (SDs 24.805 and
// 4.0208, logLik −61.0885 REML and −64.28 ML) are printed in Pinheiro & Bates (2000, Mixed-Effects Models in S and
// S-PLUS, ch. 1 — from memory); the dyestuff ANOVA (between mean square 11271.5, within 2451.25) in Davies (1947,
// from memory). Because balanced REML equals the ANOVA estimators (Searle, Casella & McCulloch 1992, exact identity),
// the variances and the SE of the mean, √(MSB/N), also follow by hand from the data: rails MSB 1862.1, MSW 16.1667 ->
// 615.31, 16.167, SE 10.171; dyestuff -> 1764.05, 2451.25, SE 19.383. The log-likelihoods are from memory, and the
// likelihood formula itself is checked against a dense n x n evaluation in denseCheck.test.ts.
describe('one-way random-effects fits reproduce published examples', () => {
  it('rails (Devore 2000): REML between SD 24.805, within SD 4.0208, mean 66.5 (SE 10.171), logLik −61.0885', () => {
    const f = fitRandomIntercept(oneWay(RAILS), opts('reml'));
    expect(f.status).toBe('converged');
    expect(Math.abs(Math.sqrt(f.variance.subject) - 24.805)).toBeLessThan(5e-4);
    expect(Math.abs(Math.sqrt(f.variance.residual) - 4.0208)).toBeLessThan(5e-5);
    expect(Math.abs(f.fixedEffects[0]!.estimate - 66.5)).toBeLessThan(5e-2);
    expect(Math.abs(f.fixedEffects[0]!.se - 10.171)).toBeLessThan(5e-4);
    expect(Math.abs(f.logLik - -61.0885)).toBeLessThan(5e-5);
  });
  it('rails (Devore 2000): ML logLik −64.2800', () => {
    const f = fitRandomIntercept(oneWay(RAILS), opts('ml'));
    expect(Math.abs(f.logLik - -64.28)).toBeLessThan(5e-5);
  });
  it('dyestuff (Davies 1947): REML between 1764.05, within 2451.25, mean 1527.5 (SE 19.383), logLik −159.827', () => {
    const f = fitRandomIntercept(oneWay(DYESTUFF), opts('reml'));
    expect(Math.abs(f.variance.subject - 1764.05)).toBeLessThan(5e-3);
    expect(Math.abs(f.variance.residual - 2451.25)).toBeLessThan(5e-3);
    expect(Math.abs(f.fixedEffects[0]!.estimate - 1527.5)).toBeLessThan(5e-2);
    expect(Math.abs(f.fixedEffects[0]!.se - 19.383)).toBeLessThan(5e-4);
    expect(Math.abs(f.logLik - -159.827)).toBeLessThan(5e-4);
  });
  it('dyestuff (Davies 1947): ML between 1388.33, logLik −163.664', () => {
    const f = fitRandomIntercept(oneWay(DYESTUFF), opts('ml'));
    expect(Math.abs(f.variance.subject - 1388.33)).toBeLessThan(5e-3);
    expect(Math.abs(f.logLik - -163.664)).toBeLessThan(5e-4);
  });
  it('the balanced one-way ICC interval is the exact F-based one (Searle 1971): rails 0.9744 (0.9051, 0.9960)', () => {
    const v = fitRandomIntercept(oneWay(RAILS), opts('reml')).variance;
    expect(Math.abs(v.icc - 0.9744)).toBeLessThan(5e-5);
    expect(Math.abs(v.iccLower - 0.9051)).toBeLessThan(5e-5);
    expect(Math.abs(v.iccUpper - 0.996)).toBeLessThan(5e-5);
  });
  it('the balanced one-way ICC interval is the exact F-based one (Searle 1971): dyestuff 0.4185 (0.0838, 0.8479)', () => {
    const v = fitRandomIntercept(oneWay(DYESTUFF), opts('reml')).variance;
    expect(Math.abs(v.icc - 0.4185)).toBeLessThan(5e-5);
    expect(Math.abs(v.iccLower - 0.0838)).toBeLessThan(5e-5);
    expect(Math.abs(v.iccUpper - 0.8479)).toBeLessThan(5e-5);
  });
  it('in balanced one-way data the intercept df is (subjects − 1) by Kenward–Roger (exact identity: the F test on group means)', () => {
    const f = fitRandomIntercept(oneWay(RAILS), opts('reml'));
    expect(f.fixedEffects[0]!.df).toBeCloseTo(5, 8); // 1e-8: the optimiser's stopping rule leaves ~1e-12 in γ
  });
});
