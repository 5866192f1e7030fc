import { createHash } from 'node:crypto';
import { mkdtemp, mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main';
import type { CliOutput } from '../../src/cli/main';
import { CAUTIONS, UNBLINDED_CAUTION } from '../../src/core/report/cautions';

const DEMO_DATA = join(__dirname, '..', '..', 'demo', 'egfr-visits.csv');
const DEMO_SCHEDULE = join(__dirname, '..', '..', 'demo', 'egfr-schedule.csv');
const FIXED_NOW = (): Date => new Date('2026-04-01T09:00:00Z');

let dir: string;
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), 'longipane-cli-'));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

interface Run {
  code: number;
  out: string[];
  err: string[];
}

async function run(...argv: string[]): Promise<Run> {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliOutput = { out: (l) => out.push(l), err: (l) => err.push(l) };
  const code = await main(argv, io, FIXED_NOW);
  return { code, out, err };
}

async function loadXlsx(path: string): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load((await readFile(path)) as unknown as Parameters<typeof wb.xlsx.load>[0]);
  return wb;
}

/** The parts of the results JSON these tests read (schema: README.md, "Results JSON"). */
interface Results {
  tool: { name: string; version: string };
  cautions: string[];
  input: { label: string; excluded: { row: number; cell: string; use: string; reason: string }[]; fingerprint: string };
  settings: { mode: string; referenceArm: string | null; mapping: Record<string, unknown> } & Record<string, unknown>;
  visits: { counts: Record<string, number>; byArm?: unknown };
  model: {
    summary: string;
    status: string;
    arms: string[];
    slopeDifferences: { arm: string; lower: number; upper: number }[];
    variance: { subjectLower: number; subjectUpper: number; residualLower: number; residualUpper: number };
  } | null;
}

const readJson = async (path: string): Promise<Results> => JSON.parse(await readFile(path, 'utf8')) as Results;

const SCHEDULE = 'visit,target_day,days_before,days_after\nBaseline,1,0,0\nWeek 4,29,3,3\nWeek 8,57,3,3\n';

/** A small invented data set: two arms, two sites; three bad rows (text value, blank participant, impossible date). */
const SMALL = [
  'USUBJID,SITEID,TRT01P,AVISIT,ADT,RANDDT,AVAL',
  'P-01,Lindale,Placebo,Baseline,2025-01-06,2025-01-06,60.1',
  'P-01,Lindale,Placebo,Week 4,2025-02-03,2025-01-06,59.0',
  'P-01,Lindale,Placebo,Week 8,2025-03-10,2025-01-06,58.2',
  'P-02,Lindale,Active,Baseline,2025-01-08,2025-01-08,52.4',
  'P-02,Lindale,Active,Week 4,2025-02-05,2025-01-08,pending',
  'P-02,Lindale,Active,Week 8,2025-03-05,2025-01-08,53.0',
  '=1+1,Corvale,Placebo,Baseline,2025-01-10,2025-01-10,48.0',
  '=1+1,Corvale,Placebo,Week 4,2025-02-20,2025-01-10,47.1',
  ',Corvale,Active,Week 4,2025-02-09,2025-01-12,50.0',
  'P-04,Corvale,Active,Baseline,2025-01-12,2025-01-12,50.9',
  'P-04,Corvale,Active,Week 4,2025-02-30,2025-01-12,51.5',
  'P-04,Corvale,Active,Week 8,2025-03-09,2025-01-12,51.8',
  'P-05,Lindale,Placebo,Baseline,2025-01-13,2025-01-13,57.7',
  'P-05,Lindale,Placebo,Week 4,2025-02-10,2025-01-13,56.0',
  'P-06,Corvale,Active,Baseline,2025-01-14,2025-01-14,49.5',
  'P-06,Corvale,Active,Week 4,2025-02-11,2025-01-14,50.2',
  'P-06,Corvale,Active,Week 8,2025-03-11,2025-01-14,50.6',
].join('\n');

