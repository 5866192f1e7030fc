import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';
import { CAUTIONS, UNBLINDED_CAUTION } from '../../../src/core/report';
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

describe('every output sheet carries the cautions of SPEC §2', () => {
  for (const mode of ['blinded', 'unblinded'] as const) {
    it(`in ${mode} mode each sheet shows all three cautions${mode === 'unblinded' ? ' and the unblinded caution' : ''}`, async () => {
      const out = await runAnalysis(cells, settings(mode));
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      expect(out.sheets.length).toBeGreaterThanOrEqual(5);
      for (const sheet of out.sheets) {
        const text = paragraphs(sheet);
        for (const caution of CAUTIONS) expect(text, `${sheet.name}: ${caution}`).toContain(caution);
        if (mode === 'unblinded') expect(text, `${sheet.name}: unblinded caution`).toContain(UNBLINDED_CAUTION);
        else expect(text).not.toContain(UNBLINDED_CAUTION);
      }
    });
  }
});
