import { describe, expect, it } from 'vitest';
import { chiSquareQuantile, DegenerateDataError, fitRandomIntercept, tQuantile, type ModelData } from '../../../src/core/model';
import { balancedAnova, DYESTUFF, fitOptions, normals, oneWay, oneWayOptions, RAILS, seeded } from './helpers';

const oneWayOpts = oneWayOptions();

/** |actual − expected| ≤ tol · |expected|: a relative check for values whose size varies (8 to 24000 here). */
function expectRelClose(actual: number, expected: number, tol: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));
}

describe('variance-component intervals', () => {
  for (const [name, groups] of [['rails (Devore 2000)', RAILS], ['dyestuff (Davies 1947)', DYESTUFF]] as const) {
    it(`${name}: the within-participant interval is the exact chi-square interval SSW/χ²(N − a) (Searle 1971, exact identity)`, () => {
      const v = fitRandomIntercept(oneWay(groups), oneWayOpts).variance;
      const { msw, a, n } = balancedAnova(groups);
      const nu = a * (n - 1);
      // Relative 1e-9: in balanced data W_22 = 2σ⁴/(N − a) exactly and the REML σ² equals MSW at the optimum, so only
      // the optimiser's stopping rule on log γ (about 1e-12, carried into σ² at that relative size) and rounding
      // separate the two; both limits are about 1e-13 relative apart on these data.
      expectRelClose(v.residualLower, (nu * msw) / chiSquareQuantile(0.975, nu), 1e-9);
      expectRelClose(v.residualUpper, (nu * msw) / chiSquareQuantile(0.025, nu), 1e-9);
    });
  }
  it('rails (Devore 2000): the within-participant interval 8.313 to 44.05 would be 7.26 to 35.99 by a log-scale Wald interval', () => {
    // Documents the choice: the Wald log-scale interval σ² exp(±1.96 √(2/12)) is 13% low at the bottom and 18% low
    // at the top against the exact chi-square interval, which the scaled chi-square method reproduces.
    const v = fitRandomIntercept(oneWay(RAILS), oneWayOpts).variance;
    const wald = [v.residual * Math.exp(-1.959964 * Math.sqrt(2 / 12)), v.residual * Math.exp(1.959964 * Math.sqrt(2 / 12))];
    expect(Math.abs(v.residualLower - 8.313)).toBeLessThan(5e-4); // 194/χ²(0.975; 12), rounded to 3 decimals
    // Bounds just above the worked ratios 0.87 and 0.82 (by hand from the exact and Wald limits).
    expect(wald[0]! / v.residualLower).toBeLessThan(0.9);
    expect(wald[1]! / v.residualUpper).toBeLessThan(0.85);
  });
});

