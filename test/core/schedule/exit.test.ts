/**
 * Participants who leave the study (SPEC §4): a scheduled visit with no record whose window had not closed by the
 * exit date is "not expected" (afterExit), never missed, not a deviation and not due; a visit whose window closed
 * before the exit is still missed; a record dated after the exit is kept with a warning. Hand-worked, invented data.
 */
import { describe, expect, it } from 'vitest';
import { classifyVisits } from '../../../src/core/schedule/classify';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import { NO_STATUS, STATUS_ORDER } from '../../../src/core/schedule/types';
import type { ScheduleVisit, VisitTiming } from '../../../src/core/schedule/types';
import { summarizeTiming } from '../../../src/core/report/summarizeTiming';
import { makeTable, type RowSpec } from './tableHelper';

const place = { sheet: 'Visits', topLeft: 'A1' };
const REF = 45000;
// Calendar windows from the reference date: Baseline 0..0, Week 4 (day 29) 25..31, Week 8 (day 57) 51..61,
// Week 12 (day 85) 79..89.
const SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
  { label: 'Week 8', targetDay: 57, before: 5, after: 5 },
  { label: 'Week 12', targetDay: 85, before: 6, after: 4 },
];
const slots = (t: VisitTiming, s: number): string[] =>
  Array.from(t.slotStatus.subarray(s * t.nVisits, (s + 1) * t.nVisits), (c) => (c === NO_STATUS ? '-' : STATUS_ORDER[c]!));

function run(rows: RowSpec[], cutoff = REF + 200) {
  const table = makeTable(rows, { labels: true, reference: true });
  const days = computeStudyDays(table, SCHEDULE, place);
  const timing = classifyVisits(table, days, SCHEDULE, { cutoff, place });
  return { table, days, timing, summary: summarizeTiming({ table, schedule: SCHEDULE, days, timing }) };
}

describe('visits after a participant left the study', () => {
  // A: baseline only, left on REF + 40. Week 4 closed (31) before the exit (40) → missed; Week 8 (51..61) and Week 12
  // open after the exit → not expected.
  // B: baseline only, left on REF + 55, inside Week 8's window (51..61) → Week 8 straddles the exit: not expected.
  // C: no exit, baseline only → Week 4, 8, 12 all missed by the cut-off REF + 200.
  const rows: RowSpec[] = [
    { subject: 'A', time: REF, visit: 'Baseline', reference: REF, exit: REF + 40 },
    { subject: 'B', time: REF, visit: 'Baseline', reference: REF },
    { subject: 'B', time: REF + 100, visit: 'Unscheduled', reference: REF, exit: REF + 55 }, // dated after B's exit
    { subject: 'C', time: REF, visit: 'Baseline', reference: REF },
  ];
  const r = run(rows);

  it('a window that closed before the exit is missed; one that opens after it, or straddles it, is not expected', () => {
    expect(slots(r.timing, 0)).toEqual(['onTime', 'missed', 'afterExit', 'afterExit']);
    expect(slots(r.timing, 1)).toEqual(['onTime', 'missed', 'afterExit', 'afterExit']);
    expect(slots(r.timing, 2)).toEqual(['onTime', 'missed', 'missed', 'missed']);
    expect(r.timing.counts).toMatchObject({ missed: 5, afterExit: 4 });
  });

  it('a record dated after the exit date is kept and flagged with a warning at its date cell', () => {
    expect(r.timing.rowStatus[2]).not.toBe(NO_STATUS);
    expect(r.timing.issues.map((i) => [i.code, i.cell, i.use])).toEqual([['after-exit', 'Visits!B4', null]]);
  });

  it('visits not expected are neither deviations nor due, and those who left are not in the visits-due list', () => {
    expect(r.summary.deviations.filter((d) => d.status === 'afterExit')).toEqual([]);
    expect(r.summary.deviations.filter((d) => d.status === 'missed').map((d) => [d.subject, d.visit])).toEqual([
      ['A', 'Week 4'],
      ['B', 'Week 4'],
      ['C', 'Week 4'],
      ['C', 'Week 8'],
      ['C', 'Week 12'],
    ]);
    expect(r.summary.upcoming.map((u) => u.subject)).toEqual(['C']);
    const week8 = r.summary.byVisit.find((v) => v.visit === 'Week 8')!;
    expect(week8).toMatchObject({ expected: 1, missed: 1, afterExit: 2, due: 1 });
  });

  it('lists who left, when, and the last visit attended', () => {
    expect(r.summary.exits.map((e) => [e.subject, e.exitDate, e.exitStudyDay, e.lastVisit])).toEqual([
      ['A', REF + 40, 41, 'Baseline'],
      ['B', REF + 55, 56, 'Baseline'],
    ]);
  });

  it('without an exit date a long silence is marked for follow-up, never reclassified', () => {
    // Two scheduled intervals: target offsets 0, 28, 56, 84 → median gap 28 → 56 days. C's last record is REF, the
    // cut-off REF + 200: 200 days without a record → marked; A and B left, so they are not marked.
    expect(r.summary.silenceDays).toBe(56);
    const c = r.summary.upcoming[0]!;
    expect(c.lastRecord).toEqual({ date: REF, daysSince: 200, silent: true });
    expect(r.summary.deviations.find((d) => d.subject === 'A')!.lastRecord.silent).toBe(false);
  });

  it('a participant with no exit date is treated as before (the visits are missed)', () => {
    const noExit = run(rows.map((x): RowSpec => ({ subject: x.subject, time: x.time, visit: x.visit ?? '', reference: x.reference ?? NaN })));
    expect(noExit.timing.counts).toMatchObject({ missed: 9, afterExit: 0 });
  });
});
