import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { AnalysisOutput } from '../../src/core/pipeline/types';
import { columnLetters, distinctValues, headersOf } from '../../src/taskpane/cells';
import { headlineOf } from '../../src/taskpane/headline';
import { messageWithoutCell } from '../../src/taskpane/IssueList';
import { fillGaps, fitsWidth, roleOfColumn, setRole, toggleCovariate, withoutArm } from '../../src/taskpane/mapping';
import {
  DEFAULT_SETTINGS,
  isCutoffDay,
  fromSaved,
  isIsoDate,
  isLevel,
  toAnalysisSettings,
  toSaved,
} from '../../src/taskpane/paneSettings';
import { SCHEDULE, SOURCE } from './fakes';

describe('mapping edits', () => {
  it('setRole gives a column to a role, takes it from the covariates, and never changes its input', () => {
    const before = Object.freeze({ covariates: Object.freeze([2, 4]) });
    expect(setRole(before, 'value', 2)).toEqual({ value: 2, covariates: [4] });
    expect(before).toEqual({ covariates: [2, 4] });
    expect(setRole({ subject: 0, covariates: [] }, 'subject', null)).toEqual({ covariates: [] });
  });

  it('toggleCovariate keeps covariates in column order without duplicates', () => {
    expect(toggleCovariate({ covariates: [5] }, 1, true)).toEqual({ covariates: [1, 5] });
    expect(toggleCovariate({ covariates: [1, 5] }, 1, true)).toEqual({ covariates: [1, 5] });
    expect(toggleCovariate({ covariates: [1, 5] }, 5, false)).toEqual({ covariates: [1] });
  });

  it('withoutArm drops only the arm, and roleOfColumn names the role a column plays', () => {
    const m = { subject: 0, arm: 2, covariates: [3] };
    expect(withoutArm(m)).toEqual({ subject: 0, covariates: [3] });
    expect([0, 2, 3, 4].map((c) => roleOfColumn(m, c))).toEqual(['subject', 'arm', 'covariate', null]);
  });

  it('fillGaps takes remembered roles only where detection found none, the column is free and fits the range', () => {
    const detected = { subject: 0, covariates: [] };
    expect(fillGaps(detected, { subject: 1, site: 3, covariates: [] }, 5)).toEqual({
      subject: 0,
      site: 3,
      covariates: [],
    });
    expect(fillGaps(detected, { site: 0, covariates: [] }, 5)).toEqual(detected); // column 0 is taken
    expect(fillGaps(detected, { site: 7, covariates: [] }, 5)).toEqual(detected); // outside a 5-column range
    expect(fitsWidth({ subject: 4, covariates: [5] }, 5)).toBe(false);
  });
});

describe('cells', () => {
  it('column letters follow the spreadsheet scheme (ECMA-376 Part 1, §18.3.1.4: A..Z, AA..)', () => {
    expect([0, 25, 26, 51, 52, 701, 702].map(columnLetters)).toEqual(['A', 'Z', 'AA', 'AZ', 'BA', 'ZZ', 'AAA']);
  });

  it('headers stand in column letters for blanks, and distinctValues lists trimmed non-blank values in order', () => {
    expect(headersOf([['USUBJID', '', null, 7]])).toEqual(['USUBJID', 'Column B', 'Column C', '7']);
    expect(distinctValues([['arm'], [' Active'], ['Placebo'], [''], ['Active'], [null]], 0)).toEqual([
      'Active',
      'Placebo',
    ]);
  });
});

