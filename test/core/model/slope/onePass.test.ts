/**
 * The one-pass likelihood and gradient of the slope model (grouped layout, profile.ts) against the two-pass route.
 * Exact identity: with v_i = w_i − K_iδ_a the expansion Σ vv' = Σ ww' − Σ (wδ'K + Kδw') + Σ KδδK is algebra, and
 * Q_i = K_i h_a K_i; so both routes give the same numbers up to rounding.
 */
import { describe, expect, it } from 'vitest';
import type { ModelData } from '../../../../src/core/model';
import { buildDesign } from '../../../../src/core/model/design';
import { slopeProfile, type RelativeG } from '../../../../src/core/model/slope/profile';
import { slopeSums } from '../../../../src/core/model/slope/sums';
import { normals, seeded } from '../helpers';

/** Invented data: m participants in three arms, visits near months 0, 3, 6, 9, 12 with jitter, some leaving early. */
function trial(m: number, seed: number): ModelData {
  const u = seeded(seed);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < m; i++) {
    const a = i % 3;
    const u0 = 5 * z();
    const u1 = 0.2 * u0 / 5 + 0.5 * z();
    const nv = u() < 0.3 ? 1 + Math.floor(u() * 4) : 5;
    for (let v = 0; v < nv; v++) {
      const t = 3 * v + (v > 0 ? 0.3 * z() : 0);
      y.push(60 - 0.5 * t + a * (1 + 0.3 * t) + u0 + u1 * t + 2 * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: m, armIndex: Int32Array.from(arm), arms: ['Placebo', 'Low', 'High'], covariates: [] };
}

describe('slope model: the one-pass gradient equals the two-pass one', () => {
  const data = trial(60, 11);
  const sums = slopeSums(data, buildDesign(data, false));
  for (const method of ['reml', 'ml'] as const) {
    it(`${method}: same value, β and gradient to 1e-9 relative, whatever β the expansion starts from`, () => {
      expect(sums.group).not.toBeNull();
      for (const D of [[0.5, 0.02, 0.05], [3, -0.4, 0.2], [0.01, 0, 0.001]] as RelativeG[]) {
        const two = slopeProfile(sums, D, method, true)!;
        for (const near of [two.beta, two.beta.map((v) => v + 0.5), new Float64Array(two.beta.length)]) {
          const one = slopeProfile(sums, D, method, true, near)!;
          expect(one.logLik).toBe(two.logLik);
          two.beta.forEach((v, j) => expect(one.beta[j]).toBe(v));
          const scale = Math.max(...two.gradient!.map(Math.abs));
          // Rounding of sums of ~250 terms, and of the expansion around a β up to 0.5 away: 1e-9 of the largest entry.
          two.gradient!.forEach((v, k) => expect(Math.abs(one.gradient![k]! - v)).toBeLessThan(1e-9 * scale));
        }
      }
    });
  }
});
