import { describe, expect, it } from 'vitest';
import type { IntakeTable } from '../../../src/core/intake/types';
import { fitFromTable, fitRandomIntercept, modelDataFromTable, ModelInputError, type FitOptions } from '../../../src/core/model';

/** An invented intake table: 6 patients (P01..P06) x 4 visits on days 1, 85, 169, 253; arms "Drug" first seen. */
function table(): IntakeTable {
  const subject: string[] = [], arm: string[] = [], value: number[] = [], day: number[] = [], site: string[] = [];
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < 4; j++) {
      subject.push(`P0${i + 1}`);
      arm.push(i % 2 === 0 ? 'Drug' : 'Placebo');
      value.push(60 + i * 1.5 - j * (i % 2 === 0 ? 0.5 : 1.2) + ((i * 3 + j * 5) % 4));
      day.push(1 + 84 * j + (i % 3));
      site.push(i < 3 ? 'S1' : 'S2');
    }
  }
  const n = subject.length;
  const ids = [...new Set(subject)];
  const usableModel = new Uint8Array(n).fill(1);
  usableModel[5] = 0; // a row with a blank value, say
  return {
    nRows: n,
    headers: ['USUBJID', 'ARM', 'ADY', 'AVAL', 'SITE'],
    mapping: { subject: 0, arm: 1, studyDay: 2, value: 3, site: 4, covariates: [] },
    mode: 'unblinded',
    sheetRows: Int32Array.from({ length: n }, (_, i) => i + 2),
    subject,
    subjectIndex: Int32Array.from(subject, (s) => ids.indexOf(s)),
    subjectIds: ids,
    timeKind: 'studyDay',
    date: new Float64Array(n).fill(NaN),
    studyDay: Float64Array.from(day),
    reference: new Float64Array(n).fill(NaN),
    visit: null,
    value: Float64Array.from(value),
    arm,
    arms: ['Drug', 'Placebo'],
    site,
    covariates: [{ name: 'Region', kind: 'categorical', values: site.map((s) => (s === 'S1' ? 'North' : 'South')), levels: ['East', 'North', 'South'] }],
    usableTiming: new Uint8Array(n).fill(1),
    usableModel,
    subjectExit: new Float64Array(ids.length).fill(NaN),
    subjectExitStatus: null,
    subjectExitReason: null,
  };
}

const opts: FitOptions & { referenceArm?: string } = { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'week', contrastDays: [{ label: 'Week 36', day: 253 }], referenceArm: 'Placebo' };

describe('fitFromTable builds the model columns from the intake table', () => {
  const t = table();
  const include = new Uint8Array(t.nRows).fill(1);
  include[0] = 0;
  // Calendar offsets from the reference date: study day d ≥ 1 is offset d − 1 (CDISC SDTM IG study-day rule).
  const days = Float64Array.from(t.studyDay, (d) => d - 1);
  days[10] = NaN;

  it('uses only rows that are included, usable for the model and have a finite offset; time = offset/7 in weeks (study day 1 is time 0)', () => {
    const d = modelDataFromTable(t, days, include, 'week', 'Placebo');
    expect(d.y.length).toBe(24 - 3);
    expect(Array.from(d.time.slice(0, 3))).toEqual([84 / 7, 168 / 7, 252 / 7]); // first row excluded; P01 days 85, 169, 253
    expect(d.subjectIds).toEqual(['P01', 'P02', 'P03', 'P04', 'P05', 'P06']);
    // Exactly the documented rows, in table order: all but row 0 (not included), 5 (not usable) and 10 (no study day).
    const kept = Array.from({ length: 24 }, (_, i) => i).filter((i) => i !== 0 && i !== 5 && i !== 10);
    expect(Array.from(d.y)).toEqual(kept.map((i) => t.value[i]!));
    expect(Array.from(d.time)).toEqual(kept.map((i) => (t.studyDay[i]! - 1) / 7));
  });
  it('puts the chosen reference arm first and codes the arm index against it', () => {
    const d = modelDataFromTable(t, days, include, 'week', 'Placebo');
    expect(d.arms).toEqual(['Placebo', 'Drug']);
    expect(d.armIndex![0]).toBe(1); // P01 is on Drug
    const byDefault = modelDataFromTable(t, days, include, 'week');
    expect(byDefault.arms).toEqual(['Drug', 'Placebo']);
  });
  it('keeps only the categorical levels present among the rows (so no empty indicator column)', () => {
    const d = modelDataFromTable(t, days, include, 'week');
    const c = d.covariates[0]!;
    expect(c.kind === 'categorical' ? c.levels : []).toEqual(['North', 'South']);
  });
  it('gives the same fit as fitRandomIntercept on the same columns, with the table subject ids', () => {
    const a = fitFromTable(t, days, include, opts);
    const b = fitRandomIntercept(modelDataFromTable(t, days, include, 'week', 'Placebo'), opts);
    expect(a.fixedEffects).toEqual(b.fixedEffects);
    expect(a.subjects.map((s) => s.id)).toEqual(['P01', 'P02', 'P03', 'P04', 'P05', 'P06']);
    expect(a.treatmentEffects[0]!.arm).toBe('Drug');
    expect(a.treatmentEffects[0]!.time).toBe(252 / 7);
  });
  it('blinded tables give no arm terms; an unknown reference arm or no usable rows throws ModelInputError', () => {
    const blind = fitFromTable({ ...t, mode: 'blinded', arm: null, arms: [] }, days, include, opts);
    expect(blind.terms.some((x) => x.kind === 'arm')).toBe(false);
    expect(() => fitFromTable(t, days, include, { ...opts, referenceArm: 'Sham' })).toThrow(/Sham/);
    expect(() => fitFromTable(t, days, new Uint8Array(t.nRows), opts)).toThrow(ModelInputError);
  });
  it('does not mutate the table, the study days or the include mask', () => {
    const before = JSON.stringify({ ...t, value: Array.from(t.value), usableModel: Array.from(t.usableModel) });
    const d0 = Array.from(days);
    const i0 = Array.from(include);
    fitFromTable(t, days, include, opts);
    expect(JSON.stringify({ ...t, value: Array.from(t.value), usableModel: Array.from(t.usableModel) })).toBe(before);
    expect(Array.from(days)).toEqual(d0);
    expect(Array.from(include)).toEqual(i0);
  });
  it('per-subject results behave as plain data: present in JSON and in a spread copy', () => {
    const fit = fitFromTable(t, days, include, opts);
    const json = JSON.parse(JSON.stringify(fit)) as { subjects: { id: string }[] };
    expect(json.subjects.map((s) => s.id)).toEqual(['P01', 'P02', 'P03', 'P04', 'P05', 'P06']);
    expect({ ...fit }.subjects).toEqual(fit.subjects);
  });
});
