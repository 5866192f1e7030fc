import { describe, expect, it } from 'vitest';
import { classifyVisits } from '../../../src/core/schedule/classify';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import type { ScheduleVisit } from '../../../src/core/schedule/types';
import { UNBLINDED_CAUTION, UNBLINDED_LINE, cautionLine } from '../../../src/core/report/cautions';
import { summarizeTiming } from '../../../src/core/report/summarizeTiming';
import { timingJson } from '../../../src/core/report/timingJson';
import { timingSheets } from '../../../src/core/report/timingSheets';
import type { TableBlock } from '../../../src/core/report/types';
import { makeTable } from '../schedule/tableHelper';
import type { RowSpec } from '../schedule/tableHelper';

// Hand-worked example (invented): Baseline day 1 (window 1..1), Week 4 day 29 (26..32), Week 8 day 57 (52..62).
const SCHEDULE: readonly ScheduleVisit[] = [
  { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
  { label: 'Week 8', targetDay: 57, before: 5, after: 5 },
];
const REF = 45000; // 2023-03-15; day numbers below are converted to ISO dates by hand counting (March has 31 days)
const ROWS: RowSpec[] = [
  { subject: 'P1', site: '01', arm: 'A', reference: REF, time: REF, visit: 'Baseline' }, // sheet row 2
  { subject: 'P1', site: '01', arm: 'A', reference: REF, time: REF + 27, visit: 'Week 4' }, // day 28: on time, −1
  { subject: 'P1', site: '01', arm: 'A', reference: REF, time: REF + 56, visit: 'Week 8' }, // day 57: on time, 0
  { subject: 'P2', site: '01', arm: 'B', reference: REF, time: REF, visit: 'Baseline' },
  { subject: 'P2', site: '01', arm: 'B', reference: REF, time: REF + 35, visit: 'Week 4' }, // row 6, day 36: late +7
  { subject: 'P3', site: '02', arm: 'A', reference: REF + 10, time: REF + 10, visit: 'Baseline' },
  { subject: 'P3', site: '02', arm: 'A', reference: REF + 10, time: REF + 20, visit: 'Unscheduled' }, // row 8: extra
];
// Cut-off = latest date REF + 56: study day 57 for P1 and P2, 47 for P3 (Week 4 closed on day 32 → missed).
// Last records as of the cut-off (calendar days): P2 REF + 35, 21 days before; P3 REF + 20, 36 days before. Silence
// mark after two scheduled intervals: targets at offsets 0, 28, 56 → median gap 28 → 56 days, so nobody is marked.

function build(unblinded: boolean) {
  const table = makeTable(ROWS, { labels: true, reference: true, site: true, arm: unblinded });
  const days = computeStudyDays(table, SCHEDULE, { sheet: 'Visits', topLeft: 'A1' });
  const timing = classifyVisits(table, days, SCHEDULE);
  return summarizeTiming({ table, schedule: SCHEDULE, days, timing });
}

describe('visit-timing reports (hand-worked example above)', () => {
  const s = build(true);

  it('counts statuses: 5 on time, 1 late, 1 missed, 2 not yet due, 1 extra', () => {
    expect(s.counts).toEqual({ onTime: 5, early: 0, late: 1, missed: 1, notYetDue: 2, afterExit: 0, extra: 1, repeat: 0 });
    expect(s.subjects).toBe(3);
    expect(s.cutoff).toBe(REF + 56);
  });

  it('summarises by visit with on-time rate = on time / due and deviation median and range', () => {
    expect(s.byVisit).toEqual([
      { visit: 'Baseline', targetDay: 1, expected: 3, onTime: 3, early: 0, late: 0, missed: 0, notYetDue: 0, afterExit: 0, due: 3, onTimeRate: 1, medianDeviation: 0, minDeviation: 0, maxDeviation: 0 },
      { visit: 'Week 4', targetDay: 29, expected: 3, onTime: 1, early: 0, late: 1, missed: 1, notYetDue: 0, afterExit: 0, due: 3, onTimeRate: 1 / 3, medianDeviation: 3, minDeviation: -1, maxDeviation: 7 },
      { visit: 'Week 8', targetDay: 57, expected: 3, onTime: 1, early: 0, late: 0, missed: 0, notYetDue: 2, afterExit: 0, due: 1, onTimeRate: 1, medianDeviation: 0, minDeviation: 0, maxDeviation: 0 },
    ]);
  });

  it('summarises by arm and visit in unblinded mode, with a null rate when nothing is due', () => {
    const b8 = s.byArm!.find((r) => r.arm === 'B' && r.visit === 'Week 8')!;
    expect(b8).toMatchObject({ expected: 1, notYetDue: 1, due: 0, onTimeRate: null, medianDeviation: null });
    const a4 = s.byArm!.find((r) => r.arm === 'A' && r.visit === 'Week 4')!;
    expect(a4).toMatchObject({ expected: 2, onTime: 1, missed: 1, due: 2, onTimeRate: 0.5, medianDeviation: -1 });
    expect(s.byArm!.map((r) => r.arm)).toEqual(['A', 'A', 'A', 'B', 'B', 'B']);
  });

  it('lists sites worst first by combined out-of-window and missed rate', () => {
    expect(s.bySite).toEqual([
      { site: '02', subjects: 1, due: 2, onTime: 1, outOfWindow: 0, missed: 1, afterExit: 0, left: 0, onTimeRate: 0.5, outOfWindowRate: 0, missedRate: 0.5, combinedRate: 0.5 },
      { site: '01', subjects: 2, due: 5, onTime: 4, outOfWindow: 1, missed: 0, afterExit: 0, left: 0, onTimeRate: 0.8, outOfWindowRate: 0.2, missedRate: 0, combinedRate: 0.2 },
    ]);
  });

  it('lists deviations with target and window dates from the subject reference date', () => {
    expect(s.deviations).toEqual([
      { subject: 'P2', site: '01', visit: 'Week 4', targetDate: REF + 28, windowOpens: REF + 25, windowCloses: REF + 31, actualDate: REF + 35, daysOff: 7, status: 'late', sheetRow: 6, lastRecord: { date: REF + 35, daysSince: 21, silent: false } },
      { subject: 'P3', site: '02', visit: 'Unscheduled', targetDate: null, windowOpens: null, windowCloses: null, actualDate: REF + 20, daysOff: null, status: 'extra', sheetRow: 8, lastRecord: { date: REF + 20, daysSince: 36, silent: false } },
      { subject: 'P3', site: '02', visit: 'Week 4', targetDate: REF + 38, windowOpens: REF + 35, windowCloses: REF + 41, actualDate: null, daysOff: null, status: 'missed', sheetRow: null, lastRecord: { date: REF + 20, daysSince: 36, silent: false } },
    ]);
  });

  it('lists the next visit of each subject still in follow-up, most overdue first', () => {
    expect(s.upcoming).toEqual([
      { subject: 'P3', site: '02', visit: 'Week 4', windowOpens: REF + 35, targetDate: REF + 38, windowCloses: REF + 41, daysUntilTarget: -18, status: 'overdue', lastRecord: { date: REF + 20, daysSince: 36, silent: false } },
      { subject: 'P2', site: '01', visit: 'Week 8', windowOpens: REF + 51, targetDate: REF + 56, windowCloses: REF + 61, daysUntilTarget: 0, status: 'windowOpen', lastRecord: { date: REF + 35, daysSince: 21, silent: false } },
    ]);
  });

  it('writes the visits JSON with ISO dates and exactly the eight count keys', () => {
    const j = timingJson(s);
    expect(j.cutoff).toBe('2023-05-10');
    expect(Object.keys(j.counts)).toEqual(['onTime', 'early', 'late', 'missed', 'notYetDue', 'afterExit', 'extra', 'repeat']);
    expect(j.deviations[0]).toEqual({
      subject: 'P2', site: '01', visit: 'Week 4', targetDate: '2023-04-12', windowOpens: '2023-04-09', windowCloses: '2023-04-15',
      actualDate: '2023-04-19', daysOff: 7, status: 'late', row: 6, lastRecord: '2023-04-19', daysSinceLastRecord: 21, noRecordLately: false,
    });
    expect(j.upcoming[0]).toMatchObject({ windowOpens: '2023-04-19', targetDate: '2023-04-22', windowCloses: '2023-04-25', status: 'overdue' });
    expect(j.byArm).toHaveLength(6);
    expect(JSON.parse(JSON.stringify(j))).toEqual(j);
  });

  it('unblinded sheets carry the by-arm table and open with the one-line caution in its unblinded form', () => {
    const sheets = timingSheets(s);
    expect(sheets.map((x) => x.name)).toEqual(['Visit timing', 'Visit deviations', 'Visits due']);
    const blocks = sheets[0]!.blocks;
    expect(blocks.some((b) => b.kind === 'table' && b.id === 'ByArmVisit')).toBe(true);
    for (const sheet of sheets) expect(sheet.blocks[0]).toEqual(cautionLine('unblinded'));
    expect(JSON.stringify(sheets)).not.toContain(UNBLINDED_CAUTION);
    const summary = blocks.find((b) => b.kind === 'paragraph' && b.text.startsWith('As of'));
    expect(summary).toEqual({
      kind: 'paragraph',
      style: 'normal',
      text:
        'As of 2023-05-10 (the latest visit date in the data), 3 participants had 7 scheduled visits due: 5 on time (71.4%), 0 early, 1 late and 1 missed; 2 visits are not yet due. Besides the scheduled visits there was 1 unscheduled record (matching no scheduled visit) and 0 repeat records (a second record of a visit already matched).',
    });
    const dev = sheets[1]!.blocks.find((b): b is TableBlock => b.kind === 'table')!;
    expect(dev.columns.map((c) => c.format)).toEqual(['text', 'text', 'text', 'date', 'date', 'date', 'date', 'integer', 'text', 'integer', 'date', 'integer', 'text']);
    expect(dev.rows[0]).toEqual(['P2', '01', 'Week 4', REF + 28, REF + 25, REF + 31, REF + 35, 7, 'Late', 6, REF + 35, 21, '']);
    // The glossary's words (README, "Words we use"): participant, target day / target date, days from target.
    expect(dev.columns.map((c) => c.header).slice(0, 8)).toEqual(['Participant', 'Site', 'Visit', 'Target date', 'Window opens', 'Window closes', 'Actual date', 'Days from target']);
    const byVisit = blocks.find((b): b is TableBlock => b.kind === 'table' && b.id === 'ByVisit')!;
    expect(byVisit.columns.map((c) => c.header).slice(0, 2)).toEqual(['Visit', 'Target day']);
    const bySite = blocks.find((b): b is TableBlock => b.kind === 'table' && b.id === 'BySite')!;
    expect(bySite.columns[1]!.header).toBe('Participants');
    expect(JSON.stringify(sheets)).not.toMatch(/subject|patient|days off|\bextra\b/i);
    const due = sheets[2]!.blocks.find((b): b is TableBlock => b.kind === 'table')!;
    const statusAt = due.columns.findIndex((c) => c.header === 'Status');
    expect(due.rows.map((r) => r[statusAt])).toEqual(['Overdue', 'Window open now']);
    // every row of a table has as many cells as the table has columns
    for (const sheet of sheets) for (const b of sheet.blocks) if (b.kind === 'table') for (const r of b.rows) expect(r).toHaveLength(b.columns.length);
  });

  it('blinded sheets show nothing by arm', () => {
    const blinded = build(false);
    expect(blinded.byArm).toBeNull();
    expect(timingJson(blinded)).not.toHaveProperty('byArm');
    const text = JSON.stringify(timingSheets(blinded));
    expect(text).not.toContain('ByArmVisit');
    expect(text).not.toContain(UNBLINDED_CAUTION);
    expect(text).not.toContain(UNBLINDED_LINE);
    expect(text).not.toContain('"Arm"');
  });
});

describe('visit-timing reports for study-day data', () => {
  it('shows study days with the integer format and says the cut-off is each participant’s last record', () => {
    const table = makeTable(
      [
        { subject: 'Q', time: 1, visit: 'Baseline' },
        { subject: 'Q', time: 40, visit: 'Week 8' }, // Week 4 closed on 32 < 40: missed; Week 8 early by 17
      ],
      { timeKind: 'studyDay', labels: true },
    );
    const days = computeStudyDays(table, SCHEDULE, { sheet: 'Visits', topLeft: 'A1' });
    const timing = classifyVisits(table, days, SCHEDULE);
    const s = summarizeTiming({ table, schedule: SCHEDULE, days, timing });
    expect(s.deviations.map((d) => [d.visit, d.targetDate, d.windowOpens, d.windowCloses, d.actualDate, d.daysOff, d.status])).toEqual([
      ['Week 4', 29, 26, 32, null, null, 'missed'],
      ['Week 8', 57, 52, 62, 40, -17, 'early'],
    ]);
    expect(s.upcoming).toEqual([]); // Week 8, the final visit, has a record
    const j = timingJson(s);
    expect(j).toMatchObject({ timeScale: 'studyDay', cutoff: null, cutoffRule: 'eachSubjectsLastRecord', bySite: [] });
    const sheets = timingSheets(s);
    const dev = sheets[1]!.blocks.find((b): b is TableBlock => b.kind === 'table')!;
    expect(dev.columns.map((c) => c.header)).toEqual(['Participant', 'Visit', 'Target day', 'Window opens', 'Window closes', 'Actual study day', 'Days from target', 'Status', 'Data row', 'Last record (study day)', 'Days since last record', 'Follow-up note']);
    expect(dev.columns[2]!.format).toBe('integer');
  });
});
