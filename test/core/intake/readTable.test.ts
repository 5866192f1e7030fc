import { describe, expect, it } from 'vitest';
import {
  ERROR_LITERALS,
  IntakeUsageError,
  readTable,
  type CellValue,
  type ColumnMapping,
  type IntakeOptions,
  type IntakeResult,
  type IntakeTable,
} from '../../../src/core/intake';

// Invented kidney-function data (eGFR every 12 weeks); nothing here describes a real trial or person.
const BLINDED: IntakeOptions = { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded' };
const UNBLINDED: IntakeOptions = { ...BLINDED, mode: 'unblinded' };

function table(r: IntakeResult): IntakeTable {
  if (!r.ok) throw new Error(`expected ok, got ${JSON.stringify(r.issues.map((i) => i.code))}`);
  return r.table;
}
const codes = (r: IntakeResult): string[] => r.issues.map((i) => i.code);
const two = (subjects: string[], arm: string): CellValue[][] => subjects.map((s) => [s, 1, 60, arm]);

describe('readTable text roles', () => {
  it('readTable turns numbers and booleans in text roles into text and trims text', () => {
    const t = table(
      readTable(
        [
          ['Subject', 'Study day', 'Visit', 'Site', 'Result'],
          [1001, 1, 12, true, 60],
          ['  K-2  ', 85, ' Week 12 ', ' S01 ', 61],
          [-0, 2, false, 3.5, 62],
        ],
        BLINDED,
      ),
    );
    expect(t.subjectIds).toEqual(['1001', 'K-2', '0']);
    expect(t.visit).toEqual(['12', 'Week 12', 'FALSE']);
    expect(t.site).toEqual(['TRUE', 'S01', '3.5']);
  });

  it('readTable keeps a subject id that looks like a formula as the same text', () => {
    const t = table(readTable([['Subject', 'Study day', 'Result'], ['=1+1', 1, 60]], BLINDED));
    expect(t.subjectIds).toEqual(['=1+1']);
  });

  it('readTable lists subjects in order of first appearance and keeps case', () => {
    const t = table(readTable([['Subject', 'Study day', 'Result'], ['b', 1, 1], ['A', 1, 1], ['B', 1, 1], ['b', 2, 1]], BLINDED));
    expect(t.subjectIds).toEqual(['b', 'A', 'B']);
    expect(Array.from(t.subjectIndex)).toEqual([0, 1, 2, 0]);
  });
});

describe('readTable error values', () => {
  it.each([...ERROR_LITERALS])('readTable reports %s as an error value in the value column', (literal) => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 1, literal], ['K-1', 2, 60]], BLINDED);
    expect(r.issues).toMatchObject([{ code: 'error-value', cell: 'Visits!C2', value: literal, use: 'model' }]);
  });

  it('readTable excludes a row with an error value as subject or date from both uses', () => {
    const r = readTable([['Subject', 'Visit date', 'Result'], ['#REF!', 45700, 60], ['K-1', '#VALUE!', 60], ['K-1', 45701, 60]], BLINDED);
    expect(r.issues.map((i) => [i.code, i.cell, i.role, i.use])).toEqual([
      ['error-value', 'Visits!A2', 'subject', 'timing'],
      ['error-value', 'Visits!A2', 'subject', 'model'],
      ['error-value', 'Visits!B3', 'date', 'timing'],
      ['error-value', 'Visits!B3', 'date', 'model'],
    ]);
  });

  it('readTable keeps a row whose site or visit label is an error value, treating it as blank with a warning', () => {
    const r = readTable([['Subject', 'Study day', 'Result', 'Site', 'Visit'], ['K-1', 1, 60, '#N/A', '#NAME?']], BLINDED);
    const t = table(r);
    expect(t.usableModel[0]).toBe(1);
    expect(t.site).toEqual(['']);
    expect(t.visit).toEqual(['']);
    expect(r.issues.map((i) => [i.code, i.cell, i.role, i.use])).toEqual([
      ['error-value', 'Visits!E2', 'visit', null],
      ['error-value', 'Visits!D2', 'site', null],
    ]);
  });
});

