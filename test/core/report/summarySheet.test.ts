import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';
import { CAUTIONS, UNBLINDED_CAUTION } from '../../../src/core/report/cautions';
import { summarizeTiming } from '../../../src/core/report/summarizeTiming';
import { SUMMARY_SHEET_NAME, timingHeadline } from '../../../src/core/report/summarySheet';
import type { SheetSpec, TableBlock } from '../../../src/core/report/types';
import type { VisitSummaryRow } from '../../../src/core/report/timingTypes';
import { classifyVisits } from '../../../src/core/schedule/classify';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import { parseSchedule } from '../../../src/core/schedule';
import type { ScheduleVisit } from '../../../src/core/schedule/types';
import { readCsvText } from '../../../src/files';
import { makeTable } from '../schedule/tableHelper';

const row = (visit: string, counts: Partial<VisitSummaryRow>): VisitSummaryRow => {
  const r = { onTime: 0, early: 0, late: 0, missed: 0, notYetDue: 0, afterExit: 0, ...counts };
  const due = r.onTime + r.early + r.late + r.missed;
  return { visit, targetDay: 1, expected: due + r.notYetDue, ...r, due, onTimeRate: due > 0 ? r.onTime / due : null, medianDeviation: null, minDeviation: null, maxDeviation: null };
};

