/**
 * Visit-timing benchmark: intake (readTable) + windowing (computeStudyDays, classifyVisits) on generated data,
 * against a baseline of one plain pass over the same cells (each row's subject, date, reference date and value cell
 * copied into typed columns, subjects numbered through a Map — the least any reader of these columns must do).
 */
import type { CellValue } from '../src/core/intake/types';
import { readTable } from '../src/core/intake';
import { classifyVisits, computeStudyDays } from '../src/core/schedule';
import { generateTrial, HEADER, SCHEDULE } from '../scripts/make-demo-data';
import type { BenchEntry } from './types';

/** Cells of a complete invented trial with rows/5 subjects × 5 visits, dates as 1900-system serials (as Excel gives
 * them), no missed, extra or repeat visits, so the row count is exact. */
export function makeBenchCells(rows: number): CellValue[][] {
  const cells: CellValue[][] = [[...HEADER]];
  generateTrial(
    {
      patients: Math.ceil(rows / SCHEDULE.length),
      seed: 7,
      firstRandomised: 45663,
      enrolmentDays: 270,
      cutoff: 1e9,
      missRate: 0,
      dropoutRate: 0,
      extraRate: 0,
      repeatRate: 0,
    },
    (r) => {
      if (cells.length <= rows) cells.push([r.subject, r.site, r.arm, r.visit, r.date, r.rand, r.value]);
    },
  );
  return cells;
}

/** Peak resident memory of the process so far, in MB (the kernel's high-water mark, so it never goes down). */
export function peakMB(): number {
  return Math.round(process.resourceUsage().maxRSS / 1024);
}

/** One plain pass: the subject, date, reference date and value cells of every row copied into typed columns, with
 * subjects numbered through a Map — what any reader of these columns must do at least, with no checks. */
function plainPass(cells: readonly (readonly CellValue[])[]): number {
  const n = cells.length - 1;
  const subject = new Int32Array(n);
  const date = new Float64Array(n);
  const reference = new Float64Array(n);
  const value = new Float64Array(n);
  const ids = new Map<string, number>();
  for (let i = 0; i < n; i++) {
    const r = cells[i + 1]!;
    const s = String(r[0]);
    let k = ids.get(s);
    if (k === undefined) {
      k = ids.size;
      ids.set(s, k);
    }
    subject[i] = k;
    date[i] = r[4] as number;
    reference[i] = r[5] as number;
    value[i] = r[6] as number;
  }
  return ids.size + date[n - 1]! - reference[n - 1]! + value[n - 1]! + subject[n - 1]!;
}

const seconds = (t0: bigint): number => Number(process.hrtime.bigint() - t0) / 1e9;

export function runTimingBench(rows: number): BenchEntry {
  const cells = makeBenchCells(rows);
  const schedule = SCHEDULE.map((v) => ({ label: v.visit, targetDay: v.targetDay, before: v.before, after: v.after }));
  let t0 = process.hrtime.bigint();
  const sink = plainPass(cells);
  const baselineSeconds = seconds(t0);
  t0 = process.hrtime.bigint();
  const read = readTable(cells, { sheet: 'Bench', topLeft: 'A1', dateSystem: 1900, mode: 'blinded' });
  if (!read.ok) throw new Error(`bench data failed intake: ${read.issues[0]?.message ?? ''}`);
  const place = { sheet: 'Bench', topLeft: 'A1' };
  const days = computeStudyDays(read.table, schedule, place);
  const timing = classifyVisits(read.table, days, schedule, { place });
  const secondsTaken = seconds(t0);
  if (timing.counts.onTime + timing.counts.early + timing.counts.late === 0 || !Number.isFinite(sink)) {
    throw new Error('bench run classified nothing');
  }
  return {
    name: `timing-${rows}`,
    rows,
    seconds: secondsTaken,
    baselineSeconds,
    ratio: secondsTaken / baselineSeconds,
    peakMB: peakMB(),
  };
}