describe('readTable numeric roles', () => {
  it('readTable reports text in a numeric column unless numeric text is accepted', () => {
    const cells = [['Subject', 'Study day', 'Result'], ['K-1', '1', '61.5'], ['K-1', 85, '1,000'], ['K-1', 169, ' -1.5e1 ']];
    const strict = readTable(cells, BLINDED);
    expect(strict.issues.map((i) => [i.code, i.cell])).toEqual([
      ['text-in-numeric', 'Visits!B2'],
      ['text-in-numeric', 'Visits!B2'],
      ['text-in-numeric', 'Visits!C2'],
      ['text-in-numeric', 'Visits!C3'],
      ['text-in-numeric', 'Visits!C4'],
      ['no-usable-rows', null],
    ]);
    const csv = readTable(cells, { ...BLINDED, numericText: 'accept' });
    const t = table(csv);
    expect(Array.from(t.studyDay)).toEqual([1, 85, 169]);
    // "1,000" has a thousands separator, which plain decimal text excludes (brief rule), so it stays a problem.
    expect(Array.from(t.value)).toEqual([61.5, NaN, -15]);
    expect(csv.issues.map((i) => [i.code, i.cell, i.value])).toEqual([['text-in-numeric', 'Visits!C3', '1,000']]);
  });

  it('readTable reports a blank value, a boolean value and a non-finite number as left out of the model only', () => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 1, null], ['K-1', 2, true], ['K-1', 3, Infinity], ['K-1', 4, '  '], ['K-1', 5, 60]], BLINDED);
    expect(r.issues.map((i) => [i.code, i.value, i.use])).toEqual([
      ['blank-value', '', 'model'],
      ['text-in-numeric', 'TRUE', 'model'],
      ['not-finite', 'Infinity', 'model'],
      ['blank-value', '', 'model'],
    ]);
    expect(Array.from(table(r).usableTiming)).toEqual([1, 1, 1, 1, 1]);
    expect(Array.from(table(r).usableModel)).toEqual([0, 0, 0, 0, 1]);
  });
});

describe('readTable study days', () => {
  it('readTable rejects study day 0 with the CDISC sentence: there is no day 0 (CDISC SDTM Implementation Guide, --DY)', () => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 0, 60], ['K-1', -1, 60], ['K-1', 1, 60]], BLINDED);
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual([
      ['bad-study-day', 'Visits!B2', 'timing'],
      ['bad-study-day', 'Visits!B2', 'model'],
    ]);
    expect(r.issues[0]!.message).toBe(
      'Visits!B2: study day 0 does not exist: by the CDISC convention the reference date is day 1 and the day before it is day -1. The row is left out of the visit-timing checks.',
    );
    expect(Array.from(table(r).studyDay)).toEqual([NaN, -1, 1]);
  });

  it('readTable rejects a fractional study day and text "0" under accepted numeric text', () => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 2.5, 60], ['K-1', '0', 60], ['K-1', '7', 60]], { ...BLINDED, numericText: 'accept' });
    expect(r.issues.filter((i) => i.use === 'timing').map((i) => [i.code, i.value])).toEqual([
      ['bad-study-day', '2.5'],
      ['bad-study-day', '0'],
    ]);
    expect(r.issues[2]!.message).toMatch(/study day 0 does not exist/);
  });
});

