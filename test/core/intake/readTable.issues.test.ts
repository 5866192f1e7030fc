import { describe, expect, it } from 'vitest';
import { readTable, type CellValue, type IntakeOptions } from '../../../src/core/intake';

// An invented kidney-function scenario (eGFR every 12 weeks); the subjects, sites and values are made up.
const HEADER = ['USUBJID', 'SITEID', 'TRT01P', 'AVISIT', 'ADT', 'AVAL'];
const grid = (lastArm: string): CellValue[][] => [
  HEADER,
  ['K-001', 'S01', 'Placebo', 'Week 0', 45658, 62.5],
  ['K-001', 'S01', 'Placebo', 'Week 12', '2025-03-26', 60.1],
  ['', 'S01', 'Placebo', 'Week 12', '2025-03-27', 58],
  ['K-002', 'S02', 'Active', 'Week 0', '2025-01-08', 'n/a'],
  ['K-002', 'S02', 'Active', 'Week 12', '2025-02-30', 59],
  ['K-003', 'S02', 'Active', 'Week 0', '2025-01-09', '#N/A'],
  ['K-004', 'S03', 'Placebo', 'Week 0', '2025-01-10', 66],
  ['K-004', 'S03', lastArm, 'Week 12', '2025-04-04', 64],
];
const OPTIONS: IntakeOptions = { sheet: 'eGFR visits', topLeft: 'A1', dateSystem: 1900, mode: 'unblinded' };

describe('readTable issue list', () => {
  it('readTable reports a blank participant, text in the value, an impossible date, #N/A and a participant in two arms, each with its cell', () => {
    const r = readTable(grid('Active'), OPTIONS);
    expect(r.ok).toBe(false);
    expect(r.issues).toEqual([
      {
        code: 'blank-subject',
        severity: 'warning',
        cell: "'eGFR visits'!A4",
        row: 4,
        role: 'subject',
        value: '',
        use: 'timing',
        message: "'eGFR visits'!A4: the participant is blank, so the row is left out of the visit-timing checks.",
      },
      {
        code: 'blank-subject',
        severity: 'warning',
        cell: "'eGFR visits'!A4",
        row: 4,
        role: 'subject',
        value: '',
        use: 'model',
        message: "'eGFR visits'!A4: the participant is blank, so the row is left out of the model.",
      },
      {
        code: 'text-in-numeric',
        severity: 'warning',
        cell: "'eGFR visits'!F5",
        row: 5,
        role: 'value',
        value: 'n/a',
        use: 'model',
        message: '\'eGFR visits\'!F5: "n/a" is not a number, and the value must be a number, so the row is left out of the model.',
      },
      {
        code: 'bad-date',
        severity: 'warning',
        cell: "'eGFR visits'!E6",
        row: 6,
        role: 'date',
        value: '2025-02-30',
        use: 'timing',
        message:
          '\'eGFR visits\'!E6: "2025-02-30" is not a valid visit date: no such day exists (dates run from 1900-01-01 to 9999-12-31), so the row is left out of the visit-timing checks.',
      },
      {
        code: 'bad-date',
        severity: 'warning',
        cell: "'eGFR visits'!E6",
        row: 6,
        role: 'date',
        value: '2025-02-30',
        use: 'model',
        message:
          '\'eGFR visits\'!E6: "2025-02-30" is not a valid visit date: no such day exists (dates run from 1900-01-01 to 9999-12-31), so the row is left out of the model.',
      },
      {
        code: 'error-value',
        severity: 'warning',
        cell: "'eGFR visits'!F7",
        row: 7,
        role: 'value',
        value: '#N/A',
        use: 'model',
        message: "'eGFR visits'!F7: the value holds the spreadsheet error value #N/A, so the row is left out of the model.",
      },
      {
        code: 'subject-in-two-arms',
        severity: 'error',
        cell: "'eGFR visits'!C8",
        row: 8,
        role: 'arm',
        value: 'Placebo',
        use: null,
        message: '\'eGFR visits\'!C8: participant "K-004" is in arm "Placebo" here but in arm "Active" elsewhere; a participant must stay in one arm.',
      },
      {
        code: 'subject-in-two-arms',
        severity: 'error',
        cell: "'eGFR visits'!C9",
        row: 9,
        role: 'arm',
        value: 'Active',
        use: null,
        message: '\'eGFR visits\'!C9: participant "K-004" is in arm "Active" here but in arm "Placebo" elsewhere; a participant must stay in one arm.',
      },
    ]);
  });

  it('readTable on the same grid without the arm conflict keeps every usable row and lists the same row warnings', () => {
    const r = readTable(grid('Placebo'), OPTIONS);
    if (!r.ok) throw new Error('expected ok');
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual([
      ['blank-subject', "'eGFR visits'!A4", 'timing'],
      ['blank-subject', "'eGFR visits'!A4", 'model'],
      ['text-in-numeric', "'eGFR visits'!F5", 'model'],
      ['bad-date', "'eGFR visits'!E6", 'timing'],
      ['bad-date', "'eGFR visits'!E6", 'model'],
      ['error-value', "'eGFR visits'!F7", 'model'],
    ]);
    const t = r.table;
    expect(t.nRows).toBe(8);
    expect(Array.from(t.sheetRows)).toEqual([2, 3, 4, 5, 6, 7, 8, 9]);
    expect(Array.from(t.usableTiming)).toEqual([1, 1, 0, 1, 0, 1, 1, 1]);
    expect(Array.from(t.usableModel)).toEqual([1, 1, 0, 0, 0, 0, 1, 1]);
    expect(t.subjectIds).toEqual(['K-001', 'K-002', 'K-003', 'K-004']);
    expect(Array.from(t.subjectIndex)).toEqual([0, 0, -1, 1, 1, 2, 3, 3]);
    expect(t.subject[2]).toBe('');
    expect(t.arms).toEqual(['Placebo', 'Active']);
    expect(t.timeKind).toBe('date');
    // 45658 is 2025-01-01 and 2025-03-26 is day 45742 (exact identity: days after 1899-12-30, checked in dates.test.ts).
    expect(t.date[0]).toBe(45658);
    expect(t.date[1]).toBe(45742);
    expect(t.date[4]).toBeNaN();
    expect(Array.from(t.studyDay).every(Number.isNaN)).toBe(true);
    expect(t.value[0]).toBe(62.5);
    expect(t.value[3]).toBeNaN();
    expect(t.visit).toEqual(['Week 0', 'Week 12', 'Week 12', 'Week 0', 'Week 12', 'Week 0', 'Week 0', 'Week 12']);
    expect(t.site?.[7]).toBe('S03');
    expect(t.headers).toEqual(HEADER);
  });
});
