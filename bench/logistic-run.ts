/**
 * `npx tsx bench/logistic-run.ts [rows] [runs]`: the yes/no model alone (bench/logistic-bench.ts) at `rows` (default
 * 1,000,000) rows, best of `runs` (default 3), against the best of five OLS passes over the same rows; prints the
 * figures and the number of distinct participant patterns (arm, exact times, answers) and writes
 * bench/logistic-latest.json.
 */
import { writeFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { distinctPatterns, yesNoEntry } from './logistic-bench';
import { benchData, olsPass } from './model-bench';

const seconds = (t0: bigint): number => Number(process.hrtime.bigint() - t0) / 1e9;
const rows = Number(process.argv[2] ?? 1_000_000);
const runs = Number(process.argv[3] ?? 3);
const data = benchData(rows);
olsPass(benchData(5_000, 1));
let ols = Infinity;
for (let k = 0; k < 5; k++) {
  const t0 = process.hrtime.bigint();
  olsPass(data);
  ols = Math.min(ols, seconds(t0));
}
const { entry, fit, times, cpuTimes } = yesNoEntry(data, benchData(5_000, 1), ols, runs);
const patterns = distinctPatterns(data);
const out = { ...entry, runs: times, cpuSeconds: cpuTimes, loadAverage: loadavg(), participants: data.nSubjects, patterns, iterations: fit.iterations, logLik: fit.logLik, quadratureCheck: fit.quadratureCheck, date: new Date().toISOString() };
writeFileSync(join(dirname(fileURLToPath(import.meta.url)), 'logistic-latest.json'), `${JSON.stringify(out, null, 2)}\n`);
process.stdout.write(
  `yes/no model, ${entry.rows.toLocaleString('en')} rows (${data.nSubjects.toLocaleString('en')} participants, ${patterns.toLocaleString('en')} distinct patterns)\n` +
    `fit: best of ${runs} ${entry.seconds.toFixed(2)} s (runs ${times.map((t) => t.toFixed(2)).join(', ')}; CPU ${cpuTimes.map((t) => t.toFixed(2)).join(', ')} s); one OLS pass ${ols.toFixed(4)} s; ratio ${entry.ratio.toFixed(0)}\n` +
    `iterations ${fit.iterations}, log-likelihood ${fit.logLik.toFixed(4)}, peak ${entry.peakMB} MB. Wrote bench/logistic-latest.json\n`,
);

