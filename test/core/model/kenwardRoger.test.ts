/**
 * Kenward & Roger (1997, Biometrics 53:983–997) show that their approximation reproduces the exact F tests of
 * balanced designs. Checked here on invented balanced data: equal subjects per arm, identical visit times.
 */
import { Matrix, inverse } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, fUpper, type DfMethod, type ModelData } from '../../../src/core/model';
import { fitOptions, normals, seeded } from './helpers';

const TIMES = [0, 1, 2, 3];

function balanced(nArms: number, perArm: number, seed: number): ModelData {
  const z = normals(seeded(seed));
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < nArms * perArm; i++) {
    const a = i % nArms;
    const u = 6 * z();
    for (const t of TIMES) {
      y.push(70 - 1.5 * t + a * 0.8 * t + 2 * a + u + 2 * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: nArms * perArm,
    armIndex: Int32Array.from(arm),
    arms: ['A', 'B', 'C'].slice(0, nArms),
    covariates: [],
  };
}

function ols(X: number[][], y: number[]): number {
  const Xm = new Matrix(X);
  const ym = Matrix.columnVector(y);
  const b = inverse(Xm.transpose().mmul(Xm)).mmul(Xm.transpose().mmul(ym));
  const r = ym.sub(Xm.mmul(b));
  return r.transpose().mmul(r).get(0, 0);
}

describe('Kenward–Roger and Satterthwaite reproduce exact tests in balanced designs (exact identity)', () => {
  const perArm = 5;
  const d = balanced(2, perArm, 11);
  const nSub = 2 * perArm;
  const N = d.y.length;
  const tbar = TIMES.reduce((s, t) => s + t, 0) / TIMES.length;
  const unit = 30.4375;
  const contrastDays = [{ label: 'Mean time', day: 1 + tbar * unit }];

  // The two-sample t on per-subject means (exact test of the arm difference at the mean visit time).
  const means = Array.from({ length: nSub }, (_, i) => TIMES.reduce((s, _t, j) => s + d.y[i * TIMES.length + j]!, 0) / TIMES.length);
  const g0 = means.filter((_, i) => i % 2 === 0);
  const g1 = means.filter((_, i) => i % 2 === 1);
  const avg = (v: number[]): number => v.reduce((s, x) => s + x, 0) / v.length;
  const ss = (v: number[]): number => v.reduce((s, x) => s + (x - avg(v)) ** 2, 0);
  const sp2 = (ss(g0) + ss(g1)) / (nSub - 2);
  const tExact = (avg(g1) - avg(g0)) / Math.sqrt(sp2 * (2 / perArm));

  for (const dfMethod of ['kenward-roger', 'satterthwaite'] as DfMethod[]) {
    it(`${dfMethod}: the arm difference at the mean time has df = subjects − 2 and t² = the two-sample t² on subject means`, () => {
      const fit = fitRandomIntercept(d, { method: 'reml', dfMethod, level: 0.95, timeUnit: 'month', contrastDays });
      expect(fit.status).toBe('converged');
      const te = fit.treatmentEffects[0]!;
      // 1e-6: the REML optimum is found to ~1e-10 in log γ; df and t are smooth functions of it.
      expect(te.df).toBeCloseTo(nSub - 2, 6);
      expect(te.t ** 2).toBeCloseTo(tExact ** 2, 6);
    });
    it(`${dfMethod}: within-subject terms (time, time × arm) have df = the within-subject residual df N − subjects − 2`, () => {
      const fit = fitRandomIntercept(d, { method: 'reml', dfMethod, level: 0.95, timeUnit: 'month', contrastDays });
      const within = N - nSub - 2;
      // 1e-6: the REML optimum is found to about 1e-10 in log γ and the df is a smooth function of it.
      expect(fit.fixedEffects.find((f) => f.kind === 'time')!.df).toBeCloseTo(within, 6);
      expect(fit.slopeDifferences[0]!.df).toBeCloseTo(within, 6);
    });
  }

  it('kenward-roger: the joint test of the arm × time terms with three arms is the exact within-subject F test', () => {
    const d3 = balanced(3, 4, 5);
    const n3 = d3.y.length;
    const s3 = d3.nSubjects;
    const fit = fitRandomIntercept(d3, fitOptions());
    expect(fit.status).toBe('converged');
    // Exact F: subject dummies + common slope (reduced) vs subject dummies + arm-specific slopes (full), by OLS.
    const rowsFull: number[][] = [];
    const rowsRed: number[][] = [];
    for (let r = 0; r < n3; r++) {
      const dummies = Array.from({ length: s3 }, (_, i) => (d3.subject[r] === i ? 1 : 0));
      const t = d3.time[r]!;
      const a = d3.armIndex![r]!;
      rowsRed.push([...dummies, t]);
      rowsFull.push([...dummies, t, a === 1 ? t : 0, a === 2 ? t : 0]);
    }
    const y = Array.from(d3.y);
    const rssF = ols(rowsFull, y);
    const rssR = ols(rowsRed, y);
    const den = n3 - s3 - 3;
    const F = (rssR - rssF) / 2 / (rssF / den);
    const jt = fit.jointTest!;
    expect(jt.numDf).toBe(2);
    expect(jt.denDf).toBeCloseTo(den, 5); // 1e-5: m is a ratio of small differences of traces
    // 1e-6: F and p depend smoothly on the estimated γ, found to about 1e-10; the least-squares route is rounding only.
    expect(jt.F).toBeCloseTo(F, 6);
    expect(jt.p).toBeCloseTo(fUpper(F, 2, den), 6);
  });

  it('satterthwaite (Fai & Cornelius 1996) and residual joint tests give the same F; the former the within-subject df', () => {
    const d3 = balanced(3, 4, 5);
    const opts = { method: 'reml', level: 0.95, timeUnit: 'month', contrastDays: [] } as const;
    const kr = fitRandomIntercept(d3, { ...opts, dfMethod: 'kenward-roger' }).jointTest!;
    const sat = fitRandomIntercept(d3, { ...opts, dfMethod: 'satterthwaite' }).jointTest!;
    const res = fitRandomIntercept(d3, { ...opts, dfMethod: 'residual' }).jointTest!;
    // Balanced: Φ_A = Φ for these within-subject contrasts, so all three Wald F values agree (rounding only).
    expect(sat.F).toBeCloseTo(kr.F, 8);
    expect(res.F).toBeCloseTo(kr.F, 8);
    // 1e-5: a ratio of small differences of traces, so a little looser than the df above.
    expect(sat.denDf).toBeCloseTo(kr.denDf, 5);
    expect(res.denDf).toBe(d3.y.length - 6); // residual df: N − p with p = 6 fixed effects
  });
});