describe('readTable dates', () => {
  const cells = (d: CellValue): CellValue[][] => [['Subject', 'Visit date', 'Result'], ['K-1', d, 60]];

  it('readTable reads a serial in the 1900 system, the same date in the 1904 system and ISO text to one day number', () => {
    // 45720 is 2025-03-04 in the 1900 system and 45720 - 1462 in the 1904 system (ECMA-376 Part 1, §18.17.4).
    expect(table(readTable(cells(45720), BLINDED)).date[0]).toBe(45720);
    expect(table(readTable(cells(45720 - 1462), { ...BLINDED, dateSystem: 1904 })).date[0]).toBe(45720);
    expect(table(readTable(cells('2025-03-04T10:30'), BLINDED)).date[0]).toBe(45720);
    expect(table(readTable(cells(45720.75), BLINDED)).date[0]).toBe(45720);
  });

  it('readTable reports the phantom serial 60 (1900-02-29) as a bad date with its own sentence', () => {
    const r = readTable([...cells(60), ['K-1', 45720, 61]], BLINDED);
    expect(r.issues[0]).toMatchObject({ code: 'bad-date', value: '60', use: 'timing' });
    expect(r.issues[0]!.message).toMatch(/1900-02-29, a day that never existed/);
  });

  it('readTable reports a partial ISO date as partial and never guesses the day', () => {
    const r = readTable(cells('2025-03'), BLINDED);
    expect(r.ok).toBe(false); // the only row is unusable
    expect(codes(r)).toEqual(['partial-date', 'partial-date', 'no-usable-rows']);
  });

  it('readTable reports an unparseable date text, a boolean date and a blank date row by row when the column has other dates', () => {
    for (const [d, code] of [['04-March-25', 'bad-date'], [true, 'bad-date'], [null, 'blank-time']] as const) {
      expect(readTable([...cells(d), ['K-1', '2025-03-04', 61]], BLINDED).issues[0]?.code).toBe(code);
    }
  });

  it('readTable reads the reference date and keeps a row whose reference date is unusable', () => {
    const r = readTable(
      [['Subject', 'Visit date', 'Result', 'Randomisation date'], ['K-1', 45720, 60, '2025-01-06'], ['K-1', 45800, 61, '2025-13-01'], ['K-1', 45801, 61, null]],
      BLINDED,
    );
    const t = table(r);
    expect(Array.from(t.reference)).toEqual([45663, NaN, NaN]); // 2025-01-06 = 45720 - 57 (exact identity: days from 2025-01-06 to 2025-03-04)
    expect(Array.from(t.usableModel)).toEqual([1, 1, 1]);
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual([['bad-reference-date', 'Visits!D3', null]]);
  });

  it('readTable warns, keeping the row, when a subject has a second reference date', () => {
    const r = readTable(
      [['Subject', 'Visit date', 'Result', 'RANDDT'], ['K-1', 45720, 60, '2025-01-06'], ['K-1', 45800, 61, '2025-01-06'], ['K-1', 45801, 61, '2025-01-13'], ['K-2', 45801, 61, '2025-01-13']],
      BLINDED,
    );
    const t = table(r);
    expect(Array.from(t.usableModel)).toEqual([1, 1, 1, 1]);
    expect(t.reference[2]).toBe(45670); // kept as given: 2025-01-13 = 2025-01-06 + 7 days (exact identity)
    expect(r.issues).toMatchObject([{ code: 'reference-date-differs', cell: 'Visits!D4', value: '2025-01-13', use: null }]);
    expect(r.issues[0]!.message).toBe(
      'Visits!D4: the reference date 2025-01-13 differs from 2025-01-06 given earlier for participant "K-1"; a participant has one reference date. The row is kept with its own reference date.',
    );
  });

  it('readTable reads the date and ignores the study day when both columns are mapped', () => {
    const t = table(readTable([['USUBJID', 'ADT', 'ADY', 'AVAL'], ['K-1', 45720, 0, 60]], BLINDED));
    expect(t.timeKind).toBe('date');
    expect(Number.isNaN(t.studyDay[0])).toBe(true);
    expect(t.usableTiming[0]).toBe(1);
  });
});

