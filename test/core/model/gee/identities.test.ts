/**
 * Exact identities of the GEE engine, checked against dense computations written out in full here (ml-matrix):
 * - independence working correlation: β̂ is the least-squares estimate (the naive fit of model/naive.ts) and the
 *   robust covariance is the cluster-robust formula (X'X)⁻¹ Σ X_i'r_i r_i'X_i (X'X)⁻¹;
 * - exchangeable: β̂ solves Σ X_i'V_i⁻¹(y_i − X_iβ) = 0 with V_i formed densely, and the bias-corrected covariance of
 *   Mancl & DeRouen 2001 equals the dense formula with the n_i × n_i leverage (I − H_i)⁻¹ (the engine uses the Woodbury
 *   reduction to p × p). Tolerance 1e-9 relative: rounding of two different orders of summation.
 */
import { Matrix, inverse, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../../src/core/model';
import { fitGee } from '../../../../src/core/model/gee';
import { fitOptions, normals, seeded } from '../helpers';

/** Invented unbalanced two-arm data with a categorical covariate; participants of 1 to 5 values, rows shuffled. */
function invented(seed: number): ModelData {
  const u = seeded(seed);
  const z = normals(u);
  const rows: { s: number; a: number; t: number; site: string; y: number }[] = [];
  for (let s = 0; s < 24; s++) {
    const a = s % 2;
    const site = ['North', 'South', 'East'][s % 3]!;
    const b = 4 * z();
    const n = 1 + Math.floor(u() * 5);
    for (let v = 0; v < n; v++) rows.push({ s, a, t: v * 3, site, y: 50 + b - 0.5 * v * 3 + a * (1 + 0.2 * v * 3) + (site === 'East' ? 2 : 0) + 3 * z() });
  }
  for (let i = rows.length - 1; i > 0; i--) {
    const j = Math.floor(u() * (i + 1));
    [rows[i], rows[j]] = [rows[j]!, rows[i]!];
  }
  return {
    y: Float64Array.from(rows, (r) => r.y),
    time: Float64Array.from(rows, (r) => r.t),
    subject: Int32Array.from(rows, (r) => r.s),
    nSubjects: 24,
    armIndex: Int32Array.from(rows, (r) => r.a),
    arms: ['Placebo', 'Drug'],
    covariates: [{ name: 'site', kind: 'categorical', values: rows.map((r) => r.site), levels: ['North', 'South', 'East'] }],
  };
}

/** Dense design rows in the engine's column order: 1, arm, t, arm·t, site South, site East. */
function denseX(d: ModelData): number[][] {
  const site = d.covariates[0]!.values as string[];
  return Array.from(d.y, (_, r) => {
    const a = d.armIndex![r]!;
    const t = d.time[r]!;
    return [1, a, t, a * t, site[r] === 'South' ? 1 : 0, site[r] === 'East' ? 1 : 0];
  });
}

function groups(d: ModelData): number[][] {
  const g: number[][] = Array.from({ length: d.nSubjects }, () => []);
  d.subject.forEach((s, r) => g[s]!.push(r));
  return g.filter((rows) => rows.length > 0);
}

function expectClose(a: number, b: number, rel = 1e-9): void {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));
}

describe('GEE with independence working correlation', () => {
  const d = invented(7);
  const gee = fitGee(d, { level: 0.95, timeUnit: 'month', structure: 'independence' });

  it('gives the least-squares estimates of the naive fit (exact identity)', () => {
    const naive = fitRandomIntercept(d, fitOptions()).naive!;
    gee.fixedEffects.forEach((e, j) => expectClose(e.estimate, naive.fixedEffects[j]!.estimate));
    expect(gee.workingCorrelation.correlation).toBe(0);
    // Model-based SE under independence is the least-squares SE s²(X'X)⁻¹ with s² = RSS/(N − p).
    gee.fixedEffects.forEach((e, j) => expectClose(e.seModel, naive.fixedEffects[j]!.se));
  });

  it('gives the cluster-robust covariance computed densely (exact identity)', () => {
    const X = new Matrix(denseX(d));
    const y = Matrix.columnVector(Array.from(d.y));
    const xtxInv = inverse(X.transpose().mmul(X));
    const beta = xtxInv.mmul(X.transpose()).mmul(y);
    const p = X.columns;
    const meat = Matrix.zeros(p, p);
    for (const rows of groups(d)) {
      const Xi = X.selection(rows, [...Array(p).keys()]);
      const ri = y.selection(rows, [0]).sub(Xi.mmul(beta));
      const ui = Xi.transpose().mmul(ri);
      meat.add(ui.mmul(ui.transpose()));
    }
    const robust = xtxInv.mmul(meat).mmul(xtxInv);
    for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) expectClose(gee.covariance.robust[i * p + j]!, robust.get(i, j));
  });
});

