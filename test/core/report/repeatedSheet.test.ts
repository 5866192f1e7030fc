/** The visit-by-visit model's sheet and JSON when the model could not be fitted: the plain paragraph says why, the
 * records left out are still listed, and the JSON has `fitted: false` and no numbers. */
import { describe, expect, it } from 'vitest';
import { cautionLine } from '../../../src/core/report/cautions';
import { repeatedJson } from '../../../src/core/report/repeatedJson';
import { repeatedSheet } from '../../../src/core/report/repeatedSheet';

const leftOut = [
  { row: 7, participant: 'P-01', status: 'extra' as const },
  { row: 9, participant: 'P-02', status: 'repeat' as const },
];

describe('visit-by-visit model output when it was not fitted', () => {
  it('opens with the caution line and a paragraph giving the reason, and still lists the records left out', () => {
    const sheet = repeatedSheet(null, { mode: 'blinded', note: 'fewer than two participants have a value at a scheduled visit', notes: [], leftOut });
    expect(sheet.blocks[0]).toEqual(cautionLine('blinded'));
    const para = sheet.blocks[1] as { kind: string; text: string };
    expect(para.kind).toBe('paragraph');
    expect(para.text).toMatch(/Unscheduled records \(1\) and repeat records \(1\) are left out/);
    expect(para.text).toMatch(/The model was not fitted: fewer than two participants have a value at a scheduled visit\.$/);
    const table = sheet.blocks.find((b) => b.kind === 'table') as { id: string; rows: readonly (readonly unknown[])[] };
    expect(table.id).toBe('VisitRecordsLeftOut');
    expect(table.rows).toEqual([
      [7, 'P-01', 'Unscheduled'],
      [9, 'P-02', 'Repeat'],
    ]);
  });

  it('JSON: kind "repeated", fitted false, the reason, and the left-out records', () => {
    expect(repeatedJson(null, { note: 'no reason', notes: [], leftOut })).toEqual({
      kind: 'repeated',
      fitted: false,
      note: 'no reason',
      notes: [],
      leftOut: { unscheduled: 1, repeat: 1, records: leftOut },
    });
  });
});