describe('readTable rows', () => {
  it('readTable gives all fully blank rows one summary warning at the first one, with the spans of rows it covers', () => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 1, 60], [null, '', '  '], [], ['K-1', 2, 61], [], ['K-1', 3, 62]], { ...BLINDED, topLeft: 'C4' });
    expect(r.issues).toEqual([
      {
        code: 'blank-row',
        severity: 'warning',
        cell: 'Visits!C6',
        row: 6,
        role: null,
        value: '',
        use: null,
        rowSpans: [[6, 7], [9, 9]],
        message: 'Visits!C6: 3 blank rows are skipped (worksheet rows 6–7, 9); a blank row is left out of the visit-timing checks and the model.',
      },
    ]);
    expect(Array.from(table(r).sheetRows)).toEqual([5, 6, 7, 8, 9, 10]);
  });

  it('readTable reads ragged rows: missing cells are blank, cells beyond the header are ignored', () => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 1], ['K-1', 2, 61, 'extra', 99]], BLINDED);
    expect(r.issues.map((i) => [i.code, i.cell])).toEqual([['blank-value', 'Visits!C2']]);
    expect(Array.from(table(r).value)).toEqual([NaN, 61]);
  });

  it('readTable never mutates the input grid', () => {
    const cells: CellValue[][] = [['Subject', 'Visit date', 'Result', 'Arm'], [' K-1 ', '2025-03-04', '60', 'A'], ['K-2', 45720, 61, 'A'], ['K-3', 45720, 61, 'B'], ['K-4', 45720, 61, 'B']];
    const copy = structuredClone(cells);
    Object.freeze(cells);
    cells.forEach((row) => Object.freeze(row));
    readTable(cells, UNBLINDED);
    expect(cells).toEqual(copy);
  });
});

describe('readTable covariates', () => {
  const head = ['Subject', 'Study day', 'Result', 'Baseline eGFR', 'Sex'];
  const mapping: ColumnMapping = { subject: 0, studyDay: 1, value: 2, covariates: [3, 4] };

  it('readTable makes a covariate numeric when every non-blank cell is a number, else categorical with sorted levels', () => {
    const r = readTable([head, ['K-1', 1, 60, 62, 'M'], ['K-2', 1, 70, 71.5, 'F'], ['K-3', 1, 70, null, 2]], { ...BLINDED, mapping });
    const t = table(r);
    expect(t.covariates[0]).toEqual({ name: 'Baseline eGFR', kind: 'numeric', values: Float64Array.from([62, 71.5, NaN]) });
    expect(t.covariates[1]).toEqual({ name: 'Sex', kind: 'categorical', values: ['M', 'F', '2'], levels: ['2', 'F', 'M'] });
    expect(Array.from(t.usableModel)).toEqual([1, 1, 0]);
    expect(r.issues.map((i) => [i.code, i.cell, i.role, i.use])).toEqual([
      ['bad-covariate', 'Visits!E2', 'covariate', null],
      ['blank-value', 'Visits!D4', 'covariate', 'model'],
    ]);
    expect(r.issues[1]!.message).toBe('Visits!D4: the covariate "Baseline eGFR" is blank, so the row is left out of the model.');
  });
});

describe('readTable modes and arms', () => {
  it('readTable in blinded mode reads no arm column even when one is mapped', () => {
    const t = table(readTable([['USUBJID', 'ADY', 'AVAL', 'TRT01P'], ['K-1', 1, 60, 'A']], { ...BLINDED, mapping: { subject: 0, studyDay: 1, value: 2, arm: 3, covariates: [] } }));
    expect(t.arm).toBeNull();
    expect(t.arms).toEqual([]);
    expect(t.mapping).toEqual({ subject: 0, studyDay: 1, value: 2, covariates: [] });
  });

  it('readTable in unblinded mode reads arms in order of first appearance and excludes a blank arm from the model', () => {
    const r = readTable([['Subject', 'Study day', 'Result', 'Arm'], ...two(['K-1', 'K-2'], 'Placebo'), ...two(['K-3', 'K-4'], 'Active'), ['K-5', 1, 60, '']], UNBLINDED);
    const t = table(r);
    expect(t.arms).toEqual(['Placebo', 'Active']);
    expect(t.arm).toEqual(['Placebo', 'Placebo', 'Active', 'Active', '']);
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual([['blank-arm', 'Visits!D6', 'model']]);
  });

  it('readTable blocks unblinded mode with fewer than two subjects in an arm, or fewer than two arms', () => {
    const oneInArm = readTable([['Subject', 'Study day', 'Result', 'Arm'], ...two(['K-1', 'K-2'], 'Placebo'), ...two(['K-3', 'K-3'], 'Active')], UNBLINDED);
    expect(oneInArm.ok).toBe(false);
    expect(oneInArm.issues).toMatchObject([{ code: 'too-few-subjects-per-arm', severity: 'error', value: 'Active', cell: null }]);
    const oneArm = readTable([['Subject', 'Study day', 'Result', 'Arm'], ...two(['K-1', 'K-2'], 'Placebo')], UNBLINDED);
    expect(codes(oneArm)).toEqual(['too-few-arms']);
  });
});

