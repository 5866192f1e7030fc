/**
 * `npm run bench -- xlsx [rows…]`: the command line reading an .xlsx listing (issue 12, item 5). For each size (data
 * rows; default 100,000 and 1,048,575, i.e. a full 1,048,576-row sheet with its header) it writes an invented visits
 * sheet (the demo trial's generator, bench/whole-run-data.ts's three arms and twelve sites; columns participant, site,
 * arm, visit, visit date and reference date as date serials under a date style, value; texts as shared strings, as a
 * spreadsheet program stores them) with test/support/sheetWorkbook.ts, and the same cells as a CSV file (ISO 8601
 * dates). Then, each in a process of its own (bench/cli-child.mjs over build/cli.mjs, LONGIPANE_PROFILE=1):
 *   (a) the baseline: the whole command-line run on the CSV file (unblinded, --out and --json);
 *   (b) the same run on the .xlsx file;
 * best of `runs` each (default 2 up to 300,000 rows, 1 above). Prints seconds, CPU seconds, peak resident MB, the
 * "read data file" stage (reading the file into cells) and intake ("reading"), file MB and sheet XML MB, and the
 * ratio (b) ÷ (a). Target (issue 12): (b) at 1,048,576 rows ≤ 20 s and ≤ 1.5 GB. Writes bench/xlsx-latest.json.
 * Needs `npm run build:cli` first.
 */
