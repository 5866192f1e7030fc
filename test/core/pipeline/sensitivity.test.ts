/**
 * The sensitivity refits of one run (target days instead of actual days; on-time visits only), on invented data
 * generated here: twelve participants in two arms, visits at study days 1, 29, 57 and 85.
 */
import { describe, expect, it } from 'vitest';
import { runAnalysis } from '../../../src/core/pipeline';
import type { AnalysisSettings } from '../../../src/core/pipeline';
import type { CellValue } from '../../../src/core/intake/types';
import { normals, seeded } from '../model/helpers';
import { testSettings } from './testSettings';

const TARGETS = [1, 29, 57, 85];
const SCHEDULE = TARGETS.map((d) => ({ label: `Day ${d}`, targetDay: d, before: d === 1 ? 0 : 3, after: d === 1 ? 0 : 3 }));

/** Invented listing; `shift(i, v)` moves participant i's visit v by that many days (0: on the target day). */
function cells(shift: (i: number, v: number) => number, unscheduled = false): CellValue[][] {
  const z = normals(seeded(3));
  const rows: CellValue[][] = [['Participant', 'Group', 'Visit', 'Visit date', 'Result']];
  for (let i = 0; i < 12; i++) {
    const start = 45663 + i; // 1900-system serials
    const level = 50 + 8 * z();
    TARGETS.forEach((d, v) => {
      const day = d + (v === 0 ? 0 : shift(i, v));
      rows.push([`P${i + 1}`, i % 2 === 0 ? 'Control' : 'Active', `Day ${d}`, start + day - 1, level - 0.05 * day + (i % 2) * 0.04 * day + z()]);
    });
    if (unscheduled) rows.push([`P${i + 1}`, i % 2 === 0 ? 'Control' : 'Active', 'Extra check', start + 40, level - 2 + z()]);
  }
  return rows;
}

const settings = (mode: 'blinded' | 'unblinded'): AnalysisSettings =>
  testSettings({ mode, ...(mode === 'unblinded' ? { referenceArm: 'Control' } : {}), schedule: SCHEDULE });

type Json = Record<string, unknown>;
const model = (json: Json): Json => json.model as Json;
const sens = (json: Json): Json[] => model(json).sensitivity as Json[];

describe('sensitivity refits', () => {
  it('give the main fit back exactly when every visit is on its target day (exact identity: same rows, same times)', async () => {
    const out = await runAnalysis(cells(() => 0), settings('unblinded'));
    if (!out.ok) throw new Error('run failed');
    const main = model(out.json);
    const lastMain = (main.treatmentEffects as Json[]).at(-1)!;
    for (const run of sens(out.json)) {
      expect(run.fitted).toBe(true);
      expect(run.nObservations).toBe(main.nObservations);
      const te = (run.treatmentEffects as Json[])[0]!;
      expect(te.label).toBe('Day 85');
      // Identical input to the engine: equal to the last bit.
      expect(te.estimate).toBe(lastMain.estimate);
    }
  });

  it('nominal time drops unscheduled records and moves the rest to their target days; on-time only keeps on-time visits', async () => {
    // Participants 1–4 come 6 days late to Day 57 (outside its ±3-day window); everyone has one unscheduled record.
    const out = await runAnalysis(cells((i, v) => (i < 4 && v === 2 ? 6 : v === 3 ? 2 : 0), true), settings('unblinded'));
    if (!out.ok) throw new Error('run failed');
    const [nominal, onTime] = sens(out.json);
    expect(model(out.json).nObservations).toBe(12 * 5);
    expect(nominal!.analysis).toBe('nominal-time');
    expect(nominal!.nObservations).toBe(12 * 4);
    expect(onTime!.analysis).toBe('on-time-only');
    expect(onTime!.nObservations).toBe(12 * 4 - 4);
    const sheet = out.sheets.find((s) => s.name === 'Model results')!;
    const text = sheet.blocks.flatMap((b) => (b.kind === 'paragraph' ? [b.text] : [])).join(' ');
    expect(text).toMatch(/The visit timing changes the estimate of the difference between Active and Control at Day 85 by .* when each visit is placed at its target day/);
    expect(sheet.blocks.some((b) => b.kind === 'table' && b.id === 'VisitTimingEffect')).toBe(true);
  });

  it('a refit that cannot be made is absent with the reason; the main model stands', async () => {
    // Every visit after the first is late: on-time only leaves one value per participant, which gives no model.
    const out = await runAnalysis(cells(() => 5), settings('blinded'));
    if (!out.ok) throw new Error('run failed');
    expect(model(out.json).nObservations).toBe(48);
    const onTime = sens(out.json)[1]!;
    expect(onTime).toMatchObject({ analysis: 'on-time-only', fitted: false, nObservations: null, slope: null });
    expect(String(onTime.note)).toMatch(/one measurement|one value/i);
    const sheet = out.sheets.find((s) => s.name === 'Model results')!;
    const text = sheet.blocks.flatMap((b) => (b.kind === 'paragraph' ? [b.text] : [])).join(' ');
    expect(text).toContain('The refit when only on-time visits are kept could not be made:');
  });

  it('in blinded mode show the change over time and the ICC, and no arm name anywhere', async () => {
    const out = await runAnalysis(cells((i, v) => (v === 2 && i % 3 === 0 ? 5 : 0)), settings('blinded'));
    if (!out.ok) throw new Error('run failed');
    for (const run of sens(out.json)) {
      expect(run.treatmentEffects).toEqual([]);
      expect(run.slopeDifferences).toEqual([]);
      expect((run.slope as Json).estimate).toEqual(expect.any(Number));
      expect((run.variance as Json).icc).toEqual(expect.any(Number));
    }
    const sheet = out.sheets.find((s) => s.name === 'Model results')!;
    const all = JSON.stringify(sheet) + JSON.stringify(model(out.json));
    expect(all).not.toMatch(/Control|Active/);
    expect(all).toMatch(/The visit timing changes the estimate of the change per week/);
  });
});
