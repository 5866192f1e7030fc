import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { detectMapping } from '../../../src/core/intake';

// Variable names and meanings: CDISC SDTM Implementation Guide and ADaM Implementation Guide (open standards).
const split = (h: string): string[] => h.split(',');

describe('detectMapping on CDISC names', () => {
  it('detectMapping maps USUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL to subject, site, arm, visit, date, reference, value', () => {
    const d = detectMapping(split('USUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL'), 'unblinded');
    expect(d.mapping).toEqual({ subject: 0, site: 1, arm: 2, visit: 3, date: 4, reference: 5, value: 6, covariates: [] });
    expect(Object.keys(d.reasons).sort()).toEqual(['arm', 'date', 'reference', 'site', 'subject', 'value', 'visit']);
    expect(d.reasons.subject).toMatch(/USUBJID/);
  });

  it('detectMapping on ADaM USUBJID,TRTA,AVISITN,AVISIT,ADY,AVAL,BASE,CHG prefers AVISIT over AVISITN and never takes BASE or CHG as the value', () => {
    const d = detectMapping(split('USUBJID,TRTA,AVISITN,AVISIT,ADY,AVAL,BASE,CHG'), 'unblinded');
    expect(d.mapping).toEqual({ subject: 0, arm: 1, visit: 3, studyDay: 4, value: 5, covariates: [] });
    expect(d.covariateSuggestions).toEqual([6]); // BASE is suggested, not added
    expect(d.notes?.some((n) => n.includes('CHG'))).toBe(true);
  });

  it('detectMapping never takes CHG or BASE as the value, even when nothing else could be', () => {
    const d = detectMapping(split('USUBJID,ADY,BASE,CHG'), 'blinded');
    expect(d.mapping).toEqual({ subject: 0, studyDay: 1, covariates: [] });
  });

  it('detectMapping prefers USUBJID over SUBJID, VISIT over VISITNUM and the domain names of SDTM', () => {
    const d = detectMapping(split('STUDYID,SUBJID,USUBJID,SITEID,ARM,VISITNUM,VISIT,LBDTC,LBDY,LBSTRESN,RFSTDTC,ABLFL'), 'unblinded');
    expect(d.mapping).toEqual({
      subject: 2,
      site: 3,
      arm: 4,
      visit: 6,
      date: 7,
      studyDay: 8,
      value: 9,
      reference: 10,
      covariates: [],
    });
  });

  it('detectMapping takes a visit number when no visit label column exists', () => {
    expect(detectMapping(split('USUBJID,AVISITN,ADY,AVAL'), 'blinded').mapping.visit).toBe(1);
  });

  it('detectMapping ignores case, spaces and underscores in CDISC names', () => {
    const d = detectMapping(['usubjid', 'A Visit', 'a_dt', 'Aval ', 'trt01p', 'Rand_DT', 'trtsdt'], 'unblinded');
    expect(d.mapping).toEqual({ subject: 0, visit: 1, date: 2, value: 3, arm: 4, reference: 5, covariates: [] });
  });

  it('detectMapping takes TRTSDT or RFSTDTC as the reference date when RANDDT is absent', () => {
    expect(detectMapping(split('USUBJID,ADT,TRTSDT,AVAL'), 'blinded').mapping.reference).toBe(2);
    expect(detectMapping(split('USUBJID,VSDTC,RFSTDTC,VSSTRESN'), 'blinded').mapping).toEqual({
      subject: 0,
      date: 1,
      reference: 2,
      value: 3,
      covariates: [],
    });
  });
});