import { closeSync, existsSync, mkdtempSync, openSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { tmpdir, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { dayNumber, DEMO_OPTIONS, generateTrial, HEADER, isoDate } from '../scripts/make-demo-data';
import { benchScheduleCsv } from './whole-run-data';
import { cliChild, type StageLine } from './whole-run';
import { sheetWorkbook, type SheetRow } from '../test/support/sheetWorkbook';

const here = dirname(fileURLToPath(import.meta.url));

interface RunFigures {
  readonly seconds: number;
  readonly cpuSeconds: number;
  readonly peakMB: number;
  /** "read data file": the file's bytes to cells. */
  readonly readSeconds: number;
  readonly readCpuSeconds: number;
  /** "reading": intake, cells to typed columns. */
  readonly intakeSeconds: number;
  readonly stages: readonly StageLine[];
}

export interface XlsxBenchEntry {
  readonly rows: number;
  readonly participants: number;
  readonly xlsxMB: number;
  readonly sheetXmlMB: number;
  readonly sharedStringsMB: number;
  readonly csvMB: number;
  readonly csv: RunFigures;
  readonly xlsx: RunFigures;
  /** Wall-clock and CPU ratios of the .xlsx run to the CSV run. */
  readonly ratio: number;
  readonly cpuRatio: number;
  readonly loadAverage: number;
}

/** The invented listing's rows, kept compactly (the texts are shared string objects). */
interface Listing {
  readonly subject: string[];
  readonly site: string[];
  readonly arm: string[];
  readonly visit: string[];
  readonly date: Float64Array;
  readonly rand: Float64Array;
  readonly value: Float64Array;
  readonly participants: number;
}

/** `rows` data rows of the demo trial's generator, seeded, with the whole-run bench's three arms. */
function listing(rows: number): Listing {
  const l: Listing = { subject: [], site: [], arm: [], visit: [], date: new Float64Array(rows), rand: new Float64Array(rows), value: new Float64Array(rows), participants: 0 };
  let n = 0;
  let participants = 0;
  let last = '';
  generateTrial(
    { ...DEMO_OPTIONS, patients: Math.ceil(rows / 4.35) + 1000, seed: 20261202, firstRandomised: dayNumber('2024-01-08'), enrolmentDays: 730, cutoff: dayNumber('2026-06-30') },
    (r) => {
      if (n >= rows) return;
      if (r.subject !== last) {
        last = r.subject;
        participants++;
      }
      const k = Number(r.subject.slice(-6));
      l.subject.push(r.subject);
      l.site.push(r.site);
      l.arm.push(r.arm === 'Placebo' ? 'Placebo' : k % 2 === 0 ? 'Active high' : 'Active low');
      l.visit.push(r.visit);
      l.date[n] = r.date;
      l.rand[n] = r.rand;
      l.value[n] = r.value;
      n++;
    },
  );
  if (n < rows) throw new Error(`the generator gave ${n} rows, fewer than ${rows}`);
  return { ...l, participants };
}

function* sheetRows(l: Listing): Generator<SheetRow> {
  yield { row: 1, cells: HEADER };
  const rows = l.date.length;
  for (let i = 0; i < rows; i++) {
    yield { row: i + 2, cells: [l.subject[i], l.site[i], l.arm[i], l.visit[i], { date: l.date[i]! }, { date: l.rand[i]! }, l.value[i]] };
  }
}

function writeCsv(path: string, l: Listing): void {
  const fd = openSync(path, 'w');
  let piece = `${HEADER.join(',')}\n`;
  for (let i = 0; i < l.date.length; i++) {
    piece += `${l.subject[i]},${l.site[i]},${l.arm[i]},${l.visit[i]},${isoDate(l.date[i]!)},${isoDate(l.rand[i]!)},${l.value[i]}\n`;
    if (piece.length > 1 << 20) {
      writeSync(fd, piece);
      piece = '';
    }
  }
  writeSync(fd, piece);
  closeSync(fd);
}

/** One whole command-line run in a child process (whole-run.ts's cliChild), with the read and intake stages picked out. */
function cliRun(args: readonly string[]): RunFigures {
  const { stages, ...total } = cliChild(args);
  const stage = (name: string): StageLine | undefined => stages.find((s) => s.stage === name);
  return {
    seconds: total.seconds,
    cpuSeconds: total.cpuSeconds,
    peakMB: total.peakMB,
    readSeconds: stage('read data file')?.seconds ?? NaN,
    readCpuSeconds: stage('read data file')?.cpuSeconds ?? NaN,
    intakeSeconds: stage('reading')?.seconds ?? NaN,
    stages,
  };
}

/** The best (fastest wall clock) of `runs` runs; its peak is the largest seen, so memory is not understated. */
function bestRun(runs: number, args: readonly string[]): RunFigures {
  let bestR: RunFigures | null = null;
  let peak = 0;
  for (let k = 0; k < runs; k++) {
    const r = cliRun(args);
    peak = Math.max(peak, r.peakMB);
    if (bestR === null || r.seconds < bestR.seconds) bestR = r;
  }
  return { ...bestR!, peakMB: peak };
}

export async function runXlsxBench(sizes: readonly number[], runsGiven?: number): Promise<XlsxBenchEntry[]> {
  if (!existsSync(join(here, '..', 'build', 'cli.mjs'))) throw new Error('build the command line first: npm run build:cli');
  const dir = mkdtempSync(join(tmpdir(), 'longipane-xlsx-bench-'));
  const entries: XlsxBenchEntry[] = [];
  try {
    const schedule = join(dir, 'schedule.csv');
    writeFileSync(schedule, benchScheduleCsv());
    for (const rows of sizes) {
      const l = listing(rows);
      const name = `visits-${rows}`;
      const xlsx = join(dir, `${name}.xlsx`);
      const csv = join(dir, `${name}.csv`);
      const parts = new Map<string, number>();
      writeFileSync(xlsx, await sheetWorkbook(() => sheetRows(l), { sheetName: 'Visits', onPart: (p, b) => parts.set(p, b) }));
      writeCsv(csv, l);
      const runs = runsGiven ?? (rows <= 300_000 ? 2 : 1);
      const common = ['--schedule', schedule, '--unblinded', '--reference-arm', 'Placebo'];
      const csvRun = bestRun(runs, ['analyze', '--data', csv, ...common, '--out', join(dir, 'csv.xlsx'), '--json', join(dir, 'csv.json')]);
      const xlsxRun = bestRun(runs, ['analyze', '--data', xlsx, ...common, '--out', join(dir, 'out.xlsx'), '--json', join(dir, 'out.json')]);
      entries.push({
        rows,
        participants: l.participants,
        xlsxMB: statSync(xlsx).size / 1048576,
        sheetXmlMB: (parts.get('xl/worksheets/sheet1.xml') ?? 0) / 1048576,
        sharedStringsMB: (parts.get('xl/sharedStrings.xml') ?? 0) / 1048576,
        csvMB: statSync(csv).size / 1048576,
        csv: csvRun,
        xlsx: xlsxRun,
        ratio: xlsxRun.seconds / csvRun.seconds,
        cpuRatio: xlsxRun.cpuSeconds / csvRun.cpuSeconds,
        loadAverage: loadavg()[0]!,
      });
      for (const f of [xlsx, csv, 'csv.xlsx', 'csv.json', 'out.xlsx', 'out.json']) rmSync(f.includes('/') ? f : join(dir, f), { force: true });
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return entries;
}

/** The table `npm run bench -- xlsx` prints. */
export function xlsxReport(entries: readonly XlsxBenchEntry[]): string {
  const pad = (s: string, n: number): string => s.padStart(n);
  const f = (n: number, d = 2): string => n.toFixed(d);
  const lines = [
    'whole command-line run (unblinded, --out and --json) on an .xlsx listing, against the same cells as CSV',
    `${pad('rows', 10)}${pad('xlsx MB', 9)}${pad('sheet MB', 10)}${pad('csv s', 8)}${pad('(CPU)', 7)}${pad('peak', 7)}${pad('xlsx s', 8)}${pad('(CPU)', 7)}${pad('peak', 7)}${pad('read s', 8)}${pad('intake s', 10)}${pad('ratio', 7)}${pad('(CPU)', 7)}${pad('load', 6)}`,
    ...entries.map(
      (e) =>
        `${pad(e.rows.toLocaleString('en-US'), 10)}${pad(f(e.xlsxMB, 1), 9)}${pad(f(e.sheetXmlMB, 1), 10)}${pad(f(e.csv.seconds), 8)}${pad(f(e.csv.cpuSeconds), 7)}${pad(String(e.csv.peakMB), 7)}${pad(f(e.xlsx.seconds), 8)}${pad(f(e.xlsx.cpuSeconds), 7)}${pad(String(e.xlsx.peakMB), 7)}${pad(f(e.xlsx.readSeconds), 8)}${pad(f(e.xlsx.intakeSeconds), 10)}${pad(f(e.ratio), 7)}${pad(f(e.cpuRatio), 7)}${pad(f(e.loadAverage, 1), 6)}`,
    ),
    '',
    'rows: data rows (plus the header). csv / xlsx: the whole run on each file, wall s, (CPU s), peak resident MB of its process.',
    'read s: the .xlsx run\'s "read data file" stage (inflate + scan the sheet into cells); intake s: its "reading" stage.',
    'ratio: xlsx run ÷ csv run. Target (issue 12 item 5): the .xlsx run at 1,048,576 rows ≤ 20 s and ≤ 1,536 MB.',
  ];
  return `${lines.join('\n')}\n`;
}

/** `npm run bench -- xlsx [rows…]`: runs, prints and writes bench/xlsx-latest.json. */
export async function mainXlsx(sizes: readonly number[]): Promise<void> {
  const runsArg = process.env.LONGIPANE_BENCH_RUNS;
  const runs = runsArg === undefined ? undefined : Math.max(1, Number(runsArg) || 1);
  const entries = await runXlsxBench(sizes.length > 0 ? sizes : [100_000, 1_048_575], runs);
  writeFileSync(join(here, 'xlsx-latest.json'), `${JSON.stringify(entries, null, 2)}\n`);
  process.stdout.write(xlsxReport(entries));
  process.stdout.write('Wrote bench/xlsx-latest.json\n');
}
