import { Matrix, determinant, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept } from '../../../src/core/model';
import { balancedAnova, DYESTUFF, oneWay, oneWayOptions, RAILS, type Anova } from './helpers';

// Where the reference values come from.
// - The data are printed in Devore (2000, Probability and Statistics for Engineering and the Sciences; the rails) and
//   Davies (1947, Statistical Methods in Research and Production; the dyestuff), with their one-way ANOVA tables.
//   Neither source prints the log-likelihoods or the ML variance checked here.
// - The variances follow from the ANOVA table by exact identities for balanced one-way data (Searle, Casella &
//   McCulloch 1992, Variance Components, ch. 3–4; chapter from memory): REML σ²_u = (MSB − MSW)/n and σ² = MSW;
//   ML σ²_u = ((1 − 1/a)·MSB − MSW)/n and σ² = MSW when positive; the SE of the mean is √(MSB/N). The test computes
//   these from the data below, and the quoted rounded figures (rails 615.31 → SD 24.805, 16.167 → SD 4.0208, SE 10.171;
//   dyestuff 1764.05, 2451.25, ML 1388.33, SE 19.383) are those identities rounded.
// - The log-likelihoods (−61.0885, −64.2800, −159.827, −163.664) were computed independently by a dense n x n
//   evaluation at those variances; the test repeats that evaluation itself with ml-matrix (denseLogLik below).
// - The ICC limits come from Searle's exact F-based interval for balanced one-way data (Searle 1971, Linear Models,
//   ch. 9; chapter from memory), computed below from F quantiles found in the test (iccLimits); the 4-decimal values
//   quoted in the titles were computed by that formula and are kept as a fixed record.
// Tolerances: a quoted figure is checked to half a unit in its last printed place; a value computed in the test is
// checked to a stated relative tolerance.

/**
 * The Gaussian log-likelihood of y = 1μ + Zu + e with V = σ²_u ZZ' + σ² I, written out densely (n x n) with ml-matrix,
 * constants included: ML −½(N log 2π + log|V| + r'V⁻¹r); REML −½((N − 1) log 2π + log|V| + log|1'V⁻¹1| + r'V⁻¹r),
 * r = y − 1μ̂ with the GLS mean μ̂ (Harville 1977, J. Am. Stat. Assoc. 72:320–338, eq. for the restricted likelihood).
 */
function denseLogLik(groups: readonly (readonly number[])[], s2u: number, s2: number, method: 'reml' | 'ml'): number {
  const y = groups.flat();
  const g = groups.flatMap((grp, i) => grp.map(() => i));
  const N = y.length;
  const V = Matrix.zeros(N, N);
  for (let i = 0; i < N; i++) for (let j = 0; j < N; j++) V.set(i, j, (g[i] === g[j] ? s2u : 0) + (i === j ? s2 : 0));
  const Vi = inverse(V);
  const X = Matrix.ones(N, 1);
  const XtViX = X.transpose().mmul(Vi).mmul(X);
  const Y = Matrix.columnVector(y);
  const mu = inverse(XtViX).mmul(X.transpose().mmul(Vi).mmul(Y));
  const r = Y.clone().sub(X.mmul(mu));
  const quad = r.transpose().mmul(Vi).mmul(r).get(0, 0);
  const logDetV = Math.log(determinant(V));
  const log2pi = Math.log(2 * Math.PI);
  if (method === 'ml') return -0.5 * (N * log2pi + logDetV + quad);
  return -0.5 * ((N - 1) * log2pi + logDetV + Math.log(XtViX.get(0, 0)) + quad);
}

/**
 * P(F ≤ f) for F(d1, d2) with d2 even, from the finite series of the incomplete beta function for an integer second
 * parameter b = d2/2: I_x(a, b) = x^a Σ_{k<b} Γ(a + k)/(Γ(a) k!) (1 − x)^k, x = d1 f/(d1 f + d2), a = d1/2
 * (the negative-binomial form of I_x; Abramowitz & Stegun 1964, 26.5 and 26.6 — from memory). Written here so the
 * check does not share the library the code under test uses.
 */
function fCdfEvenD2(f: number, d1: number, d2: number): number {
  if (d2 % 2 !== 0) throw new Error('fCdfEvenD2 needs an even d2');
  const a = d1 / 2;
  const x = (d1 * f) / (d1 * f + d2);
  let term = 1; // Γ(a + k)/(Γ(a) k!) (1 − x)^k at k = 0
  let sum = 0;
  for (let k = 0; k < d2 / 2; k++) {
    sum += term;
    term *= ((a + k) / (k + 1)) * (1 - x);
  }
  return x ** a * sum;
}

