/**
 * Profile-likelihood intervals of the variance components and the ICC (varianceIntervals.ts, profile.ts).
 * Sources:
 * - Published: the dyestuff data (Davies 1947) with its ML fit; profile-based 95% limits of the between-batch SD
 *   12.197 to 84.063 and of the within-batch SD 38.230 to 67.658, from Bates (2010), draft book on mixed-effects
 *   modelling, ch. 1 (values from memory; checked here to half a unit in the third decimal).
 * - Exact identity: each limit θ solves 2(ℓ̂ − ℓ_prof(θ)) = χ²₁(0.95) = z(0.975)² with z(0.975) = 1.959963984540054
 *   (Abramowitz & Stegun 1964, Table 26.1 gives 1.959963985; the 16 digits from memory). The test evaluates ℓ with
 *   its own dense n × n REML/ML likelihood (ml-matrix) and maximises out the other variance with its own
 *   golden-section search, so it shares nothing with the engine but the data.
 * - The 50:50 χ²₀:χ²₁ mixture at zero (Self & Liang 1987): p = ½ P(χ²₁ ≥ LR), zero inside when LR < χ²₁(0.90) =
 *   z(0.95)² = 2.7055 (z(0.95) = 1.644853626951472, from memory; A&S Table 26.1 1.644853627).
 */
import { CholeskyDecomposition, Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type FitMethod, type ModelData } from '../../../src/core/model';
import { buildDesign } from '../../../src/core/model/design';
import { profileAt } from '../../../src/core/model/likelihood';
import { residualInterval } from '../../../src/core/model/profile';
import { sufficientStats } from '../../../src/core/model/sufficient';
import { ZERO_EXCLUDED } from '../../../src/core/model/varianceIntervals';
import { DYESTUFF, fitOptions, normals, oneWay, oneWayOptions, seeded } from './helpers';

const CUT = 1.959963984540054 ** 2;
const ZERO_CUT = 1.644853626951472 ** 2;

/** Dense restricted or full log-likelihood of y = Xβ + Zu + e at (σ²_u, σ²), constants included (Harville 1977). */
function denseLogLik(X: Matrix, y: Matrix, subject: Int32Array, s2u: number, s2: number, method: FitMethod): number {
  const N = y.rows;
  const p = X.columns;
  const V = Matrix.zeros(N, N);
  for (let i = 0; i < N; i++) for (let j = 0; j < N; j++) V.set(i, j, (subject[i] === subject[j] ? s2u : 0) + (i === j ? s2 : 0));
  const L = new CholeskyDecomposition(V).lowerTriangularMatrix;
  let logDetV = 0;
  for (let i = 0; i < N; i++) logDetV += 2 * Math.log(L.get(i, i));
  const Vi = inverse(V);
  const XtVi = X.transpose().mmul(Vi);
  const XtViX = XtVi.mmul(X);
  const beta = inverse(XtViX).mmul(XtVi.mmul(y));
  const r = y.clone().sub(X.mmul(beta));
  const quad = r.transpose().mmul(Vi).mmul(r).get(0, 0);
  const log2pi = Math.log(2 * Math.PI);
  if (method === 'ml') return -0.5 * (N * log2pi + logDetV + quad);
  const sym = XtViX.clone().add(XtViX.transpose()).mul(0.5); // symmetric to rounding; the decomposition wants it exact
  const Lx = new CholeskyDecomposition(sym).lowerTriangularMatrix;
  let logDetX = 0;
  for (let i = 0; i < p; i++) logDetX += 2 * Math.log(Lx.get(i, i));
  return -0.5 * ((N - p) * log2pi + logDetV + logDetX + quad);
}

/** Golden-section maximum of f on [a, b] (the test's own; unimodal there), to 1e-11 in x. */
function goldenMax(f: (x: number) => number, a: number, b: number): number {
  const g = (Math.sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  let fc = f(c);
  let fd = f(d);
  while (b - a > 1e-11) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - g * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + g * (b - a);
      fd = f(d);
    }
  }
  return Math.max(fc, fd);
}

