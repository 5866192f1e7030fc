import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { compactIssues, excludedRows, rowsLeftOut, runAnalysis } from '../../../src/core/pipeline';
import type { AnalysisSettings } from '../../../src/core/pipeline';
import { renderMessage, type CellValue, type Issue, type IssueCode, type Role, type Use } from '../../../src/core/intake';
import { testSettings } from './testSettings';

// Issue item 2: a stray cell far below a table, or a column of "NA", must cost one summary or one entry per kind,
// not one issue object per row, and still account for every row. Generated grids; exact counts, no tolerance.
// (Speed itself is measured on the command line and reported, not asserted here: no timed tests.)

const SETTINGS: AnalysisSettings = testSettings({
  sheet: 'Data',
  schedule: [
    { label: 'Day 1', targetDay: 1, before: 0, after: 0 },
    { label: 'Week 1', targetDay: 8, before: 2, after: 2 },
  ],
  inputLabel: 'invented generated grid',
  numericText: 'accept',
});

/** 120 invented data rows (30 participants, study days 1, 8, 15, 22), as the issue's workbook had. */
function table120(): CellValue[][] {
  const cells: CellValue[][] = [['USUBJID', 'ADY', 'AVAL']];
  for (let i = 2; i <= 121; i++) cells.push([`S${i % 30}`, 1 + 7 * (i % 4), i / 3]);
  return cells;
}

describe('blank rows and repeated exclusions (issue item 2)', () => {
  it('a 120-row table with one stray cell at A1048576 gives one blank-row summary, and every blank row is listed in one entry per use', async () => {
    const cells = table120();
    const blank: CellValue[] = []; // the reader shares one row object among blank rows
    while (cells.length < 1_048_575) cells.push(blank);
    cells.push(['stray']); // worksheet row 1,048,576
    const out = await runAnalysis(cells, SETTINGS);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const blanks = out.issues.filter((i) => i.code === 'blank-row');
    expect(blanks).toHaveLength(1);
    expect(blanks[0]).toMatchObject({ cell: 'Data!A122', row: 122, use: null, rowSpans: [[122, 1_048_575]] });
    expect(blanks[0]!.message).toBe('Data!A122: 1,048,454 blank rows are skipped (worksheet rows 122–1,048,575); a blank row is left out of the visit-timing checks and the model.');
    // The whole issue list stays small: the summary, and the stray row's blank study day (two uses) and value.
    expect(out.issues.length).toBeLessThan(10);
    const spans = out.excluded.filter((e) => e.row === 122);
    expect(spans).toEqual([
      { row: 122, lastRow: 1_048_575, cell: 'Data!A122:A1048575', use: 'timing', reason: 'Data!A122:A1048575: the whole row is blank, so it is left out of the visit-timing checks.' },
      { row: 122, lastRow: 1_048_575, cell: 'Data!A122:A1048575', use: 'model', reason: 'Data!A122:A1048575: the whole row is blank, so it is left out of the model.' },
    ]);
    // Every data row is used or listed: 120 used, 1,048,454 blank, 1 stray (exact identity: 1,048,575 data rows).
    expect(rowsLeftOut(out.excluded)).toBe(1_048_454 + 1);
    expect((out.json.input as { rows: number }).rows).toBe(1_048_575);
  });

  it('a column of 50,000 "NA" values is one left-out entry and one JSON issue, and every row stays accounted for', async () => {
    const cells: CellValue[][] = [['USUBJID', 'ADY', 'AVAL']];
    for (let i = 0; i < 50_000; i++) cells.push([`S${i % 500}`, 1 + 7 * (i % 2), 'NA']);
    const out = await runAnalysis(cells, SETTINGS);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.excluded).toEqual([
      {
        row: 2,
        lastRow: 50_001,
        cell: 'Data!C2:C50001',
        use: 'model',
        reason: 'Data!C2:C50001: "NA" is not a number, and the value must be a number, so the row is left out of the model.',
      },
    ]);
    const jsonIssues = out.json.issues as { code: string; cell: string; row: number; lastRow?: number }[];
    expect(jsonIssues.filter((i) => i.code === 'text-in-numeric')).toMatchObject([{ cell: 'Data!C2:C50001', row: 2, lastRow: 50_001 }]);
    // In memory the run keeps one issue per cell (the pane selects each); the JSON and the listings join them.
    expect(out.issues.filter((i) => i.code === 'text-in-numeric')).toHaveLength(50_000);
  });

  it('a run stopped by 20,000 rows of "NA" writes JSON that joins each column\'s issues into one', async () => {
    const cells: CellValue[][] = [['USUBJID', 'ADY', 'AVAL']];
    for (let i = 0; i < 20_000; i++) cells.push(['NA', 'NA', 'NA']);
    const out = await runAnalysis(cells, SETTINGS);
    expect(out.ok).toBe(false);
    const issues = (out.json?.issues ?? []) as { code: string; cell: string | null; use: string | null; lastRow?: number }[];
    expect(issues.map((i) => [i.code, i.cell, i.use, i.lastRow ?? null])).toEqual([
      ['no-usable-rows', null, null, null],
      ['text-in-numeric', 'Data!B2:B20001', 'timing', 20_001],
      ['text-in-numeric', 'Data!B2:B20001', 'model', 20_001],
      ['text-in-numeric', 'Data!C2:C20001', 'model', 20_001],
    ]);
  });
});