describe('GEE with exchangeable working correlation', () => {
  const d = invented(11);
  const gee = fitGee(d, { level: 0.95, timeUnit: 'month' });
  const X = new Matrix(denseX(d));
  const y = Matrix.columnVector(Array.from(d.y));
  const p = X.columns;
  const alpha = gee.workingCorrelation.correlation;
  const beta = Matrix.columnVector(gee.fixedEffects.map((e) => e.estimate));
  const parts = groups(d).map((rows) => {
    const n = rows.length;
    const R = new Matrix(n, n).fill(alpha);
    for (let k = 0; k < n; k++) R.set(k, k, 1);
    const Xi = X.selection(rows, [...Array(p).keys()]);
    const Rinv = inverse(R);
    return { Xi, Rinv, ri: y.selection(rows, [0]).sub(Xi.mmul(beta)), n };
  });

  it('converges to a correlation inside (−1/(n_max − 1), 1)', () => {
    expect(gee.status).toBe('converged');
    expect(alpha).toBeGreaterThan(-0.25);
    expect(alpha).toBeLessThan(1);
  });

  it('solves the estimating equations Σ X_i\'R_i⁻¹ r_i = 0 (dense V_i)', () => {
    const score = Matrix.zeros(p, 1);
    const scale = Matrix.zeros(p, 1);
    for (const { Xi, Rinv, ri } of parts) {
      score.add(Xi.transpose().mmul(Rinv).mmul(ri));
      scale.add(Xi.transpose().mmul(Rinv).mmul(ri.clone().abs().add(Xi.mmul(beta).abs())).abs());
    }
    for (let j = 0; j < p; j++) expect(Math.abs(score.get(j, 0))).toBeLessThan(1e-8 * (1 + scale.get(j, 0)));
  });

  it('gives the dense robust and Mancl–DeRouen covariances with n_i × n_i leverages (Woodbury identity)', () => {
    const A = Matrix.zeros(p, p);
    for (const { Xi, Rinv } of parts) A.add(Xi.transpose().mmul(Rinv).mmul(Xi));
    const Ainv = inverse(A);
    const meat = Matrix.zeros(p, p);
    const meatBc = Matrix.zeros(p, p);
    for (const { Xi, Rinv, ri, n } of parts) {
      const u = Xi.transpose().mmul(Rinv).mmul(ri);
      meat.add(u.mmul(u.transpose()));
      const H = Xi.mmul(Ainv).mmul(Xi.transpose()).mmul(Rinv);
      const adj = solve(Matrix.eye(n, n).sub(H), ri);
      const ub = Xi.transpose().mmul(Rinv).mmul(adj);
      meatBc.add(ub.mmul(ub.transpose()));
    }
    const robust = Ainv.mmul(meat).mmul(Ainv);
    const bc = Ainv.mmul(meatBc).mmul(Ainv);
    for (let i = 0; i < p; i++) {
      for (let j = 0; j < p; j++) {
        expectClose(gee.covariance.robust[i * p + j]!, robust.get(i, j));
        expectClose(gee.covariance.smallSample![i * p + j]!, bc.get(i, j));
      }
    }
    const scale = gee.scale;
    for (let j = 0; j < p; j++) expectClose(gee.fixedEffects[j]!.seModel, Math.sqrt(scale * Ainv.get(j, j)));
  });
});

describe('GEE worked example and misuse', () => {
  it('two participants [1, 2] and [3, 5] at times 0, 1, blinded, independence: hand-worked estimates and robust SEs', () => {
    const d: ModelData = { y: Float64Array.of(1, 2, 3, 5), time: new Float64Array(4), subject: Int32Array.of(0, 0, 1, 1), nSubjects: 2, armIndex: null, arms: [], covariates: [] };
    // Time constant at 0 makes the time column zero: the design is rank deficient, so the engine says so.
    expect(() => fitGee(d, { level: 0.95, timeUnit: 'month', structure: 'independence' })).toThrow(/linearly dependent/);
    const d2: ModelData = { ...d, time: Float64Array.of(0, 1, 0, 1) };
    const fit = fitGee(d2, { level: 0.95, timeUnit: 'month', structure: 'independence' });
    // Least squares on (t, y): intercept 2, slope 1.5 (t = 0: mean of 1, 3; t = 1: mean of 2, 5).
    expectClose(fit.fixedEffects[0]!.estimate, 2);
    expectClose(fit.fixedEffects[1]!.estimate, 1.5);
    // Residuals −1, −1.5 | 1, 1.5; u_1 = X_1'r_1 = (−2.5, −1.5) = −u_2; (X'X)⁻¹u_1 = (−0.5, −0.25), so the robust
    // variances are 2 · 0.25 and 2 · 0.0625 (hand-worked).
    expectClose(fit.fixedEffects[0]!.se, Math.sqrt(0.5));
    expectClose(fit.fixedEffects[1]!.se, Math.sqrt(0.125));
  });

  it('a single participant is not enough', () => {
    const d: ModelData = { y: Float64Array.of(1, 2, 4), time: Float64Array.of(0, 1, 2), subject: Int32Array.of(0, 0, 0), nSubjects: 1, armIndex: null, arms: [], covariates: [] };
    expect(() => fitGee(d, { level: 0.95, timeUnit: 'month' })).toThrow(/one participant/i);
  });

  it('does not change its input', () => {
    const d = invented(3);
    const copy = Float64Array.from(d.y);
    fitGee(d, { level: 0.95, timeUnit: 'month' });
    expect(Array.from(d.y)).toEqual(Array.from(copy));
  });
});