describe('longipane analyze on the invented demo trial', () => {
  let result: Run;
  let json: Results;
  beforeAll(async () => {
    result = await run(
      'analyze', '--data', DEMO_DATA, '--schedule', DEMO_SCHEDULE,
      '--out', join(dir, 'demo', 'report.xlsx'), '--json', join(dir, 'demo', 'results.json'),
      '--unblinded', '--reference-arm', 'Placebo',
    );
    json = await readJson(join(dir, 'demo', 'results.json'));
  });

  it('succeeds, creates the output folder, writes both files and prints the unblinded caution once', async () => {
    expect(result.err).toEqual([]);
    expect(result.code).toBe(0);
    expect(result.out.filter((l) => l === UNBLINDED_CAUTION)).toHaveLength(1);
    // demo/egfr-visits.csv has 921 lines: the header and 920 data rows.
    expect(result.out.some((l) => l.startsWith('Rows: 920 '))).toBe(true);
    expect((await readdir(join(dir, 'demo'))).sort()).toEqual(['report.xlsx', 'results.json']);
  });

  it('writes the JSON compact on one line by default, and indented with --pretty (the same object)', async () => {
    const compact = await readFile(join(dir, 'demo', 'results.json'), 'utf8');
    expect(compact.endsWith('}\n')).toBe(true);
    expect(compact.slice(0, -1)).not.toContain('\n');
    const again = await run(
      'analyze', '--data', DEMO_DATA, '--schedule', DEMO_SCHEDULE, '--json', join(dir, 'demo-pretty', 'results.json'),
      '--unblinded', '--reference-arm', 'Placebo', '--pretty',
    );
    expect(again.code).toBe(0);
    const pretty = await readFile(join(dir, 'demo-pretty', 'results.json'), 'utf8');
    expect(pretty.startsWith('{\n  "ok": true,')).toBe(true);
    // The run time is fixed by the test's clock, so both runs give the same object.
    expect(JSON.parse(pretty)).toEqual(JSON.parse(compact));
  });

  it('lists the four deliberately bad cells of the demo with their cell addresses', () => {
    const cells = new Set(json.input.excluded.map((e) => e.cell));
    // demo/README.md names the four cells (G42, A157, E304, G519), on the sheet named after the file (quoted, as A1 references quote a name with a hyphen).
    for (const c of ["'egfr-visits'!G42", "'egfr-visits'!A157", "'egfr-visits'!E304", "'egfr-visits'!G519"]) expect(cells).toContain(c);
  });

  it('gives visit counts with exactly the eight status keys', () => {
    expect(Object.keys(json.visits.counts).sort()).toEqual(['afterExit', 'early', 'extra', 'late', 'missed', 'notYetDue', 'onTime', 'repeat']);
  });

  it('fits the unblinded model, and its 95% intervals cover the values the invented data were generated from', () => {
    // Truth by construction (scripts/make-demo-data.ts): between-participant SD 12 (variance 144), within-participant SD 4
    // (variance 16), yearly decline 3.0 on Placebo and 1.0 on Active, so Active's slope is higher by 2 per year =
    // 2 / 12 per month of 30.4375 days (365.25 / 12). A 95% interval misses its truth for 1 seed in 20; this seed's
    // coverage is fixed, so the check is deterministic.
    const m = json.model!;
    expect(m.status).toBe('converged');
    expect(m.arms).toEqual(['Placebo', 'Active']);
    const slope = m.slopeDifferences[0]!;
    expect(slope.arm).toBe('Active');
    expect(slope.lower).toBeLessThan(2 / 12);
    expect(slope.upper).toBeGreaterThan(2 / 12);
    expect(m.variance.subjectLower).toBeLessThan(144);
    expect(m.variance.subjectUpper).toBeGreaterThan(144);
    expect(m.variance.residualLower).toBeLessThan(16);
    expect(m.variance.residualUpper).toBeGreaterThan(16);
    expect(result.out.some((l) => l.startsWith('Model: A random-intercept'))).toBe(true);
  });

  it('carries the cautions of SPEC §2 in the JSON and on the terminal (the unblinded caution too in unblinded mode)', () => {
    expect(json.cautions).toEqual([...CAUTIONS, UNBLINDED_CAUTION]);
    for (const c of CAUTIONS) expect(result.out).toContain(`Caution: ${c}`);
  });

  it('names the tool, its version, the input fingerprint and the settings in the JSON', () => {
    expect(json.tool).toEqual({ name: 'longipane', version: expect.stringMatching(/^\d+\.\d+\.\d+/) });
    expect(json.input.fingerprint).toMatch(/^[0-9a-f]{64}$/);
    expect(json.input.label).toBe('egfr-visits.csv (A1:J921), read as UTF-8');
    expect(json.settings).toMatchObject({ mode: 'unblinded', referenceArm: 'Placebo', timeUnit: 'month', dfMethod: 'kenward-roger', method: 'reml', level: 0.95 });
    // The run time is ISO 8601 with this computer's UTC offset, naming the moment the run was given.
    expect(json.settings.runAt).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}[+-]\d{2}:\d{2}$/);
    expect(Date.parse(String(json.settings.runAt))).toBe(Date.parse('2026-04-01T09:00:00.000Z'));
    expect(json.settings.mapping).toMatchObject({ subject: 'USUBJID', date: 'ADT', reference: 'RANDDT', visit: 'AVISIT', value: 'AVAL', arm: 'TRT01P', site: 'SITEID' });
  });

  it('fingerprints the data file\'s bytes: the digest is SHA-256 of the file as node:crypto computes it, marked "file"', async () => {
    const digest = createHash('sha256').update(await readFile(DEMO_DATA)).digest('hex');
    expect(json.input.fingerprint).toBe(digest);
    expect((json.input as unknown as Record<string, unknown>).fingerprintOf).toBe('file');
  });
});

