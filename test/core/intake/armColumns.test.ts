import { describe, expect, it } from 'vitest';
import { isArmHeader, readTable, type CellValue, type IntakeOptions } from '../../../src/core/intake';

// Invented rows (an eGFR-like value at two study days); nothing here describes a real trial or person.
const BLINDED: IntakeOptions = { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded' };
const CELLS: CellValue[][] = [
  ['USUBJID', 'ADY', 'AVAL', 'TRT01P', 'SITEID'],
  ['S1', 1, 60, 'Placebo', 'Site 01'],
  ['S1', 85, 58, 'Placebo', 'Site 01'],
  ['S2', 1, 61, 'Active', 'Site 02'],
  ['S2', 85, 62, 'Active', 'Site 02'],
];

describe('blinded mode never reads an arm column (SPEC §2)', () => {
  it('isArmHeader knows the CDISC arm and treatment variables and plain arm words', () => {
    // CDISC SDTM/ADaM variable names (open standard): ARM, ARMCD, ACTARM, ACTARMCD, TRT01P/A(N), TRTP/A, TRTSEQP.
    for (const h of ['ARM', 'ARMCD', 'ACTARM', 'ACTARMCD', 'TRT01P', 'TRT01A', 'TRT01PN', 'TRTP', 'TRTA', 'TRTSEQP']) {
      expect(isArmHeader(h), h).toBe(true);
    }
    for (const h of ['Treatment group', 'Arm', 'Cohort']) expect(isArmHeader(h), h).toBe(true);
    for (const h of ['USUBJID', 'SITEID', 'AVAL', 'BASE', 'Visit date', 'Site']) expect(isArmHeader(h), h).toBe(false);
  });

  it('a blinded run that maps the arm column as a covariate is blocked at its header cell', () => {
    const r = readTable(CELLS, { ...BLINDED, mapping: { subject: 0, studyDay: 1, value: 2, site: 4, covariates: [3] } });
    expect(r.ok).toBe(false);
    const issue = r.issues.find((i) => i.code === 'arm-column-blinded');
    expect(issue).toMatchObject({ severity: 'error', cell: 'Visits!D1', role: 'covariate', value: 'TRT01P' });
    expect(issue?.message).toContain('unblinded');
  });

  it('a blinded run that maps the arm column as the site is blocked too', () => {
    const r = readTable(CELLS, { ...BLINDED, mapping: { subject: 0, studyDay: 1, value: 2, site: 3, covariates: [] } });
    expect(r.ok).toBe(false);
    expect(r.issues.map((i) => [i.code, i.cell, i.role])).toContainEqual(['arm-column-blinded', 'Visits!D1', 'site']);
  });

  it('a blinded run with the arm mapped to the arm role simply drops it and reads no arm', () => {
    const r = readTable(CELLS, { ...BLINDED, mapping: { subject: 0, studyDay: 1, value: 2, arm: 3, site: 4, covariates: [] } });
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.table.arm).toBeNull();
      expect(r.table.arms).toEqual([]);
    }
  });

  it('the guard is for blinded runs only: unblinded mode reads the arm column and raises no blinding error', () => {
    const r = readTable(CELLS, { ...BLINDED, mode: 'unblinded', mapping: { subject: 0, studyDay: 1, value: 2, arm: 3, site: 4, covariates: [] } });
    expect(r.issues.map((i) => i.code)).not.toContain('arm-column-blinded');
    // Two subjects, one per arm: unblinded mode blocks for too few subjects per arm, not for blinding.
    expect(r.issues.map((i) => i.code)).toContain('too-few-subjects-per-arm');
  });
});
