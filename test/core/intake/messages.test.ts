import { describe, expect, it } from 'vitest';
import { renderMessage, type IssueCode } from '../../../src/core/intake';

// Every code of the IssueCode union; the record type makes the compiler fail when a code is added and not listed here.
const ALL: Record<IssueCode, true> = {
  'no-rows': true,
  'no-subject-column': true,
  'no-time-column': true,
  'no-value-column': true,
  'no-arm-column': true,
  'arm-column-blinded': true,
  'duplicate-role': true,
  'bad-exit-date': true,
  'exit-date-differs': true,
  'after-exit': true,
  'subject-in-two-arms': true,
  'too-few-subjects-per-arm': true,
  'no-usable-rows': true,
  'blank-subject': true,
  'blank-time': true,
  'bad-date': true,
  'bad-study-day': true,
  'bad-reference-date': true,
  'blank-value': true,
  'text-in-numeric': true,
  'error-value': true,
  'blank-arm': true,
  'bad-covariate': true,
  'blank-row': true,
  'duplicate-header': true,
  'long-text': true,
  'implausible-date': true,
  'empty-header': true,
  'column-outside-range': true,
  'partial-date': true,
  'date-order-unknown': true,
  'date-order-mixed': true,
  'unreadable-date-column': true,
  'not-finite': true,
  'too-few-arms': true,
  'unknown-reference-arm': true,
  'reference-date-differs': true,
  'no-reference-date': true,
  'no-baseline-record': true,
  'after-cutoff': true,
  'model-not-fitted': true,
};

describe('renderMessage', () => {
  it('renderMessage gives every issue code a plain sentence that ends with a full stop', () => {
    for (const code of Object.keys(ALL) as IssueCode[]) {
      const m = renderMessage({ code, role: 'value', value: 'x', cell: 'Visits!C17', use: 'model' });
      expect(m, code).toMatch(/^[A-Z'"].*\.$/);
      expect(m, code).not.toMatch(/undefined|null|NaN/);
    }
  });

  it('renderMessage speaks the glossary\'s words for every code, role and use: participant, visit name (README, "Words we use")', () => {
    const roles = ['subject', 'date', 'studyDay', 'reference', 'visit', 'value', 'arm', 'site', 'exit', 'exitStatus', 'exitReason', 'covariate'] as const;
    for (const code of Object.keys(ALL) as IssueCode[]) {
      for (const role of roles) {
        for (const use of ['timing', 'model', null] as const) {
          const m = renderMessage({ code, role, value: 'x', cell: 'Visits!C17', use, other: 'y' });
          expect(m, `${code} ${role} ${String(use)}`).not.toMatch(/subject|patient|visit label|days off|\bextra\b|start date|planned day|measured value/i);
        }
      }
    }
    expect(renderMessage({ code: 'blank-subject', role: 'subject', value: '', cell: 'V!A4', use: 'timing' })).toBe(
      'V!A4: the participant is blank, so the row is left out of the visit-timing checks.',
    );
    expect(renderMessage({ code: 'blank-time', role: 'visit', value: '', cell: 'V!D4', use: 'timing' })).toBe(
      'V!D4: the visit name is blank, so the row is left out of the visit-timing checks.',
    );
  });

  it('renderMessage starts a row-level sentence with the cell address and says which use the row leaves', () => {
    expect(renderMessage({ code: 'blank-value', role: 'value', value: '', cell: "'My Sheet'!F7", use: 'model' })).toBe(
      "'My Sheet'!F7: the value is blank, so the row is left out of the model.",
    );
    expect(renderMessage({ code: 'blank-time', role: 'date', value: '', cell: 'Visits!B3', use: 'timing' })).toBe(
      'Visits!B3: the visit date is blank, so the row is left out of the visit-timing checks.',
    );
  });

  it('renderMessage says that study day 0 does not exist by the CDISC convention, for 0 written in any plain way', () => {
    for (const v of ['0', '-0', '+0', '0.0']) {
      expect(renderMessage({ code: 'bad-study-day', role: 'studyDay', value: v, cell: 'Visits!B3', use: 'timing' })).toMatch(/study day 0 does not exist/);
    }
    expect(renderMessage({ code: 'bad-study-day', role: 'studyDay', value: '2.5', cell: 'Visits!B3', use: 'timing' })).toMatch(/whole number other than 0/);
  });

  it('renderMessage names a covariate by its column name', () => {
    expect(renderMessage({ code: 'blank-value', role: 'covariate', value: '', cell: 'V!D4', use: 'model', context: 'Baseline eGFR' })).toBe(
      'V!D4: the covariate "Baseline eGFR" is blank, so the row is left out of the model.',
    );
  });
});

describe('renderMessage punctuation', () => {
  it('model-not-fitted ends its reason with one full stop even when the reason has its own (regression: "..")', () => {
    const m = renderMessage({ code: 'model-not-fitted', role: 'value', value: '', cell: null, use: 'model', context: 'Model input: one subject only.' });
    expect(m).toBe('The model could not be fitted: Model input: one subject only. The visit-timing results stand.');
  });
});