describe('longipane analyze on a small CSV with CDISC headers and no --map', () => {
  let result: Run;
  let json: Results;
  const xlsx = (): string => join(dir, 'small', 'report.xlsx');
  beforeAll(async () => {
    await mkdir(join(dir, 'small'), { recursive: true });
    await writeFile(join(dir, 'small', 'visits.csv'), SMALL);
    await writeFile(join(dir, 'small', 'schedule.csv'), SCHEDULE);
    result = await run(
      'analyze', '--data', join(dir, 'small', 'visits.csv'), '--schedule', join(dir, 'small', 'schedule.csv'),
      '--out', xlsx(), '--json', join(dir, 'small', 'results.json'), '--cutoff', '2025-04-30',
    );
    json = await readJson(join(dir, 'small', 'results.json'));
  });

  it('detects every column, runs, and summarises the warnings on stdout', () => {
    expect(result.err).toEqual([]);
    expect(result.code).toBe(0);
    expect(result.out.some((l) => /^Rows: \d+ \(\d+ used for visit timing, \d+ for the model\); participants: \d+\.$/.test(l))).toBe(true);
  });

  it('counts the rows left out of each use, then lists each left-out row once per use, matching that count', () => {
    const at = result.out.findIndex((l) => l.startsWith('Rows left out of'));
    // visits!G6 "pending" leaves the model only; A10 (blank participant) and E12 (2025-02-30) leave both uses.
    expect(result.out.slice(at, at + 8)).toEqual([
      'Rows left out of visit timing: 2; of the model: 3 (each is listed with its reason in the outputs).',
      'Left out of visit timing (2 rows):',
      '  visits!A10: the participant is blank, so the row is left out of the visit-timing checks.',
      expect.stringMatching(/^ {2}visits!E12: "2025-02-30" is not a valid visit date: .*left out of the visit-timing checks\.$/),
      'Left out of the model (3 rows):',
      '  visits!G6: "pending" is not a number, and the value must be a number, so the row is left out of the model.',
      '  visits!A10: the participant is blank, so the row is left out of the model.',
      expect.stringMatching(/^ {2}visits!E12: "2025-02-30" is not a valid visit date: .*left out of the model\.$/),
    ]);
    // The counts agree with the JSON's list of left-out rows, use by use.
    const rowsOf = (use: string): number => new Set(json.input.excluded.filter((e) => e.use === use).map((e) => e.row)).size;
    expect([rowsOf('timing'), rowsOf('model')]).toEqual([2, 3]);
  });

  it('lists the excluded rows (text value, blank participant, impossible date) with cell addresses and uses', () => {
    const byCell = (cell: string): string[] => json.input.excluded.filter((e) => e.cell === cell).map((e) => e.use).sort();
    expect(byCell('visits!G6')).toEqual(['model']); // "pending" in AVAL: still a timing record
    expect(byCell('visits!A10')).toEqual(['model', 'timing']); // blank participant
    expect(byCell('visits!E12')).toEqual(['model', 'timing']); // 2025-02-30
    expect(json.input.excluded.every((e) => e.cell.endsWith(String(e.row)))).toBe(true);
  });

  it('keeps the participant id "=1+1" a string cell in the workbook, never a formula', async () => {
    const wb = await loadXlsx(xlsx());
    const found: ExcelJS.Cell[] = [];
    wb.eachSheet((ws) => ws.eachRow((row) => row.eachCell((c) => {
      if (c.value === '=1+1') found.push(c);
      if (c.type === ExcelJS.ValueType.Formula) throw new Error(`formula cell at ${ws.name}!${c.address}`);
    })));
    expect(found.length).toBeGreaterThan(0);
    for (const c of found) {
      expect(c.type).toBe(ExcelJS.ValueType.String);
      expect(c.formula).toBeUndefined();
    }
  });

  it('writes the summary sheet first, then the timing sheets, and the analysis record last, each result table a real Excel table', async () => {
    const wb = await loadXlsx(xlsx());
    const names = wb.worksheets.map((w) => w.name);
    expect(names).toEqual(['Summary', 'Visit timing', 'Visit deviations', 'Visits due', 'Model results', 'Analysis record']);
    const timingTables = wb.getWorksheet('Visit timing')!.getTables().map((t) => (t as unknown as { table: { name: string } }).table.name);
    expect(timingTables).toEqual(expect.arrayContaining(['LP_ByVisit', 'LP_BySite'])); // the same names the add-in gives
    expect(wb.getWorksheet('Visit deviations')!.getTables()).toHaveLength(1);
  });

  it('shows nothing by arm in blinded mode, in the JSON or the workbook', async () => {
    expect(json.settings.mode).toBe('blinded');
    expect(json.settings.referenceArm).toBeNull();
    expect(json.visits.byArm).toBeUndefined();
    expect(JSON.stringify(json)).not.toMatch(/Placebo|Active/);
    const wb = await loadXlsx(xlsx());
    wb.eachSheet((ws) => ws.eachRow((row) => row.eachCell((c) => expect(String(c.value)).not.toMatch(/Placebo|Active/))));
  });
});

