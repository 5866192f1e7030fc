import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { decideDateOrder, readTable, type CellValue, type IntakeOptions, type IntakeResult } from '../../../src/core/intake';

// Invented kidney-function rows; day numbers are exact identities (0 = 1899-12-30; 45669 = 2025-01-12, checked
// against Date.UTC in dates.test.ts through dayNumberToIso).
const OPTIONS: IntakeOptions = { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded', numericText: 'accept' };
const grid = (dates: readonly CellValue[], refs?: readonly CellValue[]): CellValue[][] => [
  ['USUBJID', 'ADT', 'AVAL', ...(refs === undefined ? [] : ['RANDDT'])],
  ...dates.map((d, i) => ['K-1', d, '60', ...(refs === undefined ? [] : [refs[i] ?? null])]),
];
const col = (values: readonly CellValue[]): CellValue[][] => [['ADT'], ...values.map((v) => [v])];
const okTable = (r: IntakeResult) => {
  if (!r.ok) throw new Error(r.issues.map((i) => i.message).join('\n'));
  return r.table;
};

describe('decideDateOrder', () => {
  it('a first part over 12 means day first, a second part over 12 month first; the setting always wins', () => {
    expect(decideDateOrder(col(['03/04/2025', '13/04/2025']), 0, undefined)).toEqual({ kind: 'decided', order: 'dmy', source: 'data', evidence: ['13/04/2025'] });
    expect(decideDateOrder(col(['03/04/2025', '04/13/2025']), 0, undefined)).toEqual({ kind: 'decided', order: 'mdy', source: 'data', evidence: ['04/13/2025'] });
    expect(decideDateOrder(col(['03/04/2025', '04/13/2025']), 0, 'dmy')).toMatchObject({ kind: 'decided', order: 'dmy', source: 'setting' });
  });

  it('every value reading both ways is ambiguous, with up to three distinct examples; 05/05/2025 reads the same both ways', () => {
    expect(decideDateOrder(col(['03/04/2025', '03/04/2025', '05/06/2025', '07/08/2025', '09/10/2025']), 0, undefined)).toEqual({
      kind: 'ambiguous',
      examples: ['03/04/2025', '05/06/2025', '07/08/2025'],
    });
    expect(decideDateOrder(col(['05/05/2025']), 0, undefined)).toMatchObject({ kind: 'decided', source: 'none' });
  });

  it('values readable only day first beside values readable only month first are mixed; ISO, serials and two-digit years are no evidence', () => {
    expect(decideDateOrder(col(['13/01/2025', '01/13/2025']), 0, undefined)).toEqual({ kind: 'mixed', dayFirst: ['13/01/2025'], monthFirst: ['01/13/2025'] });
    expect(decideDateOrder(col(['2025-01-12', 45669, '12JAN2025', '13/01/25', null]), 0, undefined)).toEqual({ kind: 'decided', order: null, source: 'none', evidence: [] });
  });

  it('decideDateOrder never throws and always decides, or names examples from the column (property)', () => {
    const cell: fc.Arbitrary<CellValue> = fc.oneof(
      fc.string({ maxLength: 12 }),
      fc.tuple(fc.integer({ min: 0, max: 40 }), fc.integer({ min: 0, max: 40 }), fc.constantFrom('/', '.', '-', ':'), fc.constantFrom('2025', '25', '202')).map(([a, b, s, y]) => ` ${a}${s}${b}${s}${y}`),
      fc.double(),
      fc.boolean(),
      fc.constantFrom(null, undefined),
    );
    fc.assert(
      fc.property(fc.array(fc.array(cell, { maxLength: 3 }), { maxLength: 30 }), fc.integer({ min: 0, max: 3 }), fc.constantFrom(undefined, 'dmy' as const, 'mdy' as const), (rows, c, forced) => {
        const d = decideDateOrder(rows, c, forced);
        const texts = new Set(rows.slice(1).map((r) => (typeof r[c] === 'string' ? (r[c] as string).trim() : null)));
        if (forced !== undefined) expect(d).toMatchObject({ kind: 'decided', order: forced });
        if (d.kind === 'ambiguous') for (const e of d.examples) expect(texts.has(e)).toBe(true);
        if (d.kind === 'mixed') for (const e of [...d.dayFirst, ...d.monthFirst]) expect(texts.has(e)).toBe(true);
      }),
      { numRuns: 1000 },
    );
  });
});

describe('readTable date columns', () => {
  it('reads ISO, day-month-name-year and day/month/year in one column to the same day numbers', () => {
    const t = okTable(readTable(grid(['2025-01-12', '12JAN2025', '12 jan 2025', '12/01/2025', '13/01/2025', 45669]), OPTIONS));
    expect(Array.from(t.date)).toEqual([45669, 45669, 45669, 45669, 45670, 45669]);
    expect(t.dateReadings).toEqual([{ role: 'date', column: 'ADT', order: 'dmy', source: 'data', evidence: ['13/01/2025'] }]);
  });

  it('a column whose numeric dates all read both ways stops the run with one error at its header, three examples and the setting to give', () => {
    const r = readTable(grid(['03/04/2025', '05/06/2025', '07/08/2025', '09/10/2025']), OPTIONS);
    expect(r.ok).toBe(false);
    expect(r.issues).toEqual([
      {
        code: 'date-order-unknown',
        severity: 'error',
        cell: 'Visits!B1',
        row: null,
        role: 'date',
        value: 'ADT',
        use: null,
        message:
          'Column "ADT" (visit date) writes the day and month as numbers, and every such value reads both as day/month/year and as month/day/year (e.g. "03/04/2025", "05/06/2025", "07/08/2025"). Say which order the column uses: --date-order dmy or --date-order mdy on the command line, or "Order of day and month" in the pane\'s settings.',
      },
    ]);
    expect(Array.from(okTable(readTable(grid(['03/04/2025']), { ...OPTIONS, dateOrder: 'mdy' })).date)).toEqual([45720]); // 2025-03-04 (exact identity, as in readTable.test.ts)
  });

  it('a column with no readable value stops the run with one message naming the column, examples and the accepted forms', () => {
    const r = readTable(grid(['12/01/25', 'n/a', '12/01/25', 'soon', 'x']), OPTIONS);
    expect(r.issues.map((i) => [i.code, i.cell, i.severity])).toEqual([['unreadable-date-column', 'Visits!B1', 'error']]);
    expect(r.issues[0]!.message).toMatch(/^Column "ADT" \(visit date\) has no value that can be read as a date \(e\.g\. "12\/01\/25", "n\/a", "soon"\)\. Accepted forms: ISO 8601/);
    expect(r.issues[0]!.message).toMatch(/Two-digit years are not read/);
  });

  it('a forced order leaves values it cannot read out row by row, with their cells', () => {
    const r = readTable(grid(['13/01/2025', '01/13/2025']), { ...OPTIONS, dateOrder: 'dmy' });
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual([['bad-date', 'Visits!B3', 'timing'], ['bad-date', 'Visits!B3', 'model']]);
    expect(r.issues[0]!.message).toMatch(/cannot be read as day\/month\/year, the order this column's dates are read in/);
  });

  it('partial dates in every form are cell-addressed issues, and the row leaves both visit timing and the model', () => {
    const partial = ['2025-01', '2025', 'JAN2025', 'UNK-JAN-2025', '01/2025', '2025---12'];
    const r = readTable(grid(['2025-01-12', ...partial]), OPTIONS);
    const t = okTable(r);
    expect(Array.from(t.usableTiming)).toEqual([1, 0, 0, 0, 0, 0, 0]);
    expect(Array.from(t.usableModel)).toEqual([1, 0, 0, 0, 0, 0, 0]);
    expect(r.issues.map((i) => [i.code, i.cell, i.use])).toEqual(
      partial.flatMap((_, k) => [['partial-date', `Visits!B${k + 3}`, 'timing'], ['partial-date', `Visits!B${k + 3}`, 'model']]),
    );
    expect(r.issues[0]!.message).toBe('Visits!B3: "2025-01" is a partial date (a day or month is missing): the visit cannot be timed, and the missing part is never guessed. The row is left out of the visit-timing checks.');
  });

  it('the reference date column follows the same rules: its own order, partial dates kept as missing with a warning', () => {
    const r = readTable(grid(['2025-01-12', '2025-02-12', '2025-03-12'], ['12/31/2024', '12/31/2024', '2024-12']), OPTIONS);
    const t = okTable(r);
    expect(Array.from(t.reference)).toEqual([45657, 45657, NaN]); // 2024-12-31 = 45669 - 12 (exact identity)
    expect(Array.from(t.usableModel)).toEqual([1, 1, 1]);
    expect(r.issues.map((i) => [i.code, i.cell, i.role, i.use])).toEqual([['partial-date', 'Visits!D4', 'reference', null]]);
    expect(readTable(grid(['2025-01-12'], ['03/04/2024']), OPTIONS).issues.map((i) => [i.code, i.cell])).toEqual([['date-order-unknown', 'Visits!D1']]);
  });
});

describe('readDateColumn remembers each distinct text', () => {
  it('reads a column of repeated texts exactly as each cell read alone (property over a small pool of valid, impossible, partial and two-digit-year texts)', async () => {
    const { readDateColumn } = await import('../../../src/core/intake/dateColumn');
    const { readDate } = await import('../../../src/core/intake/readCell');
    const pool = ['2025-01-12', '12JAN2025', '2025-02-30', '2025-03', '12/01/25', 'soon', ' 2025-01-13 ', '', '#N/A', 45669] as const;
    fc.assert(
      fc.property(fc.array(fc.constantFrom(...pool), { maxLength: 40 }), (values) => {
        const column = readDateColumn(col(values), 0, 1900, 'dmy');
        values.forEach((v, i) => {
          const alone = readDate(v, 1900, 'dmy');
          if (typeof alone === 'number') expect(column.days[i]).toBe(alone);
          else expect(Number.isNaN(column.days[i])).toBe(true);
          expect(column.problems[i] === 0).toBe(typeof alone === 'number');
        });
      }),
    );
  });
});
