import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { runAnalysis, type AnalysisSettings } from '../../../src/core/pipeline';
import { daysFromCivil, dayNumberToIso, type CellValue } from '../../../src/core/intake';

// Issue item 5: one visit year mistyped (2205 for 2025, or 9999-12-31) must not move the default cut-off. Invented
// generated trials; day arithmetic from the proleptic Gregorian calendar (exact identity via daysFromCivil); exact
// counts, no tolerance.

const SCHEDULE = [
  { label: 'Day 1', targetDay: 1, before: 0, after: 0 },
  { label: 'Week 4', targetDay: 29, before: 3, after: 3 },
  { label: 'Week 8', targetDay: 57, before: 3, after: 3 },
  { label: 'Week 12', targetDay: 85, before: 3, after: 3 },
];
const SETTINGS: AnalysisSettings = {
  sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded', schedule: SCHEDULE,
  timeUnit: 'week', dfMethod: 'residual', method: 'reml', level: 0.95, scheduledOnly: false, perSubject: false,
  inputLabel: 'invented generated trial', runAt: '2026-01-01T09:00:00.000Z', numericText: 'accept',
};

/** ISO text of a day number counted from 1899-12-30 (intake's day numbers). */
const iso = (day: number): string => dayNumberToIso(day);
const D0 = daysFromCivil(1899, 12, 30);
const day = (y: number, m: number, d: number): number => daysFromCivil(y, m, d) - D0;

/** 24 invented participants randomised one every 3 days from 2025-01-06; visits on target while before 2025-04-10. */
function trial(): CellValue[][] {
  const cells: CellValue[][] = [['USUBJID', 'RANDDT', 'AVISIT', 'ADT', 'AVAL']];
  const stop = day(2025, 4, 10);
  for (let p = 0; p < 24; p++) {
    const ref = day(2025, 1, 6) + 3 * p;
    for (const v of SCHEDULE) {
      const at = ref + v.targetDay - 1;
      if (at <= stop) cells.push([`P${p}`, iso(ref), v.label, iso(at), 50 + p / 10 + v.targetDay / 100]);
    }
  }
  return cells;
}

type Json = { settings: { cutoff: string; cutoffRule: string }; visits: { counts: { onTime: number; missed: number; notYetDue: number } }; notes: string[]; issues: { code: string; cell: string; message: string }[] };
async function json(cells: CellValue[][], extra: Partial<AnalysisSettings> = {}): Promise<Json> {
  const out = await runAnalysis(cells, { ...SETTINGS, ...extra });
  if (!out.ok) throw new Error(out.issues.map((i) => i.message).join('\n'));
  return out.json as unknown as Json;
}

describe('visit dates far outside the data (issue item 5)', () => {
  it('a year typed 2205 for 2025 is warned about at its cell and leaves the default cut-off and every not-yet-due visit as they were', async () => {
    const good = trial();
    const base = await json(good);
    expect(base.settings.cutoff).toBe('2025-04-10');
    expect(base.visits.counts.notYetDue).toBeGreaterThan(20);
    for (const typo of ['2205', '9999']) {
      const bad = good.map((r) => [...r]);
      const last = bad.findIndex((r) => r[0] === 'P0' && r[2] === 'Week 8'); // 2025-03-03
      const when = String(bad[last]![3]);
      bad[last]![3] = typo === '9999' ? '9999-12-31' : `2205${when.slice(4)}`;
      const got = await json(bad);
      expect(got.settings.cutoff, typo).toBe('2025-04-10'); // 2025-04-10 is the latest other date: some visit falls on it
      expect(got.settings.cutoffRule).toBe('latestDate');
      const odd = got.issues.filter((i) => i.code === 'implausible-date');
      expect(odd.map((i) => i.cell)).toEqual([`Visits!D${last + 1}`]);
      expect(odd[0]!.message).toMatch(/after the day of this run \(2026-01-01\); the record is kept, but it is not used to set the default cut-off\. Check the year\.$/);
      expect(got.notes.some((n) => n.includes(`leaving out 1 date far outside the data (Visits!D${last + 1})`))).toBe(true);
      // The same statuses as the clean trial (no not-yet-due visit turns missed), except the mistyped record's own
      // visit: its record lies after the cut-off, so that visit, whose window closed on 2025-03-06, counts as missed.
      expect(got.visits.counts.notYetDue).toBe(base.visits.counts.notYetDue);
      expect(got.visits.counts.missed).toBe(base.visits.counts.missed + 1);
      expect(got.visits.counts.onTime).toBe(base.visits.counts.onTime - 1);
    }
  });

  it('a date more than 180 days after the last window of the latest reference date is flagged even before the day of the run', async () => {
    const cells = trial();
    cells.push(['P0', iso(day(2025, 1, 6)), 'Week 12', '2025-11-20', 50]);
    // Latest reference 2025-03-16 (P23: 2025-01-06 + 69 days); the last window closes at offset 84 + 3 = 87, on
    // 2025-06-11; plus 180 days: 2025-12-08. 2025-11-20 is inside, 2025-12-20 outside (calendar arithmetic, exact).
    expect((await json(cells)).issues.filter((i) => i.code === 'implausible-date')).toEqual([]);
    cells[cells.length - 1]![3] = '2025-12-20';
    const got = await json(cells);
    expect(got.issues.filter((i) => i.code === 'implausible-date').map((i) => i.message)).toEqual([
      `Visits!D${cells.length}: the visit date 2025-12-20 lies after 2025-12-08, more than 180 days after the last scheduled window of the latest reference date; the record is kept, but it is not used to set the default cut-off. Check the year.`,
    ]);
  });

  it('a visit 400 days before its reference date gets a plausibility warning; a given cut-off stays as given', async () => {
    const cells = trial();
    cells.push(['P1', iso(day(2025, 1, 9)), 'Day 1', iso(day(2025, 1, 9) - 400), 49]);
    const got = await json(cells, { cutoff: '2025-04-01' });
    expect(got.settings).toMatchObject({ cutoff: '2025-04-01', cutoffRule: 'given' });
    const odd = got.issues.filter((i) => i.code === 'implausible-date');
    expect(odd.map((i) => i.message)).toEqual([
      `Visits!D${cells.length}: the visit date 2023-12-06 lies more than 180 days before the earliest window of the schedule, counted from this row's reference date 2025-01-09; the record is kept, but it is not used to set the default cut-off. Check the year.`,
    ]);
    expect(got.notes.some((n) => n.includes('far outside the data'))).toBe(false);
  });

  it('for any invented trial with every visit within its window and before the run, nothing is flagged and the cut-off is the latest date', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(fc.tuple(fc.integer({ min: 0, max: 300 }), fc.array(fc.integer({ min: -3, max: 3 }), { minLength: 4, maxLength: 4 })), { minLength: 2, maxLength: 8 }), async (people) => {
        const cells: CellValue[][] = [['USUBJID', 'RANDDT', 'AVISIT', 'ADT', 'AVAL']];
        let latest = -Infinity;
        people.forEach(([start, shifts], p) => {
          const ref = day(2024, 1, 1) + start;
          SCHEDULE.forEach((v, k) => {
            const at = ref + v.targetDay - 1 + Math.max(-v.before, Math.min(v.after, shifts[k]!));
            latest = Math.max(latest, at);
            cells.push([`P${p}`, iso(ref), v.label, iso(at), 40 + p + k]);
          });
        });
        const got = await json(cells);
        expect(got.issues.filter((i) => i.code === 'implausible-date')).toEqual([]);
        expect(got.settings.cutoff).toBe(iso(latest));
      }),
      { numRuns: 40 },
    );
  });
});
