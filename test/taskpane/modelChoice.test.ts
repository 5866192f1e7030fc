/** The pane's model choice and yes/no threshold turn into the run settings of README "Command line" (--model, --responder-below). */
import { describe, expect, it } from 'vitest';
import { DEFAULT_SETTINGS, isThreshold, toAnalysisSettings } from '../../src/taskpane/paneSettings';
import { SCHEDULE, SOURCE } from './fakes';

const mapping = { subject: 0, value: 6, date: 4, covariates: [] };

describe('model choice in the pane', () => {
  it('the random-intercept model by default, with no yes/no threshold', () => {
    const run = toAnalysisSettings(SOURCE, mapping, SCHEDULE, DEFAULT_SETTINGS, 'T');
    expect(run.model).toBe('intercept');
    expect('responder' in run).toBe(false);
  });
  it('GEE and the yes/no model with its threshold', () => {
    expect(toAnalysisSettings(SOURCE, mapping, SCHEDULE, { ...DEFAULT_SETTINGS, model: 'gee', responderBelow: '45' }, 'T')).toMatchObject({ model: 'gee' });
    expect('responder' in toAnalysisSettings(SOURCE, mapping, SCHEDULE, { ...DEFAULT_SETTINGS, model: 'gee', responderBelow: '45' }, 'T')).toBe(false);
    expect(toAnalysisSettings(SOURCE, mapping, SCHEDULE, { ...DEFAULT_SETTINGS, model: 'logistic', responderBelow: '45' }, 'T')).toMatchObject({ model: 'logistic', responder: { below: 45 } });
    expect('responder' in toAnalysisSettings(SOURCE, mapping, SCHEDULE, { ...DEFAULT_SETTINGS, model: 'logistic', responderBelow: 'low' }, 'T')).toBe(false);
  });
  it('isThreshold accepts finite numbers only', () => {
    expect([isThreshold('45'), isThreshold(' -1.5 '), isThreshold(''), isThreshold('x'), isThreshold('Infinity')]).toEqual([true, true, false, false, false]);
  });
});