/** The q-quantile of F(d1, d2), d2 even, by bisection on fCdfEvenD2 to full double precision. */
function fQuantileEvenD2(q: number, d1: number, d2: number): number {
  let lo = 0;
  let hi = 1e4;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (fCdfEvenD2(mid, d1, d2) < q) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/**
 * Searle's exact interval for the ICC in balanced one-way data (Searle 1971): with F₀ = MSB/MSW and F quantiles on
 * (a − 1, a(n − 1)) df, the limits are (F₀/F_{1−α/2} − 1)/(F₀/F_{1−α/2} + n − 1) and (F₀/F_{α/2} − 1)/(F₀/F_{α/2} + n − 1).
 */
function iccLimits(t: Anova, level: number): [number, number] {
  const d1 = t.a - 1;
  const d2 = t.a * (t.n - 1);
  const f0 = t.msb / t.msw;
  const alpha = 1 - level;
  const lim = (fq: number): number => (f0 / fq - 1) / (f0 / fq + t.n - 1);
  return [lim(fQuantileEvenD2(1 - alpha / 2, d1, d2)), lim(fQuantileEvenD2(alpha / 2, d1, d2))];
}

const relClose = (actual: number, expected: number, tol: number): void => {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(tol * Math.abs(expected));
};

describe('the test\'s own references', () => {
  it('the even-d2 F series equals a Simpson-rule integral of the beta density (exact identity, checked numerically)', () => {
    // Beta(a, b) density with a = 5/2, b = 6 (F(5, 12)), B(a, b) = (b − 1)!/(a(a + 1)…(a + b − 1)) for integer b.
    const a = 2.5;
    const b = 6;
    let B = 120;
    for (let k = 0; k < b; k++) B /= a + k;
    const x = (5 * 3.1) / (5 * 3.1 + 12);
    const m = 20000; // Simpson on [0, x]; its error is about 5e-12 here.
    let s = 0;
    for (let i = 0; i <= m; i++) {
      const t = (x * i) / m;
      const w = i === 0 || i === m ? 1 : i % 2 === 1 ? 4 : 2;
      s += w * t ** (a - 1) * (1 - t) ** (b - 1);
    }
    const simpson = (s * x) / (3 * m) / B;
    // 1e-7 absolute: well above the quadrature error, well below any error in the series (order 1e-2 or more).
    expect(Math.abs(fCdfEvenD2(3.1, 5, 12) - simpson)).toBeLessThan(1e-7);
  });
  it('the ANOVA tables of the data: rails MSB 1862.1, MSW 16.1667; dyestuff MSB 11271.5, MSW 2451.25', () => {
    // Computed from the data; half a unit in the last quoted place.
    const r = balancedAnova(RAILS);
    const d = balancedAnova(DYESTUFF);
    expect(Math.abs(r.msb - 1862.1)).toBeLessThan(5e-2);
    expect(Math.abs(r.msw - 16.1667)).toBeLessThan(5e-5);
    expect(Math.abs(d.msb - 11271.5)).toBeLessThan(5e-2);
    expect(Math.abs(d.msw - 2451.25)).toBeLessThan(5e-3);
  });
});

describe('one-way random-effects fits reproduce the ANOVA identities and independent dense log-likelihoods', () => {
  it('rails (Devore 2000): REML between SD 24.805, within SD 4.0208, mean 66.5 (SE 10.171), logLik −61.0885', () => {
    const t = balancedAnova(RAILS);
    const f = fitRandomIntercept(oneWay(RAILS), oneWayOptions('reml'));
    expect(f.status).toBe('converged');
    const s2u = (t.msb - t.msw) / t.n;
    // Relative 1e-9 against the identity: the optimiser's stopping rule on log γ (about 1e-12) plus rounding.
    relClose(f.variance.subject, s2u, 1e-9);
    relClose(f.variance.residual, t.msw, 1e-9);
    relClose(f.fixedEffects[0]!.se, Math.sqrt(t.msb / t.N), 1e-9);
    // The quoted rounded figures, half a unit in the last place.
    expect(Math.abs(Math.sqrt(f.variance.subject) - 24.805)).toBeLessThan(5e-4);
    expect(Math.abs(Math.sqrt(f.variance.residual) - 4.0208)).toBeLessThan(5e-5);
    expect(Math.abs(f.fixedEffects[0]!.estimate - 66.5)).toBeLessThan(5e-2);
    expect(Math.abs(f.fixedEffects[0]!.se - 10.171)).toBeLessThan(5e-4);
    // The log-likelihood: the test's dense evaluation at the identity variances, then the quoted figure.
    const dense = denseLogLik(RAILS, s2u, t.msw, 'reml');
    expect(Math.abs(dense - -61.0885)).toBeLessThan(5e-5);
    // 1e-8 absolute on ℓ ≈ −61: the fit's variances differ from the identity by ~1e-13 relative, and ℓ is stationary
    // there, so only rounding in the dense n x n products (18 x 18) separates the two (about 4e-13 here).
    expect(Math.abs(f.logLik - dense)).toBeLessThan(1e-8);
  });
  it('rails (Devore 2000): ML logLik −64.2800 at the ML identity variances', () => {
    const t = balancedAnova(RAILS);
    const f = fitRandomIntercept(oneWay(RAILS), oneWayOptions('ml'));
    const s2u = ((1 - 1 / t.a) * t.msb - t.msw) / t.n;
    relClose(f.variance.subject, s2u, 1e-9); // stopping rule on log γ plus rounding, as above
    relClose(f.variance.residual, t.msw, 1e-9);
    const dense = denseLogLik(RAILS, s2u, t.msw, 'ml');
    expect(Math.abs(dense - -64.28)).toBeLessThan(5e-5);
    expect(Math.abs(f.logLik - dense)).toBeLessThan(1e-8); // as above: stationary point, rounding only
  });
  it('dyestuff (Davies 1947): REML between 1764.05, within 2451.25, mean 1527.5 (SE 19.383), logLik −159.827', () => {
    const t = balancedAnova(DYESTUFF);
    const f = fitRandomIntercept(oneWay(DYESTUFF), oneWayOptions('reml'));
    const s2u = (t.msb - t.msw) / t.n;
    relClose(f.variance.subject, s2u, 1e-9); // stopping rule on log γ plus rounding, as above
    relClose(f.variance.residual, t.msw, 1e-9);
    relClose(f.fixedEffects[0]!.se, Math.sqrt(t.msb / t.N), 1e-9);
    expect(Math.abs(f.variance.subject - 1764.05)).toBeLessThan(5e-3);
    expect(Math.abs(f.variance.residual - 2451.25)).toBeLessThan(5e-3);
    expect(Math.abs(f.fixedEffects[0]!.estimate - 1527.5)).toBeLessThan(5e-2);
    expect(Math.abs(f.fixedEffects[0]!.se - 19.383)).toBeLessThan(5e-4);
    const dense = denseLogLik(DYESTUFF, s2u, t.msw, 'reml');
    expect(Math.abs(dense - -159.827)).toBeLessThan(5e-4);
    // 1e-7 absolute on ℓ ≈ −160 with variances of order 2000 (30 x 30 dense products): rounding only, as above.
    expect(Math.abs(f.logLik - dense)).toBeLessThan(1e-7);
  });
  it('dyestuff (Davies 1947): ML between 1388.33 = ((1 − 1/a)·MSB − MSW)/n, logLik −163.664', () => {
    const t = balancedAnova(DYESTUFF);
    const f = fitRandomIntercept(oneWay(DYESTUFF), oneWayOptions('ml'));
    const s2u = ((1 - 1 / t.a) * t.msb - t.msw) / t.n;
    expect(Math.abs(s2u - 1388.33)).toBeLessThan(5e-3);
    relClose(f.variance.subject, s2u, 1e-9); // stopping rule on log γ plus rounding, as above
    expect(Math.abs(f.variance.subject - 1388.33)).toBeLessThan(5e-3);
    const dense = denseLogLik(DYESTUFF, s2u, t.msw, 'ml');
    expect(Math.abs(dense - -163.664)).toBeLessThan(5e-4);
    expect(Math.abs(f.logLik - dense)).toBeLessThan(1e-7); // as above
  });
  for (const [name, groups, quoted] of [
    ['rails (Devore 2000)', RAILS, [0.9744, 0.9051, 0.996]],
    ['dyestuff (Davies 1947)', DYESTUFF, [0.4185, 0.0838, 0.8479]],
  ] as const) {
    it(`${name}: the balanced one-way ICC interval is Searle's exact F-based one (Searle 1971): ${quoted[0]} (${quoted[1]}, ${quoted[2]})`, () => {
      const t = balancedAnova(groups);
      const v = fitRandomIntercept(oneWay(groups), oneWayOptions('reml')).variance;
      const [lower, upper] = iccLimits(t, 0.95);
      const icc = (t.msb - t.msw) / (t.msb + (t.n - 1) * t.msw);
      // Relative 1e-8 against the test's own computation: the stopping rule on log γ (~1e-12) in the ICC, and the
      // code's F quantiles come from an iterative inverse of the incomplete beta that differs from the exact bisection
      // here by up to about 3e-10 relative on these data.
      relClose(v.icc, icc, 1e-8);
      relClose(v.iccLower, lower, 1e-8);
      relClose(v.iccUpper, upper, 1e-8);
      // The quoted 4-decimal values, half a unit in the last place.
      expect(Math.abs(v.icc - quoted[0])).toBeLessThan(5e-5);
      expect(Math.abs(v.iccLower - quoted[1])).toBeLessThan(5e-5);
      expect(Math.abs(v.iccUpper - quoted[2])).toBeLessThan(5e-5);
    });
  }
  it('in balanced one-way data the intercept df is (subjects − 1) by Kenward–Roger (exact identity: the F test on group means)', () => {
    const f = fitRandomIntercept(oneWay(RAILS), oneWayOptions('reml'));
    expect(f.fixedEffects[0]!.df).toBeCloseTo(5, 8); // 1e-8: the optimiser's stopping rule leaves ~1e-12 in γ
  });
});
