/**
 * Kenward–Roger written out independently with dense n x n matrices (ml-matrix), straight from the published formulas
 * of Kenward & Roger (1997, Biometrics 53:983–997, sections 2–3 — section numbers from memory), and compared with the
 * engine's pooled-by-cluster-size code. Nothing from src/ is used here except the public fitRandomIntercept (for the
 * REML estimates of the two variances and the output under test) and the t quantile of the public API; the design
 * matrix is built in this file, and Σ, Φ, P_r, Q_rs, the expected information, Φ_A and the E/V moment-matching df in
 * the test helper denseKenwardRoger (helpers.ts), which uses nothing from src/ either.
 *
 * Data (invented, from the kidney-function scenario): 10 patients with 1–5 visits (34 rows, unequal cluster sizes,
 * jittered visit days), 5 on each arm but with different visit counts, and a numeric baseline covariate, so the design
 * is unbalanced and the engine takes its general data pass.
 */
import { Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, tQuantile, type ModelData } from '../../../src/core/model';
import { denseKenwardRoger, fitOptions } from './helpers';

// [patient, arm (0 = Placebo, 1 = Drug), study day, baseline eGFR, eGFR] — invented values.
const ROWS: readonly (readonly [number, number, number, number, number])[] = [
  [0, 0, 1, 59.9, 53.9], [0, 0, 90, 59.9, 55.1],
  [1, 1, 1, 68.6, 61.0], [1, 1, 79, 68.6, 58.2], [1, 1, 165, 68.6, 61.5], [1, 1, 250, 68.6, 60.5], [1, 1, 337, 68.6, 54.8],
  [2, 0, 1, 35.5, 35.2],
  [3, 1, 1, 71.7, 74.4], [3, 1, 91, 71.7, 72.1], [3, 1, 164, 71.7, 75.2], [3, 1, 249, 71.7, 74.9],
  [4, 1, 1, 40.3, 41.8], [4, 1, 91, 40.3, 42.7], [4, 1, 165, 40.3, 47.5],
  [5, 0, 1, 46.6, 53.4], [5, 0, 89, 46.6, 51.6], [5, 0, 174, 46.6, 50.2], [5, 0, 250, 46.6, 55.3], [5, 0, 335, 46.6, 47.6],
  [6, 1, 1, 35.9, 28.2], [6, 1, 83, 35.9, 26.5],
  [7, 0, 1, 59.1, 64.0], [7, 0, 84, 59.1, 58.9], [7, 0, 164, 59.1, 55.8], [7, 0, 254, 59.1, 60.4],
  [8, 0, 1, 62.9, 66.9], [8, 0, 81, 62.9, 69.4], [8, 0, 163, 62.9, 64.0],
  [9, 1, 1, 73.0, 68.9], [9, 1, 87, 73.0, 66.7], [9, 1, 172, 73.0, 63.2], [9, 1, 247, 73.0, 61.1], [9, 1, 340, 73.0, 65.2],
];
const MONTH = 30.4375; // days per month, 365.25/12 (common practice)
const CONTRAST_DAY = 169; // week 24

const data: ModelData = {
  y: Float64Array.from(ROWS, (r) => r[4]),
  time: Float64Array.from(ROWS, (r) => (r[2] - 1) / MONTH),
  subject: Int32Array.from(ROWS, (r) => r[0]),
  nSubjects: 10,
  armIndex: Int32Array.from(ROWS, (r) => r[1]),
  arms: ['Placebo', 'Drug'],
  covariates: [{ name: 'Baseline', kind: 'numeric', values: Float64Array.from(ROWS, (r) => r[3]) }],
};

interface DenseKR {
  estimate: number;
  se: number;
  df: number;
  lambda: number;
}

/** The dense evaluation (denseKenwardRoger in helpers.ts) for one contrast row l: estimate, adjusted SE, df and λ. */
function denseKR(X: Matrix, y: Matrix, subj: Int32Array, s2u: number, s2: number, L: Matrix): DenseKR {
  const k = denseKenwardRoger(X, y, subj, s2u, s2, L);
  return { estimate: L.mmul(k.beta).get(0, 0), se: Math.sqrt(L.mmul(k.phiA).mmul(L.transpose()).get(0, 0)), df: k.m, lambda: k.lambda };
}

