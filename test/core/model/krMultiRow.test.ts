/**
 * The Kenward–Roger F approximation for several rows, checked on unbalanced three-arm data against the formulas of
 * Kenward & Roger (1997, Biometrics 53:983–997) evaluated here with dense n x n matrices (ml-matrix).
 */
import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { normals, seeded } from './helpers';

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
    const fit = fitRandomIntercept(d, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'month', contrastDays: [] });
    expect(fit.status).toBe('converged');
    const N = d.y.length;
    const X = new Matrix(Array.from({ length: N }, (_, r) => {
      const a = d.armIndex![r]!;
      const t = d.time[r]!;
      return [1, a === 1 ? 1 : 0, a === 2 ? 1 : 0, t, a === 1 ? t : 0, a === 2 ? t : 0];
    }));
    const p = 6;
    const V1 = new Matrix(N, N);
    for (let i = 0; i < N; i++) for (let j = 0; j < N; j++) V1.set(i, j, d.subject[i] === d.subject[j] ? 1 : 0);
    const V2 = Matrix.eye(N);
    const V = V1.clone().mul(fit.variance.subject).add(V2.clone().mul(fit.variance.residual));
    const Vi = inverse(V);
    const Phi = inverse(X.transpose().mmul(Vi).mmul(X));
    const Vr = [V1, V2];
    const P = Vr.map((v) => X.transpose().mmul(Vi).mmul(v).mmul(Vi).mmul(X));
    const Q = (r: number, s: number): Matrix => X.transpose().mmul(Vi).mmul(Vr[r]!).mmul(Vi).mmul(Vr[s]!).mmul(Vi).mmul(X);
    const Pp = Vi.clone().sub(Vi.mmul(X).mmul(Phi).mmul(X.transpose()).mmul(Vi));
    const I = new Matrix(2, 2);
    for (let r = 0; r < 2; r++) for (let s = 0; s < 2; s++) I.set(r, s, 0.5 * Pp.mmul(Vr[r]!).mmul(Pp).mmul(Vr[s]!).trace());
    const W = inverse(I);
    const inner = Matrix.zeros(p, p);
    for (let r = 0; r < 2; r++) for (let s = 0; s < 2; s++) inner.add(Q(r, s).sub(P[r]!.mmul(Phi).mmul(P[s]!)).mul(W.get(r, s)));
    const PhiA = Phi.clone().add(Phi.mmul(inner).mmul(Phi).mul(2));
    const L = new Matrix([[0, 0, 0, 0, 1, 0], [0, 0, 0, 0, 0, 1]]);
    const ell = 2;
    const beta = Matrix.columnVector(fit.fixedEffects.map((f) => f.estimate));
    const Lb = L.mmul(beta);
    const F = Lb.transpose().mmul(inverse(L.mmul(PhiA).mmul(L.transpose()))).mmul(Lb).get(0, 0) / ell;
    const Theta = L.transpose().mmul(inverse(L.mmul(Phi).mmul(L.transpose()))).mmul(L);
    let A1 = 0;
    let A2 = 0;
    for (let r = 0; r < 2; r++) {
      for (let s = 0; s < 2; s++) {
        const Mr = Theta.mmul(Phi).mmul(P[r]!).mmul(Phi);
        const Ms = Theta.mmul(Phi).mmul(P[s]!).mmul(Phi);
        A1 += W.get(r, s) * Mr.trace() * Ms.trace();
        A2 += W.get(r, s) * Mr.mmul(Ms).trace();
      }
    }
    const B = (A1 + 6 * A2) / (2 * ell);
    const g = ((ell + 1) * A1 - (ell + 4) * A2) / ((ell + 2) * A2);
    const den = 3 * ell + 2 * (1 - g);
    const [c1, c2, c3] = [g / den, (ell - g) / den, (ell + 2 - g) / den];
    const E = 1 / (1 - A2 / ell);
    const Vs = (2 / ell) * ((1 + c1 * B) / ((1 - c2 * B) ** 2 * (1 - c3 * B)));
    const rho = Vs / (2 * E * E);
    const m = 4 + (ell + 2) / (ell * rho - 1);
    const lambda = m / (E * (m - 2));
    const jt = fit.jointTest!;
    // Relative 1e-7: identical formulas, the dense route losing a few digits in n x n inverses.
    expect(Math.abs(jt.denDf - m) / m).toBeLessThan(1e-7);
    expect(Math.abs(jt.F - lambda * F) / (lambda * F)).toBeLessThan(1e-7);
    expect(lambda).not.toBe(1); // unbalanced: the scale is a real adjustment here
  });
});