describe('longipane analyze on an .xlsx workbook', () => {
  it('reads the named sheet, with real date cells and a 1904 date system, and addresses problems on that sheet', async () => {
    const d = join(dir, 'xlsx');
    await mkdir(d, { recursive: true });
    const wb = new ExcelJS.Workbook();
    wb.properties.date1904 = true;
    wb.addWorksheet('Notes').getCell('A1').value = 'not the data';
    const ws = wb.addWorksheet('Visits');
    const lines = SMALL.split('\n').map((l) => l.split(','));
    lines.forEach((cells, r) => {
      ws.addRow(
        cells.map((c, k) => {
          if (r === 0) return c;
          if ((k === 4 || k === 5) && /^\d{4}-\d{2}-\d{2}$/.test(c) && c !== '2025-02-30') return new Date(`${c}T00:00:00Z`);
          if (k === 6 && /^[\d.]+$/.test(c)) return Number(c);
          return c === '' ? null : c;
        }),
      );
    });
    await writeFile(join(d, 'visits.xlsx'), new Uint8Array(await wb.xlsx.writeBuffer()));
    await writeFile(join(d, 'schedule.csv'), SCHEDULE);
    const r = await run('analyze', '--data', join(d, 'visits.xlsx'), '--sheet', 'Visits', '--schedule', join(d, 'schedule.csv'), '--cutoff', '2025-04-30', '--json', join(d, 'r.json'));
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    const json = await readJson(join(d, 'r.json'));
    expect(json.input.label).toBe('visits.xlsx, sheet Visits!A1:G18');
    const cells = json.input.excluded.map((e) => e.cell);
    expect(cells).toEqual(expect.arrayContaining(['Visits!G6', 'Visits!A10', 'Visits!E12']));
    // Same data as the CSV run: on time / late / missed counts agree whichever file type carried them.
    await writeFile(join(d, 'visits.csv'), SMALL);
    await run('analyze', '--data', join(d, 'visits.csv'), '--schedule', join(d, 'schedule.csv'), '--cutoff', '2025-04-30', '--json', join(d, 'c.json'));
    const csv = await readJson(join(d, 'c.json'));
    expect(json.visits.counts).toEqual(csv.visits.counts);
  });
});

