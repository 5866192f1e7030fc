import { mkdir, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main, type CliOutput } from '../../src/cli/main';

// The invented demo trial (demo/README.md) rewritten in the date forms clinical systems write. The three files hold
// the same days, so the whole run must agree exactly: same counts, same excluded rows, same model to the last bit
// (exact identity: the engine sees the same day numbers, so no tolerance is needed).
const DEMO_DATA = join(__dirname, '..', '..', 'demo', 'egfr-visits.csv');
const DEMO_SCHEDULE = join(__dirname, '..', '..', 'demo', 'egfr-schedule.csv');
const MONTHS = ['JAN', 'FEB', 'MAR', 'APR', 'MAY', 'JUN', 'JUL', 'AUG', 'SEP', 'OCT', 'NOV', 'DEC'];
const DATE_COLUMNS = ['ADT', 'RANDDT', 'EOSDT'];

let dir: string;
let runs = 0;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'longipane-dates-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

/** The demo CSV with every ISO date of ADT and RANDDT rewritten by `form` (text only: the impossible 2025-02-30 at E304
 * stays impossible in every form). The demo has no quoted fields, so a split on commas is exact. */
async function rewrite(form: (y: string, m: string, d: string) => string): Promise<string> {
  const lines = (await readFile(DEMO_DATA, 'utf8')).split('\n');
  const header = lines[0]!.split(',');
  const cols = DATE_COLUMNS.map((h) => header.indexOf(h));
  expect(cols.every((c) => c >= 0)).toBe(true);
  return lines
    .map((line, i) => {
      if (i === 0 || line === '') return line;
      const cells = line.split(',');
      for (const c of cols) {
        const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(cells[c]!);
        if (m) cells[c] = form(m[1]!, m[2]!, m[3]!);
      }
      return cells.join(',');
    })
    .join('\n');
}

async function runJson(file: string, ...extra: string[]): Promise<Record<string, unknown>> {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliOutput = { out: (l) => out.push(l), err: (l) => err.push(l) };
  const json = join(dir, `results-${++runs}.json`);
  const code = await main(
    ['analyze', '--data', file, '--schedule', DEMO_SCHEDULE, '--json', json, '--unblinded', '--reference-arm', 'Placebo', '--cutoff', '2026-03-31', ...extra],
    io,
    () => new Date('2026-04-01T09:00:00Z'),
  );
  expect(code, err.join('\n')).toBe(0);
  return JSON.parse(await readFile(json, 'utf8')) as Record<string, unknown>;
}

/** What must agree: everything but the input's name and fingerprint, the wording of reasons that quote the date text,
 * the date-order setting and the note saying how numeric dates were read. */
function comparable(json: Record<string, unknown>): unknown {
  const input = json.input as { rows: number; subjects: number; usedForTiming: number; usedForModel: number; excluded: { row: number; cell: string; use: string }[] };
  const settings = { ...(json.settings as Record<string, unknown>), dateOrder: undefined };
  const issues = (json.issues as { code: string; cell: string; use: string }[]).map((i) => [i.code, i.cell, i.use]);
  return {
    rows: input.rows,
    subjects: input.subjects,
    usedForTiming: input.usedForTiming,
    usedForModel: input.usedForModel,
    excluded: input.excluded.map((e) => [e.row, e.cell, e.use]),
    settings,
    visits: json.visits,
    model: json.model,
    issues,
  };
}

describe('the demo in other date forms', () => {
  it('the demo with day-month-name-year dates, and with day/month/year dates and --date-order dmy, gives exactly the counts and model of the ISO file', async () => {
    // Same file name in other folders, so every cell address (sheet = file name) is the same as for the ISO file.
    await mkdir(join(dir, 'named'));
    await mkdir(join(dir, 'dayfirst'));
    const named = join(dir, 'named', 'egfr-visits.csv');
    const dayFirst = join(dir, 'dayfirst', 'egfr-visits.csv');
    await writeFile(named, await rewrite((y, m, d) => `${d}${MONTHS[Number(m) - 1]!}${y}`));
    await writeFile(dayFirst, await rewrite((y, m, d) => `${d}/${m}/${y}`));
    expect((await readFile(named, 'utf8')).split('\n')[1]).toBe('KFT-01-001,Site 01,Placebo,Baseline,12JAN2025,12JAN2025,48.4,20DEC2025,COMPLETED,');
    expect((await readFile(dayFirst, 'utf8')).split('\n')[1]).toBe('KFT-01-001,Site 01,Placebo,Baseline,12/01/2025,12/01/2025,48.4,20/12/2025,COMPLETED,');

    const iso = await runJson(DEMO_DATA);
    const fromNamed = await runJson(named);
    const fromDayFirst = await runJson(dayFirst, '--date-order', 'dmy');
    expect(iso.model).not.toBeNull();
    expect(comparable(fromNamed)).toEqual(comparable(iso));
    expect(comparable(fromDayFirst)).toEqual(comparable(iso));
    expect((fromDayFirst.settings as { dateOrder: unknown }).dateOrder).toBe('dmy');
    // Without the setting the columns decide day first from days over 12, with the same results and a note saying so.
    const decided = await runJson(dayFirst);
    expect(comparable(decided)).toEqual(comparable(iso));
    expect(decided.notes).toContainEqual(expect.stringMatching(/^Dates in column "ADT" \(visit date\) with the day and month as numbers were read as day\/month\/year, the only reading of values such as "16\/03\/2025"/));
  }, 60_000);

  it('a CSV whose dates read both ways stops with the column named and writes a JSON that says why (ok false, input, issues)', async () => {
    const file = join(dir, 'ambiguous.csv');
    await writeFile(file, 'USUBJID,ADT,AVAL\nK-1,03/04/2025,60\nK-1,05/06/2025,61\nK-2,03/04/2025,58\nK-2,07/08/2025,59\n');
    const err: string[] = [];
    const json = join(dir, 'ambiguous.json');
    const code = await main(['analyze', '--data', file, '--schedule', DEMO_SCHEDULE, '--json', json], { out: () => undefined, err: (l) => err.push(l) });
    expect(code).toBe(1);
    expect(err.join('\n')).toMatch(/ambiguous!B1: Column "ADT" \(visit date\) writes the day and month as numbers.*"03\/04\/2025", "05\/06\/2025", "07\/08\/2025".*--date-order dmy or --date-order mdy/);
    const written = JSON.parse(await readFile(json, 'utf8')) as { ok: boolean; input: Record<string, unknown>; issues: { code: string; cell: string }[] };
    expect(written.ok).toBe(false);
    expect(written.input).toMatchObject({ label: 'ambiguous.csv (A1:C5), read as UTF-8', sheet: 'ambiguous', topLeft: 'A1', rows: 4 });
    expect(written.issues.map((i) => [i.code, i.cell])).toEqual([['date-order-unknown', 'ambiguous!B1']]);
  });
});
