/**
 * The whole run at 100k, 300k and 1,000,000 rows (`npm run bench -- whole`, sizes as further arguments), on invented
 * listings (bench/whole-run-data.ts: the demo trial's generator, three arms, twelve sites, ~230,000 participants at
 * 1M rows) written as CSV to a temporary folder. Each size measures, every one in a process of its own:
 *   (a) the baseline: papaparse parsing the same file into arrays (bench/parse-child.mjs);
 *   (b) the whole command-line run, unblinded, with --out and --json (bench/cli-child.mjs over build/cli.mjs, with
 *       LONGIPANE_PROFILE=1 so each stage's seconds, CPU seconds and memory are printed beside the total);
 * and, in this process, (c) intake + study days + windows + timing summaries in two steps: decoding the file into
 * typed columns (reading the file, its CSV index, decodeTable), against (a); and the checks on those columns
 * (checkTable), study days, windows and timing summaries, against one OLS pass (X'X and X'y of [1, arm, time,
 * arm × time], then the solve) over the same rows' typed columns. The listings' row objects, which the summaries make
 * only when a sheet or the JSON reads them, are timed apart; the old combined figure (readTable from the file's index
 * + the rest) is kept beside them.
 * Targets (issue 12): (b) ≤ 4 × (a) and ≤ 1 GB peak; (c) checks + windows + summaries ≤ 10 × its OLS pass. Writes
 * bench/whole-latest.json.
 * Needs `npm run build:cli` first.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { checkTable, decodeTable, readTable } from '../src/core/intake';
import type { IntakeTable } from '../src/core/intake/types';
import { summarizeTiming } from '../src/core/report/summarizeTiming';
import { classifyVisits, computeStudyDays } from '../src/core/schedule';
import { readCsvSource } from '../src/files/readCsvFile';
import { SCHEDULE } from '../scripts/make-demo-data';
import { benchScheduleCsv, writeBenchCsv } from './whole-run-data';
import { best, solveNormalEquations } from './timing';

export interface StageLine {
  readonly stage: string;
  readonly seconds: number;
  readonly cpuSeconds: number;
  readonly rssMB: number;
}

export interface WholeRunEntry {
  readonly rows: number;
  readonly participants: number;
  readonly fileMB: number;
  readonly papaparseSeconds: number;
  readonly papaparseCpuSeconds: number;
  readonly papaparsePeakMB: number;
  readonly wholeSeconds: number;
  readonly wholeCpuSeconds: number;
  readonly wholePeakMB: number;
  /** Wall-clock ratio, and the ratio of CPU seconds (steadier on a shared machine). */
  readonly wholeRatio: number;
  readonly wholeCpuRatio: number;
  readonly stages: readonly StageLine[];
  /** Intake + study days + windows + timing summaries from the file's index (the combined figure), ÷ one OLS pass. */
  readonly timingSeconds: number;
  readonly olsSeconds: number;
  readonly timingRatio: number;
  /** Reading the file and decoding it into typed columns (CSV index + decodeTable), and that ÷ papaparse's parse. */
  readonly decodeSeconds: number;
  readonly decodeRatio: number;
  /** Checks on the typed columns + study days + windows + timing summaries, and that ÷ one OLS pass. */
  readonly checksSeconds: number;
  readonly checksRatio: number;
  /** Making the row objects of the deviation, visits-due and exit listings (done when they are written). */
  readonly listingSeconds: number;
}

const here = dirname(fileURLToPath(import.meta.url));

/** One OLS pass over the rows usable for the model: X'X and X'y of [1, arm k (k ≥ 2), time, arm k × time], then the
 * solve by Cholesky (p is small). Time is days from the reference date. */
