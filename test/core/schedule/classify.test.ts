import { describe, expect, it } from 'vitest';
import { ClassifyError, classifyVisits } from '../../../src/core/schedule/classify';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import { NO_STATUS, STATUS_ORDER } from '../../../src/core/schedule/types';
import type { ScheduleVisit, VisitTiming } from '../../../src/core/schedule/types';
import { makeTable } from './tableHelper';
import type { RowSpec } from './tableHelper';

// Hand-worked schedule for these tests (written down here, invented):
//   Baseline day 1 (window 1..1), Week 4 day 29 (window 26..32), Week 8 day 57 (window 52..62).
const SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
  { label: 'Week 8', targetDay: 57, before: 5, after: 5 },
];
const place = { sheet: 'Visits', topLeft: 'A1' };
const REF = 45000;

const statusNames = (t: VisitTiming): string[] => Array.from(t.rowStatus, (c) => (c === NO_STATUS ? '-' : STATUS_ORDER[c]!));
const slotNames = (t: VisitTiming, s: number): string[] =>
  Array.from(t.slotStatus.subarray(s * t.nVisits, (s + 1) * t.nVisits), (c) => (c === NO_STATUS ? '-' : STATUS_ORDER[c]!));

function run(rows: RowSpec[], opts: Parameters<typeof makeTable>[1], cutoff?: number): VisitTiming {
  const table = makeTable(rows, opts);
  const days = computeStudyDays(table, SCHEDULE, place);
  return classifyVisits(table, days, SCHEDULE, cutoff === undefined ? { place } : { cutoff, place });
}

describe('classifyVisits by visit label (hand-worked example above)', () => {
  const rows: RowSpec[] = [
    { subject: 'A', time: 1, visit: 'Baseline' },
    { subject: 'A', time: 26, visit: 'Week 4' }, // window opens on 26: bound included
    { subject: 'A', time: 63, visit: 'Week 8' }, // closes on 62: one day late
    { subject: 'B', time: 1, visit: 'Baseline' },
    { subject: 'B', time: 33, visit: 'Week 4' }, // 4 days after target ...
    { subject: 'B', time: 25, visit: 'week4' }, // ... and 4 days before: tie, the earlier (25) is the visit's record
    { subject: 'B', time: 62, visit: ' WEEK 8 ' }, // closes on 62: bound included; label ignoring case and spaces
    { subject: 'B', time: 40, visit: 'Unscheduled' }, // label of no scheduled visit
    { subject: 'C', time: 1, visit: 'Baseline' },
    { subject: 'C', time: 30, visit: 'Week 4' }, // C's last record is day 30 < 62: Week 8 not yet due
    { subject: 'D', time: 1, visit: 'Baseline' },
    { subject: 'D', time: 57, visit: 'Week 8' }, // D's last record is day 57 > 32: Week 4 missed
  ];
  const t = run(rows, { timeKind: 'studyDay', labels: true });

  it('gives on time inside the window with both bounds included, early/late outside with signed deviation', () => {
    expect(statusNames(t)).toEqual([
      'onTime', 'onTime', 'late',
      'onTime', 'repeat', 'early', 'onTime', 'extra',
      'onTime', 'onTime',
      'onTime', 'onTime',
    ]);
    expect(Array.from(t.rowDeviation)).toEqual([0, -3, 6, 0, 4, -4, 5, NaN, 0, 1, 0, 0]);
    expect(Array.from(t.rowVisit)).toEqual([0, 1, 2, 0, 1, 1, 2, -1, 0, 1, 0, 2]);
  });

  it('keeps the record closest to the target as the visit record, the earlier one on a tie; the other is repeat', () => {
    expect(t.slotRow[1 * 3 + 1]).toBe(5); // row index 5 (day 25) wins the tie with day 33
  });

  it('for study-day data without a cut-off, a visit is missed when the subject has a record after its window closes', () => {
    expect(t.cutoffRule).toBe('eachSubjectsLastRecord');
    expect(t.cutoff).toBeNull();
    expect(slotNames(t, 2)).toEqual(['onTime', 'onTime', 'notYetDue']);
    expect(slotNames(t, 3)).toEqual(['onTime', 'missed', 'onTime']);
  });

  it('counts every status once (hand count: 8 on time, 1 each of the others)', () => {
    expect(t.counts).toEqual({ onTime: 8, early: 1, late: 1, missed: 1, notYetDue: 1, afterExit: 0, extra: 1, repeat: 1 });
  });
});