describe('readTable blocking errors', () => {
  const block = (cells: CellValue[][], options: IntakeOptions): string[] => {
    const r = readTable(cells, options);
    expect(r.ok).toBe(false);
    return r.issues.filter((i) => i.severity === 'error').map((i) => i.code);
  };

  it('readTable blocks an empty header row and a range without data rows', () => {
    expect(block([], BLINDED)).toEqual(['empty-header']);
    expect(block([[null, '  ', '']], BLINDED)).toEqual(['empty-header']);
    expect(block([['Subject', 'Study day', 'Result']], BLINDED)).toEqual(['no-rows']);
  });

  it('readTable blocks a mapping without a subject or a time column, and unblinded mode without an arm', () => {
    expect(block([['Result', 'Comment'], [60, 'x']], UNBLINDED)).toEqual(['no-subject-column', 'no-time-column', 'no-arm-column']);
  });

  it('readTable blocks a column mapped to two roles and a mapping outside the range', () => {
    const cells = [['Subject', 'Study day', 'Result'], ['K-1', 1, 60]];
    const r = readTable(cells, { ...BLINDED, mapping: { subject: 0, studyDay: 1, value: 1, site: 3, covariates: [7] } });
    expect(r.issues.map((i) => [i.code, i.cell, i.value])).toEqual([
      ['column-outside-range', null, 'D'],
      ['column-outside-range', null, 'H'],
      ['duplicate-role', 'Visits!B1', 'Study day'],
    ]);
    expect(r.issues[2]!.message).toBe('Column "Study day" is mapped to more than one role (study day, value); a column can play one role only.');
  });

  it('readTable blocks when no row is usable for visit timing', () => {
    expect(block([['Subject', 'Study day', 'Result'], ['', 1, 60], ['K-1', null, 60]], BLINDED)).toEqual(['no-usable-rows']);
  });

  it('readTable runs without a value column, warning once that every row is left out of the model', () => {
    const r = readTable([['Subject', 'Study day'], ['K-1', 1]], BLINDED);
    expect(r.issues).toMatchObject([{ code: 'no-value-column', severity: 'warning', use: 'model', cell: null }]);
    expect(Array.from(table(r).usableModel)).toEqual([0]);
  });

  it('readTable warns, without blocking, when timing rows exist but none can enter the model', () => {
    const r = readTable([['Subject', 'Study day', 'Result'], ['K-1', 1, null]], BLINDED);
    expect(r.ok).toBe(true);
    expect(r.issues.map((i) => [i.code, i.severity, i.use])).toEqual([
      ['blank-value', 'warning', 'model'],
      ['no-usable-rows', 'warning', 'model'],
    ]);
  });

  it('readTable throws a typed error for a malformed top-left address or a grid that runs off the worksheet', () => {
    expect(() => readTable([['Subject']], { ...BLINDED, topLeft: 'nowhere' })).toThrow(IntakeUsageError);
    expect(() => readTable([['Subject', 'Day']], { ...BLINDED, topLeft: 'XFD1' })).toThrow(IntakeUsageError);
  });
});
