import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, ModelInputError, RankDeficiencyError, type FitOptions, type ModelData } from '../../../src/core/model';
import { checkRank } from '../../../src/core/model/pivotedCholesky';

const opts: FitOptions = { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'month', contrastDays: [{ label: 'Week 24', day: 169 }] };

/** Invented: 6 subjects, 3 visits each, two arms, with a covariate that copies the arm indicator. */
function data(withCopy: boolean): ModelData {
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 6; i++) for (let j = 0; j < 3; j++) {
    y.push(50 + i + j * (i % 2 ? 1 : 2) + ((i * 7 + j * 3) % 5));
    time.push(j * 2 + 0.1 * i);
    subject.push(i);
    arm.push(i % 2);
  }
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: 6,
    armIndex: Int32Array.from(arm),
    arms: ['Placebo', 'Drug'],
    covariates: withCopy ? [{ name: 'Treated flag', kind: 'numeric', values: Float64Array.from(arm) }] : [],
  };
}

describe('misuse throws typed errors; inputs are never mutated', () => {
  it('a rank-deficient design throws RankDeficiencyError naming exactly the dependent columns', () => {
    let err: unknown;
    try {
      fitRandomIntercept(data(true), opts);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(RankDeficiencyError);
    expect((err as RankDeficiencyError).columns).toEqual(['Arm Drug vs Placebo', 'Treated flag']);
    expect((err as Error).message).toContain('"Treated flag"');
  });
  it('checkRank finds a dependence among three columns (exact identity: c = a + b)', () => {
    // X columns a = [1,1,1,1], b = [0,1,2,3], c = a + b; X'X written out by hand.
    const xtx = Float64Array.of(4, 6, 10, 6, 14, 20, 10, 20, 30);
    expect(checkRank(xtx, 3)).toEqual({ rank: 2, dependent: [0, 1, 2] });
    expect(checkRank(Float64Array.of(4, 6, 6, 14), 2)).toEqual({ rank: 2, dependent: [] });
  });
  it('wrong lengths, bad indices, non-finite values and impossible options throw ModelInputError', () => {
    const d = data(false);
    expect(() => fitRandomIntercept({ ...d, time: new Float64Array(3) }, opts)).toThrow(ModelInputError);
    expect(() => fitRandomIntercept({ ...d, subject: Int32Array.from(d.subject, (s) => s + 1) }, opts)).toThrow(/outside 0..5/);
    const y = Float64Array.from(d.y);
    y[4] = NaN;
    expect(() => fitRandomIntercept({ ...d, y }, opts)).toThrow(/observation 5/);
    expect(() => fitRandomIntercept(d, { ...opts, level: 1 })).toThrow(ModelInputError);
    expect(() => fitRandomIntercept({ ...d, covariates: [{ name: 'Sex', kind: 'categorical', values: new Array<string>(18).fill('F'), levels: ['M'] }] }, opts)).toThrow(/Sex/);
  });
  it('fitRandomIntercept does not mutate its inputs', () => {
    const d = data(false);
    const copy = { y: Float64Array.from(d.y), time: Float64Array.from(d.time), subject: Int32Array.from(d.subject), arm: Int32Array.from(d.armIndex!) };
    const o = structuredClone(opts);
    fitRandomIntercept(d, opts);
    expect(d.y).toEqual(copy.y);
    expect(d.time).toEqual(copy.time);
    expect(d.subject).toEqual(copy.subject);
    expect(d.armIndex).toEqual(copy.arm);
    expect(opts).toEqual(o);
  });
});
