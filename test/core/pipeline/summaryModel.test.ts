/**
 * The summary sheet and the pane's headline follow the model chosen with settings.model: each shows that model's own
 * main number, the very number of the results JSON `model` section (same rounding: formatCell), and names the model.
 * Run on the bundled demo, an invented kidney-function trial (demo/README.md) that describes no real trial, site or
 * person. Equality of shown text is exact (one formatter); the numbers themselves are checked in test/core/model.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';
import type { ModelKind } from '../../../src/core/model/types';
import { formatCell } from '../../../src/core/report/formats';
import { MODEL_NAMES } from '../../../src/core/report/mainResult';
import type { SheetSpec, TableBlock } from '../../../src/core/report/types';
import { parseSchedule } from '../../../src/core/schedule';
import { readCsvText } from '../../../src/files';
import { headlineOf } from '../../../src/taskpane/headline';

const cells = readCsvText(readFileSync('demo/egfr-visits.csv', 'utf8'));
const parsed = parseSchedule(readCsvText(readFileSync('demo/egfr-schedule.csv', 'utf8')), 'egfr-schedule', 'A1');
const settings = (mode: 'blinded' | 'unblinded', model: ModelKind): AnalysisSettings => ({
  sheet: 'egfr-visits', topLeft: 'A1', dateSystem: 1900, mode, numericText: 'accept', schedule: parsed.ok ? parsed.schedule : [],
  timeUnit: 'month', dfMethod: 'kenward-roger', method: 'reml', level: 0.95, scheduledOnly: false, perSubject: false,
  inputLabel: 'egfr-visits.csv', runAt: '2026-12-02T14:05:09+01:00', model,
  ...(mode === 'unblinded' ? { referenceArm: 'Placebo' } : {}),
  ...(model === 'logistic' ? { responder: { below: 45 } } : {}),
});
type Json = Record<string, unknown>;
const tableOf = (sheet: SheetSpec, id: string): TableBlock | undefined => sheet.blocks.find((b): b is TableBlock => b.kind === 'table' && b.id === id);
const paragraphs = (s: SheetSpec): string => s.blocks.map((b) => (b.kind === 'paragraph' ? b.text : '')).join(' ');
const sig = (x: unknown): string => formatCell(x as number, 'significant');

/** The JSON's number at the last scheduled visit: the largest day among treatmentEffects (the odds ratio for the yes/no model). */
function jsonLast(model: Json, kind: ModelKind): { estimate: number; lower: number; upper: number; p: number } {
  const effects = model.treatmentEffects as Json[];
  const lastDay = Math.max(...effects.map((e) => e.day as number));
  const e = effects.find((x) => x.day === lastDay)!;
  return kind === 'logistic'
    ? { estimate: e.oddsRatio as number, lower: e.oddsRatioLower as number, upper: e.oddsRatioUpper as number, p: e.p as number }
    : { estimate: e.estimate as number, lower: e.lower as number, upper: e.upper as number, p: e.p as number };
}

const KINDS: readonly ModelKind[] = ['intercept', 'slope', 'repeated', 'gee', 'logistic'];

describe('unblinded: the summary sheet and the pane headline give the chosen model\'s difference at the last visit', () => {
  for (const kind of KINDS) {
    it(`--model ${kind}`, async () => {
      const out = await runAnalysis(cells, settings('unblinded', kind));
      if (!out.ok) throw new Error('the demo must run');
      const model = out.json.model as Json;
      expect(model.kind).toBe(kind);
      const want = jsonLast(model, kind);
      const summary = out.sheets[0]!;
      const table = tableOf(summary, 'DifferenceAtLastVisit')!;
      expect(table.caption).toContain(`from ${MODEL_NAMES[kind]}`);
      const header = kind === 'logistic' ? 'Odds ratio' : 'Difference';
      const at = (h: string): unknown => table.rows[0]![table.columns.findIndex((c) => c.header === h)];
      expect(table.rows).toHaveLength(1);
      expect(at('Arm')).toBe('Active');
      expect(at('Compared with')).toBe('Placebo');
      expect(at('Visit')).toBe('Week 48');
      expect(sig(at(header))).toBe(sig(want.estimate));
      expect(sig(at('Lower limit'))).toBe(sig(want.lower));
      expect(sig(at('Upper limit'))).toBe(sig(want.upper));
      expect(formatCell(at('p') as number, 'pvalue')).toBe(formatCell(want.p, 'pvalue'));
      const ci = `(95% confidence interval ${sig(want.lower)} to ${sig(want.upper)}; p = ${formatCell(want.p, 'pvalue')}) in ${MODEL_NAMES[kind]}.`;
      const pane = headlineOf(out, 920).join(' ');
      if (kind === 'logistic') {
        expect(paragraphs(summary)).toContain(`the odds of a yes answer (value below 45) in Active were ${sig(want.estimate)} times those in Placebo ${ci}`);
        expect(pane).toContain(`the odds of a yes answer (value below 45) in Active were ${sig(want.estimate)} times those in Placebo (95% CI ${sig(want.lower)} to ${sig(want.upper)}; p = ${formatCell(want.p, 'pvalue')}) in ${MODEL_NAMES[kind]}.`);
      } else {
        expect(paragraphs(summary)).toContain(`differed from Placebo by ${sig(want.estimate)} ${ci}`);
        expect(pane).toContain(`At Week 48, Active differed from Placebo by ${sig(want.estimate)} (95% CI ${sig(want.lower)} to ${sig(want.upper)}; p = ${formatCell(want.p, 'pvalue')}) in ${MODEL_NAMES[kind]}.`);
      }
    }, 60_000);
  }
});

