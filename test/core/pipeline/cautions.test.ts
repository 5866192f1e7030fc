import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';
import { CAUTIONS, CAUTION_LINE, SUMMARY_SHEET_NAME, UNBLINDED_CAUTION, UNBLINDED_LINE } from '../../../src/core/report';
import { parseSchedule } from '../../../src/core/schedule';
import { readCsvText } from '../../../src/files';
import type { SheetSpec } from '../../../src/core/report';

// The bundled demo: an invented kidney-function trial (demo/README.md); it describes no real trial, site or person.
const cells = readCsvText(readFileSync('demo/egfr-visits.csv', 'utf8'));
const parsed = parseSchedule(readCsvText(readFileSync('demo/egfr-schedule.csv', 'utf8')), 'egfr-schedule', 'A1');
if (!parsed.ok) throw new Error('the demo schedule must parse');

function settings(mode: 'blinded' | 'unblinded'): AnalysisSettings {
  return {
    sheet: 'egfr-visits',
    topLeft: 'A1',
    dateSystem: 1900,
    mode,
    numericText: 'accept',
    schedule: parsed.ok ? parsed.schedule : [],
    timeUnit: 'month',
    dfMethod: 'kenward-roger',
    method: 'reml',
    level: 0.95,
    scheduledOnly: false,
    perSubject: true,
    inputLabel: 'egfr-visits.csv',
    runAt: '2026-01-01T00:00:00.000Z',
  };
}

const paragraphs = (sheet: SheetSpec): string[] =>
  sheet.blocks.flatMap((b) => (b.kind === 'paragraph' ? [b.text] : []));

describe('the cautions of SPEC §2: in full on the summary sheet, a one-line caution linking to it on every other sheet', () => {
  for (const mode of ['blinded', 'unblinded'] as const) {
    it(`in ${mode} mode the summary sheet comes first with all three cautions${mode === 'unblinded' ? ' and the unblinded caution' : ''}, once each`, async () => {
      const out = await runAnalysis(cells, settings(mode));
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      const summary = out.sheets[0]!;
      expect(summary.name).toBe(SUMMARY_SHEET_NAME);
      const text = paragraphs(summary);
      for (const caution of CAUTIONS) expect(text.filter((t) => t === caution), caution).toHaveLength(1);
      expect(text.filter((t) => t === UNBLINDED_CAUTION)).toHaveLength(mode === 'unblinded' ? 1 : 0);
      // The link target is A1, so the cautions must open the sheet.
      expect(summary.blocks[0]).toMatchObject({ kind: 'paragraph', text: CAUTIONS[0], style: 'caution' });
    });

    it(`in ${mode} mode every other sheet opens with the one-line caution linked to the summary sheet's A1, and no full caution`, async () => {
      const out = await runAnalysis(cells, settings(mode));
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      const others = out.sheets.slice(1);
      expect(others.length).toBeGreaterThanOrEqual(5);
      for (const sheet of others) {
        const first = sheet.blocks[0]!;
        expect(first, sheet.name).toEqual({
          kind: 'paragraph',
          text: mode === 'unblinded' ? `${CAUTION_LINE} ${UNBLINDED_LINE}` : CAUTION_LINE,
          style: 'caution',
          link: { sheet: SUMMARY_SHEET_NAME, cell: 'A1' },
        });
        const text = paragraphs(sheet);
        for (const caution of [...CAUTIONS, UNBLINDED_CAUTION]) expect(text, `${sheet.name}: ${caution}`).not.toContain(caution);
        expect(sheet.blocks.filter((b) => b.kind === 'paragraph' && b.link !== undefined), sheet.name).toHaveLength(1);
      }
    });
  }

  it('every sheet but the model results opens with a table right after the one-line caution (its header on row 4)', async () => {
    const out = await runAnalysis(cells, settings('unblinded'));
    if (!out.ok) throw new Error('the demo must run');
    for (const sheet of out.sheets.slice(1)) {
      if (sheet.name === 'Model results') expect(sheet.blocks[1]?.kind, 'the model sheet opens with its plain paragraph').toBe('paragraph');
      else expect(sheet.blocks[1]?.kind, sheet.name).toBe('table');
    }
  });
});

describe('no name of a data set behind the tests appears in what users see', () => {
  // The data sets the model tests check against (test/core/model/helpers.ts and their sources); user-facing text may
  // state what those checks found, never which data they used.
  const NAMES = /\b(rails?|dyestuff|Devore|Davies)\b/i;
  it('in either mode, no sheet text and no JSON text names them, including the note on how the ICC interval was computed', async () => {
    for (const mode of ['blinded', 'unblinded'] as const) {
      const out = await runAnalysis(cells, settings(mode));
      if (!out.ok) throw new Error('the demo must run');
      const all = JSON.stringify(out);
      // The demo is unbalanced, so its ICC interval comes with the note that compares it with the exact interval.
      expect(all).toContain('within 0.03 of the exact F-based interval');
      expect(all).not.toMatch(NAMES);
    }
  });
});

describe('the analysis record carries the model technical notes in plain sentences', () => {
  it('lists how the intervals were computed, the likelihood evaluations and the AIC/BIC definitions under its notes', async () => {
    const out = await runAnalysis(cells, settings('blinded'));
    if (!out.ok) throw new Error('the demo must run');
    const record = out.sheets[out.sheets.length - 1]!;
    expect(record.name).toBe('Analysis record');
    const text = paragraphs(record).join('\n');
    expect(text).toMatch(/How the intervals were computed: /);
    expect(text).toMatch(/The fit took \d+ likelihood evaluations\. Convergence: Converged/);
    expect(text).toMatch(/AIC = −2 × log-likelihood \+ 2k/);
  });
});