describe('timingHeadline: the visit-timing numbers of the summary sheet', () => {
  it('counts visits not expected (left) and not yet due as not due, and each participant with a deviation once', () => {
    // Hand-worked arithmetic (exact): due = 6 + 1 + 1 + 2 = 10 and 3 + 0 + 0 + 1 = 4, so 14 due, 9 on time, 9/14.
    const byVisit = [row('Week 4', { onTime: 6, early: 1, late: 1, missed: 2, notYetDue: 5, afterExit: 3 }), row('Week 8', { onTime: 3, missed: 1, afterExit: 7 })];
    const line = (subject: string, status: 'early' | 'late' | 'missed' | 'extra' | 'repeat') => ({
      subject, site: '', visit: 'Week 4', targetDate: null, windowOpens: null, windowCloses: null, actualDate: null, daysOff: null, status, sheetRow: null,
      lastRecord: { date: null, daysSince: null, silent: false },
    });
    const deviations = [line('P1', 'early'), line('P1', 'missed'), line('P2', 'late'), line('P3', 'extra'), line('P4', 'repeat')];
    const h = timingHeadline({ byVisit, deviations });
    expect(h).toEqual({ due: 14, onTime: 9, onTimeRate: 9 / 14, missed: 3, participantsWithDeviation: 2 });
  });

  it('has no on-time rate when no visit is due', () => {
    expect(timingHeadline({ byVisit: [row('Week 4', { notYetDue: 4 })], deviations: [] }).onTimeRate).toBeNull();
  });

  const SCHEDULE: readonly ScheduleVisit[] = [
    { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
    { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
    { label: 'Week 8', targetDay: 57, before: 5, after: 5 },
  ];
  it('agrees with the status counts on generated data: due = on time + early + late + missed (exact identity)', () => {
    const rowArb = fc.record({ subject: fc.constantFrom('P1', 'P2', 'P3', 'P4'), offset: fc.integer({ min: 0, max: 80 }), label: fc.constantFrom('Baseline', 'Week 4', 'Week 8', 'Other') });
    fc.assert(
      fc.property(fc.array(rowArb, { minLength: 1, maxLength: 25 }), (rows) => {
        const table = makeTable(rows.map((r) => ({ subject: r.subject, time: 45000 + r.offset, reference: 45000, visit: r.label })), { labels: true, reference: true });
        const days = computeStudyDays(table, SCHEDULE, { sheet: 'V', topLeft: 'A1' });
        const s = summarizeTiming({ table, schedule: SCHEDULE, days, timing: classifyVisits(table, days, SCHEDULE) });
        const h = timingHeadline(s);
        const c = s.counts;
        expect(h.due).toBe(c.onTime + c.early + c.late + c.missed);
        expect(h.onTime).toBe(c.onTime);
        expect(h.missed).toBe(c.missed);
        expect(h.participantsWithDeviation).toBeLessThanOrEqual(s.subjects);
        expect(h.participantsWithDeviation === 0).toBe(c.early + c.late + c.missed === 0);
      }),
    );
  });
});

// The bundled demo: an invented kidney-function trial (demo/README.md); it describes no real trial, site or person.
const cells = readCsvText(readFileSync('demo/egfr-visits.csv', 'utf8'));
const parsed = parseSchedule(readCsvText(readFileSync('demo/egfr-schedule.csv', 'utf8')), 'egfr-schedule', 'A1');
const settings = (mode: 'blinded' | 'unblinded'): AnalysisSettings => ({
  sheet: 'egfr-visits', topLeft: 'A1', dateSystem: 1900, mode, numericText: 'accept', schedule: parsed.ok ? parsed.schedule : [],
  timeUnit: 'month', dfMethod: 'kenward-roger', method: 'reml', level: 0.95, scheduledOnly: false, perSubject: true,
  inputLabel: 'egfr-visits.csv', runAt: '2026-01-01T00:00:00.000Z',
});
const tables = (s: SheetSpec): TableBlock[] => s.blocks.filter((b): b is TableBlock => b.kind === 'table');
const texts = (s: SheetSpec): string[] =>
  s.blocks.flatMap((b) => (b.kind === 'paragraph' ? [b.text] : b.kind === 'table' ? [b.caption, ...b.columns.map((c) => c.header), ...b.rows.flat().filter((x): x is string => typeof x === 'string')] : [b.chart.title, ...b.chart.series.map((x) => x.name)]));

describe('the summary sheet of a run', () => {
  it('comes first, opens with the full cautions of the mode, and names what was analysed', async () => {
    for (const mode of ['blinded', 'unblinded'] as const) {
      const out = await runAnalysis(cells, settings(mode));
      if (!out.ok) throw new Error('the demo must run');
      const first = out.sheets[0]!;
      expect(first.name).toBe(SUMMARY_SHEET_NAME);
      const opening = first.blocks.slice(0, mode === 'unblinded' ? 4 : 3).map((b) => (b.kind === 'paragraph' ? b.text : ''));
      expect(opening).toEqual(mode === 'unblinded' ? [...CAUTIONS, UNBLINDED_CAUTION] : [...CAUTIONS]);
      const analysed = tables(first).find((t) => t.id === 'WhatWasAnalysed')!;
      expect(analysed.rows.map((r) => r[0])).toEqual(['File', 'Rows read', 'Participants', 'Cut-off', 'Mode', 'Run at']);
      expect(analysed.rows[5]![1]).toBe('2026-01-01 00:00 (UTC+00:00)');
      expect(analysed.rows[0]![1]).toBe('egfr-visits.csv');
      expect(first.blocks.filter((b) => b.kind === 'chart')).toHaveLength(2);
    }
  });

  it('shows the same visits due, on time and missed as the visit timing sheet (sum of its by-visit table)', async () => {
    const out = await runAnalysis(cells, settings('blinded'));
    if (!out.ok) throw new Error('the demo must run');
    const glance = tables(out.sheets[0]!).find((t) => t.id === 'TimingAtAGlance')!;
    const byVisit = tables(out.sheets.find((s) => s.name === 'Visit timing')!).find((t) => t.id === 'ByVisit')!;
    const sumOf = (header: string): number => {
      const j = byVisit.columns.findIndex((c) => c.header === header);
      expect(j).toBeGreaterThanOrEqual(0);
      return byVisit.rows.reduce((a, r) => a + (r[j] as number), 0);
    };
    expect(glance.rows[0]![0]).toBe(sumOf('Visits due'));
    expect(glance.rows[0]![1]).toBe(sumOf('On time'));
    expect(glance.rows[0]![3]).toBe(sumOf('Missed'));
  });

  it('in unblinded mode gives the treatment difference at the last scheduled visit with its interval and p; in blinded mode the ICC and trend and no arm', async () => {
    const un = await runAnalysis(cells, settings('unblinded'));
    const bl = await runAnalysis(cells, settings('blinded'));
    if (!un.ok || !bl.ok) throw new Error('the demo must run');
    const diff = tables(un.sheets[0]!).find((t) => t.id === 'DifferenceAtLastVisit')!;
    expect(diff.columns.map((c) => c.header)).toEqual(['Arm', 'Compared with', 'Visit', 'Difference', 'Lower limit', 'Upper limit', 'p']);
    for (const r of diff.rows) {
      const [est, lo, hi, p] = r.slice(3) as number[];
      expect(lo).toBeLessThanOrEqual(est!);
      expect(est).toBeLessThanOrEqual(hi!);
      expect(p).toBeGreaterThanOrEqual(0);
      expect(p).toBeLessThanOrEqual(1);
    }
    const arms = new Set(diff.rows.flatMap((r) => [r[0], r[1]]) as string[]);
    expect(arms.size).toBeGreaterThanOrEqual(2);
    const blinded = bl.sheets[0]!;
    expect(tables(blinded).map((t) => t.id)).toEqual(['WhatWasAnalysed', 'TimingAtAGlance', 'ModelAtAGlance']);
    expect(tables(blinded).find((t) => t.id === 'ModelAtAGlance')!.rows.map((r) => r[0])).toEqual([
      'Intraclass correlation (share of the variation between participants)',
      'Overall change in the value per month',
    ]);
    for (const text of texts(blinded)) for (const arm of arms) expect(text, `blinded summary mentions ${arm}`).not.toContain(arm);
  });
});
