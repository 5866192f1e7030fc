import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readTable } from '../../../src/core/intake/readTable';
import type { CellValue } from '../../../src/core/intake/types';
import { NO_STATUS, classifyVisits, computeStudyDays, parseSchedule, starterScheduleCells } from '../../../src/core/schedule';
import { summarizeTiming, timingJson, timingSheets } from '../../../src/core/report';

// Invented kidney-function trial rows (eGFR every 12 weeks), read through the real intake layer.
// Starter schedule: Baseline day 1 (±0), Week 12 day 85, Week 24 day 169, ... each ±7 days.
const CELLS: CellValue[][] = [
  ['Subject', 'Visit', 'Visit date', 'Randomisation date', 'eGFR', 'Site'],
  ['K-001', 'Baseline', '2024-01-10', '2024-01-10', 61.5, '03'], // day 1
  ['K-001', 'week 12', '2024-04-05', '2024-01-10', 60.1, '03'], // day 87: on time (+2)
  ['K-001', 'Week 24', '2024-07-10', '2024-01-10', 58.9, '03'], // day 183: late (+14)
  ['K-002', 'Baseline', '2024-02-01', '2024-02-01', 48.0, '07'], // day 1
  ['K-002', 'Week 12', 'not a date', '2024-02-01', 47.2, '07'], // unusable date: left out by intake
  ['K-002', 'Week 24', '2024-07-20', '2024-02-01', 46.0, '07'], // day 171: on time (+2)
];

describe('schedule layer on tables read by readTable', () => {
  const read = readTable(CELLS, {
    sheet: 'Visits',
    topLeft: 'A1',
    dateSystem: 1900,
    mode: 'blinded',
    mapping: { subject: 0, visit: 1, date: 2, reference: 3, value: 4, site: 5, covariates: [] },
  });
  if (!read.ok) throw new Error(read.issues.map((i) => i.message).join('\n'));
  const { table } = read;
  const schedule = parseSchedule(starterScheduleCells(), 'Schedule', 'A1').schedule;
  const days = computeStudyDays(table, schedule, { sheet: 'Visits', topLeft: 'A1' });
  const timing = classifyVisits(table, days, schedule, { place: { sheet: 'Visits', topLeft: 'A1' } });

  it('computes CDISC study days from the reference date (hand count: 2024 is a leap year)', () => {
    // 2024-01-10 → 2024-04-05: 21 + 29 + 31 + 5 = 86 days later → day 87; → 2024-07-10: 182 days later → day 183.
    // 2024-02-01 → 2024-07-20: 28 + 31 + 30 + 31 + 30 + 20 = 170 days later → day 171.
    expect(Array.from(days.studyDays)).toEqual([1, 87, 183, 1, NaN, 171]);
  });

  it('classifies by label ignoring case, with the cut-off at the latest date (2024-07-20)', () => {
    // K-001: cut-off is day 193 → Week 36 (closes day 260) not yet due. K-002: day 171 → Week 12 (closes day 92) missed.
    expect(timing.counts).toEqual({ onTime: 4, early: 0, late: 1, missed: 1, notYetDue: 4, afterExit: 0, extra: 0, repeat: 0 });
    const s = summarizeTiming({ table, schedule, days, timing });
    expect(timingJson(s).cutoff).toBe('2024-07-20');
    expect(s.deviations.map((d) => [d.subject, d.visit, d.status, d.daysOff])).toEqual([
      ['K-001', 'Week 24', 'late', 14],
      ['K-002', 'Week 12', 'missed', null],
    ]);
    // Days until Week 36's target (day 253): K-001 252 − 192 = 60; K-002 252 − 170 = 82; soonest first.
    expect(s.upcoming.map((u) => [u.subject, u.visit, u.daysUntilTarget, u.status])).toEqual([
      ['K-001', 'Week 36', 60, 'comingUp'],
      ['K-002', 'Week 36', 82, 'comingUp'],
    ]);
  });
});

describe('schedule and timing reports on arbitrary grids read by readTable', () => {
  const cellArb = fc.oneof(
    fc.constantFrom<CellValue>(null, '', 'K-1', 'K-2', 'k-1 ', 'Baseline', 'Week 12', 'WEEK12', 'Other', '#N/A', 'x', '2024-01-10', '2024-04-05', '2024-02-30', '01', '02'),
    fc.integer({ min: 45000, max: 45400 }),
    fc.double({ min: -5, max: 400, noNaN: true }),
  );
  it('never throws from intake to sheets and JSON, and every row either has a status or is left out', () => {
    let usableRuns = 0;
    fc.assert(
      fc.property(fc.array(fc.array(cellArb, { minLength: 6, maxLength: 6 }), { minLength: 1, maxLength: 25 }), (body) => {
        const cells: CellValue[][] = [['Subject', 'Visit', 'Visit date', 'Randomisation date', 'eGFR', 'Site'], ...body];
        const read = readTable(cells, {
          sheet: 'Visits',
          topLeft: 'B2',
          dateSystem: 1900,
          mode: 'blinded',
          mapping: { subject: 0, visit: 1, date: 2, reference: 3, value: 4, site: 5, covariates: [] },
        });
        if (!read.ok) return;
        usableRuns++;
        const schedule = parseSchedule(starterScheduleCells(), 'Schedule', 'A1').schedule;
        const place = { sheet: 'Visits', topLeft: 'B2' };
        const days = computeStudyDays(read.table, schedule, place);
        const timing = classifyVisits(read.table, days, schedule, { place });
        const summary = summarizeTiming({ table: read.table, schedule, days, timing });
        expect(() => JSON.stringify(timingJson(summary))).not.toThrow();
        expect(timingSheets(summary)).toHaveLength(3);
        for (let i = 0; i < read.table.nRows; i++) {
          const hasStatus = timing.rowStatus[i] !== NO_STATUS;
          const usable = read.table.usableTiming[i] === 1 && Number.isFinite(days.studyDays[i]!);
          expect(hasStatus).toBe(usable);
        }
        for (const issue of days.issues) expect(issue.cell).toMatch(/^Visits!D\d+$/);
      }),
      { numRuns: 200 },
    );
    expect(usableRuns).toBeGreaterThan(20); // the property must reach the schedule layer often enough to mean something
  });
});
