/**
 * The model choice in one run (settings.model): the random intercept and slope model as the main fit, the model
 * comparison and the slope test in the JSON and on the model sheet, on invented data generated here (sixteen
 * participants in two arms whose rates of change differ, visits at study days 1, 29, 57, 85 and 113).
 */
import { describe, expect, it } from 'vitest';
import { runAnalysis } from '../../../src/core/pipeline';
import type { AnalysisSettings } from '../../../src/core/pipeline';
import type { CellValue } from '../../../src/core/intake/types';
import type { TableBlock } from '../../../src/core/report/types';
import { normals, seeded } from '../model/helpers';
import { testSettings } from './testSettings';

const TARGETS = [1, 29, 57, 85, 113];
const SCHEDULE = TARGETS.map((d) => ({ label: `Day ${d}`, targetDay: d, before: d === 1 ? 0 : 3, after: d === 1 ? 0 : 3 }));

/** Invented listing; slopeSd is the spread of the participants' own rates of change (per day). */
function cells(slopeSd: number): CellValue[][] {
  const z = normals(seeded(17));
  const rows: CellValue[][] = [['Participant', 'Group', 'Visit', 'Visit date', 'Result']];
  for (let i = 0; i < 16; i++) {
    const start = 45663 + i;
    const level = 50 + 8 * z();
    const rate = -0.05 + slopeSd * z();
    TARGETS.forEach((d) => {
      rows.push([`P${i + 1}`, i % 2 === 0 ? 'Control' : 'Active', `Day ${d}`, start + d - 1, level + rate * d + (i % 2) * 0.03 * d + z()]);
    });
  }
  return rows;
}

const settings = (over: Partial<AnalysisSettings>): AnalysisSettings => testSettings({ mode: 'unblinded', referenceArm: 'Control', schedule: SCHEDULE, ...over });
type Json = Record<string, unknown>;

describe('the model choice', () => {
  it('--model slope: the main model is the slope model, with kind, G, the comparison of both models and the slope test in the JSON', async () => {
    const out = await runAnalysis(cells(0.06), settings({ model: 'slope' }));
    if (!out.ok) throw new Error('run failed');
    const m = out.json.model as Json;
    expect(m.kind).toBe('slope');
    const v = m.variance as Json;
    expect(v.slope as number).toBeGreaterThan(0);
    expect(Math.abs(v.correlation as number)).toBeLessThanOrEqual(1);
    const comparison = m.comparison as Json[];
    expect(comparison.map((c) => c.kind)).toEqual(['intercept', 'slope']);
    expect(comparison.map((c) => c.nParameters)).toEqual([6, 8]);
    const test = m.slopeTest as Json;
    expect(test.df).toBe('mixture 1:2');
    // Exact identity: the statistic is twice the difference of the two log-likelihoods in the comparison.
    expect(test.statistic).toBeCloseTo(2 * ((comparison[1]!.logLik as number) - (comparison[0]!.logLik as number)), 10);
    // Rates of change spread with SD 0.06 per day (1.8 per 30 days) against within-participant SD 1: clearly detected.
    expect(test.p as number).toBeLessThan(0.001);
    expect(test.sentence).toMatch(/^Participants differ in their rate of change: yes at the 95% level/);
    // The sensitivity refits use the chosen model too.
    for (const run of m.sensitivity as Json[]) expect(run.fitted).toBe(true);
    const sheet = out.sheets.find((s) => s.title === 'Random intercept and slope model');
    expect(sheet).toBeDefined();
    const ids = sheet!.blocks.filter((b): b is TableBlock => b.kind === 'table').map((b) => b.id);
    expect(ids).toEqual(expect.arrayContaining(['FixedEffects', 'LevelAndRate', 'ModelComparison', 'SlopeTest', 'Trajectories']));
  });

  it('the default (intercept) keeps the random-intercept model as the main fit and still shows the comparison', async () => {
    const out = await runAnalysis(cells(0), settings({}));
    if (!out.ok) throw new Error('run failed');
    const m = out.json.model as Json;
    expect(m.kind).toBe('intercept');
    expect('slope' in (m.variance as Json)).toBe(false);
    expect((m.comparison as Json[]).map((c) => c.kind)).toEqual(['intercept', 'slope']);
    // No spread in the rates of change: no evidence at the 95% level (a draw; p is far above 0.05 for this seed).
    expect((m.slopeTest as Json).sentence).toMatch(/: no at the 95% level/);
    const sheet = out.sheets.find((s) => s.title === 'Random-intercept model');
    const ids = sheet!.blocks.filter((b): b is TableBlock => b.kind === 'table').map((b) => b.id);
    expect(ids).toContain('ModelComparison');
    expect(ids).not.toContain('LevelAndRate');
  });

  it('the comparison lists the main fit itself: its slope entry carries the main model\'s log-likelihood and AIC', async () => {
    const out = await runAnalysis(cells(0.06), settings({ model: 'slope' }));
    if (!out.ok) throw new Error('run failed');
    const m = out.json.model as Json;
    const [ri, rs] = m.comparison as Json[];
    expect(rs!.logLik).toBe(m.logLik);
    expect(rs!.aic).toBe(m.aic);
    // AIC = −2ℓ + 2k (exact identity) for the other entry too.
    expect(ri!.aic).toBeCloseTo(-2 * (ri!.logLik as number) + 2 * (ri!.nParameters as number), 9);
  });
});
