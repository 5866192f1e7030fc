import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { CellValue } from '../../../src/core/intake/types';
import { parseSchedule } from '../../../src/core/schedule/parseSchedule';
import { STARTER_SCHEDULE, starterScheduleCells } from '../../../src/core/schedule/starter';

describe('parseSchedule', () => {
  it('reads the CSV header and numeric text, and sorts visits by target day', () => {
    const r = parseSchedule(
      [
        ['visit', 'target_day', 'days_before', 'days_after'],
        ['Week 24', '169', '7', ' 7 '],
        ['Baseline', 1, 0, 0],
      ],
      'egfr-schedule.csv',
      'A1',
    );
    expect(r).toEqual({
      ok: true,
      schedule: [
        { label: 'Baseline', targetDay: 1, before: 0, after: 0 },
        { label: 'Week 24', targetDay: 169, before: 7, after: 7 },
      ],
      issues: [],
    });
  });

  it('reads back the starter sheet and the starter CSV unchanged (round trip)', () => {
    expect(parseSchedule(starterScheduleCells(), 'Schedule', 'A1').schedule).toEqual(STARTER_SCHEDULE);
    expect(parseSchedule(starterScheduleCells({ csv: true }), 'Schedule', 'A1').schedule).toEqual(STARTER_SCHEDULE);
  });

  it('accepts our own headings in any case and column order, and skips blank rows', () => {
    const r = parseSchedule(
      [
        ['DAYS ALLOWED AFTER', 'visit', 'Days allowed before', 'Target Study Day'],
        [3, 'Week 12', 3, 85],
        [null, '', undefined, ''],
      ],
      'Schedule',
      'C3',
    );
    expect(r.ok).toBe(true);
    expect(r.schedule).toEqual([{ label: 'Week 12', targetDay: 85, before: 3, after: 3 }]);
  });

  it('reports every bad cell with its address: blank and duplicate labels, day 0, fractions, negative allowances', () => {
    const r = parseSchedule(
      [
        ['Visit', 'Target study day', 'Days allowed before', 'Days allowed after'], // an older starter sheet's headings still read
        ['Week 12', 85, 7, 7],
        ['week12', 90, 7, 7], // same label ignoring case and spaces
        ['', 100, 1, 1],
        ['Day zero', 0, 0, 0],
        ['Half', 12.5, 0, 0],
        ['Neg', 200, -1, 'x'],
      ],
      'My Schedule',
      'B2',
    );
    expect(r.ok).toBe(false);
    expect(r.issues.map((i) => [i.code, i.cell, i.value])).toEqual([
      ['schedule-duplicate-label', "'My Schedule'!B4", 'week12'],
      ['schedule-blank-label', "'My Schedule'!B5", ''],
      ['schedule-zero-target-day', "'My Schedule'!C6", '0'],
      ['schedule-bad-target-day', "'My Schedule'!C7", '12.5'],
      ['schedule-bad-allowance', "'My Schedule'!D8", '-1'],
      ['schedule-bad-allowance', "'My Schedule'!E8", 'x'],
    ]);
    expect(r.issues[0]!.message).toBe(`The visit name "week12" repeats the name at 'My Schedule'!B3 (names are compared ignoring case and spaces).`);
    expect(r.schedule).toEqual([{ label: 'Week 12', targetDay: 85, before: 7, after: 7 }]);
  });

  it('refuses target days beyond ±36,500 and allowances above 36,500 days, with the cell address (regression: day 99,999,999,999 wrote due dates in the year 273,792,725)', () => {
    const r = parseSchedule(
      [
        ['visit', 'target_day', 'days_before', 'days_after'],
        ['Far', 99_999_999_999, 7, 7],
        ['Wide', 85, '1e20', 1e20],
        ['Edge', 36_500, 36_500, 36_500],
        ['Early edge', -36_500, 0, 0],
        ['Past edge', -36_501, 0, 36_501],
      ],
      'S',
      'A1',
    );
    expect(r.ok).toBe(false);
    expect(r.issues.filter((i) => i.severity === 'error').map((i) => [i.code, i.cell, i.value])).toEqual([
      ['schedule-bad-target-day', 'S!B2', '99999999999'],
      ['schedule-bad-allowance', 'S!C3', '1e20'],
      ['schedule-bad-allowance', 'S!D3', '100000000000000000000'],
      ['schedule-bad-target-day', 'S!B6', '-36501'],
      ['schedule-bad-allowance', 'S!D6', '36501'],
    ]);
    expect(r.issues[0]!.message).toBe('The target day must lie between -36,500 and 36,500 (100 years either side of the reference date).');
    expect(r.issues[2]!.message).toBe('The days allowed after must be a whole number of days from 0 to 36,500.');
    expect(r.schedule.map((v) => v.label)).toEqual(['Early edge', 'Edge']);
  });

  it('refuses two visits with the same target day, naming both cells (matching by day could not tell them apart)', () => {
    const r = parseSchedule(
      [
        ['visit', 'target_day', 'days_before', 'days_after'],
        ['Baseline', 1, 0, 0],
        ['Week 4', 29, 3, 3],
        ['Baseline labs', 1, 0, 2],
      ],
      'S',
      'A1',
    );
    expect(r.ok).toBe(false);
    expect(r.issues.map((i) => [i.code, i.severity, i.cell, i.value, i.message])).toEqual([
      [
        'schedule-duplicate-target-day',
        'error',
        'S!B4',
        '1',
        'The visits "Baseline" (S!B2) and "Baseline labs" have the same target day 1; give each visit its own day, or merge them into one visit.',
      ],
    ]);
  });

  it('warns about overlapping windows without blocking', () => {
    const r = parseSchedule(
      [
        ['visit', 'target_day', 'days_before', 'days_after'],
        ['A', 10, 0, 5],
        ['B', 15, 0, 0], // day 15 is in both windows (bounds inclusive)
        ['C', 30, 0, 0],
      ],
      'S',
      'A1',
    );
    expect(r.ok).toBe(true);
    expect(r.issues.map((i) => [i.code, i.severity, i.cell])).toEqual([['schedule-overlap', 'warning', 'S!B3']]);
  });

  it('reports missing columns and an empty table', () => {
    expect(parseSchedule([['visit', 'target_day']], 'S', 'A1').issues.map((i) => i.code)).toEqual(['schedule-empty']);
    const r = parseSchedule([['visit', 'target_day'], ['A', 1]], 'S', 'A1');
    expect(r.ok).toBe(false);
    expect(r.issues.map((i) => i.code)).toEqual(['schedule-missing-column', 'schedule-missing-column']);
  });

  it('does not mutate the cell grid', () => {
    const cells = starterScheduleCells();
    const copy = JSON.parse(JSON.stringify(cells));
    parseSchedule(cells, 'Schedule', 'A1');
    expect(cells).toEqual(copy);
  });
});

