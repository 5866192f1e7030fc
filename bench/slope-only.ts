/**
 * The slope model entry of the model benchmark alone (issue 11: target within 5 × one OLS pass at 1,000,000 rows):
 * the random intercept and slope fit with Kenward–Roger inference against one OLS pass over the same invented data,
 * both the best of `runs` in the same run. Usage: tsx bench/slope-only.ts [rows] [runs]; prints one JSON line.
 * Besides wall-clock seconds it gives the process's CPU seconds (user + system, process.cpuUsage) of the same best
 * runs, which a machine shared with other work inflates far less than the wall clock; the load average is printed
 * before and after.
 */
import { loadavg } from 'node:os';
import { fitRandomSlope, type FitOptions } from '../src/core/model';
import { benchData, olsPass } from './model-bench';

const rows = Number(process.argv[2] ?? 1_000_000);
const runs = Number(process.argv[3] ?? 3);
const visits = [85, 169, 253, 337].map((day) => ({ label: `Week ${(day - 1) / 7}`, day }));
const options: FitOptions = { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'month', contrastDays: visits };
const seconds = (t0: bigint): number => Number(process.hrtime.bigint() - t0) / 1e9;
function best(f: () => unknown): { wall: number; cpu: number } {
  let wall = Infinity;
  let cpu = Infinity;
  for (let k = 0; k < runs; k++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    f();
    wall = Math.min(wall, seconds(t0));
    const c = process.cpuUsage(c0);
    cpu = Math.min(cpu, (c.user + c.system) / 1e6);
  }
  return { wall, cpu };
}
const loadBefore = loadavg()[0]!;
fitRandomSlope(benchData(5_000, 1, 0.15), options);
olsPass(benchData(5_000, 1, 0.15));
const data = benchData(rows, 2026, 0.15);
const ols = best(() => olsPass(data));
const fit = best(() => {
  const f = fitRandomSlope(data, options);
  if (f.status === 'failed') throw new Error(`slope fit failed: ${f.message}`);
});
const round = (v: number): number => Number(v.toPrecision(4));
console.log(
  JSON.stringify({
    name: 'slope model fit, KR',
    rows: data.y.length,
    seconds: fit.wall,
    baselineSeconds: ols.wall,
    ratio: fit.wall / ols.wall,
    cpuSeconds: fit.cpu,
    baselineCpuSeconds: ols.cpu,
    cpuRatio: fit.cpu / ols.cpu,
    loadAverage: [round(loadBefore), round(loadavg()[0]!)],
  }),
);