function olsPass(t: IntakeTable): Float64Array {
  const arms = t.arms;
  const p = 2 + 2 * (arms.length - 1);
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  const x = new Float64Array(p);
  const armCode = new Map(arms.map((a, k) => [a, k]));
  const arm = t.arm!;
  for (let i = 0; i < t.nRows; i++) {
    if (t.usableModel[i] !== 1) continue;
    const time = t.date[i]! - t.reference[i]!;
    const k = armCode.get(arm[i]!) ?? 0;
    x.fill(0);
    x[0] = 1;
    x[1] = time;
    if (k > 0) {
      x[2 * k] = 1;
      x[2 * k + 1] = time;
    }
    const y = t.value[i]!;
    for (let a = 0; a < p; a++) {
      const xa = x[a]!;
      if (xa === 0) continue;
      xty[a] = xty[a]! + xa * y;
      for (let b = 0; b <= a; b++) xtx[a * p + b] = xtx[a * p + b]! + xa * x[b]!;
    }
  }
  return solveNormalEquations(xtx, xty, p);
}


/** (c): decoding, then checks + windows + timing summaries from the typed columns, the OLS pass over the same rows,
 * the listings' rows, and the combined figure from the file's index. Decoding and the combined figure best of two;
 * the checks and the OLS pass best of five each, since the checks' code is compiled over their first runs (measured
 * at 1M rows: 1.4 s, 1.7 s, 0.8 s, 0.9 s, 0.6 s, ... 0.5 s on 2 shared cores). */
function timingFromColumns(csv: string, sheet: string): {
  timingSeconds: number;
  olsSeconds: number;
  decodeSeconds: number;
  checksSeconds: number;
  listingSeconds: number;
} {
  const schedule = SCHEDULE.map((v) => ({ label: v.visit, targetDay: v.targetDay, before: v.before, after: v.after }));
  const place = { sheet, topLeft: 'A1' };
  const options = { sheet, topLeft: 'A1', dateSystem: 1900, mode: 'unblinded', numericText: 'accept' } as const;
  const decode = best(2, () => {
    const source = readCsvSource(new Uint8Array(readFileSync(csv)), csv, sheet).source;
    const d = decodeTable(source, options);
    if (!d.ok) throw new Error(`bench data failed intake: ${d.issues[0]?.message ?? ''}`);
    return d.decoded;
  });
  const windows = (table: IntakeTable): ReturnType<typeof summarizeTiming> => {
    const days = computeStudyDays(table, schedule, place);
    const timing = classifyVisits(table, days, schedule, { place });
    const summary = summarizeTiming({ table, schedule, days, timing });
    if (summary.counts.onTime === 0) throw new Error('bench run classified nothing');
    return summary;
  };
  const checks = best(5, () => {
    const r = checkTable(decode.value);
    if (!r.ok) throw new Error(`bench data failed intake: ${r.issues[0]?.message ?? ''}`);
    return { table: r.table, summary: windows(r.table) };
  });
  const listing = best(1, () => checks.value.summary.deviations.length + checks.value.summary.upcoming.length + checks.value.summary.exits.length);
  const read = readCsvSource(new Uint8Array(readFileSync(csv)), csv, sheet);
  const combined = best(2, () => {
    const r = readTable(read.source, options);
    if (!r.ok) throw new Error(`bench data failed intake: ${r.issues[0]?.message ?? ''}`);
    windows(r.table);
    return r.table;
  });
  const ols = best(5, () => olsPass(checks.value.table));
  if (!Number.isFinite(ols.value[1]!)) throw new Error('OLS baseline failed');
  return {
    timingSeconds: combined.seconds,
    olsSeconds: ols.seconds,
    decodeSeconds: decode.seconds,
    checksSeconds: checks.seconds,
    listingSeconds: listing.seconds,
  };
}

function parseChild(csv: string): { seconds: number; cpuSeconds: number; peakMB: number } {
  const out = execFileSync(process.execPath, [join(here, 'parse-child.mjs'), csv], { encoding: 'utf8', maxBuffer: 1 << 20 });
  return JSON.parse(out) as { seconds: number; cpuSeconds: number; peakMB: number };
}

