import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { DegenerateDataError, fitRandomIntercept, fUpper, tTwoSided, type FitOptions, type ModelData, type ModelFit } from '../../../src/core/model';
import { normalUpperTail } from '../../../src/core/model/distributions';
import { fitOptions, normals, RAILS, oneWay, oneWayOptions, seeded } from './helpers';

/** Invented: 6 participants x 4 visits at months 0, 1, 2, 3, values from `value(participant, visit)`. */
function grid(value: (i: number, j: number) => number, nSubjects = 6): ModelData {
  const y: number[] = [], time: number[] = [], subject: number[] = [];
  for (let i = 0; i < nSubjects; i++) {
    for (let j = 0; j < 4; j++) {
      y.push(value(i, j));
      time.push(j + 0.1 * (i % 3));
      subject.push(i);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects, armIndex: null, arms: [], covariates: [] };
}
/** A fixed, irregular pattern of order 1 (invented). */
const wiggle = (i: number, j: number): number => Math.sin(i * 7 + j * 3) + 0.5 * Math.cos(i * 2.3);

function refusal(data: ModelData, opts: FitOptions = fitOptions()): DegenerateDataError {
  try {
    fitRandomIntercept(data, opts);
  } catch (e) {
    if (e instanceof DegenerateDataError) return e;
    throw e;
  }
  throw new Error('expected the fit to be refused');
}

describe('degenerate data give no model and a plain reason, never wrong numbers', () => {
  it('all values identical: no model (regression: within-participant variance −4.2e-14, inverted intervals, SE 0, p = 0, "converged")', () => {
    const e = refusal(grid(() => 5));
    expect(e.reason).toBe('no-variation');
    expect(e.message).toBe('all 24 values are equal (5), so there is no variation for the model to describe');
  });

  it('values around 1e-300, 1e160 and 1e307: no model (regression: SE 0 and p = 0; null SEs shown as "converged at the zero boundary")', () => {
    for (const size of [1e-300, 1e160, -1e160, 1e307]) { // 24 values of ~1e307 overflow a plain sum: the running mean takes over
      const e = refusal(grid((i, j) => size * (1 + wiggle(i, j))));
      expect(e.reason).toBe('out-of-range');
      expect(e.message).toMatch(/rescale the values/);
    }
  });

  it('variation below the floating-point resolution of the values (1e9 ± 1e-7): no model', () => {
    const e = refusal(grid((i, j) => 1e9 + 1e-7 * wiggle(i, j)));
    expect(e.reason).toBe('below-resolution');
    expect(e.message).toMatch(/mostly rounding/);
  });

  it('values exactly on each participant’s line (no within-participant variation): no model rather than a "failed" fit with NaN', () => {
    const e = refusal(grid((i, j) => 40 + 3 * i + 2 * (j + 0.1 * (i % 3))));
    expect(e.reason).toBe('no-variation');
    expect(e.message).toMatch(/no within-participant variation/);
  });

  it('one participant: no model, saying plainly that there is no between-participant variance to estimate', () => {
    const e = refusal(grid((i, j) => 10 + wiggle(i, j), 1));
    expect(e.reason).toBe('one-subject');
    expect(e.message).toMatch(/only one participant/);
    expect(e.message).toMatch(/no between-participant variance to estimate/);
  });
});

describe('centring and scaling inside the fit: results on the original scale at any magnitude', () => {
  // Exact identity (equivariance of the model): for y* = a + b·y (b > 0) the estimates are b·β (+ a on the intercept),
  // SEs and limits scale by b, variances by b², t, df, p and the ICC are unchanged, and the log-likelihood gains the
  // Jacobian −(N − p) log b (REML; −N log b for ML). Relative tolerance 1e-8: the optimiser fixes log γ to ~1e-10, and
  // both fits run on the same scaled data up to rounding of the affine map (~1e-15), so agreement is far tighter
  // than 1e-8; 1e-8 leaves room for the df and quantile routines' own iteration.
  const base = oneWay(RAILS);
  const close = (a: number, b: number, rel = 1e-8): void => {
    expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(Math.abs(a), Math.abs(b), 1e-300));
  };
  for (const [a, b] of [[1e9, 1], [0, 1e100], [-3e120, 1e120], [0, 1e-100], [1e-97, 1e-100]] as const) {
    it(`the rails data (Devore 2000) mapped to ${a} + ${b}·y give the mapped fit (exact identity)`, () => {
      const ref = fitRandomIntercept(base, oneWayOptions());
      const f = fitRandomIntercept({ ...base, y: base.y.map((v) => a + b * v) }, oneWayOptions());
      const r0 = ref.fixedEffects[0]!;
      const f0 = f.fixedEffects[0]!;
      close(f0.estimate, a + b * r0.estimate);
      close(f0.se, b * r0.se);
      close(f0.df, r0.df);
      close(f0.lower, a + b * r0.lower);
      close(f0.upper, a + b * r0.upper);
      close(f.variance.subject, b * b * ref.variance.subject);
      close(f.variance.residual, b * b * ref.variance.residual);
      close(f.variance.residualUpper, b * b * ref.variance.residualUpper);
      close(f.variance.icc, ref.variance.icc);
      close(f.logLik, ref.logLik - (ref.nObservations - 1) * Math.log(b), 1e-10);
    });
  }

  it('rescaling time by c divides the slope and its SE by c and shifts the REML log-likelihood by −log c (exact identity)', () => {
    const u = normals(seeded(7));
    const d = grid((i, j) => 50 + 4 * u() + (j + 0.1 * (i % 3)) * 1.5 + 2 * i);
    const ref = fitRandomIntercept(d, fitOptions());
    for (const c of [1e-6, 1e6]) {
      const f = fitRandomIntercept({ ...d, time: d.time.map((t) => c * t) }, fitOptions());
      const [r1, f1] = [ref.fixedEffects[1]!, f.fixedEffects[1]!];
      close(f1.estimate, r1.estimate / c);
      close(f1.se, r1.se / c);
      close(f1.p, r1.p);
      close(f.fixedEffects[0]!.estimate, ref.fixedEffects[0]!.estimate);
      // Exact identity for REML without a log|X'X| term: X* = X·diag(1, c), so log|X*'V⁻¹X*| = log|X'V⁻¹X| + 2 log c
      // and ℓ* = ℓ − log c (the ML likelihood would not change).
      close(f.logLik, ref.logLik - Math.log(c), 1e-10);
    }
  });
});