describe('blinded: the summary sheet and the pane headline give the chosen model\'s overall numbers and nothing by arm', () => {
  // The first overall number of each model and where the JSON keeps it.
  const first: Record<ModelKind, { measure: string; value: (m: Json) => unknown }> = {
    intercept: { measure: 'Intraclass correlation (share of the variation between participants)', value: (m) => (m.variance as Json).icc },
    slope: { measure: 'Intraclass correlation at study day 1 (share of the variation between participants)', value: (m) => (m.variance as Json).icc },
    repeated: { measure: 'Mean value at Week 48, the last scheduled visit', value: (m) => (m.means as Json[]).find((x) => x.label === 'Week 48')!.estimate },
    gee: { measure: 'Overall change in the value per month', value: (m) => (m.fixedEffects as Json[]).find((x) => x.kind === 'time')!.estimate },
    logistic: { measure: 'Odds ratio of a yes answer per month', value: (m) => (m.fixedEffects as Json[]).find((x) => x.kind === 'time')!.oddsRatio },
  };
  for (const kind of KINDS) {
    it(`--model ${kind}`, async () => {
      const out = await runAnalysis(cells, settings('blinded', kind));
      if (!out.ok) throw new Error('the demo must run');
      const model = out.json.model as Json;
      expect(model.kind).toBe(kind);
      const summary = out.sheets[0]!;
      expect(tableOf(summary, 'DifferenceAtLastVisit')).toBeUndefined();
      const table = tableOf(summary, 'ModelAtAGlance')!;
      expect(table.caption).toContain(`from ${MODEL_NAMES[kind]}`);
      expect(table.rows[0]![0]).toBe(first[kind].measure);
      const want = sig(first[kind].value(model));
      expect(sig(table.rows[0]![1])).toBe(want);
      // The sentence: the measure's words without the table's explanation in brackets, "is", the number, the model.
      const what = first[kind].measure.replace(/ \(share of the variation between participants\)$/, '');
      const sentence = `${what}${what.includes(',') ? ',' : ''} is ${want} (95% `;
      const pane = headlineOf(out, 920).join(' ');
      for (const text of [paragraphs(summary), pane]) {
        expect(text).toContain(sentence);
        expect(text).toContain(`) in ${MODEL_NAMES[kind]}`);
      }
      for (const arm of ['Active', 'Placebo']) expect(paragraphs(summary) + pane).not.toContain(arm);
    }, 60_000);
  }
});

describe('the model comparison lists every model fitted in the run', () => {
  // Every run fits the random-intercept and the slope model (fitStage); the visit-by-visit model and GEE join them.
  // The yes/no model's likelihood is of another outcome, so its list holds only itself. Exact: lists of names.
  for (const [kind, expected] of [
    ['repeated', ['intercept', 'slope', 'repeated']],
    ['gee', ['intercept', 'slope', 'gee']],
    ['logistic', ['logistic']],
  ] as const) {
    it(`--model ${kind}`, async () => {
      const out = await runAnalysis(cells, settings('unblinded', kind));
      if (!out.ok) throw new Error('the demo must run');
      const comparison = (out.json.model as Json).comparison as Json[];
      expect(comparison.map((c) => c.kind)).toEqual(expected);
      // The shared entries carry the same numbers as a plain random-intercept run's list.
      const plain = await runAnalysis(cells, settings('unblinded', 'intercept'));
      if (!plain.ok) throw new Error('the demo must run');
      const plainList = (plain.json.model as Json).comparison as Json[];
      for (const c of comparison.filter((x) => x.kind === 'intercept' || x.kind === 'slope')) expect(c).toEqual(plainList.find((p) => p.kind === c.kind));
    });
  }
});
