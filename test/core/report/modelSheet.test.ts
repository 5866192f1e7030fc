import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type FitOptions, type ModelData, type ModelFit } from '../../../src/core/model';
import { CAUTIONS, UNBLINDED_CAUTION, cautionLine } from '../../../src/core/report/cautions';
import { modelJson } from '../../../src/core/report/modelJson';
import { ModelReportError, modelSheets, modelTechnicalNotes, type ModelSheetContext } from '../../../src/core/report/modelSheet';
import { fitVerdict, num, pPhrase } from '../../../src/core/report/modelText';
import { formatCell } from '../../../src/core/report/formats';
import type { TableBlock } from '../../../src/core/report/types';
import { normals, seeded } from '../model/helpers';

/** Invented kidney-function scenario: eGFR every 12 weeks in 30 participants, two arms (invented data). */
function egfr(): ModelData {
  const u = seeded(42);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [];
  for (let i = 0; i < 30; i++) {
    const a = i % 2;
    const ui = 9 * z();
    for (let v = 0; v < 5; v++) {
      const day = 1 + 84 * v + Math.round(4 * z());
      const t = (day - 1) / 30.4375;
      y.push(55 + ui - 0.5 * t + a * 0.3 * t + 3 * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: 30, armIndex: Int32Array.from(arm), arms: ['Placebo', 'Drug'], covariates: [], subjectIds: Array.from({ length: 30 }, (_, i) => `K-${100 + i}`) };
}

const visits = [{ label: 'Week 12', day: 85 }, { label: 'Week 24', day: 169 }, { label: 'Week 36', day: 253 }, { label: 'Week 48', day: 337 }];
const opts: FitOptions = { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'month', contrastDays: visits };
const observed = visits.flatMap((v) => ['Placebo', 'Drug'].map((arm) => ({ label: v.label, day: v.day, arm, mean: 55, n: 15 })));
const ctx = (mode: 'blinded' | 'unblinded', perSubject: boolean): ModelSheetContext => ({ observed, mode, perSubject, subjectIds: [] });

function tables(fitSheets: ReturnType<typeof modelSheets>): TableBlock[] {
  return fitSheets.flatMap((s) => s.blocks.filter((b): b is TableBlock => b.kind === 'table'));
}

describe('modelSheets', () => {
  const fit: ModelFit = fitRandomIntercept(egfr(), opts);

  it('opens with a plain paragraph naming participants, measurements and the last-visit difference with its interval', () => {
    const [sheet] = modelSheets(fit, ctx('unblinded', false));
    expect(sheet!.name).toBe('Model results');
    const first = sheet!.blocks[1]!;
    expect(first.kind).toBe('paragraph');
    const text = first.kind === 'paragraph' ? first.text : '';
    expect(text).toContain('150 measurements from 30 participants');
    const last = fit.treatmentEffects.find((t) => t.label === 'Week 48')!;
    expect(text).toContain('At Week 48 (study day 337) the mean of Drug differed from Placebo');
    expect(text).toContain(`by ${num(last.estimate)} (95% confidence interval ${num(last.lower)} to ${num(last.upper)}; ${pPhrase(last.p)})`);
    expect(text).toMatch(/cautions on the summary sheet: an interim look is not a final analysis/);
  });

  it('opens each sheet with the one-line caution linked to the summary sheet (unblinded words in unblinded mode only), never the full cautions', () => {
    const blind = fitRandomIntercept({ ...egfr(), armIndex: null, arms: [] }, opts);
    const sheetsOf = (mode: 'blinded' | 'unblinded') => modelSheets(mode === 'blinded' ? blind : fit, ctx(mode, true));
    for (const mode of ['blinded', 'unblinded'] as const) {
      // Both sheets (results and per participant) open with it.
      const sheets = sheetsOf(mode);
      expect(sheets).toHaveLength(2);
      for (const sh of sheets) {
        expect(sh.blocks[0]).toEqual(cautionLine(mode));
        const texts = sh.blocks.flatMap((b) => (b.kind === 'paragraph' ? [b.text] : []));
        for (const c of [...CAUTIONS, UNBLINDED_CAUTION]) expect(texts).not.toContain(c);
      }
    }
    expect(cautionLine('unblinded').text).toMatch(/Unblinded/);
    expect(cautionLine('blinded').text).not.toMatch(/nblinded/);
  });

  it('has the fixed-effects, by-visit, slope, variance, model-fit, trajectory and observed tables with consistent shapes', () => {
    const ts = tables(modelSheets(fit, ctx('unblinded', false)));
    expect(ts.map((t) => t.id)).toEqual(['FixedEffects', 'DifferenceByVisit', 'SlopeDifference', 'VarianceICC', 'ModelFit', 'FitCounts', 'NaiveFit', 'Trajectories', 'ObservedMeans']);
    for (const t of ts) {
      expect(t.id).toMatch(/^[A-Za-z0-9]+$/);
      for (const r of t.rows) expect(r.length).toBe(t.columns.length);
    }
    const byVisit = ts[1]!;
    expect(byVisit.rows.length).toBe(4);
    expect(byVisit.rows[3]![4]).toBe(fit.treatmentEffects[3]!.estimate);
  });

  it('adds a trajectory chart with a model line per arm and observed means as points', () => {
    const chart = modelSheets(fit, ctx('unblinded', false))[0]!.blocks.find((b) => b.kind === 'chart');
    expect(chart?.kind).toBe('chart');
    const series = chart?.kind === 'chart' ? chart.chart.series : [];
    expect(series.map((s) => s.name)).toEqual(['Placebo: model', 'Drug: model', 'Placebo: observed mean', 'Drug: observed mean']);
    expect(series[0]!.lower!.length).toBe(series[0]!.y.length);
  });

  it('adds a "Per participant" sheet with each random intercept only when asked', () => {
    expect(modelSheets(fit, ctx('unblinded', false)).length).toBe(1);
    const sheets = modelSheets(fit, ctx('unblinded', true));
    expect(sheets.map((s) => s.name)).toEqual(['Model results', 'Per participant']);
    const t = tables([sheets[1]!])[0]!;
    expect(t.rows.length).toBe(30);
    expect(t.rows[0]![0]).toBe('K-100');
    expect(t.rows[0]![2]).toBe(fit.subjects[0]!.blup);
  });

  it('in blinded mode describes the ICC and variation and shows no arm names', () => {
    const blind = fitRandomIntercept({ ...egfr(), armIndex: null, arms: [] }, opts);
    const sheets = modelSheets(blind, { observed: visits.map((v) => ({ ...v, arm: null, mean: 55, n: 30 })), mode: 'blinded', perSubject: false, subjectIds: [] });
    const all = JSON.stringify(sheets);
    expect(all).not.toContain('Drug');
    expect(all).not.toContain('Placebo');
    const first = sheets[0]!.blocks[1]!;
    expect(first.kind === 'paragraph' ? first.text : '').toMatch(/intraclass correlation is 0\.\d+/);
    expect(tables(sheets).map((t) => t.id)).toEqual(['FixedEffects', 'VarianceICC', 'ModelFit', 'FitCounts', 'NaiveFit', 'Trajectories', 'ObservedMeans']);
  });

  it('the verdict row gives the status word; the detail from the engine goes to the technical notes once ("Converged. Converged." never appears)', () => {
    const fitStats = tables(modelSheets(fit, ctx('unblinded', false))).find((t) => t.id === 'ModelFit')!;
    expect(fitStats.rows.find((r) => r[0] === 'Verdict')![2]).toBe('Converged');
    const notes = modelTechnicalNotes(fit);
    const verdict = notes.find((n) => n.includes('Convergence: '))!.split('Convergence: ')[1]!;
    expect(verdict).toMatch(/^Converged\. The likelihood has its maximum inside the allowed range/);
    expect(verdict).not.toMatch(/Converged\.\s+Converged/);
    expect(fitVerdict({ status: 'converged', message: 'Converged.' })).toBe('Converged.');
    expect(fitVerdict({ status: 'failed', message: 'The optimiser did not converge within its iteration limit.' })).toBe(
      'Did not converge — do not use these estimates. The optimiser did not converge within its iteration limit.',
    );
  });

  it('the counts table uses the integer format, so pages and sheets show "30", not "30.0000"', () => {
    const counts = tables(modelSheets(fit, ctx('unblinded', false))).find((t) => t.id === 'FitCounts')!;
    expect(counts.columns.map((c) => c.format)).toEqual(['text', 'integer']);
    const participants = counts.rows.find((r) => r[0] === 'Participants')!;
    expect(formatCell(participants[1] ?? null, counts.columns[1]!.format)).toBe('30');
  });

  it('in blinded mode the opening paragraph says nothing by arm: no treatment difference, no slope difference', () => {
    const blind = fitRandomIntercept({ ...egfr(), armIndex: null, arms: [] }, opts);
    const first = modelSheets(blind, { observed: [], mode: 'blinded', perSubject: false, subjectIds: [] })[0]!.blocks[1]!;
    const text = first.kind === 'paragraph' ? first.text : '';
    expect(text).toContain('pooled over all participants');
    expect(text).not.toMatch(/differed|treatment|\barms?\b/i);
    expect(text).toMatch(/changed by -?\d/);
  });

  // Hand-worked decimal rounding (exact): 4 significant digits, half away from zero on the decimal value.
  it('number phrasing: a sentence shows 4 significant digits like a significant cell; p below 0.0001 as "< 0.0001"', () => {
    expect([num(123.456), num(-2.345), num(0.012345), num(NaN)]).toEqual(['123.5', '-2.345', '0.01235', 'n/a']);
    expect(num(0.00062)).toBe(formatCell(0.00062, 'significant'));
    expect([pPhrase(0.00001), pPhrase(0.01234)]).toEqual(['p < 0.0001', 'p = 0.0123']);
  });

  it('in blinded mode no text outside the cautions speaks of arms: sheet titles, paragraphs, captions, headers, cells and chart', () => {
    const blind = fitRandomIntercept({ ...egfr(), armIndex: null, arms: [] }, opts);
    const blindObserved = visits.map((v) => ({ ...v, arm: null, mean: 55, n: 30 }));
    const sheets = modelSheets(blind, { observed: blindObserved, mode: 'blinded', perSubject: true, subjectIds: [] });
    expect(sheets.map((s) => s.name)).toEqual(['Model results', 'Per participant']);
    const texts: string[] = [];
    for (const sh of sheets) {
      texts.push(sh.name, sh.title);
      for (const b of sh.blocks) {
        if (b.kind === 'paragraph') {
          if (b.style !== 'caution') texts.push(b.text);
        } else if (b.kind === 'table') {
          texts.push(b.id, b.caption, ...b.columns.map((c) => c.header));
          for (const r of b.rows) for (const c of r) if (typeof c === 'string') texts.push(c);
        } else {
          const c = b.chart;
          texts.push(c.id, c.title, c.xLabel, c.yLabel, ...c.series.map((x) => x.name));
        }
      }
    }
    const armWord = /\barms?\b/i;
    expect(texts.filter((t) => armWord.test(t))).toEqual([]);
    // The cautions are the only text excepted; the check itself can fail (the unblinded sheets do speak of arms).
    const unblindedTexts = modelSheets(fit, ctx('unblinded', true)).flatMap((sh) =>
      sh.blocks.flatMap((b) => (b.kind === 'paragraph' && b.style !== 'caution' ? [b.text] : b.kind === 'table' ? [b.caption, ...b.columns.map((c) => c.header)] : [])),
    );
    expect(unblindedTexts.filter((t) => armWord.test(t)).length).toBeGreaterThan(0);
  });

  it('in blinded mode the trajectory and observed-mean tables hold the pooled rows without an arm column', () => {
    const blind = fitRandomIntercept({ ...egfr(), armIndex: null, arms: [] }, opts);
    const ts = tables(modelSheets(blind, { observed: visits.map((v) => ({ ...v, arm: null, mean: 55, n: 30 })), mode: 'blinded', perSubject: false, subjectIds: [] }));
    const traj = ts.find((t) => t.id === 'Trajectories')!;
    const obs = ts.find((t) => t.id === 'ObservedMeans')!;
    expect(traj.columns[0]!.header).toBe('Study day');
    expect(traj.rows.length).toBe(blind.trajectories[0]!.day.length);
    expect(obs.columns.map((c) => c.header)).toEqual(['Visit', 'Study day', 'Observed mean', 'Participants']);
    expect(obs.rows[0]).toEqual(['Week 12', 85, 55, 30]);
    const unblindedObs = tables(modelSheets(fit, ctx('unblinded', false))).find((t) => t.id === 'ObservedMeans')!;
    expect(unblindedObs.columns[0]!.header).toBe('Arm');
    expect(unblindedObs.rows[0]![0]).toBe('Placebo');
  });

  it('refuses a blinded report of a fit with arms (ModelReportError), so arms never leak into blinded sheets', () => {
    expect(() => modelSheets(fit, ctx('blinded', false))).toThrow(ModelReportError);
  });

  it('sheet names are at most 24 characters', () => {
    for (const s of modelSheets(fit, ctx('unblinded', true))) expect(s.name.length).toBeLessThanOrEqual(24);
  });
});

describe('modelJson', () => {
  it('holds the fit numbers with the documented keys and survives a JSON round trip unchanged', () => {
    const fit = fitRandomIntercept(egfr(), opts);
    const j = modelJson(fit);
    expect(Object.keys(j)).toEqual(expect.arrayContaining(['method', 'dfMethod', 'nSubjects', 'nObservations', 'logLik', 'aic', 'bic', 'converged', 'status', 'fixedEffects', 'variance', 'treatmentEffects', 'slopeDifferences']));
    expect(JSON.parse(JSON.stringify(j))).toEqual(j);
    const fe = (j.fixedEffects as Record<string, unknown>[])[0]!;
    expect(Object.keys(fe)).toEqual(['term', 'kind', 'arm', 'estimate', 'se', 'df', 't', 'p', 'lower', 'upper']);
    expect(fe.estimate).toBe(fit.fixedEffects[0]!.estimate);
  });
  it('writes non-finite numbers (an unbounded variance limit, a failed fit) as null, never NaN or Infinity', () => {
    const fit = fitRandomIntercept(egfr(), opts);
    const j = modelJson({ ...fit, logLik: NaN, variance: { ...fit.variance, subjectUpper: Infinity } });
    const text = JSON.stringify(j);
    expect(text).not.toContain('NaN');
    expect(j.logLik).toBeNull();
    expect((j.variance as { subjectUpper: unknown }).subjectUpper).toBeNull();
  });
});

describe('technical notes leave the model sheet for the analysis record', () => {
  const fit: ModelFit = fitRandomIntercept(egfr(), opts);
  it('the model sheet has no interval method, likelihood evaluation count or AIC/BIC formula; the notes have all of them', () => {
    const text = JSON.stringify(modelSheets(fit, ctx('unblinded', true)));
    for (const technical of ['How the intervals were computed', 'Likelihood evaluations', '−2 × log-likelihood', 'constants included', 'Satterthwaite']) expect(text).not.toContain(technical);
    const notes = modelTechnicalNotes(fit).join(' ');
    expect(notes).toContain(`How the intervals were computed: ${fit.variance.intervalMethod}`);
    expect(notes).toContain(`${fit.iterations} likelihood evaluations`);
    expect(notes).toContain(`k = ${fit.nParameters}`);
    expect(notes).toContain(`N = ${fit.bicN}`);
  });
});
