/**
 * --model gee and --model logistic through the whole run, on invented data generated here: 40 participants in two
 * arms, visits at study days 1, 29, 57 and 85, and a 0/1 column. Checks the wiring (sheets, JSON keys of the README's
 * "Results JSON", the way "yes" is defined, refusals as notes); the numbers themselves are checked in
 * test/core/model/gee and test/core/model/logistic.
 */
import { describe, expect, it } from 'vitest';
import { runAnalysis } from '../../../src/core/pipeline';
import type { AnalysisSettings } from '../../../src/core/pipeline';
import type { CellValue } from '../../../src/core/intake/types';
import { fitGee } from '../../../src/core/model/gee';
import { normals, seeded } from '../model/helpers';
import { testSettings } from './testSettings';

const TARGETS = [1, 29, 57, 85];
const SCHEDULE = TARGETS.map((d) => ({ label: `Day ${d}`, targetDay: d, before: d === 1 ? 0 : 3, after: d === 1 ? 0 : 3 }));

function cells(): CellValue[][] {
  const z = normals(seeded(5));
  const rows: CellValue[][] = [['Participant', 'Group', 'Visit', 'Visit date', 'Result', 'Flag']];
  for (let i = 0; i < 40; i++) {
    const start = 45663 + i;
    const level = 50 + 8 * z();
    TARGETS.forEach((d) => {
      const v = level - 0.05 * d + (i % 2) * 0.04 * d + 2 * z();
      rows.push([`P${i + 1}`, i % 2 === 0 ? 'Control' : 'Active', `Day ${d}`, start + d - 1, v, v < 48 ? 1 : 0]);
    });
  }
  return rows;
}

const settings = (over: Partial<AnalysisSettings>): AnalysisSettings => testSettings({ mode: 'unblinded', referenceArm: 'Control', schedule: SCHEDULE, ...over });
type Json = Record<string, unknown>;

describe('--model gee in a run', () => {
  it('writes the marginal-model sheet, opening with the caution line then a plain paragraph, and model.kind "gee" with three SEs', async () => {
    const out = await runAnalysis(cells(), settings({ model: 'gee' }));
    if (!out.ok) throw new Error('run failed');
    const sheet = out.sheets.find((s) => s.name === 'Marginal model')!;
    expect(sheet.blocks[0]!.kind).toBe('paragraph');
    expect(sheet.blocks[1]).toMatchObject({ kind: 'paragraph', style: 'normal' });
    const m = out.json.model as Json;
    expect(m.kind).toBe('gee');
    expect((m.workingCorrelation as Json).structure).toBe('exchangeable');
    const fe = m.fixedEffects as Json[];
    expect(fe.map((f) => f.term)).toEqual(['Intercept', 'Arm Active vs Control', 'Time', 'Time × arm Active']);
    for (const f of fe) for (const k of ['se', 'seModel', 'seSmallSample']) expect(typeof f[k]).toBe('number');
    expect((m.comparison as Json[]).map((c) => c.kind)).toEqual(['intercept', 'slope', 'gee']);
    // 20 per arm < 40: the small-sample caution is on the sheet and in the JSON.
    expect(m.smallSampleCaution).toMatch(/Fewer than 40 participants in an arm \(20\)/);
    expect(sheet.blocks.some((b) => b.kind === 'paragraph' && b.style === 'caution' && /Fewer than 40/.test(b.text))).toBe(true);
  });

  it('gives the engine\'s numbers on the same rows (identity: same data, same engine)', async () => {
    const out = await runAnalysis(cells(), settings({ model: 'gee' }));
    if (!out.ok) throw new Error('run failed');
    const rows = cells().slice(1);
    const ids = [...new Set(rows.map((r) => r[0]))];
    const fit = fitGee(
      {
        y: Float64Array.from(rows, (r) => r[4] as number),
        time: Float64Array.from(rows, (r) => ((r[3] as number) - 45663 - Number(String(r[0]).slice(1)) + 1) / 7),
        subject: Int32Array.from(rows, (r) => ids.indexOf(r[0])),
        nSubjects: ids.length,
        armIndex: Int32Array.from(rows, (r) => (r[1] === 'Control' ? 0 : 1)),
        arms: ['Control', 'Active'],
        covariates: [],
      },
      { level: 0.95, timeUnit: 'week' },
    );
    const fe = (out.json.model as Json).fixedEffects as Json[];
    fe.forEach((f, j) => expect(f.estimate as number).toBeCloseTo(fit.fixedEffects[j]!.estimate, 10));
  });
});

describe('--model logistic in a run', () => {
  it('defines yes from a threshold below the value and reports odds ratios, the variance, nodes and probabilities by visit', async () => {
    const out = await runAnalysis(cells(), settings({ model: 'logistic', responder: { below: 48 } }));
    if (!out.ok) throw new Error('run failed');
    const m = out.json.model as Json;
    expect(m.kind).toBe('logistic');
    expect(m.outcome).toBe('value below 48');
    expect(m.nodes).toBe(25);
    expect(typeof (m.variance as Json).subject).toBe('number');
    for (const f of m.fixedEffects as Json[]) expect(f.oddsRatio).toBeCloseTo(Math.exp(f.estimate as number), 12);
    expect((m.probabilities as Json[]).length).toBe(TARGETS.length * 2);
    const sheet = out.sheets.find((s) => s.name === 'Yes-no model')!;
    expect(sheet.blocks[1]).toMatchObject({ kind: 'paragraph', style: 'normal' });
  });

  it('reads a mapped 0/1 column the same way as the matching threshold', async () => {
    const byColumn = await runAnalysis(cells(), settings({ model: 'logistic', mapping: { subject: 0, arm: 1, visit: 2, date: 3, value: 4, responder: 5, covariates: [] } }));
    const byThreshold = await runAnalysis(cells(), settings({ model: 'logistic', responder: { below: 48 } }));
    if (!byColumn.ok || !byThreshold.ok) throw new Error('run failed');
    const a = (byColumn.json.model as Json).fixedEffects as Json[];
    const b = (byThreshold.json.model as Json).fixedEffects as Json[];
    a.forEach((f, j) => expect(f.estimate).toBe(b[j]!.estimate));
  });

  it('without a threshold or a yes/no column: no model, a sheet that says why', async () => {
    const out = await runAnalysis(cells(), settings({ model: 'logistic' }));
    if (!out.ok) throw new Error('run failed');
    expect(out.json.model).toBeNull();
    expect(out.json.modelNote).toMatch(/needs a yes\/no answer/);
  });
});
