import { describe, expect, it } from 'vitest';
import { PipelineUsageError, runAnalysis } from '../../../src/core/pipeline';
import type { AnalysisSettings, Stage } from '../../../src/core/pipeline';
import type { CellValue } from '../../../src/core/intake/types';

/** Invented: four subjects on two sites, visits at study days 1, 29 and 57 (dates as 1900-system serials). */
const CELLS: CellValue[][] = [
  ['Patient', 'Centre', 'Group', 'Visit', 'Visit date', 'Result'],
  ['A', 'North', 'X', 'Day 1', 45663, 60],
  ['A', 'North', 'X', 'Day 29', 45691, 59],
  ['A', 'North', 'X', 'Day 57', 45719, 58],
  ['B', 'North', 'Y', 'Day 1', 45664, 52],
  ['B', 'North', 'Y', 'Day 29', 45700, 'pending'],
  ['B', 'North', 'Y', 'Day 57', 45722, 53],
  ['C', 'South', 'X', 'Day 1', 45665, 48],
  ['C', 'South', 'X', 'Day 29', 45693, 47],
  ['D', 'South', 'Y', 'Day 1', 45666, 51],
  ['D', 'South', 'Y', 'Day 29', 45694, 51.5],
  ['D', 'South', 'Y', 'Day 57', 45722, 52],
];

const SETTINGS: AnalysisSettings = {
  sheet: 'Visits',
  topLeft: 'A1',
  dateSystem: 1900,
  mode: 'blinded',
  schedule: [
    { label: 'Day 1', targetDay: 1, before: 0, after: 0 },
    { label: 'Day 29', targetDay: 29, before: 3, after: 3 },
    { label: 'Day 57', targetDay: 57, before: 3, after: 3 },
  ],
  cutoff: '2025-03-31',
  timeUnit: 'week',
  dfMethod: 'kenward-roger',
  method: 'reml',
  level: 0.95,
  scheduledOnly: false,
  perSubject: false,
  inputLabel: 'invented test data',
  runAt: '2026-01-01T00:00:00.000Z',
};