describe('longipane analyze with --map, --covariate and model options', () => {
  /** Invented: headers no detector could read as roles; a baseline covariate column. */
  const ODD = [
    'Pt,When,Score,Start,Base',
    ...['a', 'b', 'c', 'd', 'e', 'f'].flatMap((p, k) => [
      `${p},2025-01-${String(6 + k).padStart(2, '0')},${50 + k},2025-01-${String(6 + k).padStart(2, '0')},${50 + k}`,
      `${p},2025-02-${String(3 + k).padStart(2, '0')},${49 + k + (k % 2) / 2},2025-01-${String(6 + k).padStart(2, '0')},${50 + k}`,
      `${p},2025-03-${String(3 + k).padStart(2, '0')},${48.5 + k - (k % 3) / 4},2025-01-${String(6 + k).padStart(2, '0')},${50 + k}`,
    ]),
  ].join('\n');

  it('uses the roles given with --map and the covariate given with --covariate, and records them in the JSON', async () => {
    const d = join(dir, 'map');
    await mkdir(d, { recursive: true });
    await writeFile(join(d, 'odd.csv'), ODD);
    await writeFile(join(d, 'schedule.csv'), SCHEDULE);
    const r = await run(
      'analyze', '--data', join(d, 'odd.csv'), '--schedule', join(d, 'schedule.csv'), '--json', join(d, 'r.json'), '--out', join(d, 'r.xlsx'),
      '--map', 'participant=Pt', '--map', 'date=When', '--map', 'value=Score', '--map', 'reference=Start', '--covariate', 'Base',
      '--time-unit', 'week', '--df', 'satterthwaite', '--method', 'ml', '--level', '0.9', '--scheduled-only', '--per-participant',
    );
    expect(r.err).toEqual([]);
    expect(r.code).toBe(0);
    const json = await readJson(join(d, 'r.json'));
    expect(json.settings.mapping).toEqual({ subject: 'Pt', date: 'When', reference: 'Start', value: 'Score', covariates: ['Base'] });
    expect(json.settings).toMatchObject({ timeUnit: 'week', daysPerUnit: 7, dfMethod: 'satterthwaite', method: 'ml', level: 0.9, scheduledOnly: true, perSubject: true });
    const wb = await loadXlsx(join(d, 'r.xlsx'));
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Summary', 'Visit timing', 'Visit deviations', 'Visits due', 'Model results', 'Per participant', 'Analysis record']);
  });

  it('exits with 2 and lists the headers when --map names a column the data do not have', async () => {
    const d = join(dir, 'map');
    const r = await run('analyze', '--data', join(d, 'odd.csv'), '--schedule', join(d, 'schedule.csv'), '--map', 'value=eGFR');
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/no column headed "eGFR". Headers: "Pt", "When", "Score", "Start", "Base"/);
  });
});