describe('pane settings', () => {
  it('isIsoDate accepts real calendar dates only (2024 is a leap year, 2025 is not: exact calendar fact)', () => {
    expect(['2024-02-29', '2025-02-28'].map(isIsoDate)).toEqual([true, true]);
    expect(['2025-02-29', '2025-13-01', '25-01-01', '2025-1-1', ''].map(isIsoDate)).toEqual([
      false,
      false,
      false,
      false,
      false,
    ]);
  });

  it('isIsoDate, now that the cut-off is typed as text, agrees with the Gregorian calendar rule for any year, month and day written YYYY-MM-DD', () => {
    // The rule (ISO 8601 uses the Gregorian calendar): 30 days hath September, April, June and November, February 28
    // or 29 in a leap year, a year divisible by 4 is leap unless divisible by 100 but not by 400. Written here
    // independently of Date, which isIsoDate uses.
    const leap = (y: number): boolean => (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
    const daysIn = (y: number, m: number): number =>
      m === 2 ? (leap(y) ? 29 : 28) : [4, 6, 9, 11].includes(m) ? 30 : 31;
    const pad = (n: number, w: number): string => String(n).padStart(w, '0');
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 9999 }), fc.integer({ min: 0, max: 13 }), fc.integer({ min: 0, max: 32 }), (y, m, d) => {
        const real = m >= 1 && m <= 12 && d >= 1 && d <= daysIn(y, m);
        expect(isIsoDate(`${pad(y, 4)}-${pad(m, 2)}-${pad(d, 2)}`)).toBe(real);
      }),
    );
    // Text around a date, or another order, is not a date written year-month-day.
    expect([' 2026-06-30', '2026-06-30 ', '30-06-2026', '2026/06/30', '2026-06-30T00'].map(isIsoDate)).toEqual([
      false,
      false,
      false,
      false,
      false,
    ]);
  });

  it('isLevel accepts confidence levels strictly between one half and one', () => {
    expect([0.95, 0.9, 0.999].map(isLevel)).toEqual([true, true, true]);
    expect([0.5, 1, Number.NaN, 95].map(isLevel)).toEqual([false, false, false, false]);
  });

  it('fromSaved restores settings but never the mode, and ignores invalid remembered values', () => {
    const s = fromSaved({
      settings: { mode: 'unblinded', referenceArm: 'Active', level: 1.5, cutoff: '2025-02-30', dfMethod: 'residual' },
    });
    expect(s).toEqual({ ...DEFAULT_SETTINGS, referenceArm: 'Active', dfMethod: 'residual' });
    expect(fromSaved(null)).toEqual(DEFAULT_SETTINGS);
  });

  it('the model choice is remembered and passed on; a remembered kind the pane does not offer falls back to the default', () => {
    expect(fromSaved({ settings: { model: 'slope' } }).model).toBe('slope');
    expect(fromSaved({ settings: { model: 'gee' } }).model).toBe('gee');
    expect(fromSaved({ settings: { model: 'spline' as never } }).model).toBe('intercept');
    expect(toSaved({ ...DEFAULT_SETTINGS, model: 'slope' }, { subject: 0, covariates: [] }, null).settings?.model).toBe('slope');
    expect(toAnalysisSettings(SOURCE, { subject: 0, covariates: [] }, SCHEDULE, { ...DEFAULT_SETTINGS, model: 'slope' }, 'T').model).toBe('slope');
  });

  it('toAnalysisSettings drops the arm and reference arm in blinded mode and passes the source through', () => {
    const mapping = { subject: 0, arm: 2, value: 6, date: 4, covariates: [] };
    const blinded = toAnalysisSettings(SOURCE, mapping, SCHEDULE, { ...DEFAULT_SETTINGS, referenceArm: 'Active' }, 'T');
    expect(blinded.mapping).toEqual({ subject: 0, value: 6, date: 4, covariates: [] });
    expect('referenceArm' in blinded).toBe(false);
    expect('cutoff' in blinded).toBe(false);
    expect(blinded).toMatchObject({
      sheet: 'Visits',
      topLeft: 'A1',
      inputLabel: 'Visits!A1:G5',
      runAt: 'T',
      mode: 'blinded',
    });
    const open = toAnalysisSettings(
      { ...SOURCE, numericText: 'accept' },
      mapping,
      SCHEDULE,
      { ...DEFAULT_SETTINGS, mode: 'unblinded', referenceArm: 'Active', cutoff: '2026-06-30' },
      'T',
    );
    expect(open).toMatchObject({ mapping, referenceArm: 'Active', cutoff: '2026-06-30', numericText: 'accept' });
  });

  it('a cut-off study day is passed on as a whole number, and day 0 or text is never sent (there is no study day 0)', () => {
    const mapping = { subject: 0, studyDay: 1, covariates: [] };
    const run = (cutoffDay: string): Record<string, unknown> =>
      toAnalysisSettings(SOURCE, mapping, SCHEDULE, { ...DEFAULT_SETTINGS, cutoffDay }, 'T') as unknown as Record<string, unknown>;
    expect(run('365').cutoffDay).toBe(365);
    expect(run('-7').cutoffDay).toBe(-7);
    expect('cutoffDay' in run('')).toBe(false);
    expect('cutoffDay' in run('0')).toBe(false);
    expect('cutoffDay' in run('12.5')).toBe(false);
    expect([isCutoffDay('365'), isCutoffDay('0'), isCutoffDay('abc'), isCutoffDay(' -14 ')]).toEqual([true, false, false, true]);
  });

  it('toSaved remembers the mapping, the schedule and the settings that were set', () => {
    const mapping = { subject: 0, covariates: [] };
    expect(toSaved(DEFAULT_SETTINGS, mapping, 'Schedule')).toEqual({
      mapping,
      scheduleSource: 'Schedule',
      settings: { mode: 'blinded', timeUnit: 'month', dfMethod: 'kenward-roger', method: 'reml', model: 'intercept', level: 0.95 },
    });
  });
});