describe('runAnalysis', () => {
  it('reports the four stages in order and yields to the front end before each', async () => {
    const events: string[] = [];
    const out = await runAnalysis(CELLS, SETTINGS, {
      onStage: (s: Stage) => events.push(s),
      yieldControl: async () => {
        events.push('yield');
      },
    });
    expect(out.ok).toBe(true);
    expect(events).toEqual(['reading', 'yield', 'windowing', 'yield', 'fitting', 'yield', 'writing', 'yield']);
  });

  it('stops with cancelled: true and no issues when the signal is aborted between stages', async () => {
    const signal = { aborted: false };
    const seen: Stage[] = [];
    const out = await runAnalysis(CELLS, SETTINGS, {
      signal,
      onStage: (s) => {
        seen.push(s);
        if (s === 'windowing') signal.aborted = true;
      },
    });
    expect(out).toEqual({ ok: false, issues: [], cancelled: true });
    expect(seen).toEqual(['reading', 'windowing']);
  });

  it('returns the blocking issues when the data cannot be read, and never modifies the cells', async () => {
    const cells = CELLS.map((r) => [...r]);
    const before = JSON.stringify(cells);
    const out = await runAnalysis(cells, { ...SETTINGS, mapping: { date: 4, value: 5, covariates: [] } });
    expect(out.ok).toBe(false);
    expect(out.issues.map((i) => i.code)).toContain('no-subject-column');
    expect(JSON.stringify(cells)).toBe(before);
  });

  it('stops with an error when no record is left on or before the cut-off, keeping the row warnings', async () => {
    const out = await runAnalysis(CELLS, { ...SETTINGS, cutoff: '2024-12-31' });
    expect(out.ok).toBe(false);
    const errors = out.issues.filter((i) => i.severity === 'error');
    expect(errors.map((i) => [i.code, i.message])).toEqual([['no-usable-rows', 'No record is dated on or before the data cut-off 2024-12-31, so there is nothing to analyse.']]);
    expect(out.issues.filter((i) => i.code === 'after-cutoff' && i.use === 'timing')).toHaveLength(11);
  });

  it('throws PipelineUsageError for settings no front end should send: an empty schedule or a cut-off that is no date', async () => {
    await expect(runAnalysis(CELLS, { ...SETTINGS, schedule: [] })).rejects.toThrow(PipelineUsageError);
    await expect(runAnalysis(CELLS, { ...SETTINGS, cutoff: '2025-02-30' })).rejects.toThrow(/runAnalysis: the cut-off must be a real date written YYYY-MM-DD \(2025-02-30\)/);
  });

  it('notes that a calendar cut-off cannot apply to study-day data, and uses each subject’s last record instead', async () => {
    const cells: CellValue[][] = [['USUBJID', 'ADY', 'AVAL'], ['A', 1, 5], ['A', 29, 6], ['B', 1, 4], ['B', 30, 4.5], ['C', 1, 7], ['C', 57, 6]];
    const out = await runAnalysis(cells, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    expect(out.json.notes).toEqual(['The cut-off 2025-03-31 is a calendar date, but the data carry study days only; each participant\'s last record serves as the cut-off instead.']);
    expect((out.json.settings as { cutoffRule: unknown }).cutoffRule).toBe('eachSubjectsLastRecord');
  });

  it('lists each excluded row once per use with its cell address, and counts rows used for timing and the model', async () => {
    const out = await runAnalysis(CELLS, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    expect(out.excluded).toEqual([{ row: 6, cell: 'Visits!F6', use: 'model', reason: expect.stringMatching(/"pending" is not a number/) }]);
    const input = out.json.input as Record<string, unknown>;
    expect(input).toMatchObject({ rows: 11, subjects: 4, usedForTiming: 11, usedForModel: 10 });
  });

  it('keeps the visit-timing results when the model cannot be fitted (no value column): model null and a reason', async () => {
    const cells = CELLS.map((r) => r.slice(0, 5));
    const out = await runAnalysis(cells, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    expect(out.json.model).toBeNull();
    expect(out.json.modelNote).toMatch(/value/);
    expect(out.issues.map((i) => i.code)).toContain('no-value-column');
    expect((out.json.visits as { counts: Record<string, number> }).counts.onTime).toBeGreaterThan(0);
  });

  it('gives JSON visit counts with exactly the eight status keys, matching a count by hand', async () => {
    const out = await runAnalysis(CELLS, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    // By hand: B's Day 29 is study day 37 (late, window 26–32); C's Day 57 has no record and its window closed on
    // day 60 = 2025-03-08, before the cut-off 2025-03-31, so it is missed; the other ten records are on time.
    expect((out.json.visits as { counts: unknown }).counts).toEqual({ onTime: 10, early: 0, late: 1, missed: 1, notYetDue: 0, afterExit: 0, extra: 0, repeat: 0 });
  });

  it('names no arm anywhere in blinded mode and reads the arms in unblinded mode with the chosen reference first', async () => {
    const blinded = await runAnalysis(CELLS, { ...SETTINGS, mapping: { subject: 0, site: 1, arm: 2, visit: 3, date: 4, value: 5, covariates: [] } });
    if (!blinded.ok) throw new Error('run failed');
    const text = JSON.stringify(blinded.json) + JSON.stringify(blinded.sheets);
    expect(text).not.toMatch(/"X"|"Y"|Group/);
    const unblinded = await runAnalysis(CELLS, {
      ...SETTINGS,
      mode: 'unblinded',
      referenceArm: 'Y',
      mapping: { subject: 0, site: 1, arm: 2, visit: 3, date: 4, value: 5, covariates: [] },
    });
    if (!unblinded.ok) throw new Error('run failed');
    expect((unblinded.json.settings as { referenceArm: unknown }).referenceArm).toBe('Y');
  });

  it('refuses a chosen reference arm that is not in the data, naming the arms there (a silent fallback would flip the sign of every difference)', async () => {
    const out = await runAnalysis(CELLS, {
      ...SETTINGS,
      mode: 'unblinded',
      referenceArm: 'Z',
      mapping: { subject: 0, site: 1, arm: 2, visit: 3, date: 4, value: 5, covariates: [] },
    });
    expect(out.ok).toBe(false);
    const issue = out.issues.find((i) => i.code === 'unknown-reference-arm');
    expect(issue).toMatchObject({ severity: 'error', role: 'arm', value: 'Z' });
    expect(issue?.message).toBe(
      'The reference arm "Z" is not among the arms in the data ("X", "Y"); choose one of them, since the reference arm decides the sign of every treatment difference.',
    );
  });

  it('notes how many days a given cut-off lies after the latest visit date, since a mistyped year makes every open window missed', async () => {
    // CELLS' latest date is serial 45722 = 2025-03-06 (1900 system; 45658 = 2025-01-01, ECMA-376 Part 1 §18.17.4,
    // plus 64 days by hand count: 31 in January, 28 in February, 5 in March). 2025-03-31 is 25 days later.
    const out = await runAnalysis(CELLS, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    expect(out.json.notes).toEqual([
      'The cut-off 2025-03-31 is 25 days after the latest visit date in the data (2025-03-06); every visit whose window closed before it without a record counts as missed.',
    ]);
    const onTheDay = await runAnalysis(CELLS, { ...SETTINGS, cutoff: '2025-03-06' });
    if (!onTheDay.ok) throw new Error('run failed');
    expect(onTheDay.json.notes).toEqual([]);
  });

  it('all values identical: no model, the reason in modelNote, a warning, and a model sheet that says why (regression: "converged" with SE 0 and p = 0)', async () => {
    const cells = CELLS.map((r, i) => (i === 0 ? r : [...r.slice(0, 5), 50]));
    const out = await runAnalysis(cells, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    expect(out.json.model).toBeNull();
    expect(out.json.modelNote).toBe('all 11 values are equal (50), so there is no variation for the model to describe');
    expect(out.issues.filter((i) => i.code === 'model-not-fitted').map((i) => i.message)).toEqual([
      'The model could not be fitted: all 11 values are equal (50), so there is no variation for the model to describe. The visit-timing results stand.',
    ]);
    const sheet = out.sheets.find((s) => s.name === 'Model results');
    const texts = sheet?.blocks.flatMap((b) => (b.kind === 'paragraph' ? [b.text] : [])) ?? [];
    expect(texts[1]).toBe('No model was fitted: all 11 values are equal (50), so there is no variation for the model to describe. No estimates, intervals or p-values are shown, because any would be wrong. The visit-timing sheets are not affected.');
    expect(sheet?.blocks.some((b) => b.kind === 'table')).toBe(false);
  });

  it('one participant: the visit timing stands, and the model sheet says what one participant cannot give (no between-participant variance)', async () => {
    const cells = CELLS.filter((r, i) => i === 0 || r[0] === 'A');
    const out = await runAnalysis(cells, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    expect(out.json.model).toBeNull();
    expect(out.json.modelNote).toMatch(/^only one participant has measurements the model can use\. .*no between-participant variance to estimate/);
    expect((out.json.visits as { counts: Record<string, number> }).counts.onTime).toBe(3);
  });

  it('the results JSON never holds p = 0, even when the tail probability underflows (the documented floor 2^-1074)', async () => {
    // Invented: 100 subjects on study days 1, 29 and 57, values rising 1,000 per week with a wobble of order 1, so the
    // time slope's t is in the tens of thousands on ~300 df and its tail probability underflows.
    const cells: CellValue[][] = [['USUBJID', 'ADY', 'AVAL']];
    for (let i = 0; i < 100; i++) for (const d of [1, 29, 57]) cells.push([`S${i}`, d, 1000 * ((d - 1) / 7) + ((i * 7 + d) % 5) - 2 + (i % 4)]);
    const out = await runAnalysis(cells, SETTINGS);
    if (!out.ok) throw new Error('run failed');
    const model = out.json.model as { fixedEffects: { term: string; p: number }[] } | null;
    expect(model).not.toBeNull();
    for (const f of model!.fixedEffects) expect(f.p).toBeGreaterThan(0);
    expect(model!.fixedEffects.find((f) => f.term === 'Time')!.p).toBeLessThan(1e-100);
  });
});

describe('runAnalysis with a cut-off given as a study day (study-day data)', () => {
  // Invented: two subjects with study days only. Day 29's window is study days 26..32 (offsets 25..31).
  const STUDY_DAY_CELLS: CellValue[][] = [
    ['USUBJID', 'AVISIT', 'ADY', 'AVAL'],
    ['A', 'Day 1', 1, 60],
    ['A', 'Day 29', 29, 59],
    ['B', 'Day 1', 1, 52],
  ];
  const noCutoff: AnalysisSettings = Object.fromEntries(Object.entries(SETTINGS).filter(([k]) => k !== 'cutoff')) as unknown as AnalysisSettings;
  const counts = async (extra: Partial<AnalysisSettings>): Promise<Record<string, number>> => {
    const out = await runAnalysis(STUDY_DAY_CELLS, { ...noCutoff, ...extra });
    if (!out.ok) throw new Error('run stopped');
    return (out.json.visits as { counts: Record<string, number> }).counts;
  };

  it("without a cut-off, each participant's own last record serves: B's Day 29 is not yet due", async () => {
    expect(await counts({})).toMatchObject({ onTime: 3, missed: 0, notYetDue: 3 });
  });

  it('a cut-off on study day 32 (the window closes that day) keeps Day 29 not yet due; study day 33 makes it missed', async () => {
    expect(await counts({ cutoffDay: 32 })).toMatchObject({ missed: 0 });
    expect(await counts({ cutoffDay: 33 })).toMatchObject({ missed: 1 });
  });

  it('refuses a cut-off study day of 0 (there is no study day 0) as misuse', async () => {
    await expect(runAnalysis(STUDY_DAY_CELLS, { ...noCutoff, cutoffDay: 0 })).rejects.toThrow(PipelineUsageError);
  });
});
