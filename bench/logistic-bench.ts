/**
 * The yes/no model (random-intercept logistic, adaptive Gauss–Hermite quadrature with 25 points, the check at 50) on
 * the model bench's invented data (bench/model-bench.ts: rows/5 participants, 5 visits about 12 weeks apart with a few
 * days' jitter, two arms; yes = value below 55), against one OLS pass over the same rows, each the best of `runs`.
 * Alone: `npx tsx bench/logistic-run.ts [rows] [runs]`; `npm run bench` includes the same entry at every size.
 */
import type { ModelData } from '../src/core/model';
import { fitLogistic, type LogisticFit } from '../src/core/model/logistic';
import type { BenchEntry } from './types';

const visits = [85, 169, 253, 337].map((day) => ({ label: `Week ${(day - 1) / 7}`, day }));
const seconds = (t0: bigint): number => Number(process.hrtime.bigint() - t0) / 1e9;
const peakMB = (): number => Math.round(process.resourceUsage().maxRSS / 1024);

/** yes = value below 55. */
export function yesNoData(data: ModelData): ModelData {
  return { ...data, y: data.y.map((v) => (v < 55 ? 1 : 0)) };
}

/** The yes/no model's entry: best of `runs` fits (after one on `warm`) against `olsSeconds`; throws when the fit fails. */
export function yesNoEntry(data: ModelData, warm: ModelData, olsSeconds: number, runs: number): { entry: BenchEntry; fit: LogisticFit; times: number[]; cpuTimes: number[] } {
  const yesNo = yesNoData(data);
  fitLogistic(yesNoData(warm), { level: 0.95, timeUnit: 'month', contrastDays: visits });
  const times: number[] = [];
  const cpuTimes: number[] = [];
  let fit: LogisticFit | undefined;
  for (let k = 0; k < runs; k++) {
    const t0 = process.hrtime.bigint();
    const c0 = process.cpuUsage();
    fit = fitLogistic(yesNo, { level: 0.95, timeUnit: 'month', contrastDays: visits });
    times.push(seconds(t0));
    const c = process.cpuUsage(c0);
    cpuTimes.push((c.user + c.system) / 1e6);
  }
  if (fit === undefined || fit.status === 'failed') throw new Error(`benchmark yes/no model failed: ${fit?.message ?? 'no run'}`);
  const best = Math.min(...times);
  return { entry: { name: 'yes/no model, 25 points', rows: data.y.length, seconds: best, baselineSeconds: olsSeconds, ratio: best / olsSeconds, peakMB: peakMB() }, fit, times, cpuTimes };
}

/** Participants with distinct (design rows, answers): arm, exact times and answers here. */
export function distinctPatterns(data: ModelData): number {
  const yes = yesNoData(data).y;
  const keys = new Set<string>();
  let key = '';
  for (let r = 0; r < yes.length; r++) {
    if (r > 0 && data.subject[r] !== data.subject[r - 1]) {
      keys.add(key);
      key = '';
    }
    key += `${data.armIndex?.[r] ?? 0}:${data.time[r]}:${yes[r]};`;
  }
  keys.add(key);
  return keys.size;
}