describe('p-values are never 0 and never above 1', () => {
  it('normalUpperTail keeps full precision far into the tail (normal tail values Q(3), Q(5), Q(10), Q(20), from memory of standard tables)', () => {
    // Relative tolerance 1e-12: the 200-term continued fraction converges to rounding from z = 3 on; 1 − Φ(z) below 3
    // is accurate to ~1e-16 absolute on values above 1e-3.
    const ref: [number, number][] = [[3, 1.3498980316300946e-3], [5, 2.866515718791939e-7], [10, 7.619853024160527e-24], [20, 2.7536241186062e-89]];
    for (const [z, q] of ref) expect(Math.abs(normalUpperTail(z) - q) / q).toBeLessThan(1e-12);
  });
  it('a tail probability that underflows is reported as the smallest positive double, 2^-1074 (the documented rule)', () => {
    expect(tTwoSided(1e200, 3)).toBe(Number.MIN_VALUE);
    expect(tTwoSided(Infinity, 3)).toBe(Number.MIN_VALUE);
    expect(tTwoSided(60, Infinity)).toBe(Number.MIN_VALUE);
    expect(fUpper(1e300, 2, 5)).toBe(Number.MIN_VALUE);
    expect(tTwoSided(0, 7)).toBe(1);
  });
});

// Property test: over generated small data sets — constant responses, tiny and huge magnitudes, large offsets, one or
// several participants, blinded or two arms — every fit either is refused with a reason (DegenerateDataError, or status
// 'failed' with its message) or satisfies: variances ≥ 0 (within-participant > 0), lower ≤ estimate ≤ upper for every
// interval, 0 < p ≤ 1. Exact inequalities, no tolerance.
describe('fit properties on generated data', () => {
  const dataArb = fc
    .record({
      nSubjects: fc.integer({ min: 1, max: 8 }),
      visits: fc.integer({ min: 1, max: 5 }),
      size: fc.constantFrom(1e-300, 1e-160, 1e-100, 1e-20, 1e-6, 1, 1e6, 1e20, 1e100, 1e160, 1e300),
      offset: fc.constantFrom(0, 1, 1e9, -1e15),
      constant: fc.integer({ min: 0, max: 5 }).map((k) => k === 0),
      armed: fc.boolean(),
      seed: fc.integer({ min: 1, max: 1_000_000 }),
      method: fc.constantFrom<'reml' | 'ml'>('reml', 'ml'),
      dfMethod: fc.constantFrom<'kenward-roger' | 'satterthwaite' | 'residual'>('kenward-roger', 'satterthwaite', 'residual'),
    });
  it('every fit has variances ≥ 0, lower ≤ estimate ≤ upper and 0 < p ≤ 1, or no model with a reason', () => {
    const seen = { fitted: 0, refused: 0 };
    fc.assert(
      fc.property(dataArb, (g) => {
        const z = normals(seeded(g.seed));
        const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
        for (let i = 0; i < g.nSubjects; i++) {
          const ui = z();
          for (let j = 0; j < g.visits; j++) {
            y.push(g.constant ? g.offset + g.size : g.offset + g.size * (ui + z() + 0.3 * j));
            time.push(j + 0.05 * i);
            subject.push(i);
            arm.push(i % 2);
          }
        }
        const armed = g.armed && g.nSubjects >= 4;
        const data: ModelData = {
          y: Float64Array.from(y),
          time: Float64Array.from(time),
          subject: Int32Array.from(subject),
          nSubjects: g.nSubjects,
          armIndex: armed ? Int32Array.from(arm) : null,
          arms: armed ? ['A', 'B'] : [],
          covariates: [],
        };
        let fit: ModelFit;
        try {
          fit = fitRandomIntercept(data, fitOptions({ method: g.method, dfMethod: g.dfMethod, contrastDays: [{ label: 'Month 2', day: 61 }] }));
        } catch (e) {
          if (e instanceof DegenerateDataError) {
            expect(e.message.length).toBeGreaterThan(20);
            seen.refused++;
            return;
          }
          // Too few observations or a design without full rank (e.g. one visit each) is misuse-level refusal.
          expect((e as Error).name).toMatch(/ModelInputError|RankDeficiencyError/);
          return;
        }
        if (fit.status === 'failed') {
          expect(fit.message.length).toBeGreaterThan(20);
          return;
        }
        const v = fit.variance;
        expect(v.residual).toBeGreaterThan(0);
        expect(v.subject).toBeGreaterThanOrEqual(0);
        for (const [lo, est, hi] of [[v.subjectLower, v.subject, v.subjectUpper], [v.residualLower, v.residual, v.residualUpper], [v.iccLower, v.icc, v.iccUpper]] as const) {
          expect(lo).toBeLessThanOrEqual(est);
          expect(est).toBeLessThanOrEqual(hi);
        }
        for (const r of [...fit.fixedEffects, ...fit.treatmentEffects, ...fit.slopeDifferences]) {
          expect(r.lower).toBeLessThanOrEqual(r.estimate);
          expect(r.estimate).toBeLessThanOrEqual(r.upper);
          expect(r.se).toBeGreaterThan(0);
          expect(r.p).toBeGreaterThan(0);
          expect(r.p).toBeLessThanOrEqual(1);
        }
        expect(Number.isFinite(fit.logLik)).toBe(true);
        seen.fitted++;
      }),
      { numRuns: 300, seed: 20260301 },
    );
    // Both branches are exercised (the generator mixes good and degenerate data), so the property is not vacuous.
    expect(seen.fitted).toBeGreaterThan(30);
    expect(seen.refused).toBeGreaterThan(30);
  });
});
