/**
 * The visit-by-visit model in a run (`model: 'repeated'`) on the bundled invented demo trial (demo/README.md; it
 * describes no real trial, site or person): its sheet opens like every other sheet, its JSON section carries the keys
 * the README lists, blinded runs show nothing by arm, and visits nobody has reached are left out with a note.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';
import { cautionLine } from '../../../src/core/report/cautions';
import { REPEATED_SHEET_NAME } from '../../../src/core/report/repeatedSheet';
import { parseSchedule } from '../../../src/core/schedule';
import { readCsvText } from '../../../src/files';
import { testSettings } from './testSettings';

const cells = readCsvText(readFileSync('demo/egfr-visits.csv', 'utf8'));
const parsed = parseSchedule(readCsvText(readFileSync('demo/egfr-schedule.csv', 'utf8')), 'egfr-schedule', 'A1');
if (!parsed.ok) throw new Error('the demo schedule must parse');
const schedule = parsed.schedule;

const settings = (over: Partial<AnalysisSettings>): AnalysisSettings => testSettings({ schedule, numericText: 'accept', timeUnit: 'month', model: 'repeated', ...over });

async function run(over: Partial<AnalysisSettings>): Promise<{ sheets: readonly { name: string; blocks: readonly unknown[] }[]; model: Record<string, unknown> }> {
  const out = await runAnalysis(cells, settings(over));
  if (!out.ok) throw new Error('the demo must run');
  return { sheets: out.sheets, model: out.json.model as Record<string, unknown> };
}

describe('the visit-by-visit model in a run', () => {
  it('unblinded: its sheet opens with the caution line and a plain paragraph, and its JSON has every listed key', async () => {
    const { sheets, model } = await run({ mode: 'unblinded', referenceArm: 'Placebo' });
    const sheet = sheets.find((s) => s.name === REPEATED_SHEET_NAME)!;
    expect(sheet.blocks[0]).toEqual(cautionLine('unblinded'));
    expect(sheet.blocks[1]).toMatchObject({ kind: 'paragraph', style: 'normal' });
    expect((sheet.blocks[1] as { text: string }).text).toMatch(/^This model treats each scheduled visit as a time point of its own\./);
    expect((sheet.blocks[1] as { text: string }).text).toMatch(/At Week 48, the last scheduled visit, the mean value of Active differed from Placebo by/);
    expect(model.kind).toBe('repeated');
    expect(model.fitted).toBe(true);
    expect(model.visits).toEqual(schedule.map((v) => v.label));
    const V = schedule.length;
    const cov = model.covariance as number[][];
    const cor = model.correlation as number[][];
    expect(cov).toHaveLength(V);
    for (let j = 0; j < V; j++) {
      expect(cov[j]).toHaveLength(V);
      expect(cor[j]![j]).toBe(1);
      for (let k = 0; k < V; k++) expect(cov[j]![k]).toBe(cov[k]![j]);
    }
    const effects = model.treatmentEffects as { arm: string; label: string; last: boolean; estimate: number; lower: number; upper: number }[];
    expect(effects.map((e) => e.label)).toEqual(schedule.map((v) => v.label));
    expect(effects.filter((e) => e.last).map((e) => e.label)).toEqual(['Week 48']);
    for (const e of effects) expect(e.lower).toBeLessThan(e.estimate);
    const kinds = new Set((model.fixedEffects as { kind: string }[]).map((f) => f.kind));
    expect([...kinds]).toEqual(['intercept', 'arm', 'visit', 'armVisit']);
    expect((model.comparison as { kind: string }[]).map((c) => c.kind)).toEqual(['intercept', 'slope', 'repeated']);
    const leftOut = model.leftOut as { unscheduled: number; repeat: number; records: { status: string }[] };
    expect(leftOut.records.filter((r) => r.status === 'extra')).toHaveLength(leftOut.unscheduled);
    expect(leftOut.records.filter((r) => r.status === 'repeat')).toHaveLength(leftOut.repeat);
    expect(leftOut.unscheduled + leftOut.repeat).toBeGreaterThan(0); // the demo has both kinds
  });

  it('blinded: nothing on its sheet names an arm', async () => {
    const { sheets, model } = await run({ mode: 'blinded' });
    // Regression: Fisher scoring alone crept near this optimum and stopped at 200 steps without converging; the
    // Newton polish (scoring.ts) converges.
    expect(model.fitted).toBe(true);
    const sheet = sheets.find((s) => s.name === REPEATED_SHEET_NAME)!;
    const text = JSON.stringify(sheet);
    expect(text).not.toMatch(/Active|Placebo|\barm\b/i);
    expect(model.treatmentEffects).toEqual([]);
    expect(model.arms).toEqual([]);
  });

  it('a visit that no participant has reached is left out with a note; without the setting there is no such sheet', async () => {
    const late = [...schedule, { label: 'Week 200', targetDay: 1401, before: 14, after: 14 }];
    const { model } = await run({ mode: 'blinded', schedule: late });
    expect(model.visits).toEqual(schedule.map((v) => v.label));
    expect(model.notes).toEqual(['The visit-by-visit model leaves out "Week 200": no participant has a value matched to that visit.']);
    const plain = await runAnalysis(cells, settings({ model: 'intercept' }));
    if (!plain.ok) throw new Error('the demo must run');
    expect(plain.sheets.some((s) => s.name === REPEATED_SHEET_NAME)).toBe(false);
    expect((plain.json.model as Record<string, unknown>).kind).toBe('intercept');
  });
});