describe('headline', () => {
  const output = (json: Record<string, unknown>): Extract<AnalysisOutput, { ok: true }> => ({
    ok: true,
    issues: [],
    excluded: [],
    sheets: [{ name: 'Model results', title: 'Model', blocks: [{ kind: 'paragraph', text: 'The model summary.' }] }],
    json,
  });
  // Counts as in the results-JSON schema (README); due = on time + early + late + missed (exact identity).
  const input = { subjects: 240, usedForTiming: 918, usedForModel: 916 };
  const visits = { counts: { onTime: 820, early: 41, late: 28, missed: 86, notYetDue: 225, extra: 10, repeat: 19 } };

  it('states rows, participants, visits on time among visits due (820 / 975 = 84.1%), and the last treatment difference', () => {
    const model = {
      level: 0.95,
      converged: true,
      arms: ['Placebo', 'Active'],
      treatmentEffects: [
        { arm: 'Active', label: 'Week 12', estimate: 1, lower: 0, upper: 2, p: 0.5 },
        { arm: 'Active', label: 'Week 48', estimate: 4.0512, lower: 0.7623, upper: 7.3301, p: 0.01594 },
      ],
    };
    expect(headlineOf(output({ input, visits, model }), 920)).toEqual([
      '920 rows read from 240 participants: 918 used for visit timing, 916 in the model.',
      '820 of 975 visits due were on time (84.1%); 86 missed.',
      // 4 significant digits, as the sheets and the page show the same numbers (formats.ts)
      'At Week 48, Active differed from Placebo by 4.051 (95% CI 0.7623 to 7.330; p = 0.0159) in the random-intercept model.',
    ]);
  });

  it('in blinded mode reports the intraclass correlation and names the model', () => {
    const model = { level: 0.95, converged: true, arms: [], treatmentEffects: [], variance: { icc: 0.904, iccLower: 0.884, iccUpper: 0.921 } };
    expect(headlineOf(output({ input, visits, model }), 920)[2]).toBe(
      'Intraclass correlation is 0.9040 (95% CI 0.8840 to 0.9210) in the random-intercept model: the share of the variation that lies between participants.',
    );
  });

  it('shows no numbers from a fit that did not converge, and says so', () => {
    const model = { level: 0.95, converged: false, message: 'the iteration limit was reached', arms: [], treatmentEffects: [], variance: { icc: 0.904, iccLower: 0.884, iccUpper: 0.921 } };
    expect(headlineOf(output({ input, visits, model }), 920)[2]).toBe('The random-intercept model did not converge: the iteration limit was reached.');
  });

  it('ends with the run time as a readable local date-time with its offset (the JSON keeps ISO 8601)', () => {
    const lines = headlineOf(output({ settings: { runAt: '2026-12-02T14:05:09+01:00' } }), 1);
    expect(lines[lines.length - 1]).toBe('Run at 2026-12-02 14:05 (UTC+01:00).');
  });

  it('falls back to the model sheet summary when the JSON has no model part', () => {
    expect(headlineOf(output({}), 1)).toEqual(['1 row read.', 'The model summary.']);
  });
});

describe('issue messages', () => {
  it('drop a leading copy of the cell address, which the list shows as a link already', () => {
    const issue = {
      code: 'blank-value' as const,
      severity: 'warning' as const,
      cell: "'egfr-visits'!G42",
      row: 42,
      role: 'value' as const,
      value: '',
      use: 'model' as const,
      message: "'egfr-visits'!G42: the value is blank.",
    };
    expect(messageWithoutCell(issue)).toBe('The value is blank.');
    expect(messageWithoutCell({ ...issue, message: 'Other text.' })).toBe('Other text.');
  });
});
