import { describe, expect, it } from 'vitest';
import { analysisRecordSheet, mappingLines } from '../../../src/core/report/record';
import type { AnalysisRecordInput } from '../../../src/core/report/record';
import type { TableBlock } from '../../../src/core/report/types';
import { STARTER_SCHEDULE } from '../../../src/core/schedule/starter';

const base: AnalysisRecordInput = {
  inputLabel: 'Visits!A1:F7',
  fingerprint: 'ab'.repeat(32),
  rowsRead: 6,
  rowsTiming: 5,
  rowsModel: 4,
  excluded: [
    { row: 3, cell: 'Visits!B3', use: 'timing', reason: 'The visit date is blank.' },
    { row: 3, cell: 'Visits!B3', use: 'model', reason: 'The visit date is blank.' },
    { row: 6, cell: 'Visits!E6', use: 'model', reason: 'The value is text.' },
  ],
  mapping: mappingLines({ subject: 0, date: 1, value: 4, covariates: [5] }, ['ID', 'When', 'x', 'y', 'eGFR', 'Base']),
  schedule: STARTER_SCHEDULE,
  settings: [{ name: 'Time unit', value: 'month' }],
  cutoff: '2024-06-30 (the latest visit date in the data)',
  mode: 'blinded',
  version: '0.1.0',
  runAt: '2026-12-02T02:00:00Z',
};
const table = (id: string, input: AnalysisRecordInput = base): TableBlock =>
  analysisRecordSheet(input).blocks.find((b): b is TableBlock => b.kind === 'table' && b.id === id)!;

describe('analysis record', () => {
  it('lists the mapping role by role with headings and 1-based column numbers', () => {
    expect(base.mapping).toEqual([
      { role: 'Participant', header: 'ID', column: 1 },
      { role: 'Visit date', header: 'When', column: 2 },
      { role: 'Value', header: 'eGFR', column: 5 },
      { role: 'Covariate', header: 'Base', column: 6 },
    ]);
  });

  it('records input, fingerprint, counts, schedule and every exclusion with its use and reason', () => {
    expect(analysisRecordSheet(base).name).toBe('Analysis record');
    expect(table('RunFacts').rows[1]).toEqual(['Fingerprint of the input values (SHA-256)', base.fingerprint]);
    expect(table('RowCounts').rows).toEqual([
      ['Data rows read', 6],
      ['Used for visit timing', 5],
      ['Used for the model', 4],
      ['Left out of visit timing', 1],
      ['Left out of the model', 2],
      ['Left out of at least one use', 2],
    ]);
    expect(table('Schedule').rows).toHaveLength(STARTER_SCHEDULE.length);
    expect(table('LeftOut').rows).toEqual([
      [3, 3, 'Visits!B3', 'Visit timing', 'The visit date is blank.'],
      [3, 3, 'Visits!B3', 'Model', 'The visit date is blank.'],
      [6, 6, 'Visits!E6', 'Model', 'The value is text.'],
    ]);
  });

  it('lists all exclusions even when there are 100,000 of them', () => {
    const many = Array.from({ length: 100_000 }, (_, i) => ({ row: i + 2, cell: `Visits!B${i + 2}`, use: 'timing' as const, reason: 'The visit date is blank.' }));
    expect(table('LeftOut', { ...base, excluded: many }).rows).toHaveLength(100_000);
  });

  it('does not mutate its input', () => {
    const copy = JSON.parse(JSON.stringify(base));
    analysisRecordSheet(base);
    expect(JSON.parse(JSON.stringify(base))).toEqual(copy);
  });
});