/** One whole command-line run (build/cli.mjs through bench/cli-child.mjs) in a child process, with its stage lines
 * (LONGIPANE_PROFILE); throws when the run fails. Shared with bench/xlsx-bench.ts. */
export function cliChild(args: readonly string[]): { seconds: number; cpuSeconds: number; peakMB: number; stages: StageLine[] } {
  const r = spawnSync(process.execPath, [join(here, 'cli-child.mjs'), ...args], {
    encoding: 'utf8',
    env: { ...process.env, LONGIPANE_PROFILE: '1' },
    maxBuffer: 64 << 20,
  });
  const stages: StageLine[] = [];
  type Total = { seconds: number; cpuSeconds: number; peakMB: number; exitCode: number };
  const totals: Total[] = [];
  for (const line of r.stderr.split('\n')) {
    if (line.startsWith('longipane-profile ')) stages.push(JSON.parse(line.slice('longipane-profile '.length)) as StageLine);
    else if (line.startsWith('longipane-bench ')) totals.push(JSON.parse(line.slice('longipane-bench '.length)) as Total);
  }
  const total = totals[0] ?? null;
  if (total === null || total.exitCode !== 0) throw new Error(`the command line failed (exit ${total?.exitCode ?? r.status}): ${r.stderr.slice(0, 2000)}`);
  return { seconds: total.seconds, cpuSeconds: total.cpuSeconds, peakMB: total.peakMB, stages };
}

