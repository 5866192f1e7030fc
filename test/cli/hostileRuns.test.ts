import { mkdtemp, readdir, rm, utimes, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import type { CliOutput } from '../../src/cli/main';
import { groupLines, groupWarnings, leftOutOf, otherWarnings } from '../../src/cli/groupWarnings';
import { removeLiveTemporaries, removeStaleTemporaries, STALE_AFTER_MS, writeFilesAtomic } from '../../src/cli/atomicWrite';
import { makeZip, sheetXml, workbookParts } from '../support/zipFixture';

let d: string;
beforeAll(async () => {
  d = await mkdtemp(join(tmpdir(), 'longipane-hostile-'));
  await writeFile(join(d, 'schedule.csv'), 'visit,target_day,days_before,days_after\nBaseline,1,0,0\nWeek 1,8,2,2\n');
});
afterAll(async () => {
  await rm(d, { recursive: true, force: true });
});

async function run(...argv: string[]): Promise<{ code: number; out: string[]; err: string[] }> {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliOutput = { out: (l) => out.push(l), err: (l) => err.push(l) };
  const code = await main(argv, io, () => new Date('2026-04-01T09:00:00Z'));
  return { code, out, err };
}
const analyze = (data: string, ...more: string[]): ReturnType<typeof run> => run('analyze', '--data', join(d, data), '--schedule', join(d, 'schedule.csv'), ...more);

describe('groupWarnings', () => {
  it('groups by kind with a count and the first cells, counting a cell once per kind, in one pass (issue item 2)', () => {
    const n = 300_000;
    const items = Array.from({ length: n }, (_, k) => ({ code: 'blank', role: 'value', cell: `S!C${k + 2}`, message: `S!C${k + 2}: blank.` }));
    const groups = groupWarnings([...items, ...items, { code: 'other', role: null, cell: null, message: 'whole range' }]);
    expect(groups.map((g) => g.count)).toEqual([n, 1]);
    expect(groupLines(groups)).toEqual(['  S!C2: blank.', '    … and 299,999 more like it: S!C3, S!C4, S!C5, S!C6, ….', '  whole range']);
  });
});

describe('leftOutOf', () => {
  it('lists each left-out row once per use under its first warning, so the groups add up to the count of rows', () => {
    const n = 200_000;
    const w = (code: string, row: number, use: 'timing' | 'model' | null, col = 'C') =>
      ({ code, role: 'value', severity: 'warning', row, use, cell: `S!${col}${row}`, message: `S!${col}${row}: ${code}.` });
    const issues = [
      // every row: a blank value (model); even rows also a bad date, for both uses, so those rows carry two model warnings
      ...Array.from({ length: n }, (_, k) => w('blank', k + 2, 'model')),
      ...Array.from({ length: n / 2 }, (_, k) => w('date', 2 * k + 2, 'timing', 'B')),
      ...Array.from({ length: n / 2 }, (_, k) => w('date', 2 * k + 2, 'model', 'B')),
      w('kept', 5, null), // a warning that keeps its row
      { code: 'stop', role: null, severity: 'error', row: null, use: null, cell: null, message: 'stop.' },
    ];
    const timing = leftOutOf(issues, 'timing');
    const model = leftOutOf(issues, 'model');
    expect(timing.rows).toBe(n / 2);
    expect(model.rows).toBe(n);
    // model: each row once, under the first warning that names it (blank value), never again under the bad date
    expect(model.groups.map((g) => [g.first.code, g.count])).toEqual([['blank', n]]);
    expect(timing.groups.map((g) => [g.first.code, g.count])).toEqual([['date', n / 2]]);
    for (const r of [timing, model]) expect(r.groups.reduce((k, g) => k + g.count, 0)).toBe(r.rows);
    expect(otherWarnings(issues.filter((i) => i.severity === 'warning')).map((i) => i.code)).toEqual(['kept']);
  });
});

describe('longipane analyze on hostile and careless files', () => {
  it('prints the warnings that explain a stop on exit 1, grouped (issue item 11)', async () => {
    await writeFile(join(d, 'na.csv'), `USUBJID,ADY,AVAL\n${'NA,NA,NA\n'.repeat(500)}`);
    const r = await analyze('na.csv');
    expect(r.code).toBe(1);
    const err = r.err.join('\n');
    expect(err).toMatch(/No data row has both a participant and a valid visit date or study day/);
    expect(err).toMatch(/The warnings found before it stopped \(1,000, grouped by kind\):/);
    expect(err).toMatch(/na!B2: "NA" is not a number.*\n {4}… and 499 more like it: na!B3, na!B4, na!B5, na!B6, …\./);
  });

  it('reads a CSV with mixed line ends without merging records and warns, with the cell, about extra fields (issue item 6)', async () => {
    const rows = ['USUBJID,ADY,AVAL', ...Array.from({ length: 120 }, (_, k) => `S${k % 40},${k < 40 ? 1 : 8},${50 + (k % 7)}`)];
    rows[10] += ',stray';
    await writeFile(join(d, 'mixed.csv'), rows.map((r, k) => r + ['\n', '\r\n', '\r'][k % 3]).join(''));
    const r = await analyze('mixed.csv', '--json', join(d, 'mixed.json'));
    expect(r.code).toBe(0);
    expect(r.out.join('\n')).toMatch(/mixed!D11: 1 row has more fields than the header \(3\): D11\./);
    expect(r.out.join('\n')).toMatch(/Rows: 120 \(120 used for visit timing/);
  });

  it('names a stray invalid UTF-8 byte\'s cell and records the encoding used (issue item 7)', async () => {
    const enc = (s: string): number[] => [...new TextEncoder().encode(s)];
    const bytes = Uint8Array.from([...enc('USUBJID,ADY,AVAL,SITEID\nS1,1,50,Zürich\nS1,8,51,Zürich\nS2,1,52,Bern'), 0xff, ...enc('\nS2,8,53,Bern\n')]);
    await writeFile(join(d, 'stray.csv'), bytes);
    const r = await analyze('stray.csv', '--json', join(d, 'stray.json'));
    expect(r.code).toBe(0);
    expect(r.out.join('\n')).toMatch(/stray!D4: the file is UTF-8 with 1 invalid byte sequence/);
    const json = JSON.parse(await (await import('node:fs/promises')).readFile(join(d, 'stray.json'), 'utf8')) as { input: { label: string }; notes: string[] };
    expect(json.input.label).toMatch(/, read as UTF-8$/);
    expect(json.notes[0]).toMatch(/^stray!D4: the file is UTF-8/);
  });

  it('gives a damaged workbook one plain message and exit 2, with no library text (issue item 12)', async () => {
    const good = makeZip(workbookParts(sheetXml([['A1', 'USUBJID']])));
    await writeFile(join(d, 'cut.xlsx'), good.subarray(0, good.length - 30));
    const r = await analyze('cut.xlsx');
    expect(r.code).toBe(2);
    expect(r.err).toEqual([expect.stringMatching(/^longipane: ".*cut\.xlsx": The file is damaged: its zip directory is missing/) as unknown]);
  });

  it('refuses a workbook with a stray value at XFD1048576 quickly, naming the cell, with exit 2 (issue item 1)', async () => {
    await writeFile(join(d, 'far.xlsx'), makeZip(workbookParts(sheetXml([['A1', 'USUBJID'], ['A2', 'S1'], ['XFD1048576', 1]]))));
    const r = await analyze('far.xlsx');
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/the far cell is XFD1048576/);
  });

  it('runs a 120-row workbook with a stray value at A1048576 to the end with one line for the blank rows, and lists them as one span per use (issue item 2)', async () => {
    const cells: [string, string | number][] = [['A1', 'USUBJID'], ['B1', 'ADY'], ['C1', 'AVAL']];
    for (let i = 2; i <= 121; i++) cells.push([`A${i}`, `S${i % 30}`], [`B${i}`, 1 + 7 * (i % 2)], [`C${i}`, i / 3]);
    await writeFile(join(d, 'tall.xlsx'), makeZip(workbookParts(sheetXml([...cells, ['A1048576', 'stray']]))));
    const r = await analyze('tall.xlsx', '--json', join(d, 'tall.json'), '--out', join(d, 'tall-report.xlsx'));
    expect(r.code).toBe(0);
    const out = r.out.join('\n');
    expect(out).toMatch(/Data!A122: 1,048,454 blank rows are skipped \(worksheet rows 122–1,048,575\)/);
    const json = JSON.parse(await (await import('node:fs/promises')).readFile(join(d, 'tall.json'), 'utf8')) as { input: { excluded: { row: number; lastRow?: number; use: string }[] }; issues: unknown[] };
    expect(json.input.excluded.filter((e) => e.row === 122)).toMatchObject([{ lastRow: 1_048_575, use: 'timing' }, { lastRow: 1_048_575, use: 'model' }]);
    expect(json.issues.length).toBeLessThan(10);
    // The summary counts the 1,048,454 blank rows and the stray cell's row (no study day) under each use, as the
    // excluded-row list does, with one line for the blank rows (no "… more like it" after a summary).
    expect(out).toMatch(/Rows left out of visit timing: 1,048,455; of the model: 1,048,455/);
    expect(out).not.toMatch(/Other warnings[^\n]*\n[^\n]*blank rows/);
    expect(out).not.toMatch(/1,048,453 more like it/);
  });

  it('stops on two columns headed USUBJID with a warning naming both cells, and runs once --map picks one by its letter (issue item 8)', async () => {
    const rows = ['USUBJID,ADY,AVAL,USUBJID', ...Array.from({ length: 8 }, (_, k) => `S${k % 4},${k < 4 ? 1 : 8},${50 + k},S${k % 4}`)];
    await writeFile(join(d, 'twice.csv'), `${rows.join('\n')}\n`);
    const stopped = await analyze('twice.csv');
    expect(stopped.code).toBe(1);
    expect(stopped.err.join('\n')).toMatch(/twice!D1: columns twice!A1 and twice!D1 are both headed "USUBJID", so neither is used as the participant .*--map participant="column D"/);
    const ran = await analyze('twice.csv', '--map', 'subject=column D');
    expect(ran.code).toBe(0);
    const twice = await analyze('twice.csv', '--map', 'value=AVAL', '--map', 'value=ADY');
    expect(twice.code).toBe(2);
    expect(twice.err[0]).toBe('longipane: --map gives the role value twice (value=AVAL and value=ADY); give each role once.');
  });

  it('answers `analyze --help` with the help text and exit 0 (issue item 13)', async () => {
    const r = await run('analyze', '--help');
    expect(r.code).toBe(0);
    expect(r.out.join('\n')).toMatch(/longipane analyze --data FILE --schedule FILE/);
  });

  it('says plainly that an empty --json value or a system folder cannot be written (issue item 13)', async () => {
    await writeFile(join(d, 'ok.csv'), 'USUBJID,ADY,AVAL\nS1,1,50\nS1,8,51\nS2,1,52\nS2,8,53\n');
    const empty = await analyze('ok.csv', '--json', '');
    expect(empty.code).toBe(2);
    expect(empty.err[0]).toBe('longipane: --json needs a value; it was given an empty one.');
    // /proc exists on Linux and takes no new files (a read-only system folder, whoever runs the test).
    const sys = await analyze('ok.csv', '--json', '/proc/results.json');
    expect(sys.code).toBe(2);
    expect(sys.err.join('\n')).toMatch(/Cannot write "\/proc\/results\.json": its folder does not accept new files \(a system or read-only folder\)/);
  });
});

describe('temporary output files (issue item 14)', () => {
  it('removes stale temporaries of its own pattern older than a day, and leaves others alone', async () => {
    const out = join(d, 'tmpdir');
    await (await import('node:fs/promises')).mkdir(out);
    const stale = '.report.xlsx.4242-0123abcd.tmp';
    const fresh = '.report.xlsx.4243-89abcdef.tmp';
    const foreign = '.report.xlsx.tmp';
    for (const f of [stale, fresh, foreign]) await writeFile(join(out, f), 'x');
    const old = (Date.now() - STALE_AFTER_MS - 60_000) / 1000;
    await utimes(join(out, stale), old, old);
    await utimes(join(out, foreign), old, old);
    await writeFilesAtomic([{ target: join(out, 'report.json'), data: '{}' }]);
    expect((await readdir(out)).sort()).toEqual([fresh, foreign, 'report.json'].sort());
    await removeStaleTemporaries(out, Date.now() + 2 * STALE_AFTER_MS);
    expect((await readdir(out)).sort()).toEqual([foreign, 'report.json'].sort());
  });

  it('the signal handler\'s clean-up removes a temporary that is still being written', async () => {
    const out = join(d, 'live');
    let release!: () => void;
    const gate = new Promise<void>((r) => (release = r));
    // A data source that stalls mid-write stands in for a run interrupted while writing.
    const slow = (async function* () {
      yield 'a';
      await gate;
      yield 'b';
    })();
    const writing = writeFilesAtomic([{ target: join(out, 'r.json'), data: slow as unknown as string }]).catch(() => undefined);
    await new Promise((r) => setTimeout(r, 100));
    expect((await readdir(out)).some((f) => f.endsWith('.tmp'))).toBe(true);
    removeLiveTemporaries();
    expect((await readdir(out)).some((f) => f.endsWith('.tmp'))).toBe(false);
    release();
    await writing;
  });
});
