/**
 * Hand-worked visit windows across the reference date. The rule (CDISC SDTM Implementation Guide, study-day
 * variables --DY): study day = date − reference + 1 on or after the reference date, date − reference before it, so
 * there is no day 0. Windows, deviations and the choice of the closest record are counted in calendar days from the
 * target date (target study day t sits t − 1 days after the reference date for t ≥ 1, t days from it for t ≤ −1).
 * Every expected value below is worked out by hand in the comment beside it.
 */
import { describe, expect, it } from 'vitest';
import { classifyVisits } from '../../../src/core/schedule/classify';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import { NO_STATUS, STATUS_ORDER } from '../../../src/core/schedule/types';
import type { ScheduleVisit, VisitTiming } from '../../../src/core/schedule/types';
import { listVisitsDue } from '../../../src/core/report/visitsDue';
import { listDeviations } from '../../../src/core/report/deviationList';
import { makeTable, type RowSpec } from './tableHelper';

const place = { sheet: 'Visits', topLeft: 'A1' };
const REF = 45000; // the reference (randomisation) date as a day number; 2023-03-15
// Baseline on study day 1 with 3 days allowed either side: calendar window REF − 3 .. REF + 3.
// Week 2 on study day 15 (REF + 14), 2 days either side: REF + 12 .. REF + 16.
const SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 3, after: 3 },
  { label: 'Week 2', targetDay: 15, before: 2, after: 2 },
];
const NO_LAST = { date: null, daysSince: null, silent: false };
const names = (t: VisitTiming): string[] => Array.from(t.rowStatus, (c) => (c === NO_STATUS ? '-' : STATUS_ORDER[c]!));

function classify(rows: RowSpec[], timeKind: 'date' | 'studyDay', cutoff?: number) {
  const table = makeTable(rows, { timeKind, labels: true, reference: timeKind === 'date' });
  const days = computeStudyDays(table, SCHEDULE, place);
  const timing = classifyVisits(table, days, SCHEDULE, cutoff === undefined ? { place } : { cutoff, place });
  return { table, days, timing };
}

describe('visit windows across the reference date (CDISC SDTM IG study-day rule, hand-worked)', () => {
  it('a baseline 3 calendar days before the reference date is on time with 3 days allowed before (was: early by 4)', () => {
    // Date REF − 3: study day −3, offset −3; window opens at offset 0 − 3 = −3, bound included → on time, −3 days.
    const { timing, days } = classify([{ subject: 'A', time: REF - 3, visit: 'Baseline', reference: REF }], 'date');
    expect(names(timing)).toEqual(['onTime']);
    expect(timing.rowDeviation[0]).toBe(-3);
    expect(days.studyDays[0]).toBe(-3);
    expect(days.offsets[0]).toBe(-3);
  });

  it('one day further out (4 days before) is early by 4 calendar days', () => {
    const { timing } = classify([{ subject: 'A', time: REF - 4, visit: 'Baseline', reference: REF }], 'date');
    expect(names(timing)).toEqual(['early']);
    expect(timing.rowDeviation[0]).toBe(-4);
  });

  it('records on each side of the reference date: the day before is −1 day off, the reference date itself 0', () => {
    // REF − 1: study day −1, offset −1, deviation −1 (on time). REF: study day 1, offset 0, deviation 0 — the
    // closer one is the visit's record, the other a repeat.
    const { timing, days } = classify(
      [
        { subject: 'A', time: REF - 1, visit: 'Baseline', reference: REF },
        { subject: 'A', time: REF, visit: 'Baseline', reference: REF },
      ],
      'date',
    );
    expect(Array.from(days.studyDays)).toEqual([-1, 1]);
    expect(names(timing)).toEqual(['repeat', 'onTime']);
    expect(Array.from(timing.rowDeviation)).toEqual([-1, 0]);
  });

  it('a tie between records 2 calendar days either side of the target goes to the earlier one', () => {
    // REF − 2 (study day −2) and REF + 2 (study day 3) are both 2 calendar days from the target date REF; in study
    // days they would be 3 and 2 days off and the later one would wrongly win. The earlier wins the tie (SPEC §4).
    const { timing } = classify(
      [
        { subject: 'A', time: REF + 2, visit: 'Baseline', reference: REF },
        { subject: 'A', time: REF - 2, visit: 'Baseline', reference: REF },
      ],
      'date',
    );
    expect(names(timing)).toEqual(['repeat', 'onTime']);
    expect(Array.from(timing.rowDeviation)).toEqual([2, -2]);
    expect(timing.slotRow[0]).toBe(1);
  });

  it('study-day input gives the same statuses and deviations as the same visits given as dates', () => {
    // Study day −3 is offset −3; study day 3 is offset 2; study day 17 is offset 16 (Week 2 window closes there).
    const dated = classify(
      [
        { subject: 'A', time: REF - 3, visit: 'Baseline', reference: REF },
        { subject: 'A', time: REF + 2, visit: 'Baseline', reference: REF },
        { subject: 'A', time: REF + 16, visit: 'Week 2', reference: REF },
      ],
      'date',
    );
    const given = classify(
      [
        { subject: 'A', time: -3, visit: 'Baseline' },
        { subject: 'A', time: 3, visit: 'Baseline' },
        { subject: 'A', time: 17, visit: 'Week 2' },
      ],
      'studyDay',
    );
    expect(names(given.timing)).toEqual(names(dated.timing));
    expect(Array.from(given.timing.rowDeviation)).toEqual(Array.from(dated.timing.rowDeviation));
    expect(Array.from(given.timing.rowDeviation)).toEqual([-3, 2, 2]);
  });

  it('the model time of a record the day before the reference date is −1 day, not −2', () => {
    const { days } = classify([{ subject: 'A', time: REF - 1, visit: 'Baseline', reference: REF }], 'date');
    expect(days.offsets[0]).toBe(-1); // model time = offset / unit (see test/core/model/fromTable.test.ts)
  });

  it('the visits-due list and the deviation listing agree with the classification on every days-from-target figure', () => {
    // Cut-off REF + 10: Week 2's window (REF + 12 .. REF + 16) has not opened; target REF + 14 is 4 days ahead.
    const rows: RowSpec[] = [
      { subject: 'A', time: REF - 4, visit: 'Baseline', reference: REF },
      { subject: 'B', time: REF + 1, visit: 'Baseline', reference: REF + 1 },
    ];
    const r = classify(rows, 'date', REF + 10);
    const due = listVisitsDue({ table: r.table, schedule: SCHEDULE, days: r.days, timing: r.timing }, () => '', () => NO_LAST);
    expect(due.map((d) => [d.subject, d.visit, d.daysUntilTarget, d.status, d.windowOpens, d.windowCloses])).toEqual([
      ['A', 'Week 2', 4, 'comingUp', REF + 12, REF + 16],
      ['B', 'Week 2', 5, 'comingUp', REF + 13, REF + 17], // B's reference is one day later
    ]);
    const dev = listDeviations({ table: r.table, schedule: SCHEDULE, days: r.days, timing: r.timing }, () => '', () => NO_LAST);
    expect(dev.map((d) => [d.subject, d.visit, d.status, d.daysOff, d.windowOpens, d.targetDate])).toEqual([
      ['A', 'Baseline', 'early', -4, REF - 3, REF],
    ]);
  });
});
