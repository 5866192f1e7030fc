import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { detectMapping, readTable, type CellValue, type IntakeOptions } from '../../../src/core/intake';
import { duplicateHeaderGroups } from '../../../src/core/intake/duplicateHeaders';

// Issue item 8: two columns with one header (two USUBJID, two AVAL) must never give a role to one of them silently.
// Exact expectations on generated and small invented grids; no tolerance.

const OPTIONS: IntakeOptions = { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded' };
const ROWS: CellValue[][] = [
  ['K-1', 1, 60, 'K-1'],
  ['K-2', 8, 61, 'K-2'],
];

describe('duplicate headers (issue item 8)', () => {
  it('detectMapping gives no role to columns that share a header, and says so in a note', () => {
    const d = detectMapping(['USUBJID', 'ADY', 'AVAL', 'usubjid '], 'blinded');
    expect(d.mapping).toEqual({ studyDay: 1, value: 2, covariates: [] });
    expect(d.notes).toContain('Column "USUBJID" appears 2 times (column 1, column 4); none of them is given a role until you choose which one to use.');
  });

  it('readTable warns at the later header cell, naming both cells, and stops for want of a subject when the mapping was detected', () => {
    const r = readTable([['USUBJID', 'ADY', 'AVAL', 'USUBJID'], ...ROWS], OPTIONS);
    expect(r.ok).toBe(false);
    expect(r.issues.map((i) => [i.code, i.severity, i.cell])).toEqual([
      ['no-subject-column', 'error', null],
      ['duplicate-header', 'warning', 'Visits!D1'],
    ]);
    expect(r.issues[1]!.message).toBe(
      'Visits!D1: columns Visits!A1 and Visits!D1 are both headed "USUBJID", so neither is used as the participant until you say which: choose the column in the pane\'s column roles, or on the command line give --map participant="column D" (a column\'s letter, as the spreadsheet shows it).',
    );
  });

  it('readTable runs without the warning once the mapping picks one of the two columns', () => {
    const r = readTable([['USUBJID', 'ADY', 'AVAL', 'USUBJID'], ...ROWS], { ...OPTIONS, mapping: { subject: 3, studyDay: 1, value: 2, covariates: [] } });
    expect(r.ok).toBe(true);
    expect(r.issues).toEqual([]);
  });

  it('two AVAL columns leave the value unmapped with a warning at both cells: the model is not fed from a guess', () => {
    const r = readTable([['USUBJID', 'AVAL', 'ADY', 'AVAL'], ['K-1', 60, 1, 61]], { ...OPTIONS, topLeft: 'B3' });
    expect(r.ok).toBe(true);
    expect(r.issues.map((i) => [i.code, i.cell, i.value])).toEqual([
      ['no-value-column', null, ''],
      ['duplicate-header', 'Visits!E3', 'AVAL'],
    ]);
    expect(r.issues[1]!.message).toMatch(/^Visits!E3: columns Visits!C3 and Visits!E3 are both headed "AVAL", so neither is used as the value .* --map value="column E"/);
  });

  it('for any header row, no detected role sits on a column whose header another column shares', () => {
    const header = fc.constantFrom('USUBJID', 'usubjid', 'ADT', 'ADY', 'AVAL', 'AVISIT', 'SITEID', 'Visit date', 'Result', ' AVAL ', '', 'Note');
    fc.assert(
      fc.property(fc.array(header, { maxLength: 8 }), fc.constantFrom('blinded', 'unblinded' as const), (headers, mode) => {
        const shared = new Set(duplicateHeaderGroups(headers).flat());
        const { mapping } = detectMapping(headers, mode);
        for (const [role, col] of Object.entries(mapping)) if (role !== 'covariates') expect(shared.has(col as number), `${role} on column ${String(col)}`).toBe(false);
        // Groups are exactly the non-blank headers that repeat, ignoring case and surrounding spaces.
        const keys = headers.map((h) => h.trim().toLowerCase());
        headers.forEach((h, c) => expect(shared.has(c)).toBe(h.trim() !== '' && keys.filter((k) => k === keys[c]).length > 1));
      }),
      { numRuns: 400 },
    );
  });
});
