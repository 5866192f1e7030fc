/**
 * Internal cross-check: the fast, pooled-by-cluster-size computations against a direct dense n x n evaluation
 * (written here with ml-matrix) on small unbalanced data with covariates.
 */
// Formulas: Harville 1977 (JASA 72:320–338) for the REML log-likelihood and its information; Kenward & Roger 1997 (Biometrics 53:983–997) for the adjusted covariance Φ_A.
import { Matrix, determinant, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { buildDesign } from '../../../src/core/model/design';
import { informationPieces } from '../../../src/core/model/information';
import { profileAt } from '../../../src/core/model/likelihood';
import { sufficientStats } from '../../../src/core/model/sufficient';
import { fitOptions, normals, seeded } from './helpers';

/** Invented unbalanced data: 9 subjects with 1–5 visits, 2 arms, a numeric and a 3-level categorical covariate. */
function smallData(): ModelData {
  const u = seeded(7);
  const z = normals(u);
  const sizes = [1, 3, 5, 2, 4, 5, 3, 2, 4];
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [], base: number[] = [], site: string[] = [];
  sizes.forEach((n, i) => {
    const ui = 3 * z();
    const b = 50 + 10 * u();
    const s = ['North', 'South', 'East'][i % 3]!;
    for (let j = 0; j < n; j++) {
      const t = j * 2.7 + u();
      y.push(60 + 0.5 * b - 0.8 * t - (i % 2) * 0.6 * t + ui + 2 * z());
      time.push(t);
      subject.push(i);
      arm.push(i % 2);
      base.push(b);
      site.push(s);
    }
  });
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: sizes.length,
    armIndex: Int32Array.from(arm),
    arms: ['Placebo', 'Drug'],
    covariates: [
      { name: 'Baseline', kind: 'numeric', values: Float64Array.from(base) },
      { name: 'Region', kind: 'categorical', values: site, levels: ['North', 'South', 'East'] },
    ],
  };
}

/** The design matrix written out independently, in the documented term order. */
function denseX(d: ModelData): Matrix {
  const rows: number[][] = [];
  const region = d.covariates[1]!.values as readonly string[];
  const baseVals = d.covariates[0]!.values as Float64Array;
  for (let r = 0; r < d.y.length; r++) {
    const a = d.armIndex![r]!;
    const t = d.time[r]!;
    rows.push([1, a, t, a * t, baseVals[r]!, region[r] === 'South' ? 1 : 0, region[r] === 'East' ? 1 : 0]);
  }
  return new Matrix(rows);
}

function denseV(d: ModelData, s2u: number, s2: number, r = -1): Matrix {
  const n = d.y.length;
  const V = Matrix.zeros(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const same = d.subject[i] === d.subject[j] ? 1 : 0;
      const v1 = same;
      const v2 = i === j ? 1 : 0;
      V.set(i, j, r === 0 ? v1 : r === 1 ? v2 : s2u * v1 + s2 * v2);
    }
  }
  return V;
}

const LOG2PI = Math.log(2 * Math.PI);

function denseLogLik(d: ModelData, s2u: number, s2: number, method: 'reml' | 'ml'): number {
  const X = denseX(d);
  const p = X.columns;
  const N = X.rows;
  const V = denseV(d, s2u, s2);
  const Vi = inverse(V);
  const XtViX = X.transpose().mmul(Vi).mmul(X);
  const y = Matrix.columnVector(Array.from(d.y));
  const beta = inverse(XtViX).mmul(X.transpose().mmul(Vi).mmul(y));
  const r = y.clone().sub(X.mmul(beta));
  const quad = r.transpose().mmul(Vi).mmul(r).get(0, 0);
  const logDetV = Math.log(determinant(V));
  if (method === 'ml') return -0.5 * (N * LOG2PI + logDetV + quad);
  return -0.5 * ((N - p) * LOG2PI + logDetV + Math.log(determinant(XtViX)) + quad);
}

const trace = (m: Matrix): number => m.trace();

