/**
 * Exact identities of the random intercept and slope model and its likelihood-ratio test.
 */
import { describe, expect, it } from 'vitest';
import type { ModelData } from '../../../../src/core/model';
import { buildDesign } from '../../../../src/core/model/design';
import { profileAt } from '../../../../src/core/model/likelihood';
import { fitRandomSlope, mixtureUpperTail, slopeTest } from '../../../../src/core/model/slope';
import { slopeProfile } from '../../../../src/core/model/slope/profile';
import { slopeSums } from '../../../../src/core/model/slope/sums';
import { sufficientStats } from '../../../../src/core/model/sufficient';
import { fitOptions, normals, seeded } from '../helpers';

/** Invented data: m participants, two arms alternating, visits at `times` (all alike) unless `jitter`, some dropout. */
function trial(m: number, times: readonly number[], seed: number, jitter = false): ModelData {
  const u = seeded(seed);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < m; i++) {
    const a = i % 2;
    const u0 = 5 * z();
    const u1 = 0.3 * u0 / 5 + 0.6 * z();
    const nv = jitter && u() < 0.3 ? 1 + Math.floor(u() * (times.length - 1)) : times.length;
    for (let v = 0; v < nv; v++) {
      const t = times[v]! + (jitter && v > 0 ? 0.2 * z() : 0);
      y.push(60 - 0.5 * t + a * (1 + 0.3 * t) + u0 + u1 * t + 2 * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: m, armIndex: Int32Array.from(arm), arms: ['Placebo', 'Drug'], covariates: [] };
}

describe('exact identities of the slope model', () => {
  it('with the slope variance and the covariance fixed at 0, the slope likelihood is the random-intercept likelihood (REML and ML)', () => {
    // Exact identity: G = [[γσ², 0], [0, 0]] makes V_i = σ²(I + γJ), the random-intercept model's V_i.
    const data = trial(14, [0, 3, 6, 9, 12], 5, true);
    const design = buildDesign(data, false);
    const sums = slopeSums(data, design);
    const st = sufficientStats(data.y, data.subject, data.nSubjects, design, data.time);
    for (const method of ['reml', 'ml'] as const) {
      for (const gamma of [0, 0.3, 2.5, 40]) {
        const a = slopeProfile(sums, [gamma, 0, 0], method, false)!;
        const b = profileAt(st, gamma, method)!;
        // Two routes to the same sums of about 60 terms: agreement to rounding (1e-10 relative).
        expect(Math.abs(a.logLik - b.logLik)).toBeLessThan(1e-10 * Math.abs(b.logLik));
        expect(Math.abs(a.sigma2 - b.sigma2)).toBeLessThan(1e-10 * b.sigma2);
        a.beta.forEach((v, j) => expect(Math.abs(v - b.beta[j]!)).toBeLessThan(1e-10 * (1 + Math.abs(b.beta[j]!))));
      }
    }
  });

  it('balanced design, same times for everyone: Kenward–Roger df and SEs equal the exact two-sample t test on per-participant summaries', () => {
    // Exact identity (the summary-statistic argument; Kenward & Roger 1997 show their method reproduces such exact
    // tests): with Z_i = Z for all i, each participant's least-squares intercept and slope are independent across
    // participants with a common covariance G + σ²(Z'Z)⁻¹, so a contrast of the arm terms (at any time) is a
    // two-sample comparison of per-participant summaries with m − 2 degrees of freedom, its SE from the pooled sample
    // variance. Between-participant (arm at time 0) and within-participant (time × arm) contrasts alike.
    const times = [0, 3, 6, 9, 12];
    const m = 16;
    const data = trial(m, times, 21);
    const fit = fitRandomSlope(data, fitOptions({ contrastDays: [{ label: 'Week 26', day: 183 }] }));
    expect(fit.status).toBe('converged');
    // Per-participant least-squares intercept and slope.
    const tbar = times.reduce((s, t) => s + t, 0) / times.length;
    const stt = times.reduce((s, t) => s + (t - tbar) ** 2, 0);
    const summaries = Array.from({ length: m }, (_, i) => {
      const ys = times.map((_, v) => data.y[i * times.length + v]!);
      const ybar = ys.reduce((s, v) => s + v, 0) / ys.length;
      const slope = ys.reduce((s, v, k) => s + v * (times[k]! - tbar), 0) / stt;
      return { arm: i % 2, intercept: ybar - slope * tbar, slope };
    });
    const twoSample = (value: (s: (typeof summaries)[number]) => number): { diff: number; se: number } => {
      const g = [0, 1].map((a) => summaries.filter((s) => s.arm === a).map(value));
      const mean = g.map((v) => v.reduce((s, x) => s + x, 0) / v.length);
      const ss = g.reduce((s, v, a) => s + v.reduce((t, x) => t + (x - mean[a]!) ** 2, 0), 0);
      const pooled = ss / (m - 2);
      return { diff: mean[1]! - mean[0]!, se: Math.sqrt(pooled * (1 / g[0]!.length + 1 / g[1]!.length)) };
    };
    const t183 = (183 - 1) / 30.4375;
    const exact = {
      arm: twoSample((s) => s.intercept),
      armTime: twoSample((s) => s.slope),
      atDay: twoSample((s) => s.intercept + t183 * s.slope),
    };
    const armTerm = fit.fixedEffects[1]!;
    const armTimeTerm = fit.fixedEffects[3]!;
    const atDay = fit.treatmentEffects[0]!;
    for (const [r, e] of [[armTerm, exact.arm], [armTimeTerm, exact.armTime], [atDay, exact.atDay]] as const) {
      // Rounding only: the optimiser's stopping point moves G by ~1e-8 relative, which the df and SE inherit.
      expect(Math.abs(r.df - (m - 2))).toBeLessThan(1e-5);
      expect(Math.abs(r.estimate - e.diff)).toBeLessThan(1e-9 * (1 + Math.abs(e.diff)));
      expect(Math.abs(r.se - e.se)).toBeLessThan(1e-6 * e.se);
    }
  });

  it('the 50:50 mixture of χ²₁ and χ²₂ has its 5% critical value at 5.14 (Stram & Lee 1994, table)', () => {
    let lo = 1;
    let hi = 10;
    for (let k = 0; k < 100; k++) {
      const mid = (lo + hi) / 2;
      if (mixtureUpperTail(mid) > 0.05) lo = mid;
      else hi = mid;
    }
    // The table gives two decimals.
    expect(Math.abs(lo - 5.14)).toBeLessThan(0.005);
    // And the two halves: at 3.84 (χ²₁'s 5% point) and 5.99 (χ²₂'s) the mixture lies between them.
    expect(mixtureUpperTail(3.841459)).toBeCloseTo(0.5 * 0.05 + 0.5 * Math.exp(-3.841459 / 2), 6);
    expect(mixtureUpperTail(0)).toBe(1);
  });

  it('slopeTest states the answer in plain words at the chosen level', () => {
    const yes = slopeTest(-120, -125, 0.95);
    expect(yes.statistic).toBe(10);
    expect(yes.df).toBe('mixture 1:2');
    expect(yes.p).toBeCloseTo(0.5 * 0.0015654022580025 + 0.5 * Math.exp(-5), 8); // χ²₁ tail at 10 (closed form 2Φ̄(√10))
    expect(yes.sentence).toMatch(/^Participants differ in their rate of change: yes at the 95% level/);
    const no = slopeTest(-124.9, -125, 0.95);
    expect(no.differ).toBe(false);
    expect(no.sentence).toMatch(/: no at the 95% level/);
    // A slope fit a hair below the intercept fit (rounding) gives statistic 0 and p = 1.
    expect(slopeTest(-125.0000001, -125, 0.9).p).toBe(1);
  });
});
