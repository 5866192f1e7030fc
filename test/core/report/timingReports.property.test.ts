import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { classifyVisits } from '../../../src/core/schedule/classify';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import type { ScheduleVisit } from '../../../src/core/schedule/types';
import { summarizeTiming } from '../../../src/core/report/summarizeTiming';
import { timingSheets } from '../../../src/core/report/timingSheets';
import { makeTable } from '../schedule/tableHelper';

const SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
  { label: 'Week 8', targetDay: 57, before: 5, after: 5 },
];
const REF = 45000;

const rowArb = fc.record({
  subject: fc.constantFrom('P1', 'P2', 'P3', 'P4', 'P5'),
  offset: fc.integer({ min: 0, max: 80 }),
  label: fc.constantFrom('Baseline', 'Week 4', 'week 8', 'Other'),
  arm: fc.constantFrom('A', 'B', ''),
  site: fc.constantFrom('01', '02', ''),
});

const sum = (xs: readonly number[]): number => xs.reduce((a, b) => a + b, 0);

describe('visit-timing report totals (exact identities)', () => {
  it('tables by visit, by arm and by site, and the deviation listing, add up to the status counts', () => {
    fc.assert(
      fc.property(fc.array(rowArb, { minLength: 1, maxLength: 30 }), fc.boolean(), (rows, labels) => {
        const table = makeTable(
          rows.map((r) => ({ subject: r.subject, time: REF + r.offset, reference: REF, visit: r.label, arm: r.arm, site: r.site })),
          { labels, reference: true, arm: true, site: true },
        );
        const days = computeStudyDays(table, SCHEDULE, { sheet: 'V', topLeft: 'A1' });
        const timing = classifyVisits(table, days, SCHEDULE);
        const s = summarizeTiming({ table, schedule: SCHEDULE, days, timing });
        const c = s.counts;
        for (const key of ['onTime', 'early', 'late', 'missed', 'notYetDue'] as const) {
          expect(sum(s.byVisit.map((r) => r[key]))).toBe(c[key]);
          expect(sum(s.byArm!.map((r) => r[key]))).toBe(c[key]);
        }
        for (const r of s.byVisit) {
          expect(r.expected).toBe(s.subjects);
          expect(r.due).toBe(r.onTime + r.early + r.late + r.missed);
        }
        const due = c.onTime + c.early + c.late + c.missed;
        expect(sum(s.bySite!.map((r) => r.due))).toBe(due);
        expect(sum(s.bySite!.map((r) => r.subjects))).toBe(s.subjects);
        expect(sum(s.bySite!.map((r) => r.outOfWindow))).toBe(c.early + c.late);
        expect(s.deviations).toHaveLength(c.early + c.late + c.missed + c.extra + c.repeat);
        // worst first
        for (let k = 1; k < s.bySite!.length; k++) {
          expect(s.bySite![k - 1]!.combinedRate ?? -1).toBeGreaterThanOrEqual(s.bySite![k]!.combinedRate ?? -1);
        }
        // every table row has one cell per column
        for (const sheet of timingSheets(s)) for (const b of sheet.blocks) if (b.kind === 'table') for (const r of b.rows) expect(r).toHaveLength(b.columns.length);
      }),
      { numRuns: 200 },
    );
  });
});