describe('parseSchedule on arbitrary grids', () => {
  const cell = fc.oneof(
    fc.constantFrom<CellValue>(null, undefined, '', 0, -3, 7, 85, 1.5, '12', ' 7 ', 'x', true, '#N/A', 'Week 4', 'week4'),
    fc.string({ maxLength: 6 }),
    fc.integer({ min: -400, max: 400 }),
    fc.constantFrom<CellValue>(36_500, 36_501, -36_501, 99_999_999_999, 1e20, '1e20'),
  );
  it('never throws, and keeps only valid visits sorted by target day, each error with a cell address', () => {
    fc.assert(
      fc.property(fc.array(fc.array(cell, { maxLength: 6 }), { maxLength: 8 }), fc.boolean(), (body, csv) => {
        const head = csv ? ['visit', 'target_day', 'days_before', 'days_after'] : ['Visit name', 'Target day', 'Days allowed before', 'Days allowed after'];
        const r = parseSchedule([head, ...body], 'Schedule', 'A1');
        for (const v of r.schedule) {
          expect(Number.isInteger(v.targetDay) && v.targetDay !== 0 && Math.abs(v.targetDay) <= 36_500).toBe(true);
          expect(Number.isInteger(v.before) && v.before >= 0 && v.before <= 36_500 && Number.isInteger(v.after) && v.after >= 0 && v.after <= 36_500).toBe(true);
          expect(v.label.trim()).not.toBe('');
        }
        for (let k = 1; k < r.schedule.length; k++) expect(r.schedule[k]!.targetDay).toBeGreaterThanOrEqual(r.schedule[k - 1]!.targetDay);
        // A schedule that is accepted has one visit per target day.
        if (r.ok) expect(new Set(r.schedule.map((v) => v.targetDay)).size).toBe(r.schedule.length);
        expect(r.ok).toBe(!r.issues.some((i) => i.severity === 'error'));
        for (const i of r.issues) if (i.code !== 'schedule-empty') expect(i.cell).toMatch(/^Schedule![A-Z]+\d+$/);
      }),
      { numRuns: 300 },
    );
  });
});
