import { describe, expect, it } from 'vitest';
import { HELP_TEXT, isIsoDate, parseAnalyzeArgs, UsageError } from '../../src/cli/args';
import { buildMapping } from '../../src/cli/mapping';

const BASE = ['--data', 'v.csv', '--schedule', 's.csv'];

describe('parseAnalyzeArgs', () => {
  it('fills the defaults of SPEC §5: blinded, month, Kenward–Roger, REML, level 0.95, all valid rows', () => {
    expect(parseAnalyzeArgs(BASE)).toEqual({
      data: 'v.csv',
      schedule: 's.csv',
      map: [],
      unblinded: false,
      timeUnit: 'month',
      df: 'kenward-roger',
      method: 'reml',
      model: 'intercept',
      level: 0.95,
      covariates: [],
      scheduledOnly: false,
      perSubject: false,
    });
  });

  it('takes values after a space or after "=", repeats --map and --covariate, and reads boolean flags', () => {
    const a = parseAnalyzeArgs([...BASE, '--level=0.9', '--map', 'value=AVAL', '--map=site=Centre name', '--covariate', 'BASE', '--covariate', 'AGE', '--unblinded', '--reference-arm', 'Placebo', '--per-subject']);
    expect(a.level).toBe(0.9);
    expect(a.map).toEqual([
      ['value', 'AVAL'],
      ['site', 'Centre name'],
    ]);
    expect(a.covariates).toEqual(['BASE', 'AGE']);
    expect(a).toMatchObject({ unblinded: true, referenceArm: 'Placebo', perSubject: true, scheduledOnly: false });
  });

  it('--per-participant asks for the per-participant sheet; --per-subject, its older spelling, still does', () => {
    expect(parseAnalyzeArgs([...BASE, '--per-participant']).perSubject).toBe(true);
    expect(parseAnalyzeArgs([...BASE, '--per-subject']).perSubject).toBe(true);
    expect(parseAnalyzeArgs(BASE).perSubject).toBe(false);
  });

  it('the help speaks the glossary\'s words: participant, visit name, target day, days allowed before and after', () => {
    expect(HELP_TEXT).toContain('--per-participant');
    expect(HELP_TEXT).not.toContain('--per-subject');
    expect(HELP_TEXT).toMatch(/visit name, target\s+day, days allowed before, days allowed after/);
    expect(HELP_TEXT).not.toMatch(/patient|per-subject|planned day|start date|measured value|visit label/i);
  });

  it('the default df follows the method: Kenward–Roger with REML, Satterthwaite with ML; any df may be chosen with either', () => {
    expect(parseAnalyzeArgs(BASE).df).toBe('kenward-roger');
    expect(parseAnalyzeArgs([...BASE, '--method', 'ml']).df).toBe('satterthwaite');
    expect(parseAnalyzeArgs([...BASE, '--method', 'ml', '--df', 'kenward-roger']).df).toBe('kenward-roger');
    expect(parseAnalyzeArgs([...BASE, '--df', 'containment']).df).toBe('containment');
  });

  it('--date-order takes dmy or mdy, is absent by default (each column decides) and rejects anything else', () => {
    expect(parseAnalyzeArgs([...BASE, '--date-order', 'dmy']).dateOrder).toBe('dmy');
    expect(parseAnalyzeArgs([...BASE, '--date-order=mdy']).dateOrder).toBe('mdy');
    expect(parseAnalyzeArgs(BASE).dateOrder).toBeUndefined();
    expect(() => parseAnalyzeArgs([...BASE, '--date-order', 'ymd'])).toThrow(/--date-order must be one of dmy, mdy; got "ymd"/);
  });

  it('rejects misuse with a UsageError that names the flag', () => {
    const bad: [string[], RegExp][] = [
      [['--data', 'v.csv'], /--schedule FILE is required/],
      [[...BASE, '--level', '1.5'], /--level must be a number between 0 and 1/],
      [[...BASE, '--df', 'between'], /--df must be one of kenward-roger, satterthwaite, residual, containment/],
      [[...BASE, '--time-unit', 'year'], /--time-unit must be one of month, week, day/],
      [[...BASE, '--map', 'AVAL'], /--map takes role=Header/],
      [[...BASE, '--out'], /--out needs a value/],
      [[...BASE, '--out', 'a.xlsx', '--out', 'b.xlsx'], /--out is given twice/],
      [[...BASE, '--unblinded=yes'], /--unblinded takes no value/],
      [[...BASE, '--reference-arm', 'Placebo'], /--reference-arm only applies with --unblinded/],
      [[...BASE, 'extra'], /Unexpected argument "extra"/],
    ];
    for (const [argv, message] of bad) expect(() => parseAnalyzeArgs(argv)).toThrow(message);
    expect(() => parseAnalyzeArgs([])).toThrow(UsageError);
  });

  it('refuses an output that would overwrite an input or the other output, and an --out that is not .xlsx (regression: --out could replace the data file)', () => {
    const bad: [string[], RegExp][] = [
      [['--data', 'v.xlsx', '--schedule', 's.csv', '--out', './v.xlsx'], /--out "\.\/v\.xlsx" is the same file as --data/],
      [[...BASE, '--json', 's.csv'], /--json "s\.csv" is the same file as --schedule/],
      [[...BASE, '--out', 'r.xlsx', '--json', 'r.xlsx'], /--json "r\.xlsx" is the same file as --out/],
      [[...BASE, '--out', 'report.csv'], /--out must name an \.xlsx file/],
    ];
    for (const [argv, message] of bad) expect(() => parseAnalyzeArgs(argv)).toThrow(message);
    expect(parseAnalyzeArgs([...BASE, '--out', 'R.XLSX', '--json', 'r.json'])).toMatchObject({ out: 'R.XLSX', json: 'r.json' });
  });
});