describe('classifyVisits by nearest target day (no visit column)', () => {
  // Study days 1, 20, 43, 44, 56, 58, 100 for one subject.
  // 20 → Week 4 (9 from 29, 19 from 1): the only Week 4 record within reach, early by 9.
  // 43 → tie between Week 4 (14) and Week 8 (14) → the earlier visit, Week 4; outside its window → extra.
  // 44 → Week 8 (13); outside 52..62 → extra. 56 and 58 → Week 8, both 1 day off: the earlier (56) is the record,
  // 58 is inside the window → repeat. 100 → Week 8, outside → extra.
  const t = run(
    [1, 20, 43, 44, 56, 58, 100].map((d) => ({ subject: 'F', time: d })),
    { timeKind: 'studyDay' },
  );
  it('matches each record to the nearest target (tie → earlier visit) and marks records outside the window extra', () => {
    expect(statusNames(t)).toEqual(['onTime', 'early', 'extra', 'extra', 'onTime', 'repeat', 'extra']);
    expect(Array.from(t.rowVisit)).toEqual([0, 1, -1, -1, 2, 2, -1]);
    expect(Array.from(t.rowDeviation)).toEqual([0, -9, NaN, NaN, -1, 1, NaN]);
    expect(slotNames(t, 0)).toEqual(['onTime', 'early', 'onTime']);
  });
});

describe('classifyVisits around a dated cut-off', () => {
  // Subject E: reference REF, Baseline on REF (day 1). Week 4's window closes on day 32 = REF + 31.
  const rows: RowSpec[] = [{ subject: 'E', time: REF, reference: REF }];
  it('a visit whose window closes on the cut-off day is not yet due; one day later it is missed', () => {
    const onClose = run(rows, { reference: true }, REF + 31);
    expect(onClose.cutoffOffset[0]).toBe(31); // calendar days from the reference date: study day 32
    expect(slotNames(onClose, 0)).toEqual(['onTime', 'notYetDue', 'notYetDue']);
    const dayAfter = run(rows, { reference: true }, REF + 32);
    expect(slotNames(dayAfter, 0)).toEqual(['onTime', 'missed', 'notYetDue']);
    expect(dayAfter.cutoffRule).toBe('given');
  });

  it('defaults the cut-off to the latest date in the data and leaves out records after a given cut-off', () => {
    const data: RowSpec[] = [
      { subject: 'E', time: REF, reference: REF },
      { subject: 'G', time: REF + 40, reference: REF + 40 },
      { subject: 'G', time: REF + 70, reference: REF + 40 }, // day 31: Week 4 on time
    ];
    const latest = run(data, { reference: true });
    expect(latest.cutoff).toBe(REF + 70);
    expect(latest.cutoffRule).toBe('latestDate');
    expect(slotNames(latest, 0)).toEqual(['onTime', 'missed', 'missed']); // E: day 71 as of the cut-off
    const early = run(data, { reference: true }, REF + 60);
    expect(statusNames(early)).toEqual(['onTime', 'onTime', '-']);
    expect(early.issues.map((i) => [i.code, i.cell, i.value])).toEqual([['after-cutoff', 'Visits!B4', '2023-05-24']]);
  });
});

describe('classifyVisits misuse and edge cases', () => {
  it('throws a typed error for an empty schedule', () => {
    const table = makeTable([{ subject: 'A', time: 1 }], { timeKind: 'studyDay' });
    expect(() => classifyVisits(table, computeStudyDays(table, SCHEDULE, place), [])).toThrow(ClassifyError);
  });

  it('subjects without a usable record take no part and rows without a study day carry no status', () => {
    const t = run([{ subject: 'A', time: NaN }, { subject: 'B', time: 1 }], { timeKind: 'studyDay' });
    expect(statusNames(t)).toEqual(['-', 'onTime']);
    expect(slotNames(t, 0)).toEqual(['-', '-', '-']);
    expect(Array.from(t.subjectInTiming)).toEqual([0, 1]);
  });
});
