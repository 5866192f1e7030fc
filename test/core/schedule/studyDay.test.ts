import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { StudyDayError, dateForStudyDay, studyDay, windowDates, windowOffsets, windowStudyDays } from '../../../src/core/schedule/studyDay';
import { offsetOfStudyDay, studyDayOfOffset } from '../../../src/core/intake/dayOffset';
import { computeStudyDays } from '../../../src/core/schedule/computeStudyDays';
import { dayNumberFromIso, isoDate } from '../../../src/core/schedule/dates';
import { STARTER_SCHEDULE } from '../../../src/core/schedule/starter';
import { makeTable } from './tableHelper';

const place = { sheet: 'Visits', topLeft: 'A1' };
const REF = 45000; // 2023-03-15 (exact: 45000 days after 1899-12-30, checked by isoDate below)

describe('studyDay (CDISC SDTM Implementation Guide, --DY rule)', () => {
  it('studyDay counts the reference date as day 1 and has no day 0', () => {
    // CDISC SDTM IG: --DY = date − RFSTDTC + 1 on or after the reference date, date − RFSTDTC before it.
    expect(studyDay(REF, REF)).toBe(1);
    expect(studyDay(REF + 1, REF)).toBe(2);
    expect(studyDay(REF - 1, REF)).toBe(-1);
    expect(studyDay(REF + 84, REF)).toBe(85);
    for (let d = -400; d <= 400; d++) expect(studyDay(REF + d, REF)).not.toBe(0);
  });

  it('dateForStudyDay inverts studyDay for every non-zero day (exact identity)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 80000 }), fc.integer({ min: -5000, max: 5000 }).filter((d) => d !== 0), (ref, day) => {
        expect(studyDay(dateForStudyDay(ref, day), ref)).toBe(day);
      }),
    );
  });

  it('dateForStudyDay refuses day 0 and fractions with a typed error', () => {
    expect(() => dateForStudyDay(REF, 0)).toThrow(StudyDayError);
    expect(() => dateForStudyDay(REF, 1.5)).toThrow(StudyDayError);
  });

  it('windowDates counts a window in calendar days from the target date, across the reference date with no day 0 gap', () => {
    // Target study day t sits t − 1 calendar days after the reference date when t ≥ 1, and at offset t when t ≤ −1
    // (CDISC SDTM IG study-day rule); the allowance is in calendar days on either side (hand-worked).
    expect(windowDates(REF, { targetDay: 85, before: 7, after: 7 })).toEqual({ opens: REF + 77, target: REF + 84, closes: REF + 91 });
    // Baseline on day 1 with 3 days allowed before: the window opens 3 calendar days before the reference date (study
    // day −3), not 2 as a count in study days would give.
    expect(windowDates(REF, { targetDay: 1, before: 3, after: 0 })).toEqual({ opens: REF - 3, target: REF, closes: REF });
    // A screening visit on day −14 with 14 days after: the window closes at offset 0, the reference date itself.
    expect(windowDates(REF, { targetDay: -14, before: 0, after: 14 })).toEqual({ opens: REF - 14, target: REF - 14, closes: REF });
    // target −1, 1 day after: the window closes on the reference date (study day 1).
    expect(windowDates(REF, { targetDay: -1, before: 0, after: 1 }).closes).toBe(REF);
  });

  it('windowOffsets and windowStudyDays: target day t at offset t − 1 (t ≥ 1) or t (t ≤ −1); study days skip 0', () => {
    expect(windowOffsets({ targetDay: 1, before: 3, after: 3 })).toEqual({ opens: -3, target: 0, closes: 3 });
    expect(windowStudyDays({ targetDay: 1, before: 3, after: 3 })).toEqual({ opens: -3, target: 1, closes: 4 });
    expect(windowOffsets({ targetDay: -7, before: 2, after: 7 })).toEqual({ opens: -9, target: -7, closes: 0 });
    expect(windowStudyDays({ targetDay: -7, before: 2, after: 7 })).toEqual({ opens: -9, target: -7, closes: 1 });
  });

  it('offsetOfStudyDay and studyDayOfOffset invert each other and skip study day 0 (exact identity)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -5000, max: 5000 }), (o) => {
        const day = studyDayOfOffset(o);
        expect(day).not.toBe(0);
        expect(offsetOfStudyDay(day)).toBe(o);
        // and agrees with studyDay of a date o days after any reference
        expect(day).toBe(studyDay(REF + o, REF));
      }),
    );
    expect(offsetOfStudyDay(0)).toBeNaN();
  });

  it('isoDate and dayNumberFromIso use 1899-12-30 as day 0 (ECMA-376 Part 1 §18.17.4, 1900 date system)', () => {
    // 2023-03-15 is serial 45000 in the 1900 system (from memory; checked here by the exact day count below).
    expect(isoDate(REF)).toBe('2023-03-15');
    expect(dayNumberFromIso('2023-03-15')).toBe(REF);
    expect(isoDate(0)).toBe('1899-12-30');
    expect(dayNumberFromIso('2023-02-30')).toBeNaN();
    expect(isoDate(NaN)).toBe('');
  });
});