/** Relative difference |a − b|/|b|. */
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('Kenward–Roger: the pooled engine equals an independent dense evaluation of the published formulas', () => {
  const fit = fitRandomIntercept(data, fitOptions({ contrastDays: [{ label: 'Week 24', day: CONTRAST_DAY }] }));
  // Design written out here in the documented order: intercept, arm Drug, time, time × Drug, baseline.
  const X = new Matrix(ROWS.map((r) => {
    const t = (r[2] - 1) / MONTH;
    return [1, r[1], t, r[1] * t, r[3]];
  }));
  const y = Matrix.columnVector(ROWS.map((r) => r[4]));
  const at = (l: number[]): DenseKR => denseKR(X, y, data.subject, fit.variance.subject, fit.variance.residual, new Matrix([l]));
  // Tolerance 1e-8 relative: both sides evaluate the same closed-form expressions at the same (σ²_u, σ²); they differ
  // only by rounding — the dense side inverts 34 x 34 matrices with condition number ~1e3 and the pooled side sums by
  // cluster size — which costs at most a few digits of the 16 available. Observed agreement is ~1e-13.

  it('the data are unbalanced and the fit is an interior REML optimum (so both variances are estimated)', () => {
    const sizes = new Set(Array.from({ length: 10 }, (_, i) => ROWS.filter((r) => r[0] === i).length));
    expect(sizes.size).toBeGreaterThan(3);
    expect(fit.status).toBe('converged');
    expect(fit.terms.map((t) => t.kind)).toEqual(['intercept', 'arm', 'time', 'armTime', 'covariate']);
  });

  it('every fixed effect: estimate, Kenward–Roger SE (√ of LΦ_AL\') and df (E/V moment matching) to 1e-8 relative', () => {
    fit.fixedEffects.forEach((fe, j) => {
      const l = [0, 0, 0, 0, 0];
      l[j] = 1;
      const d = at(l);
      expect(rel(fe.estimate, d.estimate)).toBeLessThan(1e-8);
      expect(rel(fe.se, d.se)).toBeLessThan(1e-8);
      expect(rel(fe.df, d.df)).toBeLessThan(1e-8);
      // For one row Kenward & Roger's scale λ is exactly 1, so the statistic is the plain Wald t.
      // 1e-9: λ is 1 by construction for one row; only rounding in the ratio remains.
      expect(Math.abs(d.lambda - 1)).toBeLessThan(1e-9);
      expect(rel(fe.t, d.estimate / d.se)).toBeLessThan(1e-8);
    });
  });

  it('the treatment difference at day 169 (arm + time × arm at (169 − 1)/30.4375) and the slope difference, with their intervals', () => {
    const te = fit.treatmentEffects[0]!;
    const d = at([0, 1, 0, (CONTRAST_DAY - 1) / MONTH, 0]);
    expect(rel(te.estimate, d.estimate)).toBeLessThan(1e-8);
    expect(rel(te.se, d.se)).toBeLessThan(1e-8);
    expect(rel(te.df, d.df)).toBeLessThan(1e-8);
    const q = tQuantile(0.975, d.df);
    expect(rel(te.upper - te.lower, 2 * q * d.se)).toBeLessThan(1e-8);
    const sd = fit.slopeDifferences[0]!;
    const ds = at([0, 0, 0, 1, 0]);
    expect(rel(sd.se, ds.se)).toBeLessThan(1e-8);
    expect(rel(sd.df, ds.df)).toBeLessThan(1e-8);
  });

  it('the adjustment is real here: every Kenward–Roger SE exceeds the unadjusted one, the time term\'s by about 0.9%', () => {
    const sat = fitRandomIntercept(data, fitOptions({ dfMethod: 'satterthwaite' }));
    const ratio = fit.fixedEffects.map((fe, j) => fe.se / sat.fixedEffects[j]!.se - 1);
    for (const r of ratio) expect(r).toBeGreaterThan(0);
    // 0.5%: well above the 1e-8 agreement, so the comparisons above would catch a missing or halved adjustment.
    expect(ratio[2]!).toBeGreaterThan(0.005);
  });
});
