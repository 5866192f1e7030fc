/** The run settings the pipeline tests share: REML with Kenward–Roger, 95% intervals, time in weeks, blinded, sheet
 * "Visits" at A1 in the 1900 date system; each test gives its schedule and whatever else differs. */
import type { AnalysisSettings } from '../../../src/core/pipeline';

export function testSettings(over: Partial<AnalysisSettings> & Pick<AnalysisSettings, 'schedule'>): AnalysisSettings {
  return {
    sheet: 'Visits',
    topLeft: 'A1',
    dateSystem: 1900,
    mode: 'blinded',
    timeUnit: 'week',
    dfMethod: 'kenward-roger',
    method: 'reml',
    level: 0.95,
    scheduledOnly: false,
    perSubject: false,
    inputLabel: 'invented test data',
    runAt: '2026-01-01T00:00:00.000Z',
    ...over,
  };
}