describe('longipane analyze when something is wrong', () => {
  it('leaves an existing output file untouched and no temporary file behind when the data cannot be analysed', async () => {
    const d = join(dir, 'fail');
    await mkdir(d, { recursive: true });
    await writeFile(join(d, 'bad.csv'), 'Colour,Weight\nred,3\n');
    await writeFile(join(d, 'schedule.csv'), SCHEDULE);
    await writeFile(join(d, 'report.xlsx'), 'a good earlier report');
    const r = await run('analyze', '--data', join(d, 'bad.csv'), '--schedule', join(d, 'schedule.csv'), '--out', join(d, 'report.xlsx'));
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/participant/);
    expect(await readFile(join(d, 'report.xlsx'), 'utf8')).toBe('a good earlier report');
    expect((await readdir(d)).sort()).toEqual(['bad.csv', 'report.xlsx', 'schedule.csv']);
  });

  it('writes nothing, leaves no temporary file and names the output when a folder of that name is in the way', async () => {
    const d = join(dir, 'blocked');
    await mkdir(join(d, 'results.json'), { recursive: true }); // a folder where the JSON file should go
    await writeFile(join(d, 'visits.csv'), SMALL);
    await writeFile(join(d, 'schedule.csv'), SCHEDULE);
    const r = await run('analyze', '--data', join(d, 'visits.csv'), '--schedule', join(d, 'schedule.csv'), '--json', join(d, 'results.json'));
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/Cannot write ".*results\.json": a folder of that name is in the way\. Nothing was written\./);
    expect((await readdir(d)).sort()).toEqual(['results.json', 'schedule.csv', 'visits.csv']);
  });

  it('reports a schedule problem with its cell address and exits with 1', async () => {
    const d = join(dir, 'sched');
    await mkdir(d, { recursive: true });
    await writeFile(join(d, 'visits.csv'), SMALL);
    await writeFile(join(d, 'schedule.csv'), 'visit,target_day,days_before,days_after\nBaseline,0,0,0\n');
    const r = await run('analyze', '--data', join(d, 'visits.csv'), '--schedule', join(d, 'schedule.csv'));
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/schedule!B2: There is no study day 0/);
  });

  it('exits with 2 and a clear message for a missing flag, an unknown flag, a bad date or a missing file', async () => {
    const cases: [string[], RegExp][] = [
      [['analyze', '--schedule', 's.csv'], /--data FILE is required/],
      [['analyze', '--data', 'd.csv', '--schedule', 's.csv', '--colour', 'red'], /Unknown flag "--colour"/],
      [['analyze', '--data', 'd.csv', '--schedule', 's.csv', '--cutoff', '2025-02-30'], /--cutoff must be a real date/],
      [['analyze', '--data', join(dir, 'nope.csv'), '--schedule', 's.csv'], /Cannot read the data file .*no such file/],
      [['frobnicate'], /unknown command "frobnicate"/],
    ];
    for (const [argv, message] of cases) {
      const r = await run(...argv);
      expect(r.code).toBe(2);
      expect(r.err.join('\n')).toMatch(message);
    }
  });

  it('exits with 2 and says to split the file when a CSV has more rows than a worksheet holds (1,048,576, header included)', async () => {
    const d = join(dir, 'huge');
    await mkdir(d, { recursive: true });
    // 1,048,576 is Excel's row limit (ECMA-376 Part 1 leaves it to the application; common practice).
    await writeFile(join(d, 'huge.csv'), `USUBJID\n${'x\n'.repeat(1_048_576)}`);
    await writeFile(join(d, 'schedule.csv'), SCHEDULE);
    const r = await run('analyze', '--data', join(d, 'huge.csv'), '--schedule', join(d, 'schedule.csv'));
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/has 1,048,577 lines and 1 columns; a worksheet holds at most 1,048,576 rows .* Split the file/);
  });

  it('prints the help text for `help` and exits with 0', async () => {
    const r = await run('help');
    expect(r.code).toBe(0);
    expect(r.out.join('\n')).toMatch(/longipane analyze --data FILE --schedule FILE/);
    expect(r.out.join('\n')).toMatch(/--date-order dmy\|mdy/);
  });
});

