/**
 * The results JSON's variance section (modelJson.ts, README "Results JSON"): every variance and the ICC with its
 * interval and how it was computed, an unbounded limit as null with its reason, and the test at zero.
 */
import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { modelJson } from '../../../src/core/report/modelJson';
import { DYESTUFF, fitOptions, oneWay, oneWayOptions } from '../model/helpers';

type Entry = { estimate: number | null; lower: number | null; upper: number | null; intervalMethod: string; note: string | null };
type Variance = { intervals: { subject: Entry; residual: Entry; icc: Entry }; zeroTest: { statistic: number; p: number } };

describe('modelJson variance.intervals and variance.zeroTest', () => {
  it('balanced one-way data: σ² exact chi-square, ICC exact F, σ²_u profile; the entries repeat the flat keys', () => {
    const fit = fitRandomIntercept(oneWay(DYESTUFF), oneWayOptions());
    const v = modelJson(fit).variance as Variance & Record<string, number>;
    expect(v.intervals.subject).toEqual({ estimate: v.subject, lower: v.subjectLower, upper: v.subjectUpper, intervalMethod: 'profile-likelihood', note: null });
    expect(v.intervals.residual).toEqual({ estimate: v.residual, lower: v.residualLower, upper: v.residualUpper, intervalMethod: 'exact-chi-square', note: null });
    expect(v.intervals.icc).toEqual({ estimate: v.icc, lower: v.iccLower, upper: v.iccUpper, intervalMethod: 'exact-f', note: null });
    expect(v.zeroTest.statistic).toBeGreaterThan(0);
    expect(JSON.parse(JSON.stringify(v))).toEqual(v);
  });
  it('an upper limit the data do not give is null with its reason in note (never a huge number)', () => {
    // Invented: two participants, one per arm, so the arm takes up all between-participant variation.
    const d: ModelData = { y: Float64Array.of(50, 52, 49, 70, 69, 73), time: Float64Array.of(0, 3, 6, 0, 3, 6), subject: Int32Array.of(0, 0, 0, 1, 1, 1), nSubjects: 2, armIndex: Int32Array.of(0, 0, 0, 1, 1, 1), arms: ['A', 'B'], covariates: [] };
    const v = modelJson(fitRandomIntercept(d, fitOptions())).variance as Variance;
    expect(v.intervals.subject.upper).toBeNull();
    expect(v.intervals.subject.note).toMatch(/unbounded/);
    expect(v.intervals.icc.upper).toBe(1);
    expect(v.intervals.icc.note).toMatch(/given as 1/);
    expect(JSON.stringify(v)).not.toMatch(/NaN|Infinity/);
  });
});