describe('isIsoDate', () => {
  it('accepts only real calendar dates written YYYY-MM-DD (ISO 8601 extended format)', () => {
    // 2024 is a leap year and 2025 is not (Gregorian rule, common practice).
    expect(['2024-02-29', '2025-12-31', '1900-01-01'].map(isIsoDate)).toEqual([true, true, true]);
    expect(['2025-02-29', '2025-13-01', '2025-1-5', '20250105', '2025-02-30 '].map(isIsoDate)).toEqual([false, false, false, false, false]);
  });
});

describe('buildMapping', () => {
  const headers = ['USUBJID', 'ADT', 'AVAL', 'BASE', 'Visit day'];
  const detected = { subject: 0, date: 1, value: 2, covariates: [] };

  it('lays each --map role over the detected mapping, matching headers exactly or else ignoring case', () => {
    expect(buildMapping(detected, headers, [['value', 'base']], [])).toEqual({ subject: 0, date: 1, value: 3, covariates: [] });
    expect(buildMapping(detected, headers, [['study-day', 'Visit day']], ['BASE'])).toEqual({ subject: 0, date: 1, value: 2, studyDay: 4, covariates: [3] });
  });

  it('removes a role mapped to "none", and moves a column given a new role out of its detected one', () => {
    expect(buildMapping(detected, headers, [['date', 'none']], [])).toEqual({ subject: 0, value: 2, covariates: [] });
    expect(buildMapping(detected, headers, [['site', 'AVAL']], [])).toEqual({ subject: 0, date: 1, site: 2, covariates: [] });
  });

  it('takes the glossary\'s words as role names: participant (the JSON key stays subject), visit name, reference date', () => {
    const h = ['Pt', 'When', 'Score', 'Start', 'Name'];
    expect(buildMapping({ covariates: [] }, h, [['participant', 'Pt'], ['visit-name', 'Name'], ['reference date', 'Start'], ['visit_date', 'When']], [])).toEqual({
      subject: 0,
      visit: 4,
      reference: 3,
      date: 1,
      covariates: [],
    });
  });

  it('throws a UsageError for an unknown role or a header the data do not have', () => {
    expect(() => buildMapping(detected, headers, [['colour', 'AVAL']], [])).toThrow(/unknown role "colour"/);
    expect(() => buildMapping(detected, headers, [], ['AGE'])).toThrow(/no column headed "AGE"/);
  });
});

describe('buildMapping with repeated roles and shared headers (issue item 8)', () => {
  const headers = ['USUBJID', 'ADY', 'AVAL', 'AVAL2', 'USUBJID'];
  const detected = { studyDay: 1, value: 2, covariates: [] };

  it('refuses a role given twice, since the last would otherwise win silently', () => {
    expect(() => buildMapping(detected, headers, [['value', 'AVAL'], ['value', 'AVAL2']], [])).toThrow(UsageError);
    expect(() => buildMapping(detected, headers, [['value', 'AVAL'], ['value', 'AVAL2']], [])).toThrow('--map gives the role value twice (value=AVAL and value=AVAL2); give each role once.');
    // Two spellings of one role are the same role.
    expect(() => buildMapping(detected, headers, [['studyDay', 'ADY'], ['day', 'ADY']], [])).toThrow(/role studyDay twice/);
    expect(() => buildMapping(detected, headers, [], ['AVAL2', 'aval2'])).toThrow(/--covariate names column D \("AVAL2"\) twice/);
  });

  it('refuses a header that two columns share, naming both letters, and takes "column E" to pick one', () => {
    expect(() => buildMapping(detected, headers, [['subject', 'USUBJID']], [])).toThrow('--map subject=USUBJID: 2 columns are headed "USUBJID" (A, E); say which one with its letter, e.g. --map subject="column E".');
    expect(buildMapping(detected, headers, [['subject', 'column E']], [])).toEqual({ subject: 4, studyDay: 1, value: 2, covariates: [] });
    // Letters count from the sheet's column A: data starting in column C have their first column at "column C".
    expect(buildMapping(detected, headers, [['subject', 'Column c']], [], 2)).toEqual({ subject: 0, studyDay: 1, value: 2, covariates: [] });
    expect(() => buildMapping(detected, headers, [['subject', 'column Z']], [])).toThrow(/no column Z \(they span A to E\)/);
  });
});
