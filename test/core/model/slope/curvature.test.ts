/**
 * The exact Hessian of the slope model's profiled likelihood (curvature.ts) against central differences of the
 * analytic gradient (profile.ts, itself checked against the dense n × n evaluation in dense.test.ts), in both layouts,
 * REML and ML; and the grouped layout's scalar loop against the general route on the same sums.
 * Tolerances: central differences with step h = 2e-6 · (1 + |D_k|) have truncation error O(h²) times the third
 * derivative and rounding error O(ε/h) times the gradient's size, about 1e-8 relative here at worst (the near-zero D, where the third derivatives are largest), so 1e-6 relative to the
 * Hessian's largest entry leaves a wide margin; the two exact routes agree to rounding (1e-10).
 */
import { describe, expect, it } from 'vitest';
import type { ModelData } from '../../../../src/core/model';
import { buildDesign } from '../../../../src/core/model/design';
import { slopeCurvature, slopeCurvatureGeneral } from '../../../../src/core/model/slope/curvature';
import { slopeProfile, type RelativeG } from '../../../../src/core/model/slope/profile';
import { slopeSums } from '../../../../src/core/model/slope/sums';
import { normals, seeded } from '../helpers';

/** Invented unbalanced data: participants with 1–6 visits at irregular times, 3 arms, an optional baseline covariate. */
function data(withCovariate: boolean, m = 23): ModelData {
  const u = seeded(17);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [], base: number[] = [];
  for (let i = 0; i < m; i++) {
    const nv = 1 + (i * 7) % 6;
    const u0 = 3 * z();
    const u1 = 0.4 * z();
    const b = 50 + 10 * u();
    for (let j = 0; j < nv; j++) {
      const t = j * 1.7 + 0.6 * u();
      y.push(60 + (withCovariate ? 0.3 * b : 0) - 0.8 * t - (i % 3) * 0.4 * t + u0 + u1 * t + z());
      time.push(t);
      subject.push(i);
      arm.push(i % 3);
      base.push(b);
    }
  }
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: m,
    armIndex: Int32Array.from(arm),
    arms: ['Placebo', 'Low', 'High'],
    covariates: withCovariate ? [{ name: 'Baseline', kind: 'numeric', values: Float64Array.from(base) }] : [],
  };
}

describe('slope model: the exact Hessian of the profiled likelihood', () => {
  for (const withCovariate of [false, true]) {
    for (const method of ['reml', 'ml'] as const) {
      for (const D of [[2.5, 0.3, 0.4], [0.7, -0.2, 0.15], [1, 0.5, 0.25], [0.01, 0, 1e-4]] as RelativeG[]) {
        it(`${withCovariate ? 'general' : 'grouped'} layout, ${method}, D = ${D.join(', ')}: gradient equals profile.ts's, Hessian equals central differences of it`, () => {
          const sums = slopeSums(data(withCovariate), buildDesign(data(withCovariate), false));
          expect(sums.group === null).toBe(withCovariate);
          const at = slopeProfile(sums, D, method, true)!;
          const c = slopeCurvature(sums, D, method, at);
          const gScale = Math.max(1, ...at.gradient!.map(Math.abs));
          for (let k = 0; k < 3; k++) expect(Math.abs(c.gradient[k]! - at.gradient![k]!)).toBeLessThan(1e-10 * gScale);
          const hScale = Math.max(...c.hessian.map(Math.abs));
          for (let l = 0; l < 3; l++) {
            const h = 2e-6 * (1 + Math.abs(D[l]!));
            const up = [...D] as [number, number, number];
            const dn = [...D] as [number, number, number];
            up[l] = up[l]! + h;
            dn[l] = dn[l]! - h;
            const gu = slopeProfile(sums, up, method, true)!.gradient!;
            const gd = slopeProfile(sums, dn, method, true)!.gradient!;
            for (let k = 0; k < 3; k++) expect(Math.abs((gu[k]! - gd[k]!) / (2 * h) - c.hessian[3 * k + l]!)).toBeLessThan(1e-6 * hScale);
          }
          if (!withCovariate) {
            const ref = slopeCurvatureGeneral(sums, D, method, at);
            for (let k = 0; k < 9; k++) expect(Math.abs(ref.hessian[k]! - c.hessian[k]!)).toBeLessThan(1e-10 * hScale);
          }
        });
      }
    }
  }
});
