/**
 * The allocation-free likelihood pieces of the profile intervals (profilePieces.ts) against the fit's own likelihood
 * (likelihood.ts, itself checked against dense likelihoods and published values in published.test.ts) and their
 * analytic derivatives against central differences (identity checks).
 */
import { describe, expect, it } from 'vitest';
import { buildDesign } from '../../../src/core/model/design';
import { profileAt } from '../../../src/core/model/likelihood';
import { piecesEvaluator } from '../../../src/core/model/profilePieces';
import { sufficientStats } from '../../../src/core/model/sufficient';
import type { ModelData } from '../../../src/core/model';
import { normals, seeded } from './helpers';

/** Invented two-arm data with 2–5 visits per participant (several cluster sizes). */
function data(): ModelData {
  const u = seeded(42);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 30; i++) {
    const ui = 3 * z();
    const visits = 2 + Math.floor(u() * 4);
    for (let j = 0; j < visits; j++) {
      const t = 2.76 * j + 0.2 * z();
      y.push(5 + ui - 0.3 * t + (i % 2) * 0.2 * t + 2 * z());
      time.push(t);
      subject.push(i);
      arm.push(i % 2);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: 30, armIndex: Int32Array.from(arm), arms: ['A', 'B'], covariates: [] };
}

describe('profilePieces', () => {
  const d = data();
  const st = sufficientStats(d.y, d.subject, d.nSubjects, buildDesign(d, false), d.time);
  for (const method of ['reml', 'ml'] as const) {
    const ev = piecesEvaluator(st, method);
    it(`${method}: ℓ_p(γ) equals likelihood.ts and ℓ(γ, σ̂²_γ) equals ℓ_p(γ) (σ² maximised out in closed form)`, () => {
      for (const g of [0, 0.05, 0.7, 3, 40]) {
        const pt = profileAt(st, g, method)!;
        // 1e-11 absolute on ℓ ≈ −200: the same sums in a different order, rounding only.
        expect(Math.abs(ev.ratio(g) - pt.logLik)).toBeLessThan(1e-11);
        expect(Math.abs(ev.full(g, pt.sigma2) - pt.logLik)).toBeLessThan(1e-11);
        expect(ev.full(g, 1.3 * pt.sigma2)).toBeLessThan(pt.logLik);
      }
    });
    it(`${method}: the analytic ∂ℓ/∂γ and ∂ℓ/∂σ² match central differences`, () => {
      for (const [g, s2] of [[0.05, 3], [0.7, 4], [3, 6]] as const) {
        const f = ev.fullSlope(g, s2);
        const [dg, ds] = [ev.slope[0]!, ev.slope[1]!];
        expect(f).toBe(ev.full(g, s2));
        const h = 1e-5 * g;
        const k = 1e-5 * s2;
        const cg = (ev.full(g + h, s2) - ev.full(g - h, s2)) / (2 * h);
        const cs = (ev.full(g, s2 + k) - ev.full(g, s2 - k)) / (2 * k);
        // 1e-6 relative: central differences with a step of 1e-5 relative have truncation error ~1e-10 relative and
        // rounding error ~ε|ℓ|/h ≈ 1e-7 relative on ℓ ≈ −200.
        expect(Math.abs(dg - cg)).toBeLessThan(1e-6 * Math.max(1, Math.abs(cg)));
        expect(Math.abs(ds - cs)).toBeLessThan(1e-6 * Math.max(1, Math.abs(cs)));
      }
    });
  }
});