describe('the pooled computations equal a dense n x n evaluation', () => {
  const d = smallData();
  const design = buildDesign(d, false);
  const st = sufficientStats(d.y, d.subject, d.nSubjects, design);

  for (const method of ['reml', 'ml'] as const) {
    it(`the profiled ${method.toUpperCase()} objective equals the dense log-likelihood at (γσ̂², σ̂²) to 1e-9`, () => {
      for (const gamma of [0, 0.05, 0.7, 4]) {
        const pt = profileAt(st, gamma, method)!;
        const dense = denseLogLik(d, gamma * pt.sigma2, pt.sigma2, method);
        // 1e-9 absolute on a log-likelihood of order 100: both are direct formulas, differing only in rounding.
        expect(Math.abs(pt.logLik - dense)).toBeLessThan(1e-9);
      }
    });
    it(`the analytic ${method.toUpperCase()} γ-derivative matches central finite differences`, () => {
      for (const gamma of [0.05, 0.7, 4]) {
        const h = 1e-4 * gamma;
        const fd = (profileAt(st, gamma + h, method)!.logLik - profileAt(st, gamma - h, method)!.logLik) / (2 * h);
        const an = profileAt(st, gamma, method)!.slope;
        // Central differences with h = 1e-4 γ have truncation error O(h²) ~ 1e-8 relative and rounding
        // ~1e-16·|ℓ|/h; 1e-6 relative covers both with margin.
        expect(Math.abs(an - fd)).toBeLessThan(1e-6 * Math.max(1, Math.abs(an)));
      }
    });
  }

  it('the optimum is stationary: the finite-difference derivative in log γ is ≈ 0', () => {
    const fit = fitRandomIntercept(d, fitOptions());
    expect(fit.status).toBe('converged');
    const gamma = fit.variance.subject / fit.variance.residual;
    const h = 1e-4;
    const f = (rho: number): number => profileAt(st, Math.exp(rho), 'reml')!.logLik;
    const fd = (f(Math.log(gamma) + h) - f(Math.log(gamma) - h)) / (2 * h);
    // At a maximum the derivative vanishes; 1e-7 allows for the O(h²) difference error and rounding over h.
    expect(Math.abs(fd)).toBeLessThan(1e-7);
  });

  it('the analytic expected REML information equals ½ tr(P V_r P V_s) from dense matrices', () => {
    const gamma = 0.7;
    const pt = profileAt(st, gamma, 'reml')!;
    const s2 = pt.sigma2;
    const phi = pt.aInv.map((v) => v * s2);
    const info = informationPieces(st, gamma, s2, phi, 'reml').information;
    const X = denseX(d);
    const Vi = inverse(denseV(d, gamma * s2, s2));
    const Phi = inverse(X.transpose().mmul(Vi).mmul(X));
    const P = Vi.clone().sub(Vi.mmul(X).mmul(Phi).mmul(X.transpose()).mmul(Vi));
    const Vr = [denseV(d, 0, 0, 0), denseV(d, 0, 0, 1)];
    for (let r = 0; r < 2; r++) {
      for (let s = 0; s < 2; s++) {
        const dense = 0.5 * trace(P.mmul(Vr[r]!).mmul(P).mmul(Vr[s]!));
        // Relative 1e-9: the same quantity by two exact routes, differing by rounding in n x n products.
        expect(Math.abs(info[r * 2 + s]! - dense)).toBeLessThan(1e-9 * Math.abs(dense));
      }
    }
  });

  it('analytic vs numerical information: the finite-difference REML Hessian equals I_rs − y\'PV_rPV_sPy (exact identity)', () => {
    // For V linear in θ, −∂²ℓ_R/∂θ_r∂θ_s = y'PV_rPV_sPy − ½ tr(PV_rPV_s) (Harville 1977), so the numerical Hessian
    // ties the analytic expected information I_rs = ½ tr(PV_rPV_s) to a quantity computed without it.
    const gamma = 0.7;
    const pt = profileAt(st, gamma, 'reml')!;
    const th = [gamma * pt.sigma2, pt.sigma2];
    const phi = pt.aInv.map((v) => v * pt.sigma2);
    const info = informationPieces(st, gamma, pt.sigma2, phi, 'reml').information;
    const X = denseX(d);
    const Vi = inverse(denseV(d, th[0]!, th[1]!));
    const Phi = inverse(X.transpose().mmul(Vi).mmul(X));
    const P = Vi.clone().sub(Vi.mmul(X).mmul(Phi).mmul(X.transpose()).mmul(Vi));
    const y = Matrix.columnVector(Array.from(d.y));
    const Vr = [denseV(d, 0, 0, 0), denseV(d, 0, 0, 1)];
    const f = (a: number, b: number): number => denseLogLik(d, a, b, 'reml');
    const h = th.map((v) => 1e-3 * v);
    for (let r = 0; r < 2; r++) {
      for (let s = 0; s < 2; s++) {
        const at = (dr: number, ds: number): number => {
          const x = [...th];
          x[r] = x[r]! + dr * h[r]!;
          x[s] = x[s]! + ds * h[s]!;
          return f(x[0]!, x[1]!);
        };
        const hess = r === s ? (at(1, 0) - 2 * at(0, 0) + at(-1, 0)) / h[r]! ** 2 : (at(1, 1) - at(1, -1) - at(-1, 1) + at(-1, -1)) / (4 * h[r]! * h[s]!);
        const quad = y.transpose().mmul(P).mmul(Vr[r]!).mmul(P).mmul(Vr[s]!).mmul(P).mmul(y).get(0, 0);
        // Relative 1e-4: second differences with h = 1e-3 θ carry O(h²) truncation and ~1e-14·|ℓ|/h² rounding.
        expect(Math.abs(-hess - (quad - info[r * 2 + s]!))).toBeLessThan(1e-4 * Math.abs(quad));
      }
    }
  });

  it('the analytic expected ML information equals ½ tr(V⁻¹V_r V⁻¹V_s) from dense matrices (the pooled T_rs forms)', () => {
    const gamma = 0.7;
    const pt = profileAt(st, gamma, 'ml')!;
    const s2 = pt.sigma2;
    const phi = pt.aInv.map((v) => v * s2);
    const info = informationPieces(st, gamma, s2, phi, 'ml').information;
    const Vi = inverse(denseV(d, gamma * s2, s2));
    const Vr = [denseV(d, 0, 0, 0), denseV(d, 0, 0, 1)];
    for (let r = 0; r < 2; r++) {
      for (let s = 0; s < 2; s++) {
        const dense = 0.5 * trace(Vi.mmul(Vr[r]!).mmul(Vi).mmul(Vr[s]!));
        // ML expected information (Searle, Casella & McCulloch 1992, from memory); 1e-9 relative: two exact routes, rounding only.
        expect(Math.abs(info[r * 2 + s]! - dense)).toBeLessThan(1e-9 * Math.abs(dense));
      }
    }
  });

  it('fixed-effect SEs equal √diag((X\'V⁻¹X)⁻¹) from dense matrices (Satterthwaite: unadjusted covariance)', () => {
    const fit = fitRandomIntercept(d, fitOptions({ dfMethod: 'satterthwaite' }));
    const X = denseX(d);
    const Vi = inverse(denseV(d, fit.variance.subject, fit.variance.residual));
    const Phi = inverse(X.transpose().mmul(Vi).mmul(X));
    fit.fixedEffects.forEach((fe, j) => {
      // Relative 1e-8: same formula, rounding differences only.
      expect(Math.abs(fe.se - Math.sqrt(Phi.get(j, j)))).toBeLessThan(1e-8 * fe.se);
    });
  });

  it('Kenward–Roger SEs equal √diag(Φ_A) and the df equal 2(LΦL\')²/(g\'Wg) with g from finite differences of dense Φ(θ)', () => {
    const fit = fitRandomIntercept(d, fitOptions());
    const X = denseX(d);
    const p = X.columns;
    const th = [fit.variance.subject, fit.variance.residual];
    const phiAt = (a: number, b: number): Matrix => inverse(X.transpose().mmul(inverse(denseV(d, a, b))).mmul(X));
    const Vi = inverse(denseV(d, th[0]!, th[1]!));
    const Phi = phiAt(th[0]!, th[1]!);
    const Vr = [denseV(d, 0, 0, 0), denseV(d, 0, 0, 1)];
    const Pm = Vr.map((v) => X.transpose().mmul(Vi).mmul(v).mmul(Vi).mmul(X));
    const Qm = (r: number, s: number): Matrix => X.transpose().mmul(Vi).mmul(Vr[r]!).mmul(Vi).mmul(Vr[s]!).mmul(Vi).mmul(X);
    const Pproj = Vi.clone().sub(Vi.mmul(X).mmul(Phi).mmul(X.transpose()).mmul(Vi));
    const I = new Matrix(2, 2);
    for (let r = 0; r < 2; r++) for (let s = 0; s < 2; s++) I.set(r, s, 0.5 * trace(Pproj.mmul(Vr[r]!).mmul(Pproj).mmul(Vr[s]!)));
    const W = inverse(I);
    const inner = Matrix.zeros(p, p);
    for (let r = 0; r < 2; r++) for (let s = 0; s < 2; s++) inner.add(Qm(r, s).sub(Pm[r]!.mmul(Phi).mmul(Pm[s]!)).mul(W.get(r, s)));
    const PhiA = Phi.clone().add(Phi.mmul(inner).mmul(Phi).mul(2));
    for (let j = 0; j < p; j++) {
      const fe = fit.fixedEffects[j]!;
      expect(Math.abs(fe.se - Math.sqrt(PhiA.get(j, j)))).toBeLessThan(1e-8 * fe.se); // rounding only
      const g = [0, 1].map((r) => {
        const h = 1e-5 * th[r]!;
        const up = r === 0 ? phiAt(th[0]! + h, th[1]!) : phiAt(th[0]!, th[1]! + h);
        const dn = r === 0 ? phiAt(th[0]! - h, th[1]!) : phiAt(th[0]!, th[1]! - h);
        return (up.get(j, j) - dn.get(j, j)) / (2 * h);
      });
      const gWg = W.get(0, 0) * g[0]! ** 2 + 2 * W.get(0, 1) * g[0]! * g[1]! + W.get(1, 1) * g[1]! ** 2;
      const df = (2 * Phi.get(j, j) ** 2) / gWg;
      // For one row, Kenward & Roger's denominator df equals this Satterthwaite form (Kenward & Roger 1997, from memory).
      // 1e-5 relative: the central-difference gradient carries O(h²) ≈ 1e-10 relative error, amplified by cancellation.
      expect(Math.abs(fe.df - df)).toBeLessThan(1e-5 * df);
    }
  });

  it('BLUPs equal σ²_u Z\'V⁻¹(y − Xβ̂) and residuals equal y − Xβ̂ − Zû from dense matrices (Henderson 1975)', () => {
    const fit = fitRandomIntercept(d, fitOptions({ residuals: true }));
    const X = denseX(d);
    const Vi = inverse(denseV(d, fit.variance.subject, fit.variance.residual));
    const beta = Matrix.columnVector(fit.fixedEffects.map((f) => f.estimate));
    const r = Matrix.columnVector(Array.from(d.y)).sub(X.mmul(beta));
    const Vir = Vi.mmul(r);
    for (let i = 0; i < d.nSubjects; i++) {
      let u = 0;
      for (let k = 0; k < d.y.length; k++) if (d.subject[k] === i) u += Vir.get(k, 0);
      u *= fit.variance.subject;
      // Absolute 1e-8 on intercepts of order 1–10: the same quantity by two exact routes.
      expect(Math.abs(fit.subjects[i]!.blup - u)).toBeLessThan(1e-8);
      let resSum = 0;
      let n = 0;
      for (let k = 0; k < d.y.length; k++) {
        if (d.subject[k] !== i) continue;
        // Absolute 1e-8 on residuals of order 1–10 (y up to about 95): the same quantity by two exact routes, whose
        // rounding differences are about 2e-14 here; 1e-8 sits far above that rounding (the dense route solves with
        // X'V⁻¹X of condition number about 1.6e6) and far below any formula error, which would show at order 1.
        expect(Math.abs(fit.residuals![k]! - (r.get(k, 0) - u))).toBeLessThan(1e-8);
        resSum += fit.residuals![k]!;
        n++;
      }
      expect(fit.subjects[i]!.n).toBe(n);
      // Absolute 5e-10 (toBeCloseTo, 9 digits): the mean of the same n ≤ 5 residuals summed in a possibly different
      // order, so only rounding of order 1e-15 separates the two.
      expect(fit.subjects[i]!.meanResidual).toBeCloseTo(resSum / n, 9);
    }
  });
});
