/**
 * The between/within (containment) degrees of freedom (common practice for mixed models, from memory): between-
 * participant terms get participants − between columns, within-participant terms get measurements − participants −
 * within columns. In a balanced design with everyone seen at the same times these are the exact split-plot ANOVA df,
 * which Kenward–Roger also reproduces there (Kenward & Roger 1997, Biometrics 53:983–997) — the identity checked here.
 */
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { fitOptions, normals, seeded } from './helpers';

const TIMES = [0, 1, 2, 3];
const UNIT = 30.4375;

/** Invented balanced data: arms alternate over participants, everyone at TIMES, participant SD 6, within SD 2. */
function balanced(nArms: number, perArm: number, seed: number, covariate?: 'baseline' | 'varying'): ModelData {
  const z = normals(seeded(seed));
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [], cov: number[] = [];
  for (let i = 0; i < nArms * perArm; i++) {
    const a = i % nArms;
    const u = 6 * z();
    const base = 50 + 5 * z();
    for (const t of TIMES) {
      y.push(70 - 1.5 * t + a * 0.8 * t + 2 * a + u + 2 * z() + 0.1 * base);
      time.push(t);
      subject.push(i);
      arm.push(a);
      cov.push(covariate === 'varying' ? base + z() : base);
    }
  }
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: nArms * perArm,
    armIndex: Int32Array.from(arm),
    arms: ['A', 'B', 'C'].slice(0, nArms),
    covariates: covariate === undefined ? [] : [{ name: 'Cov', kind: 'numeric', values: Float64Array.from(cov) }],
  };
}

describe('containment df equal the exact df of a balanced design, as Kenward–Roger does (exact identity)', () => {
  const perArm = 5;
  const d = balanced(2, perArm, 11);
  const nSub = 2 * perArm;
  const N = d.y.length;
  const tbar = TIMES.reduce((s, t) => s + t, 0) / TIMES.length;
  const contrastDays = [{ label: 'Mean time', day: 1 + tbar * UNIT }];
  const cont = fitRandomIntercept(d, fitOptions({ dfMethod: 'containment', contrastDays }));
  const kr = fitRandomIntercept(d, fitOptions({ contrastDays }));

  it('the arm difference at the mean time gets participants − 2, and Kenward–Roger gives the same', () => {
    expect(cont.containment).toEqual({ betweenDf: nSub - 2, withinDf: N - nSub - 2 });
    expect(cont.treatmentEffects[0]!.df).toBe(nSub - 2);
    // 1e-6: the REML optimum is found to about 1e-10 in log γ; the KR df is a smooth function of it.
    expect(kr.treatmentEffects[0]!.df).toBeCloseTo(cont.treatmentEffects[0]!.df, 6);
  });

  it('time and time × arm get measurements − participants − 2, and Kenward–Roger gives the same', () => {
    const within = N - nSub - 2;
    const time = cont.fixedEffects.find((f) => f.kind === 'time')!;
    expect(time.df).toBe(within);
    expect(cont.slopeDifferences[0]!.df).toBe(within);
    // 1e-6 as above.
    expect(kr.fixedEffects.find((f) => f.kind === 'time')!.df).toBeCloseTo(within, 6);
    expect(kr.slopeDifferences[0]!.df).toBeCloseTo(within, 6);
  });

  it('the intercept and the arm term are between-participant terms; SEs are the unadjusted ones (as Satterthwaite)', () => {
    const arm = cont.fixedEffects.find((f) => f.kind === 'arm')!;
    expect(cont.fixedEffects[0]!.df).toBe(nSub - 2);
    expect(arm.df).toBe(nSub - 2);
    const sat = fitRandomIntercept(d, fitOptions({ dfMethod: 'satterthwaite' }));
    // Same Φ = (X'V⁻¹X)⁻¹ from the same fit: equal up to rounding.
    cont.fixedEffects.forEach((f, j) => expect(f.se).toBeCloseTo(sat.fixedEffects[j]!.se, 10));
  });

  it('the joint test of three arms’ slopes uses measurements − participants − 3, the exact within F test df', () => {
    const d3 = balanced(3, 4, 5);
    const fit = fitRandomIntercept(d3, fitOptions({ dfMethod: 'containment' }));
    const den = d3.y.length - d3.nSubjects - 3;
    expect(fit.jointTest!.denDf).toBe(den);
    const kr3 = fitRandomIntercept(d3, fitOptions());
    expect(kr3.jointTest!.denDf).toBeCloseTo(den, 5); // 1e-5: KR's m is a ratio of small differences of traces
    // Same Wald F as Kenward–Roger in a balanced design (Φ_A = Φ for within contrasts): rounding only.
    expect(fit.jointTest!.F).toBeCloseTo(kr3.jointTest!.F, 8);
  });
});

describe('containment df classify covariates by whether they change within a participant', () => {
  it('a covariate measured once per participant is a between-participant column', () => {
    const d = balanced(2, 5, 3, 'baseline');
    const fit = fitRandomIntercept(d, fitOptions({ dfMethod: 'containment' }));
    // between: intercept, arm, covariate (3); within: time, time × arm (2).
    expect(fit.containment).toEqual({ betweenDf: 10 - 3, withinDf: 40 - 10 - 2 });
    expect(fit.fixedEffects.find((f) => f.kind === 'covariate')!.df).toBe(7);
  });
  it('a covariate that changes from visit to visit is a within-participant column', () => {
    const d = balanced(2, 5, 3, 'varying');
    const fit = fitRandomIntercept(d, fitOptions({ dfMethod: 'containment' }));
    expect(fit.containment).toEqual({ betweenDf: 10 - 2, withinDf: 40 - 10 - 3 });
    expect(fit.fixedEffects.find((f) => f.kind === 'covariate')!.df).toBe(27);
  });
});