interface Dense {
  readonly at: (s2u: number, s2: number) => number;
}

/** The dense likelihood of a data set with the design intercept, arm, time, arm × time (or intercept only). */
function dense(d: ModelData, method: FitMethod, interceptOnly: boolean): Dense {
  const N = d.y.length;
  const cols = interceptOnly ? 1 : 4;
  const X = Matrix.zeros(N, cols);
  for (let i = 0; i < N; i++) {
    X.set(i, 0, 1);
    if (!interceptOnly) {
      const a = d.armIndex![i]!;
      X.set(i, 1, a);
      X.set(i, 2, d.time[i]!);
      X.set(i, 3, a * d.time[i]!);
    }
  }
  const y = Matrix.columnVector(Array.from(d.y));
  return { at: (s2u, s2) => denseLogLik(X, y, d.subject, s2u, s2, method) };
}

/** Invented two-arm data, 16 participants with 2–5 visits each (unbalanced), eGFR-like values. */
function twoArm(seed: number, sdSubject: number, sdWithin: number): ModelData {
  const u = seeded(seed);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 16; i++) {
    const a = i % 2;
    const ui = sdSubject * z();
    const visits = 2 + Math.floor(u() * 4);
    for (let j = 0; j < visits; j++) {
      const t = j * 2.76 + 0.3 * z();
      y.push(60 + ui - 0.4 * t + a * 0.25 * t + sdWithin * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: 16, armIndex: Int32Array.from(arm), arms: ['Placebo', 'Drug'], covariates: [] };
}

/** Profile of σ²_u = τ by the dense likelihood: max over log σ² around the estimate. */
const subjectProf = (D: Dense, s2: number) => (tau: number): number => goldenMax((x) => D.at(tau, Math.exp(x)), Math.log(s2) - 6, Math.log(s2) + 6);
/** Profile of σ² = s: max over τ ≥ 0 (log τ over a wide range, and τ = 0 itself). */
const residualProf = (D: Dense, s2u: number, s2: number) => (s: number): number =>
  Math.max(D.at(0, s), goldenMax((x) => D.at(Math.exp(x), s), Math.log(Math.max(s2u, 1e-6 * s2)) - 12, Math.log(s2 + s2u) + 6));
/** Profile of γ: σ² maximised out. */
const ratioProf = (D: Dense, s2: number) => (g: number): number => goldenMax((x) => D.at(g * Math.exp(x), Math.exp(x)), Math.log(s2) - 6, Math.log(s2) + 6);

describe('profile-likelihood intervals: every limit solves the likelihood-ratio equation (independent dense likelihood)', () => {
  for (const method of ['reml', 'ml'] as const) {
    it(`unbalanced two-arm data, ${method.toUpperCase()}: 2(ℓ̂ − ℓ_prof) = 3.8415 at each limit of σ²_u, σ² and the ICC, to 1e-8`, () => {
      const d = twoArm(7, 4, 3);
      const fit = fitRandomIntercept(d, fitOptions({ method }));
      expect(fit.status).toBe('converged');
      const v = fit.variance;
      const D = dense(d, method, false);
      const top = D.at(v.subject, v.residual);
      // 1e-8 absolute on LR: the dense ℓ (N ≈ 55, Cholesky log-determinants) carries ~1e-12 rounding, the golden search
      // finds the inner maximum to 1e-11 in log σ² (ℓ error ~1e-20), the engine solves to ~1e-13 in log θ.
      const lr = (l: number): number => 2 * (top - l);
      const su = subjectProf(D, v.residual);
      expect(Math.abs(lr(su(v.subjectLower)) - CUT)).toBeLessThan(1e-8);
      expect(Math.abs(lr(su(v.subjectUpper)) - CUT)).toBeLessThan(1e-8);
      const re = residualProf(D, v.subject, v.residual);
      expect(Math.abs(lr(re(v.residualLower)) - CUT)).toBeLessThan(1e-8);
      expect(Math.abs(lr(re(v.residualUpper)) - CUT)).toBeLessThan(1e-8);
      const ra = ratioProf(D, v.residual);
      expect(Math.abs(lr(ra(v.iccLower / (1 - v.iccLower))) - CUT)).toBeLessThan(1e-8);
      expect(Math.abs(lr(ra(v.iccUpper / (1 - v.iccUpper))) - CUT)).toBeLessThan(1e-8);
      // The fit's maximum is the dense one: the LR at the estimate is 0 and the zero test's statistic is 2(ℓ̂ − ℓ_prof(0)).
      expect(Math.abs(lr(su(v.subject)))).toBeLessThan(1e-8);
      expect(Math.abs(v.zeroTest!.statistic - lr(su(0)))).toBeLessThan(1e-8);
      expect(v.intervals!.subject.method).toBe('profile-likelihood');
      expect(v.intervals!.icc.method).toBe('profile-likelihood');
      expect(v.intervals!.residual.method).toBe('profile-likelihood');
    });
  }

  it('at the zero boundary (unbalanced one-way data, equal group means): lower limits 0, zero test 0 with p = 1, upper limits solve the equation', () => {
    const d = oneWay([[1, 10], [2, 9, 5.5], [3, 8], [4, 7, 5.5, 5.5]]);
    const fit = fitRandomIntercept(d, oneWayOptions());
    expect(fit.status).toBe('boundary');
    const v = fit.variance;
    expect(v.subjectLower).toBe(0);
    expect(v.iccLower).toBe(0);
    expect(v.zeroTest).toEqual({ statistic: 0, p: 1 });
    const D = dense(d, 'reml', true);
    const top = D.at(0, v.residual);
    const lr = (l: number): number => 2 * (top - l);
    expect(Math.abs(lr(subjectProf(D, v.residual)(v.subjectUpper)) - CUT)).toBeLessThan(1e-8); // as above
    expect(Math.abs(lr(ratioProf(D, v.residual)(v.iccUpper / (1 - v.iccUpper))) - CUT)).toBeLessThan(1e-8);
    const re = residualProf(D, 0, v.residual);
    expect(Math.abs(lr(re(v.residualLower)) - CUT)).toBeLessThan(1e-8);
    expect(Math.abs(lr(re(v.residualUpper)) - CUT)).toBeLessThan(1e-8);
  });
});

describe('the 50:50 mixture at zero (Self & Liang 1987)', () => {
  // Invented one-way data, unequal group sizes; k moves the group means apart: k = 0 gives a statistic of about 1.9
  // (below 2.71), k = 0.2 about 3.4 (between 2.71 and 3.84), k = 0.5 about 5.8 (above 3.84).
  const groups = (k: number): number[][] =>
    [[10, 12, 11, 9], [13, 9, 12], [8, 11, 10, 12, 9], [14, 12, 13], [9, 10, 8, 11], [12, 11]].map((g, i) => g.map((x) => x + k * [0, 1, -1, 1.5, -0.8, 0.3][i]!));
  const zeroP = (lr: number): number => 0.5 * chiSquare1Upper(lr);

  it('statistic below χ²₁(0.90) = 2.71: zero is inside both intervals, p = ½P(χ²₁ ≥ LR) above 0.05', () => {
    const v = fitRandomIntercept(oneWay(groups(0)), oneWayOptions()).variance;
    const t = v.zeroTest!;
    expect(t.statistic).toBeGreaterThan(0);
    expect(t.statistic).toBeLessThan(ZERO_CUT);
    // 1e-9 relative: the test's series for the χ²₁ tail and the engine's normal tail agree to rounding.
    expect(Math.abs(t.p - zeroP(t.statistic))).toBeLessThan(1e-9 * t.p);
    expect(t.p).toBeGreaterThan(0.05);
    expect(v.subjectLower).toBe(0);
    expect(v.iccLower).toBe(0);
    expect(v.intervals!.subject.note).toBeNull();
  });
  it('statistic between 2.71 and 3.84: lower limit 0 but zero itself excluded, said in a note; p between 0.025 and 0.05', () => {
    const v = fitRandomIntercept(oneWay(groups(0.2)), oneWayOptions()).variance;
    const t = v.zeroTest!;
    expect(t.statistic).toBeGreaterThan(ZERO_CUT);
    expect(t.statistic).toBeLessThan(CUT);
    expect(t.p).toBeLessThan(0.05);
    expect(t.p).toBeGreaterThan(0.025);
    expect(v.subjectLower).toBe(0);
    expect(v.iccLower).toBe(0);
    expect(v.intervals!.subject.note).toBe(ZERO_EXCLUDED);
    expect(v.intervals!.icc.note).toBe(ZERO_EXCLUDED);
  });
  it('statistic above 3.84: the lower limits are positive profile roots', () => {
    const d = oneWay(groups(0.5));
    const v = fitRandomIntercept(d, oneWayOptions()).variance;
    expect(v.zeroTest!.statistic).toBeGreaterThan(CUT);
    expect(v.subjectLower).toBeGreaterThan(0);
    expect(v.iccLower).toBeGreaterThan(0);
    const D = dense(d, 'reml', true);
    const top = D.at(v.subject, v.residual);
    expect(Math.abs(2 * (top - subjectProf(D, v.residual)(v.subjectLower)) - CUT)).toBeLessThan(1e-8); // as above
  });
});

/** P(χ²₁ ≥ x) = erfc(√(x/2)), erfc by its continued fraction for large arguments and the series below (A&S 7.1.5, 7.1.14). */
function chiSquare1Upper(x: number): number {
  const z = Math.sqrt(x / 2);
  if (z < 2) {
    // erf by its Maclaurin series (A&S 7.1.5): 2/√π Σ (−1)^n z^(2n+1) / (n! (2n + 1)).
    let term = z;
    let sum = z;
    for (let n = 1; n < 80; n++) {
      term *= (-z * z) / n;
      sum += term / (2 * n + 1);
    }
    return 1 - (2 / Math.sqrt(Math.PI)) * sum;
  }
  let f = z;
  for (let k = 60; k >= 1; k--) f = z + k / 2 / f;
  return Math.exp(-z * z) / Math.sqrt(Math.PI) / f;
}

describe('a published example: the dyestuff data (Davies 1947), ML fit, profile limits of Bates (2010, ch. 1; from memory)', () => {
  it('between-batch SD 12.197 to 84.063 (the fit\'s profile interval of σ²_u, square-rooted)', () => {
    const v = fitRandomIntercept(oneWay(DYESTUFF), oneWayOptions('ml')).variance;
    expect(Math.abs(Math.sqrt(v.subjectLower) - 12.197)).toBeLessThan(5e-4);
    expect(Math.abs(Math.sqrt(v.subjectUpper) - 84.063)).toBeLessThan(5e-4);
  });
  it('within-batch SD 38.230 to 67.658 by the profile (the report gives the exact chi-square interval in balanced data)', () => {
    const d = oneWay(DYESTUFF);
    const fit = fitRandomIntercept(d, oneWayOptions('ml'));
    expect(fit.variance.intervals!.residual.method).toBe('exact-chi-square');
    const st = sufficientStats(d.y, d.subject, d.nSubjects, buildDesign(d, true));
    const gamma = fit.variance.subject / fit.variance.residual;
    const pt = profileAt(st, gamma, 'ml')!;
    const r = residualInterval({ st, method: 'ml', gamma, sigma2: pt.sigma2, logLik: pt.logLik }, CUT);
    expect(Math.abs(Math.sqrt(r.lower) - 38.23)).toBeLessThan(5e-4);
    expect(Math.abs(Math.sqrt(r.upper) - 67.658)).toBeLessThan(5e-4);
  });
});

describe('limits the data do not give are unbounded, with a reason, never absurd numbers', () => {
  it('two participants, one per arm (the arm takes up all between-participant variation): upper limits +∞ and 1, said in a note', () => {
    // Invented: the REML likelihood is flat in σ²_u once the arm absorbs the two participant means.
    const d: ModelData = { y: Float64Array.of(50, 52, 49, 70, 69, 73), time: Float64Array.of(0, 3, 6, 0, 3, 6), subject: Int32Array.of(0, 0, 0, 1, 1, 1), nSubjects: 2, armIndex: Int32Array.of(0, 0, 0, 1, 1, 1), arms: ['A', 'B'], covariates: [] };
    const v = fitRandomIntercept(d, fitOptions()).variance;
    expect(v.subjectUpper).toBe(Infinity);
    expect(v.iccUpper).toBe(1);
    expect(v.intervals!.subject.note).toMatch(/do not bound the between-participant variance from above/);
    expect(v.intervals!.icc.note).toMatch(/upper limit is given as 1/);
    expect(v.intervalMethod).toMatch(/unbounded/);
    expect(Number.isFinite(v.residualUpper)).toBe(true);
  });
});

describe('regression: no absurd limits (an upper limit of 4.7e233 came from a Satterthwaite df of 0.01 near the boundary)', () => {
  it('on 300 small invented data sets every limit is ordered, finite limits stay within the search range, and an unbounded one carries a note', () => {
    const u = seeded(99);
    const z = normals(u);
    let unbounded = 0;
    for (let rep = 0; rep < 300; rep++) {
      const nSubjects = 2 + Math.floor(u() * 5);
      const sdU = [0, 0.1, 1, 5][rep % 4]!;
      const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
      for (let i = 0; i < nSubjects; i++) {
        const ui = sdU * z();
        const visits = 2 + Math.floor(u() * 3);
        for (let j = 0; j < visits; j++) {
          y.push(50 + ui + 0.1 * j + z());
          time.push(j * 3 + u());
          subject.push(i);
          arm.push(i % 2);
        }
      }
      const d: ModelData = { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects, armIndex: Int32Array.from(arm), arms: ['A', 'B'], covariates: [] };
      let v;
      try {
        v = fitRandomIntercept(d, fitOptions()).variance;
      } catch {
        continue; // tiny designs may give no model (rank, degenerate data): not what this checks
      }
      const total = v.subject + v.residual;
      for (const [lo, est, hi, note] of [
        [v.subjectLower, v.subject, v.subjectUpper, v.intervals!.subject.note],
        [v.residualLower, v.residual, v.residualUpper, v.intervals!.residual.note],
      ] as const) {
        expect(lo).toBeGreaterThanOrEqual(0);
        expect(lo).toBeLessThanOrEqual(est);
        expect(est).toBeLessThanOrEqual(hi);
        // The search stops at 1e6 times the total variance (VARIANCE_SEARCH_CAP); a limit beyond it is reported as +∞.
        if (Number.isFinite(hi)) expect(hi).toBeLessThanOrEqual(1e6 * total * (1 + 1e-12));
        else {
          unbounded++;
          expect(note).toMatch(/unbounded/);
        }
      }
      expect(v.iccLower).toBeGreaterThanOrEqual(0);
      expect(v.iccUpper).toBeLessThanOrEqual(1);
      if (v.iccUpper === 1) expect(v.intervals!.icc.note).toMatch(/given as 1/);
    }
    // Some of these tiny designs (two participants, one per arm) bound nothing above: the check above ran on them.
    expect(unbounded).toBeGreaterThan(0);
  });
});
