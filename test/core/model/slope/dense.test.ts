/**
 * Internal cross-check of the slope model's per-participant 2 × 2 algebra against a direct dense n × n evaluation
 * written here with ml-matrix: V/σ² = H = I + Z D Z' built in full, the profiled REML and ML log-likelihoods
 * (Harville 1977, J. Am. Stat. Assoc. 72:320–338) and their gradient from the unprofiled score at σ̂²:
 *   REML ∂ℓ/∂D_k = −½ tr(P H_k) + ½ e'H⁻¹H_kH⁻¹e/σ̂²,  P = H⁻¹ − H⁻¹X(X'H⁻¹X)⁻¹X'H⁻¹,
 *   ML   ∂ℓ/∂D_k = −½ tr(H⁻¹H_k) + ½ e'H⁻¹H_kH⁻¹e/σ̂²,  H_k = Z E_k Z',
 * which at σ̂² equals the profiled gradient (σ̂² maximises over σ²). Both layouts (grouped: arms only; general: with a
 * covariate) and a singular D are checked. Tolerance 1e-8 relative: the two routes differ only by rounding in sums of
 * about 40 terms of order one, and the dense inverse of a 40 × 40 well-conditioned matrix.
 */
import { Matrix, determinant, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import type { FitMethod, ModelData } from '../../../../src/core/model';
import { buildDesign } from '../../../../src/core/model/design';
import { slopeProfile, type RelativeG } from '../../../../src/core/model/slope/profile';
import { slopeAdjustedCovariance, slopeInformation } from '../../../../src/core/model/slope/information';
import { slopeSums } from '../../../../src/core/model/slope/sums';
import { normals, seeded } from '../helpers';

/** Invented unbalanced data: 9 participants with 1–6 visits at irregular times, 2 arms, an optional baseline covariate. */
function smallData(withCovariate: boolean): ModelData {
  const u = seeded(11);
  const z = normals(u);
  const sizes = [1, 3, 6, 2, 4, 5, 3, 2, 6];
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [], base: number[] = [];
  sizes.forEach((n, i) => {
    const u0 = 3 * z();
    const u1 = 0.4 * z();
    const b = 50 + 10 * u();
    for (let j = 0; j < n; j++) {
      const t = j * 1.9 + 0.5 * u();
      y.push(60 + (withCovariate ? 0.3 * b : 0) - 0.8 * t - (i % 2) * 0.6 * t + u0 + u1 * t + z());
      time.push(t);
      subject.push(i);
      arm.push(i % 2);
      base.push(b);
    }
  });
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: sizes.length,
    armIndex: Int32Array.from(arm),
    arms: ['Placebo', 'Drug'],
    covariates: withCovariate ? [{ name: 'Baseline', kind: 'numeric', values: Float64Array.from(base) }] : [],
  };
}

function dense(data: ModelData, D: RelativeG, method: FitMethod): { logLik: number; gradient: number[] } {
  const design = buildDesign(data, false);
  const n = data.y.length;
  const p = design.p;
  const X = new Matrix(n, p);
  const Z = new Matrix(n, 2 * data.nSubjects);
  const x = new Float64Array(p);
  for (let r = 0; r < n; r++) {
    design.fillRow(r, x);
    for (let j = 0; j < p; j++) X.set(r, j, x[j]!);
    Z.set(r, 2 * data.subject[r]!, 1);
    Z.set(r, 2 * data.subject[r]! + 1, data.time[r]!);
  }
  const blockD = (E: RelativeG): Matrix => {
    const G = new Matrix(2 * data.nSubjects, 2 * data.nSubjects);
    for (let i = 0; i < data.nSubjects; i++) {
      G.set(2 * i, 2 * i, E[0]);
      G.set(2 * i, 2 * i + 1, E[1]);
      G.set(2 * i + 1, 2 * i, E[1]);
      G.set(2 * i + 1, 2 * i + 1, E[2]);
    }
    return G;
  };
  const H = Matrix.eye(n).add(Z.mmul(blockD(D)).mmul(Z.transpose()));
  const Hi = inverse(H);
  const y = Matrix.columnVector(Array.from(data.y));
  const A = X.transpose().mmul(Hi).mmul(X);
  const Ai = inverse(A);
  const beta = Ai.mmul(X.transpose().mmul(Hi).mmul(y));
  const e = y.clone().sub(X.mmul(beta));
  const R = e.transpose().mmul(Hi).mmul(e).get(0, 0);
  const nu = method === 'reml' ? n - p : n;
  const s2 = R / nu;
  const logDetH = Math.log(determinant(H));
  const logLik =
    method === 'reml'
      ? -0.5 * ((n - p) * Math.log(2 * Math.PI * s2) + logDetH + Math.log(determinant(A)) + R / s2)
      : -0.5 * (n * Math.log(2 * Math.PI * s2) + logDetH + R / s2);
  const P = method === 'reml' ? Hi.clone().sub(Hi.mmul(X).mmul(Ai).mmul(X.transpose()).mmul(Hi)) : Hi;
  const He = Hi.mmul(e);
  const gradient = ([[1, 0, 0], [0, 1, 0], [0, 0, 1]] as const).map((E) => {
    const Hk = Z.mmul(blockD(E)).mmul(Z.transpose());
    return -0.5 * P.mmul(Hk).trace() + (0.5 * He.transpose().mmul(Hk).mmul(He).get(0, 0)) / s2;
  });
  return { logLik, gradient };
}

const close = (a: number, b: number, rel: number): void => {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));
};

