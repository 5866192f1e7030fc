import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { capJsonText, CELL_TEXT_LIMIT, JSON_TEXT_CAP, readTable, type CellValue, type IntakeOptions } from '../../../src/core/intake';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';

// Issue item 9 (intake part): text longer than a spreadsheet cell holds is warned about at its cell, and the JSON keeps
// it whole up to JSON_TEXT_CAP. The limit 32,767 is the published per-cell limit of current spreadsheet programs
// (common practice). Exact lengths; no tolerance.

const OPTIONS: IntakeOptions = { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded' };

describe('long text (issue item 9)', () => {
  it('readTable warns at every mapped cell and header longer than 32,767 characters, keeps the row, and ignores unmapped columns', () => {
    const long = 'x'.repeat(CELL_TEXT_LIMIT + 1);
    const atLimit = 'y'.repeat(CELL_TEXT_LIMIT);
    const cells: CellValue[][] = [
      ['USUBJID', 'ADY', 'AVAL', 'SITEID', `Note${long}`],
      [long, 1, 60, atLimit, long],
      ['K-2', 8, 61, long, long],
    ];
    const r = readTable(cells, OPTIONS);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.issues.map((i) => [i.code, i.cell, i.role, i.use, i.value.length])).toEqual([
      ['long-text', 'Visits!E1', null, null, CELL_TEXT_LIMIT + 5],
      ['long-text', 'Visits!A2', 'subject', null, CELL_TEXT_LIMIT + 1],
      ['long-text', 'Visits!D3', 'site', null, CELL_TEXT_LIMIT + 1],
    ]);
    expect(r.issues[1]!.message).toBe(
      'Visits!A2: the participant holds 32,768 characters, more than a spreadsheet cell can hold (32,767): the report workbook shows it cut, and the results JSON keeps it whole up to 1,048,576 characters. The row is kept.',
    );
    expect(r.table.subject[0]).toBe(long); // kept whole in the table
    expect(Array.from(r.table.usableTiming)).toEqual([1, 1]);
  });

  it('a sentence shows a long value shortened, while the issue keeps the value whole', () => {
    const r = readTable([['USUBJID', 'ADY', 'AVAL'], ['K-1', 1, 'z'.repeat(50_000)]], { ...OPTIONS, numericText: 'accept' });
    const issue = r.issues.find((i) => i.code === 'text-in-numeric')!;
    expect(issue.value).toHaveLength(50_000);
    expect(issue.message).toBe(`Visits!C2: "${'z'.repeat(200)}…" (50,000 characters) is not a number, and the value must be a number, so the row is left out of the model.`);
  });

  it('capJsonText keeps strings up to the cap unchanged and cuts longer ones to the cap plus a marker giving the whole length', () => {
    const text = fc.string({ maxLength: 12 });
    const json: fc.Arbitrary<unknown> = fc.letrec((tie) => ({
      value: fc.oneof({ depthSize: 'small' }, text, fc.integer(), fc.boolean(), fc.constant(null), fc.array(tie('value'), { maxLength: 4 }), fc.dictionary(text, tie('value'), { maxKeys: 4 })),
    })).value;
    fc.assert(
      fc.property(json, fc.integer({ min: 0, max: 8 }), (v, cap) => {
        const before = JSON.stringify(v);
        const out = capJsonText(v, cap);
        expect(JSON.stringify(v)).toBe(before); // the input is never modified
        const check = (a: unknown, b: unknown): void => {
          if (typeof a === 'string') {
            expect(b).toBe(a.length <= cap ? a : `${a.slice(0, cap)} … [cut: ${a.length.toLocaleString('en-US')} characters in all]`);
          } else if (a !== null && typeof a === 'object') {
            expect(Object.keys(b as object)).toEqual(Object.keys(a));
            for (const k of Object.keys(a)) check((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]);
          } else expect(b).toBe(a);
        };
        check(v, out);
      }),
      { numRuns: 300 },
    );
  });

  it('the results JSON keeps a 40,000-character site name whole and cuts a 1,100,000-character one at 1,048,576 characters', async () => {
    const mid = 's'.repeat(40_000);
    const huge = 'h'.repeat(1_100_000);
    const cells: CellValue[][] = [['USUBJID', 'SITEID', 'ADY', 'AVAL']];
    for (let p = 0; p < 4; p++) for (const day of [1, 8]) cells.push([`P${p}`, p < 2 ? mid : huge, day, 50 + p + day / 10]);
    const settings: AnalysisSettings = {
      sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded',
      schedule: [{ label: 'Day 1', targetDay: 1, before: 0, after: 0 }, { label: 'Week 1', targetDay: 8, before: 1, after: 1 }],
      timeUnit: 'week', dfMethod: 'residual', method: 'reml', level: 0.95, scheduledOnly: false, perSubject: false,
      inputLabel: 'invented', runAt: '2026-01-01T00:00:00.000Z',
    };
    const out = await runAnalysis(cells, settings);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const strings: string[] = [];
    JSON.stringify(out.json, (_k, v: unknown) => (typeof v === 'string' && v.length > 30_000 ? (strings.push(v), '') : v));
    expect(strings).toContain(mid);
    expect(strings.every((s) => s.length <= JSON_TEXT_CAP + 60)).toBe(true);
    expect(strings).toContain(`${'h'.repeat(JSON_TEXT_CAP)} … [cut: 1,100,000 characters in all]`);
  });
});