describe('longipane analyze used carelessly (each case a bug found by trying it)', () => {
  let d: string;
  beforeAll(async () => {
    d = join(dir, 'careless');
    await mkdir(d, { recursive: true });
    await writeFile(join(d, 'schedule.csv'), SCHEDULE);
  });
  const analyze = (data: string, ...more: string[]): Promise<Run> =>
    run('analyze', '--data', join(d, data), '--schedule', join(d, 'schedule.csv'), ...more);

  it('an empty data file or schedule is named as empty and exits with 2 (regression: "the header row is empty")', async () => {
    await writeFile(join(d, 'empty.csv'), '');
    const r = await analyze('empty.csv');
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/empty\.csv" is empty: it needs a header row/);
    await writeFile(join(d, 'visits.csv'), SMALL);
    await writeFile(join(d, 'blank-schedule.csv'), '\n\n');
    const s = await run('analyze', '--data', join(d, 'visits.csv'), '--schedule', join(d, 'blank-schedule.csv'));
    expect(s.code).toBe(2);
    expect(s.err.join('\n')).toMatch(/The schedule ".*blank-schedule\.csv" is empty/);
  });

  it('a binary file or a workbook renamed .csv is called what it is (regression: "no column is mapped to the subject")', async () => {
    await writeFile(join(d, 'binary.csv'), Uint8Array.of(0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x00, 0x00, 0x2c, 0x0a));
    const bin = await analyze('binary.csv');
    expect(bin.code).toBe(2);
    expect(bin.err.join('\n')).toMatch(/binary\.csv" is not CSV text: it holds binary data \(a zero byte at byte 7\)/);
    const wb = new ExcelJS.Workbook();
    wb.addWorksheet('S').addRow(['USUBJID']);
    await writeFile(join(d, 'workbook.csv'), new Uint8Array(await wb.xlsx.writeBuffer()));
    const zip = await analyze('workbook.csv');
    expect(zip.code).toBe(2);
    expect(zip.err.join('\n')).toMatch(/workbook\.csv" is a zip archive such as an \.xlsx workbook, not CSV text/);
  });

  it('a text file named .xlsx gets a plain message without library internals (regression: a zip library’s web link)', async () => {
    await writeFile(join(d, 'text.xlsx'), SMALL);
    const r = await analyze('text.xlsx');
    expect(r.code).toBe(2);
    expect(r.err).toEqual([
      `longipane: "${join(d, 'text.xlsx')}": The file is not an .xlsx workbook: an .xlsx file is a zip archive and this one is not. If it holds CSV text, give it the .csv extension.`,
    ]);
  });

  it('a CSV saved in the Windows-1252 code page keeps its accented site name (regression: replacement characters)', async () => {
    const latin1 = Uint8Array.from([...SMALL.replaceAll('Lindale', 'M\u00fchlfeld')].map((ch) => ch.charCodeAt(0)));
    await writeFile(join(d, 'latin1.csv'), latin1);
    const r = await analyze('latin1.csv', '--json', join(d, 'latin1.json'));
    expect(r.code).toBe(0);
    const text = await readFile(join(d, 'latin1.json'), 'utf8');
    expect(text).toContain('M\u00fchlfeld');
    expect(text).not.toContain('\ufffd');
  });

  it('--out naming the data file is refused and the data are left as they were (regression: the source was replaced)', async () => {
    await writeFile(join(d, 'own.xlsx'), 'not really a workbook');
    const r = await run('analyze', '--data', join(d, 'own.xlsx'), '--schedule', join(d, 'schedule.csv'), '--out', join(d, 'own.xlsx'));
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/--out ".*own\.xlsx" is the same file as --data/);
    expect(await readFile(join(d, 'own.xlsx'), 'utf8')).toBe('not really a workbook');
  });

  it('when the JSON cannot be written the report is not written either (regression: half the outputs were left)', async () => {
    const o = join(d, 'half');
    await mkdir(o, { recursive: true });
    await writeFile(join(o, 'taken'), 'a file where a folder is needed');
    await writeFile(join(d, 'visits.csv'), SMALL);
    const r = await analyze('visits.csv', '--out', join(o, 'report.xlsx'), '--json', join(o, 'taken', 'results.json'));
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/Cannot write ".*results\.json": a part of the path is a file, not a folder/);
    expect(await readdir(o)).toEqual(['taken']);
  });

  it('a --reference-arm not in the data (a typo) stops the run with the arms there, writes no report, and the JSON says why (regression: model not fitted, "..")', async () => {
    await writeFile(join(d, 'visits.csv'), SMALL);
    const r = await analyze('visits.csv', '--unblinded', '--reference-arm', 'Plaecbo', '--out', join(d, 'ref.xlsx'), '--json', join(d, 'ref.json'));
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/The reference arm "Plaecbo" is not among the arms in the data \("Placebo", "Active"\)/);
    expect(r.err.join('\n')).not.toMatch(/\.\./);
    expect(await readdir(d)).not.toContain('ref.xlsx');
    const json = JSON.parse(await readFile(join(d, 'ref.json'), 'utf8')) as { ok: boolean; issues: { code: string; severity: string }[] };
    expect(json.ok).toBe(false);
    // The stopping problem comes first; the row warnings of the data follow it.
    expect(json.issues.map((i) => i.code)).toEqual(['unknown-reference-arm', 'text-in-numeric', 'blank-subject', 'blank-subject', 'bad-date', 'bad-date']);
  });

  it('semicolons, Windows line endings, a byte-order mark and a quoted line break give the same results as a plain CSV', async () => {
    await writeFile(join(d, 'plain.csv'), SMALL);
    const base = await analyze('plain.csv', '--json', join(d, 'plain.json'));
    expect(base.code).toBe(0);
    const want = await readJson(join(d, 'plain.json'));
    const variants: [string, string][] = [
      ['semicolon.csv', SMALL.replaceAll(',', ';')],
      ['crlf.csv', SMALL.replaceAll('\n', '\r\n')],
      ['bom.csv', `\ufeff${SMALL}`],
      // RFC 4180 §2.6: a quoted field may hold a line break; it stays one record, so row numbers count records.
      ['quoted.csv', SMALL.replace('P-01,Lindale,Placebo,Baseline', 'P-01,"Lin\ndale",Placebo,Baseline')],
    ];
    for (const [name, text] of variants) {
      await writeFile(join(d, name), text);
      const r = await analyze(name, '--json', join(d, `${name}.json`));
      expect(r.code, name).toBe(0);
      const got = await readJson(join(d, `${name}.json`));
      expect(got.visits.counts, name).toEqual(want.visits.counts);
      expect(got.input.excluded.map((e) => `${e.cell.replace(/^.*!/, '')} ${e.use}`), name).toEqual(want.input.excluded.map((e) => `${e.cell.replace(/^.*!/, '')} ${e.use}`));
    }
  });

  it('three arms in unblinded mode fit one model with the chosen reference first', async () => {
    const three = SMALL.replace(/P-06,Corvale,Active/g, 'P-06,Corvale,Boost').replace(/P-05,Lindale,Placebo/g, 'P-05,Lindale,Boost');
    await writeFile(join(d, 'three.csv'), three);
    const r = await analyze('three.csv', '--unblinded', '--reference-arm', 'Active', '--json', join(d, 'three.json'));
    const json = await readJson(join(d, 'three.json'));
    expect(r.code).toBe(0);
    expect(json.model?.arms).toEqual(['Active', 'Placebo', 'Boost']);
  });

  it('a schedule that is not a CSV file is refused by name (regression: "needs a heading row" for an .xlsx schedule)', async () => {
    await writeFile(join(d, 'visits.csv'), SMALL);
    await writeFile(join(d, 'schedule.xlsx'), 'anything');
    const r = await run('analyze', '--data', join(d, 'visits.csv'), '--schedule', join(d, 'schedule.xlsx'));
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/--schedule must be a CSV file with the header visit,target_day,days_before,days_after/);
  });

  it('the reason a model was not fitted ends with one full stop inside its brackets (regression: ".).")', async () => {
    await writeFile(join(d, 'two.csv'), 'USUBJID,ADT,AVAL\nA,2025-01-06,3\nB,2025-01-07,4\n');
    const r = await analyze('two.csv');
    expect(r.code).toBe(0);
    const line = r.out.find((l) => l.startsWith('Model: not fitted ('));
    expect(line).toMatch(/^Model: not fitted \([^)]*[^.]\)\.$/);
  });

  it('when no column is recognised as the subject or date, the message says how to name them and lists the headers', async () => {
    await writeFile(join(d, 'unknown.csv'), 'Colour,Weight\nred,3\n');
    const r = await analyze('unknown.csv');
    expect(r.code).toBe(1);
    expect(r.err.join('\n')).toMatch(/Name the columns with --map role=Header .*; the headers are: "Colour", "Weight"\./);
  });

  it('a quoted field that never closes is named by file and cell (regression: "data row 2" for the first data row)', async () => {
    await writeFile(join(d, 'quote.csv'), 'USUBJID,ADT,AVAL\nA,2025-01-06,"3\nB,2025-01-07,4\n');
    const r = await analyze('quote.csv');
    expect(r.code).toBe(2);
    expect(r.err.join('\n')).toMatch(/quote\.csv": The CSV text has a quoted field that never closes at cell C2: /);
  });
});