describe('slope model: the per-participant 2 × 2 algebra equals the dense n × n evaluation', () => {
  for (const withCovariate of [false, true]) {
    for (const method of ['reml', 'ml'] as const) {
      for (const D of [[2.5, 0.3, 0.4], [0.7, -0.2, 0.15], [1, 0.5, 0.25]] as RelativeG[]) {
        it(`${withCovariate ? 'general' : 'grouped'} layout, ${method}, D = ${D.join(', ')}: log-likelihood and gradient to 1e-8`, () => {
          const data = smallData(withCovariate);
          const design = buildDesign(data, false);
          const sums = slopeSums(data, design);
          expect(sums.group === null).toBe(withCovariate);
          const fast = slopeProfile(sums, D, method, true)!;
          const ref = dense(data, D, method);
          close(fast.logLik, ref.logLik, 1e-8);
          for (let k = 0; k < 3; k++) close(fast.gradient![k]!, ref.gradient[k]!, 1e-8);
        });
      }
    }
  }
});

/**
 * The Kenward–Roger pieces in θ = (G11, G12, G22, σ²) against the dense formulas (Kenward & Roger 1997):
 * V = Z(I⊗G)Z' + σ²I, V_r = ∂V/∂θ_r, P_r = X'V⁻¹V_rV⁻¹X, Q_rs = X'V⁻¹V_rV⁻¹V_sV⁻¹X, Φ = (X'V⁻¹X)⁻¹,
 * REML information ½ tr(ΠV_rΠV_s) with Π = V⁻¹ − V⁻¹XΦX'V⁻¹ (ML: ½ tr(V⁻¹V_rV⁻¹V_s)), Φ_A = Φ + 2Φ[Σ W_rs(Q_rs −
 * P_rΦP_s)]Φ. Same data and tolerance reasoning as above (1e-8 relative to each matrix's largest entry).
 */
describe('slope model: the Kenward–Roger pieces equal the dense n × n formulas', () => {
  for (const withCovariate of [false, true]) {
    for (const method of ['reml', 'ml'] as const) {
      it(`${withCovariate ? 'general' : 'grouped'} layout, ${method}: expected information and Φ_A to 1e-8`, () => {
        const data = smallData(withCovariate);
        const design = buildDesign(data, false);
        const sums = slopeSums(data, design);
        const D: RelativeG = [2.5, 0.3, 0.4];
        const s2 = 1.7;
        const n = data.y.length;
        const p = design.p;
        const X = new Matrix(n, p);
        const x = new Float64Array(p);
        for (let r = 0; r < n; r++) {
          design.fillRow(r, x);
          for (let j = 0; j < p; j++) X.set(r, j, x[j]!);
        }
        const Vr = ([[1, 0, 0], [0, 1, 0], [0, 0, 1]] as const).map((E) => {
          const m = new Matrix(n, n);
          for (let a = 0; a < n; a++) {
            for (let b = 0; b < n; b++) {
              if (data.subject[a] !== data.subject[b]) continue;
              const ta = data.time[a]!;
              const tb = data.time[b]!;
              m.set(a, b, E[0] + E[1] * (ta + tb) + E[2] * ta * tb);
            }
          }
          return m;
        });
        Vr.push(Matrix.eye(n));
        const V = Matrix.eye(n).mul(s2);
        [D[0] * s2, D[1] * s2, D[2] * s2].forEach((g, r) => V.add(Vr[r]!.clone().mul(g)));
        const Vi = inverse(V);
        const Phi = inverse(X.transpose().mmul(Vi).mmul(X));
        const Pi = method === 'reml' ? Vi.clone().sub(Vi.mmul(X).mmul(Phi).mmul(X.transpose()).mmul(Vi)) : Vi;
        const info = new Matrix(4, 4);
        for (let r = 0; r < 4; r++) for (let c = 0; c < 4; c++) info.set(r, c, 0.5 * Pi.mmul(Vr[r]!).mmul(Pi).mmul(Vr[c]!).trace());
        const phi = Float64Array.from(Phi.to1DArray());
        const fast = slopeInformation(sums, D, s2, phi, method);
        const maxInfo = Math.max(...info.to1DArray().map(Math.abs));
        for (let k = 0; k < 16; k++) expect(Math.abs(fast.information[k]! - info.to1DArray()[k]!)).toBeLessThan(1e-8 * maxInfo);
        // Φ_A with W = inverse information.
        const W = inverse(info);
        const P = Vr.map((v) => X.transpose().mmul(Vi).mmul(v).mmul(Vi).mmul(X));
        const inner = new Matrix(p, p);
        for (let r = 0; r < 4; r++) {
          for (let c = 0; c < 4; c++) {
            const Q = X.transpose().mmul(Vi).mmul(Vr[r]!).mmul(Vi).mmul(Vr[c]!).mmul(Vi).mmul(X);
            inner.add(Q.sub(P[r]!.mmul(Phi).mmul(P[c]!)).mul(W.get(r, c)));
          }
        }
        const phiA = Phi.clone().add(Phi.mmul(inner).mmul(Phi).mul(2)).to1DArray();
        const fastA = slopeAdjustedCovariance(phi, fast, Float64Array.from(W.to1DArray()), p);
        const maxA = Math.max(...phiA.map(Math.abs));
        for (let k = 0; k < p * p; k++) expect(Math.abs(fastA[k]! - phiA[k]!)).toBeLessThan(1e-8 * maxA);
      });
    }
  }
});
