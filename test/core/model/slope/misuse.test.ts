/**
 * The slope model's failure channels: misuse throws a typed error naming the problem, data that cannot give the model
 * throw DegenerateDataError with a plain reason, and per-participant outputs hold together (exact identities).
 */
import { describe, expect, it } from 'vitest';
import { DegenerateDataError, ModelInputError, type ModelData } from '../../../../src/core/model';
import { fitRandomSlope } from '../../../../src/core/model/slope';
import { fitOptions, normals, seeded } from '../helpers';

function data(m = 10, times = [0, 2, 4, 6]): ModelData {
  const z = normals(seeded(9));
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < m; i++) {
    const u0 = 4 * z();
    const u1 = 0.8 * z();
    for (const t of times) {
      y.push(50 + u0 + (u1 - 0.5) * t + z());
      time.push(t);
      subject.push(i);
      arm.push(i % 2);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: m, armIndex: Int32Array.from(arm), arms: ['A', 'B'], covariates: [] };
}

describe('slope model: misuse and data that cannot give the model', () => {
  it('a subject or arm index out of range throws ModelInputError naming the observation', () => {
    const d = data();
    const badSubject = Int32Array.from(d.subject);
    badSubject[5] = 99;
    expect(() => fitRandomSlope({ ...d, subject: badSubject }, fitOptions())).toThrow(ModelInputError);
    const badArm = Int32Array.from(d.armIndex!);
    badArm[7] = 3;
    expect(() => fitRandomSlope({ ...d, armIndex: badArm }, fitOptions())).toThrow(ModelInputError);
  });

  it("design 'intercept-only' is refused: the slope needs time in the design", () => {
    expect(() => fitRandomSlope(data(), fitOptions({ design: 'intercept-only' }))).toThrow(/needs time/);
  });

  it('everyone measured at one time only (repeats on the same day): no rate of change to estimate, DegenerateDataError', () => {
    const d = data(8, [3, 3]);
    let err: unknown;
    try {
      fitRandomSlope({ ...d, armIndex: null, arms: [] }, fitOptions());
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(DegenerateDataError);
  });

  it('per-participant predictions and residuals hold together: each mean residual is the mean of that participant\'s residuals', () => {
    const d = data();
    const fit = fitRandomSlope(d, fitOptions({ residuals: true }));
    expect(fit.subjects).toHaveLength(10);
    const res = fit.residuals!;
    for (let i = 0; i < 10; i++) {
      let sum = 0;
      let n = 0;
      for (let r = 0; r < res.length; r++) if (d.subject[r] === i) { sum += res[r]!; n++; }
      // Exact identity up to rounding (two routes through the same sums).
      expect(Math.abs(fit.subjects[i]!.meanResidual - sum / n)).toBeLessThan(1e-9);
    }
    expect(fit.subjects.every((s) => Number.isFinite(s.slopeBlup))).toBe(true);
  });
});
