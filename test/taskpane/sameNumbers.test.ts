/** The pane, the page and the sheets show the same text for the same number (one rule: core formats.ts). */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../src/core/pipeline';
import { formatCell } from '../../src/core/report/formats';
import type { SheetSpec, TableBlock } from '../../src/core/report/types';
import { parseSchedule } from '../../src/core/schedule';
import { readCsvText } from '../../src/files';
import { headlineOf } from '../../src/taskpane/headline';

// The bundled demo: an invented kidney-function trial (demo/README.md); it describes no real trial, site or person.
const cells = readCsvText(readFileSync('demo/egfr-visits.csv', 'utf8'));
const parsed = parseSchedule(readCsvText(readFileSync('demo/egfr-schedule.csv', 'utf8')), 'egfr-schedule', 'A1');
const settings: AnalysisSettings = {
  sheet: 'egfr-visits', topLeft: 'A1', dateSystem: 1900, mode: 'unblinded', numericText: 'accept', schedule: parsed.ok ? parsed.schedule : [],
  timeUnit: 'month', dfMethod: 'kenward-roger', method: 'reml', level: 0.95, scheduledOnly: false, perSubject: false,
  inputLabel: 'egfr-visits.csv', runAt: '2026-12-02T14:05:09+01:00', referenceArm: 'Placebo',
};
const tableOf = (sheets: readonly SheetSpec[], id: string): TableBlock =>
  sheets.flatMap((s) => s.blocks).find((b): b is TableBlock => b.kind === 'table' && b.id === id)!;
const paragraphs = (s: SheetSpec): string => s.blocks.map((b) => (b.kind === 'paragraph' ? b.text : '')).join(' ');

describe('the same number reads the same everywhere', () => {
  it('the treatment difference at the last visit: pane headline, summary table and sentence, model table and sentence', async () => {
    const out = await runAnalysis(cells, settings);
    if (!out.ok) throw new Error('the demo must run');
    const glance = tableOf(out.sheets, 'DifferenceAtLastVisit');
    const row = glance.rows[glance.rows.length - 1]!;
    const shown = (header: string): string => {
      const j = glance.columns.findIndex((c) => c.header === header);
      return formatCell(row[j] ?? null, glance.columns[j]!.format);
    };
    const [est, lo, hi, p] = [shown('Difference'), shown('Lower limit'), shown('Upper limit'), shown('p')];
    expect(est).toMatch(/^-?\d+\.\d{3}$|^-?\d{4,}$|^-?0\.0*\d{4}$/); // 4 significant digits
    const pane = headlineOf(out, 920).join(' ');
    expect(pane).toContain(`by ${est} (95% CI ${lo} to ${hi}; p = ${p})`);
    expect(paragraphs(out.sheets[0]!)).toContain(`by ${est} (95% confidence interval ${lo} to ${hi}; p = ${p})`);
    const model = out.sheets.find((s) => s.name === 'Model results')!;
    expect(paragraphs(model)).toContain(`by ${est} (95% confidence interval ${lo} to ${hi}; p = ${p})`);
    // The model sheet's own table of differences by visit shows the same digits for the last visit.
    const byVisit = tableOf(out.sheets, 'DifferenceByVisit');
    const last = byVisit.rows[byVisit.rows.length - 1]!;
    const j = byVisit.columns.findIndex((c) => c.header === 'Estimate');
    expect(formatCell(last[j] ?? null, byVisit.columns[j]!.format)).toBe(est);
    // The run time, readable with its offset, on the summary sheet, the analysis record and in the pane.
    expect(tableOf(out.sheets, 'WhatWasAnalysed').rows.find((r) => r[0] === 'Run at')?.[1]).toBe('2026-12-02 14:05 (UTC+01:00)');
    expect(tableOf(out.sheets, 'RunFacts').rows.find((r) => r[0] === 'Run at')?.[1]).toBe('2026-12-02 14:05 (UTC+01:00)');
    expect(pane).toContain('Run at 2026-12-02 14:05 (UTC+01:00).');
    expect((out.json.settings as { runAt: string }).runAt).toBe('2026-12-02T14:05:09+01:00');
  });
});