/** A row issue as intake makes it, for the property below. */
function rowIssue(code: IssueCode, row: number, col: string, role: Role, value: string, use: Use): Issue {
  const cell = `Data!${col}${row}`;
  return { code, severity: 'warning', cell, row, role, value, use, message: renderMessage({ code, role, value, cell, use }) };
}

const anyRowIssue = fc
  .tuple(
    fc.constantFrom<IssueCode>('text-in-numeric', 'blank-value', 'blank-subject'),
    fc.integer({ min: 2, max: 30 }),
    fc.constantFrom('B', 'C'),
    fc.constantFrom('NA', 'x', ''),
    fc.constantFrom<Use>('timing', 'model'),
  )
  .map(([code, row, col, value, use]) => rowIssue(code, row, col, col === 'B' ? 'studyDay' : 'value', value, use));

describe('compactIssues', () => {
  it('compactIssues names exactly the (row, use, code, column, value) cases of its input, each joined run being consecutive rows', () => {
    fc.assert(
      fc.property(fc.array(anyRowIssue, { maxLength: 60 }), (issues) => {
        const key = (i: Issue, row: number): string => `${row}|${i.use}|${i.code}|${i.cell!.replace(/^Data!([A-Z]+).*$/, '$1')}|${i.value}`;
        const want = new Set(issues.map((i) => key(i, i.row!)));
        const got = new Set<string>();
        let entries = 0;
        for (const c of compactIssues(issues)) {
          const last = c.lastRow ?? c.row!;
          expect(last).toBeGreaterThanOrEqual(c.row!);
          expect(c.message.startsWith(c.cell!)).toBe(true);
          if (c.lastRow !== undefined) expect(c.cell).toMatch(new RegExp(`^Data![BC]${c.row!}:[BC]${last}$`));
          for (let r = c.row!; r <= last; r++) got.add(key(c, r));
          entries++;
        }
        expect(got).toEqual(want);
        expect(entries).toBeLessThanOrEqual(issues.length);
      }),
      { numRuns: 300 },
    );
  });

  it('excludedRows counts each left-out row once across overlapping entries (rowsLeftOut)', () => {
    const issues = [rowIssue('blank-value', 5, 'C', 'value', '', 'model'), rowIssue('blank-value', 6, 'C', 'value', '', 'model'), rowIssue('text-in-numeric', 6, 'B', 'studyDay', 'x', 'timing')];
    const list = excludedRows(issues);
    expect(list.map((e) => [e.row, e.lastRow ?? null, e.use])).toEqual([
      [5, 6, 'model'],
      [6, null, 'timing'],
    ]);
    expect(rowsLeftOut(list)).toBe(2); // rows 5 and 6 (exact count)
  });
});