/** Invented two-arm data, unbalanced visits, 40 participants (eGFR-like values). */
function twoArm(): ModelData {
  const u = seeded(3);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 40; i++) {
    const a = i % 2;
    const ui = 8 * z();
    const visits = 2 + Math.floor(u() * 4);
    for (let j = 0; j < visits; j++) {
      const t = j * 2.76 + 0.3 * z();
      y.push(60 + ui - 0.4 * t + a * 0.25 * t + 3 * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: 40, armIndex: Int32Array.from(arm), arms: ['Placebo', 'Drug'], covariates: [] };
}

describe('contrasts, trajectories, AIC and BIC', () => {
  const d = twoArm();
  const opts = fitOptions({ level: 0.9, contrastDays: [{ label: 'Week 12', day: 85 }, { label: 'Week 48', day: 337 }] });
  const fit = fitRandomIntercept(d, opts);

  it('the treatment difference at a day is the arm term plus time × the arm-by-time term, time = (day − 1)/30.4375', () => {
    const b = fit.fixedEffects;
    for (const te of fit.treatmentEffects) {
      // 30.4375 = 365.25/12 days per month (common practice).
      expect(te.time).toBe((te.day - 1) / 30.4375);
      // Exact identities; absolute 5e-11 (10 digits) on values of order 1–10 leaves only a few products' rounding.
      expect(te.estimate).toBeCloseTo(b[1]!.estimate + te.time * b[3]!.estimate, 10);
      // The interval is estimate ± t(0.95; df)·SE at level 0.9.
      expect(te.upper - te.estimate).toBeCloseTo(tQuantile(0.95, te.df) * te.se, 10);
    }
    expect(fit.slopeDifferences[0]!.estimate).toBe(b[3]!.estimate);
    expect(fit.jointTest).toBeNull();
  });

  it('trajectories: the arm curves differ by the treatment effect at every grid time (exact identity)', () => {
    const [ref, drug] = fit.trajectories;
    expect(ref!.arm).toBe('Placebo');
    expect(drug!.arm).toBe('Drug');
    const b = fit.fixedEffects;
    // Exact identities; absolute 5e-10 (9 digits) on means of order 60 and days up to about 340: rounding of a few
    // products and sums only (about 340 · 2.2e-16 ≈ 1e-13).
    ref!.time.forEach((t, g) => {
      expect(ref!.mean[g]).toBeCloseTo(b[0]!.estimate + t * b[2]!.estimate, 9);
      expect(drug!.mean[g]! - ref!.mean[g]!).toBeCloseTo(b[1]!.estimate + t * b[3]!.estimate, 9);
      // Study day of the grid point's calendar offset t·30.4375 (CDISC SDTM IG: offset + 1 from the reference date on, the offset before it).
      expect(ref!.day[g]).toBeCloseTo(t >= 0 ? 1 + t * 30.4375 : t * 30.4375, 9);
      expect(ref!.lower[g]!).toBeLessThan(ref!.mean[g]!);
    });
    expect(ref!.time.length).toBe(25);
    // The grid runs from the earlier of 0 and the first observed time to the later of the last observed time and the last contrast time.
    expect(ref!.time[0]).toBe(Math.min(0, Math.min(...d.time)));
    expect(ref!.time[24]).toBe(Math.max(Math.max(...d.time), 336 / 30.4375));
  });

  it('AIC = −2ℓ + 2(p + 2) and BIC = −2ℓ + (p + 2) log(N − p) for REML; BIC uses N for ML', () => {
    const p = fit.fixedEffects.length;
    expect(fit.nParameters).toBe(p + 2);
    expect(fit.bicN).toBe(d.y.length - p);
    // AIC = −2ℓ + 2k (Akaike 1974); BIC = −2ℓ + k·log N (Schwarz 1978), with N = n − p for REML (a common convention, from memory).
    // Same formula by hand; absolute 5e-11 (10 digits) on criteria of order 1000 leaves only rounding (about 1e-13).
    expect(fit.aic).toBeCloseTo(-2 * fit.logLik + 2 * (p + 2), 10);
    expect(fit.bic).toBeCloseTo(-2 * fit.logLik + (p + 2) * Math.log(d.y.length - p), 10);
    const ml = fitRandomIntercept(d, { ...opts, method: 'ml' });
    expect(ml.bicN).toBe(d.y.length);
  });

  it('blinded data give intercept and time only, one pooled trajectory, and no treatment contrasts', () => {
    const blind = fitRandomIntercept({ ...d, armIndex: null, arms: [] }, opts);
    expect(blind.terms.map((t) => t.kind)).toEqual(['intercept', 'time']);
    expect(blind.treatmentEffects).toEqual([]);
    expect(blind.trajectories.length).toBe(1);
    expect(blind.trajectories[0]!.arm).toBeNull();
    expect(blind.variance.iccLower).toBeLessThan(blind.variance.icc);
    expect(blind.variance.iccUpper).toBeGreaterThan(blind.variance.icc);
  });

  it('every subject gets a BLUP; BLUPs shrink subject mean residuals toward zero (exact identity |û_i| < |ē_i|)', () => {
    expect(fit.subjects.length).toBe(40);
    for (const s of fit.subjects) {
      const raw = s.blup + s.meanResidual; // (t_i − s_i'β)/n_i
      // û_i = n_iγ/(1 + n_iγ) · ē_i with a factor below 1, so the inequality is strict in exact arithmetic; the absolute
      // 1e-12 slack only absorbs rounding in sums of n_i ≤ 5 values of order 60 (about 60 · 5 · 2.2e-16 ≈ 7e-14).
      expect(Math.abs(s.blup)).toBeLessThanOrEqual(Math.abs(raw) + 1e-12);
    }
  });

  it('one measurement per participant everywhere gives no model (DegenerateDataError) with a plain reason, never a between-participant variance of zero', () => {
    const single: ModelData = { y: Float64Array.of(1, 2, 4, 3, 5), time: Float64Array.of(0, 1, 2, 3, 4), subject: Int32Array.of(0, 1, 2, 3, 4), nSubjects: 5, armIndex: null, arms: [], covariates: [] };
    expect(() => fitRandomIntercept(single, { ...opts, contrastDays: [] })).toThrow(DegenerateDataError);
    expect(() => fitRandomIntercept(single, { ...opts, contrastDays: [] })).toThrow(/no participant has more than one measurement/);
  });

  it('unbalanced data at the zero boundary: both lower limits are 0, the zero test is 0 with p = 1, the upper limits are finite', () => {
    // Invented one-way data with equal group means (5.5) and unequal group sizes, so the REML between-participant variance
    // is 0 and the balanced exact interval does not apply; the upper limits' likelihood-ratio equation is checked against
    // a dense likelihood in profileIntervals.test.ts.
    const f = fitRandomIntercept(oneWay([[1, 10], [2, 9, 5.5], [3, 8], [4, 7, 5.5, 5.5]]), oneWayOpts);
    expect(f.status).toBe('boundary');
    const v = f.variance;
    expect(v.iccLower).toBe(0);
    expect(v.subjectLower).toBe(0);
    expect(v.zeroTest).toEqual({ statistic: 0, p: 1 });
    expect(v.subjectUpper).toBeGreaterThan(0);
    expect(Number.isFinite(v.subjectUpper)).toBe(true);
    expect(v.iccUpper).toBeGreaterThan(0);
    expect(v.iccUpper).toBeLessThan(1);
    expect(v.intervalMethod).toMatch(/mixture of chi-square distributions with 0 and 1 degrees of freedom/);
  });
});