export function runWholeBench(sizes: readonly number[]): WholeRunEntry[] {
  if (!existsSync(join(here, '..', 'build', 'cli.mjs'))) throw new Error('build the command line first: npm run build:cli');
  const dir = mkdtempSync(join(tmpdir(), 'longipane-whole-bench-'));
  const entries: WholeRunEntry[] = [];
  try {
    const schedule = join(dir, 'schedule.csv');
    writeFileSync(schedule, benchScheduleCsv());
    for (const rows of sizes) {
      const name = `listing-${rows}`;
      const csv = join(dir, `${name}.csv`);
      const participants = writeBenchCsv(csv, rows);
      const fileMB = readFileSync(csv).length / 1048576;
      const parse = parseChild(csv);
      const whole = cliChild([
        'analyze', '--data', csv, '--schedule', schedule, '--out', join(dir, `${name}.xlsx`), '--json', join(dir, `${name}.json`),
        '--unblinded', '--reference-arm', 'Placebo',
      ]);
      const { timingSeconds, olsSeconds, decodeSeconds, checksSeconds, listingSeconds } = timingFromColumns(csv, name);
      entries.push({
        rows,
        participants,
        fileMB,
        papaparseSeconds: parse.seconds,
        papaparseCpuSeconds: parse.cpuSeconds,
        papaparsePeakMB: parse.peakMB,
        wholeSeconds: whole.seconds,
        wholeCpuSeconds: whole.cpuSeconds,
        wholePeakMB: whole.peakMB,
        wholeRatio: whole.seconds / parse.seconds,
        wholeCpuRatio: whole.cpuSeconds / parse.cpuSeconds,
        stages: whole.stages,
        timingSeconds,
        olsSeconds,
        timingRatio: timingSeconds / olsSeconds,
        decodeSeconds,
        decodeRatio: decodeSeconds / parse.seconds,
        checksSeconds,
        checksRatio: checksSeconds / olsSeconds,
        listingSeconds,
      });
      rmSync(join(dir, `${name}.xlsx`), { force: true });
      rmSync(join(dir, `${name}.json`), { force: true });
      rmSync(csv, { force: true });
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return entries;
}

/** The table `npm run bench -- whole` prints. */
export function wholeReport(entries: readonly WholeRunEntry[]): string {
  const pad = (s: string, n: number): string => s.padStart(n);
  const lines = [
    `${'whole run (CSV, unblinded, --out and --json)'.padEnd(46)}`,
    `${pad('rows', 10)}${pad('people', 9)}${pad('file MB', 9)}${pad('papaparse s', 13)}${pad('(CPU)', 7)}${pad('whole s', 9)}${pad('(CPU)', 7)}${pad('ratio', 7)}${pad('(CPU)', 7)}${pad('peak MB', 9)}${pad('timing s', 10)}${pad('OLS s', 8)}${pad('ratio', 7)}`,
    ...entries.map(
      (e) =>
        `${pad(e.rows.toLocaleString('en-US'), 10)}${pad(e.participants.toLocaleString('en-US'), 9)}${pad(e.fileMB.toFixed(1), 9)}${pad(e.papaparseSeconds.toFixed(2), 13)}${pad(e.papaparseCpuSeconds.toFixed(2), 7)}${pad(e.wholeSeconds.toFixed(2), 9)}${pad(e.wholeCpuSeconds.toFixed(2), 7)}${pad(e.wholeRatio.toFixed(1), 7)}${pad(e.wholeCpuRatio.toFixed(1), 7)}${pad(String(e.wholePeakMB), 9)}${pad(e.timingSeconds.toFixed(2), 10)}${pad(e.olsSeconds.toFixed(3), 8)}${pad(e.timingRatio.toFixed(1), 7)}`,
    ),
    '',
    'Intake + windows + timing summaries in two steps (same process; decoding best of two, checks and OLS best of five):',
    `${pad('rows', 10)}${pad('decode s', 10)}${pad('÷ papaparse', 13)}${pad('checks s', 10)}${pad('OLS s', 8)}${pad('÷ OLS', 8)}${pad('listing rows s', 16)}${pad('combined ÷ OLS', 16)}`,
    ...entries.map(
      (e) =>
        `${pad(e.rows.toLocaleString('en-US'), 10)}${pad(e.decodeSeconds.toFixed(2), 10)}${pad(e.decodeRatio.toFixed(2), 13)}${pad(e.checksSeconds.toFixed(3), 10)}${pad(e.olsSeconds.toFixed(3), 8)}${pad(e.checksRatio.toFixed(1), 8)}${pad(e.listingSeconds.toFixed(3), 16)}${pad(e.timingRatio.toFixed(1), 16)}`,
    ),
    '',
    'Stages of the whole run (wall s / CPU s / resident MB at the end of the stage):',
    ...entries.map((e) => `${pad(e.rows.toLocaleString('en-US'), 10)}  ${e.stages.map((s) => `${s.stage} ${s.seconds.toFixed(2)}/${s.cpuSeconds.toFixed(2)}/${s.rssMB}`).join('; ')}`),
    '',
    'ratio (whole): the whole command-line run ÷ papaparse parsing the same file into arrays, wall clock and (CPU) CPU seconds (target ≤ 4; peak ≤ 1,024 MB).',
    'ratio (timing), combined ÷ OLS: intake (from the CSV index) + study days + windows + timing summaries ÷ one OLS pass over the same rows.',
    'decode: reading the file, its CSV index and decodeTable (typed columns) ÷ papaparse parsing the same file (in its own process).',
    'checks ÷ OLS: checkTable on the typed columns + study days + windows + timing summaries ÷ one OLS pass (target ≤ 10);',
    '  the listings\' row objects are made when a sheet or the JSON reads them (listing rows s, counted in the whole run\'s writing).',
    'Each whole run and each papaparse parse ran in a process of its own; peak MB is that process\'s high-water mark of resident memory.',
  ];
  return `${lines.join('\n')}\n`;
}

/** Runs the sizes given (default 100k, 300k, 1M), prints the table and writes bench/whole-latest.json. */
export function mainWhole(sizes: readonly number[]): void {
  const entries = runWholeBench(sizes.length > 0 ? sizes : [100_000, 300_000, 1_000_000]);
  writeFileSync(join(here, 'whole-latest.json'), `${JSON.stringify(entries, null, 2)}\n`);
  process.stdout.write(wholeReport(entries));
  process.stdout.write('Wrote bench/whole-latest.json\n');
}
