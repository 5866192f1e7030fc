/**
 * The Kenward–Roger F approximation for several rows, checked on unbalanced three-arm data against the formulas of
 * Kenward & Roger (1997, Biometrics 53:983–997) evaluated with dense n x n matrices (ml-matrix; denseKenwardRoger in
 * helpers.ts, the same evaluation the one-row check in krDense.test.ts uses).
 */
import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { denseKenwardRoger, fitOptions, normals, seeded } from './helpers';

/** Invented: 18 patients in three arms with 2–5 visits at jittered times. */
function threeArms(): ModelData {
  const u = seeded(321);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 18; i++) {
    const a = i % 3;
    const ui = 4 * z();
    const n = 2 + Math.floor(u() * 4);
    for (let j = 0; j < n; j++) {
      const t = j * 2.8 + 0.5 * u();
      y.push(50 + ui - 0.6 * t + 0.3 * a * t + 2 * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: 18, armIndex: Int32Array.from(arm), arms: ['A', 'B', 'C'], covariates: [] };
}

describe('Kenward–Roger with several rows equals the dense evaluation of the published formulas', () => {
  it('joint test of the two arm × time terms: F, scale λ and denominator df m', () => {
    const d = threeArms();
    const fit = fitRandomIntercept(d, fitOptions());
    expect(fit.status).toBe('converged');
    const N = d.y.length;
    const X = new Matrix(Array.from({ length: N }, (_, r) => {
      const a = d.armIndex![r]!;
      const t = d.time[r]!;
      return [1, a === 1 ? 1 : 0, a === 2 ? 1 : 0, t, a === 1 ? t : 0, a === 2 ? t : 0];
    }));
    const L = new Matrix([[0, 0, 0, 0, 1, 0], [0, 0, 0, 0, 0, 1]]);
    const ell = 2;
    const { phiA: PhiA, m, lambda } = denseKenwardRoger(X, Matrix.columnVector(Array.from(d.y)), d.subject, fit.variance.subject, fit.variance.residual, L);
    const beta = Matrix.columnVector(fit.fixedEffects.map((f) => f.estimate));
    const Lb = L.mmul(beta);
    const F = Lb.transpose().mmul(inverse(L.mmul(PhiA).mmul(L.transpose()))).mmul(Lb).get(0, 0) / ell;
    const jt = fit.jointTest!;
    // Relative 1e-7: identical formulas, the dense route losing a few digits in n x n inverses.
    expect(Math.abs(jt.denDf - m) / m).toBeLessThan(1e-7);
    expect(Math.abs(jt.F - lambda * F) / (lambda * F)).toBeLessThan(1e-7);
    expect(lambda).not.toBe(1); // unbalanced: the scale is a real adjustment here
  });
});