describe('computeStudyDays', () => {
  it('uses the given study days as they are for study-day data', () => {
    const t = makeTable([{ subject: 'S1', time: 1 }, { subject: 'S1', time: 86 }, { subject: 'S1', time: NaN }], { timeKind: 'studyDay' });
    const r = computeStudyDays(t, STARTER_SCHEDULE, place);
    expect(Array.from(r.studyDays)).toEqual([1, 86, NaN]);
    expect(r.issues).toEqual([]);
  });

  it('uses the row reference date, falling back to the subject reference found on another row', () => {
    const t = makeTable(
      [
        { subject: 'S1', time: REF + 84, reference: REF },
        { subject: 'S1', time: REF - 3 }, // blank reference cell: the subject's reference serves
        { subject: 'S2', time: REF + 10, reference: REF + 10 },
      ],
      { reference: true },
    );
    const r = computeStudyDays(t, STARTER_SCHEDULE, place);
    expect(Array.from(r.studyDays)).toEqual([85, -3, 1]);
    expect(Array.from(r.referenceDay)).toEqual([REF, REF + 10]);
  });

  it('without a reference column uses the baseline record by label, and reports rows of participants without one', () => {
    const t = makeTable(
      [
        { subject: 'S1', time: REF + 90, visit: 'Week 12' },
        { subject: 'S1', time: REF + 6, visit: ' baseLINE ' }, // label matched ignoring case and spaces
        { subject: 'S2', time: REF + 85, visit: 'Week 12' }, // S2 has no baseline record
      ],
      { labels: true },
    );
    const r = computeStudyDays(t, STARTER_SCHEDULE, place);
    expect(Array.from(r.studyDays)).toEqual([85, 1, NaN]);
    expect(r.issues).toEqual([
      {
        code: 'no-baseline-record',
        severity: 'warning',
        cell: 'Visits!B4',
        row: 4,
        value: 'S2',
        use: 'timing',
        message:
          'Participant S2 has no record of the first scheduled visit (the baseline), so the study day of this visit cannot be computed; the row is left out of visit timing.',
      },
    ]);
  });

  it('without labels or a reference column, the earliest dated record is day 1', () => {
    const t = makeTable([{ subject: 'S1', time: REF + 168 }, { subject: 'S1', time: REF }, { subject: 'S1', time: REF + 80 }]);
    expect(Array.from(computeStudyDays(t, STARTER_SCHEDULE, place).studyDays)).toEqual([169, 1, 81]);
  });

  it('reports a dated row whose subject has no reference date at all', () => {
    const t = makeTable([{ subject: 'S9', time: REF }], { reference: true });
    const r = computeStudyDays(t, STARTER_SCHEDULE, place);
    expect(r.studyDays[0]).toBeNaN();
    expect(r.issues.map((i) => [i.code, i.cell])).toEqual([['no-reference-date', 'Visits!B2']]);
  });

  it('does not mutate the table', () => {
    const t = makeTable([{ subject: 'S1', time: REF + 168 }, { subject: 'S1', time: REF }]);
    const before = Array.from(t.date);
    computeStudyDays(t, STARTER_SCHEDULE, place);
    expect(Array.from(t.date)).toEqual(before);
  });
});

describe('computeStudyDays with a first visit before day 1', () => {
  it('places the first visit record on its own target day (screening on day −14: day 1 is 14 days later)', () => {
    const schedule = [
      { label: 'Screening', targetDay: -14, before: 7, after: 0 },
      { label: 'Week 12', targetDay: 85, before: 7, after: 7 },
    ];
    const t = makeTable([{ subject: 'S1', time: REF }, { subject: 'S1', time: REF + 14 + 84 }]);
    const r = computeStudyDays(t, schedule, { sheet: 'Visits', topLeft: 'A1' });
    // CDISC rule: the reference date REF + 14 is day 1, so REF is day −14 and REF + 98 is day 85.
    expect(Array.from(r.studyDays)).toEqual([-14, 85]);
    expect(r.referenceDay[0]).toBe(REF + 14);
  });
});
