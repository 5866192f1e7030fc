/**
 * `npm run bench`: visit timing (intake + windowing) at 10k, 100k and 1,000,000 rows, plus the model engine's
 * entries (bench/model-bench.ts), each beside its baseline measured in the same run. Writes bench/latest.json and
 * prints a table. Sizes can be given as arguments: `npm run bench -- 10000 50000`. Then the hostile-workbook cases
 * (bench/hostile-bench.ts), written to bench/hostile-latest.json; `npm run bench -- hostile` runs only those. The report
 * writer before and after (bench/writer-bench.ts), written to bench/writer-latest.json; `npm run bench -- writer` runs
 * only that (sizes may follow: `npm run bench -- writer 200000`).
 * `npm run bench -- page [rows…]` runs only the browser page's bench (bench/page-bench.ts, bench/page-latest.json).
 * `npm run bench -- whole [sizes]` runs only the whole command-line run against papaparse (bench/whole-run.ts).
 * `npm run bench -- xlsx [rows…]` runs only the .xlsx input's bench (bench/xlsx-bench.ts, bench/xlsx-latest.json).
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runModelBench } from './model-bench';
import { runTimingBench } from './timing-bench';
import { runHostileBench } from './hostile-bench';
import { pageBenchTable, runPageBench } from './page-bench';
import { runWriterBench, writerTable } from './writer-bench';
import { mainWhole } from './whole-run';
import { mainXlsx } from './xlsx-bench';
import type { BenchEntry } from './types';

// `npm run bench -- page [rows…]`: the browser page only (bench/page-bench.ts), at 300,000 and 1,000,000 rows by
// default; writes bench/page-latest.json.
if (process.argv[2] === 'page') {
  const given = process.argv.slice(3).map(Number).filter((n) => Number.isInteger(n) && n > 0);
  const page = await runPageBench(given.length > 0 ? given : [300_000, 1_000_000]);
  writeFileSync(join(dirname(fileURLToPath(import.meta.url)), 'page-latest.json'), `${JSON.stringify(page, null, 2)}\n`);
  process.stdout.write(`${pageBenchTable(page)}\nWrote bench/page-latest.json\n`);
  process.exit(0);
}

const onlyHostile = process.argv.includes('hostile');
const onlyWriter = process.argv.includes('writer');
const sizes = process.argv.slice(2).map(Number).filter((n) => Number.isInteger(n) && n > 0);
const rowsList = sizes.length > 0 ? sizes : [10_000, 100_000, 1_000_000];

// `npm run bench -- xlsx [rows…]`: the command line on an .xlsx listing against the same cells as CSV
// (bench/xlsx-bench.ts), nothing else.
if (process.argv[2] === 'xlsx') {
  await mainXlsx(sizes);
  process.exit(0);
}

// `npm run bench -- whole [sizes]`: the whole command-line run against papaparse (bench/whole-run.ts), nothing else.
if (process.argv.includes('whole')) {
  mainWhole(sizes);
  process.exit(0);
}

const entries: BenchEntry[] = [];
if (onlyWriter) {
  // `npm run bench -- writer [sizes]`: only the report writer, before and after (bench/writer-bench.ts).
  const writer = runWriterBench(sizes.length > 0 ? sizes : undefined);
  writeFileSync(join(dirname(fileURLToPath(import.meta.url)), 'writer-latest.json'), `${JSON.stringify(writer, null, 2)}\n`);
  process.stdout.write(`${writerTable(writer)}\nWrote bench/writer-latest.json\n`);
  process.exit(0);
}

for (const rows of onlyHostile ? [] : rowsList) {
  entries.push(runTimingBench(rows));
  entries.push(...(await runModelBench(rows)));
}

const out = join(dirname(fileURLToPath(import.meta.url)), 'latest.json');
if (!onlyHostile) writeFileSync(out, `${JSON.stringify(entries, null, 2)}\n`);

const pad = (s: string, n: number): string => s.padStart(n);
const lines = [
  `${'name'.padEnd(28)}${pad('rows', 10)}${pad('seconds', 10)}${pad('baseline s', 12)}${pad('ratio', 8)}${pad('rows/s', 12)}${pad('peak MB', 9)}`,
  ...entries.map(
    (e) =>
      `${e.name.padEnd(28)}${pad(String(e.rows), 10)}${pad(e.seconds.toFixed(3), 10)}${pad(e.baselineSeconds.toFixed(3), 12)}${pad(e.ratio.toFixed(2), 8)}${pad(Math.round(e.rows / e.seconds).toLocaleString('en'), 12)}${pad(String(e.peakMB), 9)}`,
  ),
];
process.stdout.write(`${lines.join('\n')}\n`);
process.stdout.write(
  'Baseline of timing-*: one plain pass copying the subject, date, reference date and value cells into typed columns.\n' +
    'peak MB: the process high-water mark of resident memory (it includes the generated cells and earlier sizes).\n' +
    (onlyHostile ? '' : `Wrote ${out}\n`),
);

// The report writer at a 200,000- and a 1,000,000-row run, before and after.
if (!onlyHostile) {
  const writer = runWriterBench();
  writeFileSync(join(dirname(out), 'writer-latest.json'), `${JSON.stringify(writer, null, 2)}\n`);
  process.stdout.write(`\n${writerTable(writer)}\nWrote bench/writer-latest.json\n`);
}

// The hostile workbooks of the reader (each read in a process of its own, so the peak is the case's alone).
const hostile = await runHostileBench();
writeFileSync(join(dirname(out), 'hostile-latest.json'), `${JSON.stringify(hostile, null, 2)}\n`);
process.stdout.write(
  `\n${'hostile .xlsx case'.padEnd(32)}${pad('file KB', 9)}${pad('seconds', 9)}${pad('peak MB', 9)}  outcome\n` +
    hostile.map((h) => `${h.name.padEnd(32)}${pad(String(h.fileKB), 9)}${pad(h.seconds.toFixed(2), 9)}${pad(String(h.peakMB), 9)}  ${h.outcome}`).join('\n') +
    '\npeak MB: the reading process\'s high-water mark of resident memory (Node itself takes ~50 MB). Wrote bench/hostile-latest.json\n',
);
