import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { dfMethodNote } from '../../../src/core/report/dfNotes';
import { modelJson } from '../../../src/core/report/modelJson';
import { modelExtraBlocks } from '../../../src/core/report/modelExtras';
import { naiveSentences } from '../../../src/core/report/naiveReport';
import { fitOptions, normals, seeded } from '../model/helpers';

/** Invented high-ICC data: 16 participants in two arms, 4 visits, participant SD 10, within SD 1. */
function highIcc(): ModelData {
  const z = normals(seeded(9));
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 16; i++) {
    const u = 10 * z();
    for (let v = 0; v < 4; v++) {
      y.push(30 + u - v + (i % 2) * 0.5 * v + z());
      time.push(v);
      subject.push(i);
      arm.push(i % 2);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: 16, armIndex: Int32Array.from(arm), arms: ['Control', 'Active'], covariates: [] };
}

describe('the naive fit on the model sheet and in the JSON', () => {
  const fit = fitRandomIntercept(highIcc(), fitOptions());

  it('JSON model.naive.fixedEffects lists {term, estimate, se, seRatio} for every term', () => {
    const naive = modelJson(fit).naive as { fixedEffects: Record<string, unknown>[] };
    expect(naive.fixedEffects.map((f) => Object.keys(f))).toEqual(fit.terms.map(() => ['term', 'estimate', 'se', 'seRatio']));
    expect(naive.fixedEffects.map((f) => f.term)).toEqual(fit.terms.map((t) => t.name));
  });

  it('says the naive SE is too small for the arm and too large for time when the ICC is high', () => {
    const [between, within] = naiveSentences(fit);
    expect(between).toMatch(/compare participants with one another \(Arm Active vs Control\).*too small/);
    expect(within).toMatch(/same participant over time \(Time, Time × arm Active\).*too large/);
  });
});

describe('the note on the degrees-of-freedom method', () => {
  it('flags Kenward–Roger after ML and residual df as liberal, and nothing for the standard choices', () => {
    expect(dfMethodNote('ml', 'kenward-roger')).toMatch(/defined for a REML fit/);
    expect(dfMethodNote('reml', 'residual')).toMatch(/too many: intervals come out too narrow/);
    expect(dfMethodNote('reml', 'kenward-roger')).toBeNull();
    expect(dfMethodNote('ml', 'satterthwaite')).toBeNull();
    expect(dfMethodNote('reml', 'containment')).toBeNull();
  });
  it('appears on the model sheet of an ML fit with Kenward–Roger df', () => {
    const fit = fitRandomIntercept(highIcc(), fitOptions({ method: 'ml' }));
    const first = modelExtraBlocks(fit, [], 'unblinded', 'month')[0]!;
    expect(first.kind === 'paragraph' ? first.text : '').toMatch(/^About the degrees of freedom: Kenward–Roger degrees of freedom are defined for a REML fit/);
  });
});
