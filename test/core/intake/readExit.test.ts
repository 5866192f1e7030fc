import { describe, expect, it } from 'vitest';
import { detectMapping, readTable } from '../../../src/core/intake';
import type { CellValue } from '../../../src/core/intake/types';

const OPTIONS = { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900 as const, mode: 'blinded' as const };

describe('the exit-date role (ADaM EOSDT, EOSSTT, DCSREAS)', () => {
  it('detects the CDISC ADaM end-of-study names and plain headers, and never a treatment discontinuation date', () => {
    // Variable names from the CDISC ADaM Implementation Guide (subject-level dataset ADSL).
    const m = detectMapping(['USUBJID', 'ADT', 'AVAL', 'EOSDT', 'EOSSTT', 'DCSREAS'], 'blinded').mapping;
    expect(m).toMatchObject({ subject: 0, date: 1, value: 2, exit: 3, exitStatus: 4, exitReason: 5 });
    for (const h of ['End of study date', 'Discontinuation date', 'Withdrawal date', 'Study exit date']) {
      expect(detectMapping(['Patient', 'Visit date', h], 'blinded').mapping.exit).toBe(2);
    }
    expect(detectMapping(['Patient', 'Visit date', 'Discontinuation reason'], 'blinded').mapping.exitReason).toBe(2);
    expect(detectMapping(['Patient', 'Visit date', 'End of study status'], 'blinded').mapping.exitStatus).toBe(2);
    expect(detectMapping(['Patient', 'Visit date', 'Treatment discontinuation date'], 'blinded').mapping.exit).toBeUndefined();
  });

  it('takes the exit date from every row or from one row only, and the status and reason from the first non-blank', () => {
    const cells: CellValue[][] = [
      ['USUBJID', 'ADT', 'AVAL', 'EOSDT', 'EOSSTT', 'DCSREAS'],
      ['K-1', '2025-01-06', 60, '2025-03-01', 'DISCONTINUED', 'WITHDRAWAL BY SUBJECT'],
      ['K-1', '2025-02-03', 59, '2025-03-01', 'DISCONTINUED', 'WITHDRAWAL BY SUBJECT'],
      ['K-2', '2025-01-07', 61, '', '', ''],
      ['K-2', '2025-02-04', 62, '2025-06-30', 'COMPLETED', ''],
      ['K-3', '2025-01-08', 63, '', 'ONGOING', ''],
    ];
    const r = readTable(cells, OPTIONS);
    if (!r.ok) throw new Error('stopped');
    // 2025-03-01 is 1900-system serial 45717 and 2025-06-30 is 45838 (ECMA-376 Part 1 §18.17.4 day count).
    expect(Array.from(r.table.subjectExit)).toEqual([45717, 45838, NaN]);
    expect(r.table.subjectExitStatus).toEqual(['DISCONTINUED', 'COMPLETED', 'ONGOING']);
    expect(r.table.subjectExitReason).toEqual(['WITHDRAWAL BY SUBJECT', '', '']);
    expect(r.issues).toEqual([]);
  });

  it('conflicting exit dates of one participant are a cell-addressed warning, and the latest is used', () => {
    const cells: CellValue[][] = [
      ['USUBJID', 'ADT', 'AVAL', 'EOSDT'],
      ['K-1', '2025-01-06', 60, '2025-03-01'],
      ['K-1', '2025-02-03', 59, '2025-04-01'],
      ['K-1', '2025-02-10', 58, 'soon'],
    ];
    const r = readTable(cells, OPTIONS);
    if (!r.ok) throw new Error('stopped');
    expect(Array.from(r.table.subjectExit)).toEqual([45748]); // 2025-04-01
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual([
      ['bad-exit-date', 'Visits!D4', null],
      ['exit-date-differs', 'Visits!D2', null],
    ]);
    expect(r.issues[1]!.message).toBe(
      'Visits!D2: the exit date 2025-03-01 differs from 2025-04-01 given for participant "K-1"; a participant leaves once, so the latest date is used. The row is kept.',
    );
  });
});