describe('detectMapping on plain words', () => {
  it('detectMapping maps "Patient ID", "Visit", "Visit date", "eGFR result", "Treatment group", "Site"', () => {
    const d = detectMapping(['Patient ID', 'Visit', 'Visit date', 'eGFR result', 'Treatment group', 'Site'], 'unblinded');
    expect(d.mapping).toEqual({ subject: 0, visit: 1, date: 2, value: 3, arm: 4, site: 5, covariates: [] });
    for (const role of ['subject', 'visit', 'date', 'value', 'arm', 'site'] as const) expect(d.reasons[role]).toBeTypeOf('string');
  });

  it('detectMapping reads study day, randomisation and first-dose dates, centre and outcome words', () => {
    const d = detectMapping(['Participant', 'Study day', 'Randomization date', 'First dose date', 'Centre', 'Outcome'], 'blinded');
    expect(d.mapping).toEqual({ subject: 0, studyDay: 1, reference: 2, site: 4, value: 5, covariates: [] });
  });

  it('detectMapping suggests a baseline column as a covariate but never adds it', () => {
    const d = detectMapping(['Subject', 'Visit date', 'Result', 'Baseline eGFR'], 'blinded');
    expect(d.mapping.covariates).toEqual([]);
    expect(d.covariateSuggestions).toEqual([3]);
    expect(d.mapping.value).toBe(2);
  });

  it('detectMapping reads "Randomised arm" as the arm and leaves "Days since randomisation" unmapped (it may have a day 0)', () => {
    expect(detectMapping(['Subject', 'Randomised arm', 'Days since randomisation', 'Result'], 'unblinded').mapping).toEqual({
      subject: 0,
      arm: 1,
      value: 3,
      covariates: [],
    });
  });

  it('detectMapping does not take a birth date as the visit date', () => {
    expect(detectMapping(['Subject', 'Date of birth', 'Result'], 'blinded').mapping.date).toBeUndefined();
  });

  it('detectMapping leaves unknown or blank headers unmapped', () => {
    expect(detectMapping(['', 'Comment', 'eGFR'], 'blinded').mapping).toEqual({ covariates: [] });
  });
});

describe('detectMapping in blinded mode', () => {
  it('detectMapping proposes no arm in blinded mode (SPEC §2: no arm column is read)', () => {
    for (const headers of [split('USUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL'), ['Patient ID', 'Visit date', 'Result', 'Treatment group', 'Arm']]) {
      const d = detectMapping(headers, 'blinded');
      expect(d.mapping.arm).toBeUndefined();
      expect(d.reasons.arm).toBeUndefined();
    }
    const d = detectMapping(split('USUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL'), 'blinded');
    expect(d.mapping).toEqual({ subject: 0, site: 1, visit: 3, date: 4, reference: 5, value: 6, covariates: [] });
  });
});

describe('detectMapping properties', () => {
  const header = fc.oneof(
    fc.string({ maxLength: 12 }),
    fc.constantFrom('USUBJID', 'SUBJID', 'TRT01P', 'TRTA', 'AVISIT', 'AVISITN', 'ADT', 'ADY', 'AVAL', 'BASE', 'CHG', 'ABLFL', 'Visit date', 'Result', 'Arm', 'Site'),
  );

  it('detectMapping maps each column to one role at most, never BASE or CHG, never an arm in blinded mode, and adds no covariates', () => {
    fc.assert(
      fc.property(fc.array(header, { maxLength: 12 }), fc.constantFrom('blinded' as const, 'unblinded' as const), (headers, mode) => {
        const d = detectMapping(headers, mode);
        const { covariates, ...roles } = d.mapping;
        const cols = Object.values(roles);
        expect(new Set(cols).size).toBe(cols.length);
        for (const c of cols) {
          expect(c).toBeGreaterThanOrEqual(0);
          expect(c).toBeLessThan(headers.length);
          expect(['BASE', 'CHG']).not.toContain(headers[c]);
        }
        expect(covariates).toEqual([]);
        if (mode === 'blinded') expect(d.mapping.arm).toBeUndefined();
        expect(Object.keys(d.reasons).sort()).toEqual(Object.keys(roles).sort());
      }),
      { numRuns: 500 },
    );
  });
});
