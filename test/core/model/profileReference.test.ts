/**
 * The profile-likelihood intervals against an outside reference: test/reference/profile-intervals.json, written by
 * test/reference/profile_intervals.py with Debian's python3 (numpy, scipy) from a likelihood written there from its
 * textbook form (Harville 1977) and evaluated densely, the nuisance variance maximised out by scipy's bounded scalar
 * minimiser and the limits found by scipy's Brent root finder. Invented data, stored in the fixture.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type FitMethod, type ModelData } from '../../../src/core/model';
import { fitOptions } from './helpers';

interface Case {
  readonly name: string;
  readonly data: { y: number[]; time: number[]; subject: number[]; arm: number[]; nSubjects: number };
  readonly reference: {
    method: FitMethod;
    s2u: number;
    s2: number;
    logLikDifferenceToZero: number;
    subject: [number, number];
    residual: [number, number];
    ratio: [number, number];
  };
}

const fixture = JSON.parse(readFileSync(join(__dirname, '../../reference/profile-intervals.json'), 'utf8')) as { cases: Case[] };

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('profile-likelihood intervals against the committed numpy/scipy reference (test/reference/profile_intervals.py)', () => {
  it('the fixture holds the three invented cases', () => {
    expect(fixture.cases.map((c) => c.name)).toEqual(['moderate ICC, dropout, REML', 'moderate ICC, dropout, ML', 'small ICC, 15 per arm, REML']);
  });
  for (const c of fixture.cases) {
    it(`${c.name}: estimates, zero-test statistic and the limits of σ²_u, σ² and the ICC agree (estimates 1e-6, limits 1e-10 relative)`, () => {
      const d: ModelData = {
        y: Float64Array.from(c.data.y),
        time: Float64Array.from(c.data.time),
        subject: Int32Array.from(c.data.subject),
        nSubjects: c.data.nSubjects,
        armIndex: Int32Array.from(c.data.arm),
        arms: ['Placebo', 'Drug'],
        covariates: [],
      };
      const r = c.reference;
      const v = fitRandomIntercept(d, fitOptions({ method: r.method })).variance;
      // Estimates 1e-6 relative: the reference finds them by nested bounded scalar minimisations (1e-11 in a
      // log-variance each), which leave ~1e-7 in the variances (observed 2e-8 to 9e-8).
      expect(rel(v.subject, r.s2u)).toBeLessThan(1e-6);
      expect(rel(v.residual, r.s2)).toBeLessThan(1e-6);
      // Limits 1e-10 relative and the statistic 1e-9 absolute: both sides solve the likelihood-ratio equation to
      // ~1e-14 in log θ on likelihoods accurate to ~1e-12, and the estimates' small error does not move ℓ̂ (ℓ is
      // stationary there); observed agreement 1e-14 relative, 2e-13 in the statistic.
      expect(Math.abs(v.zeroTest!.statistic - r.logLikDifferenceToZero)).toBeLessThan(1e-9);
      expect(rel(v.subjectLower, r.subject[0])).toBeLessThan(1e-10);
      expect(rel(v.subjectUpper, r.subject[1])).toBeLessThan(1e-10);
      expect(rel(v.residualLower, r.residual[0])).toBeLessThan(1e-10);
      expect(rel(v.residualUpper, r.residual[1])).toBeLessThan(1e-10);
      expect(rel(v.iccLower, r.ratio[0] / (1 + r.ratio[0]))).toBeLessThan(1e-10);
      expect(rel(v.iccUpper, r.ratio[1] / (1 + r.ratio[1]))).toBeLessThan(1e-10);
    });
  }
});
