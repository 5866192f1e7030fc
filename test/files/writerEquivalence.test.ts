/**
 * The streaming writer (src/files/writeWorkbook.ts) against the exceljs-based writer it replaced (kept unchanged in
 * test/support/exceljsWriter/ for this test only): the invented demo trial's report (demo/, `npm run demo` settings),
 * written by both, holds the same content cell by cell — values, types, number formats, the used area (which sets the printed width), merged ranges, column widths,
 * row heights, tables with their names, ranges, filters and columns, internal links, frozen rows, print settings and the
 * charts' anchors and series references. The old writer is run rather than a committed snapshot compared, so the test
 * keeps holding when the report's sheets change (a snapshot would go stale with every new column).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../src/core/pipeline';
import { parseSchedule } from '../../src/core/schedule';
import { readCsvText } from '../../src/files';
import { writeWorkbook } from '../../src/files/writeWorkbook';
import { writeWorkbook as writeWorkbookWithExceljs } from '../support/exceljsWriter/writeWorkbook';
import { workbookContent } from '../support/workbookContent';

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
    ...(mode === 'unblinded' ? { referenceArm: 'Placebo' } : {}),
  };
}

const stamp = { runAt: '2026-01-01T00:00:00.000Z', fingerprint: '0123456789abcdef0123' };

describe('the streaming writer writes the same report as the exceljs writer it replaced', () => {
  for (const mode of ['unblinded', 'blinded'] as const) {
    it(`the demo report in ${mode} mode: same sheets, cells, formats, merges, tables, links, print settings and charts`, async () => {
      const out = await runAnalysis(cells, settings(mode));
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      const before = await workbookContent(await writeWorkbookWithExceljs(out.sheets, stamp));
      const after = await workbookContent(await writeWorkbook(out.sheets, stamp));
      expect(after.map((s) => s.name)).toEqual(before.map((s) => s.name));
      // Guard against an empty comparison: the demo report has six sheets, tables on each, charts and links.
      expect(before.length).toBeGreaterThanOrEqual(6);
      expect(before.flatMap((s) => s.tables).length).toBeGreaterThan(6);
      expect(before.flatMap((s) => s.charts).length).toBeGreaterThan(0);
      expect(before.flatMap((s) => s.links).length).toBe(before.length - 1);
      for (const [k, b] of before.entries()) {
        const a = after[k]!;
        expect(Object.keys(a.cells).length, b.name).toBe(Object.keys(b.cells).length);
        expect(a.cells, b.name).toEqual(b.cells);
        expect(a.used, b.name).toEqual(b.used);
        expect(a.merges, b.name).toEqual(b.merges);
        expect(a.widths, b.name).toEqual(b.widths);
        expect(a.heights, b.name).toEqual(b.heights);
        expect(a.links, b.name).toEqual(b.links);
        expect(a.frozenRows, b.name).toBe(b.frozenRows);
        expect(a.print, b.name).toEqual(b.print);
        expect(a.tables, b.name).toEqual(b.tables);
        expect(a.charts, b.name).toEqual(b.charts);
      }
    });
  }
});
