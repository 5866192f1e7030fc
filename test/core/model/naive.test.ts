/**
 * The naive least-squares fit beside the mixed model (naive.ts): checked against the normal equations solved densely
 * on the full design matrix (exact identity: β = (X'X)⁻¹X'y, s² = RSS/(N − p), Cov = s²(X'X)⁻¹; e.g. Draper & Smith
 * 1998, Applied Regression Analysis, ch. 5), and for the SE pattern that motivates the mixed model on invented
 * high-ICC data (ignoring the correlation makes between-participant SEs too small and within-participant SEs too large;
 * common practice, from memory).
 */
import fc from 'fast-check';
import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { fitOptions, normals, seeded } from './helpers';

/** Invented unbalanced data: 2 arms, visits at irregular times, some missing, a numeric covariate. */
function invented(seed: number, perArm: number, visits: number, subjectSd: number, withinSd: number): ModelData {
  const u = seeded(seed);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [], cov: number[] = [];
  for (let i = 0; i < 2 * perArm; i++) {
    const a = i % 2;
    const b = subjectSd * z();
    const base = 40 + 4 * z();
    let kept = 0;
    for (let v = 0; v < visits; v++) {
      if (kept >= 2 && u() < 0.15) continue; // an occasional missed visit, keeping at least two per participant
      const t = v * 3 + (u() - 0.5);
      y.push(100 + 3 * a - 1.2 * t + 0.6 * a * t + 0.2 * base + b + withinSd * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
      cov.push(base);
      kept++;
    }
  }
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: 2 * perArm,
    armIndex: Int32Array.from(arm),
    arms: ['Placebo', 'Active'],
    covariates: [{ name: 'Baseline', kind: 'numeric', values: Float64Array.from(cov) }],
  };
}

describe('naiveFit equals ordinary least squares by the normal equations (exact identity)', () => {
  const d = invented(7, 6, 5, 5, 2);
  const fit = fitRandomIntercept(d, fitOptions());
  const X = new Matrix(Array.from(d.y, (_, r) => {
    const a = d.armIndex![r]!;
    const t = d.time[r]!;
    return [1, a, t, a * t, d.covariates[0]!.values[r] as number];
  }));
  const yv = Matrix.columnVector(Array.from(d.y));
  const xtxInv = inverse(X.transpose().mmul(X));
  const beta = xtxInv.mmul(X.transpose().mmul(yv));
  const res = yv.sub(X.mmul(beta));
  const N = d.y.length;
  const s2 = res.transpose().mmul(res).get(0, 0) / (N - 5);

  it('gives the least-squares estimates, s² = RSS/(N − p) and SE = sqrt(s² (X\'X)⁻¹) for every term', () => {
    const naive = fit.naive!;
    expect(naive.df).toBe(N - 5);
    // 1e-9 relative: both routes are exact in exact arithmetic; X'X here has a condition number of about 1e5, so
    // rounding leaves well under 1e-9 of each number.
    expect(Math.abs(naive.residualVariance - s2) / s2).toBeLessThan(1e-9);
    naive.fixedEffects.forEach((f, j) => {
      const se = Math.sqrt(s2 * xtxInv.get(j, j));
      expect(Math.abs(f.estimate - beta.get(j, 0))).toBeLessThan(1e-9 * (Math.abs(beta.get(j, 0)) + se));
      expect(Math.abs(f.se - se) / se).toBeLessThan(1e-9);
      expect(f.df).toBe(N - 5);
      expect(f.seRatio).toBeCloseTo(f.se / fit.fixedEffects[j]!.se, 12); // the definition, rounding only
    });
  });

  it('marks intercept, arm and the once-measured covariate as between-participant terms, time terms as within', () => {
    expect(fit.naive!.fixedEffects.map((f) => f.between)).toEqual([true, true, false, false, true]);
  });

  it('does not change the mixed model’s own numbers', () => {
    const again = fitRandomIntercept(d, fitOptions());
    expect(again.fixedEffects).toEqual(fit.fixedEffects);
  });
});

describe('with a high ICC the naive SE is too small for the arm and too large for time (property, invented data)', () => {
  it('arm SE ratio < 1 and time SE ratio > 1 whenever the participant SD is at least 4 times the within SD', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1_000_000 }),
        fc.integer({ min: 4, max: 12 }),
        fc.integer({ min: 3, max: 6 }),
        fc.double({ min: 4, max: 20, noNaN: true }),
        (seed, perArm, visits, subjectSd) => {
          const fit = fitRandomIntercept(invented(seed, perArm, visits, subjectSd, 1), fitOptions());
          const byKind = (k: string): number => fit.naive!.fixedEffects.find((f) => f.kind === k)!.seRatio;
          expect(byKind('arm')).toBeLessThan(1);
          expect(byKind('time')).toBeGreaterThan(1);
          expect(byKind('armTime')).toBeGreaterThan(1);
        },
      ),
      { numRuns: 40, seed: 20250601 },
    );
  });
});

describe('naiveFit of the intercept alone', () => {
  it('is the sample mean with SE sqrt(s²/N), s² the sample variance (exact identity)', () => {
    const d: ModelData = { y: Float64Array.of(1, 2, 5, 7), time: new Float64Array(4), subject: Int32Array.of(0, 0, 1, 1), nSubjects: 2, armIndex: null, arms: [], covariates: [] };
    const fit = fitRandomIntercept(d, fitOptions({ design: 'intercept-only' }));
    // Exact: mean 3.75, s² = Σ(y − 3.75)² / 3 = 22.75 / 3, SE = sqrt(s²/4).
    expect(fit.naive!.fixedEffects[0]!.estimate).toBeCloseTo(3.75, 12);
    expect(fit.naive!.fixedEffects[0]!.se).toBeCloseTo(Math.sqrt(22.75 / 3 / 4), 12);
  });
});
