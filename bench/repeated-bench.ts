/**
 * Benchmark of the repeated-measures model (unstructured covariance across visits, Kenward–Roger) against one
 * ordinary least squares pass over the same rows and the same fixed-effect columns (intercept, arm, 4 visit terms,
 * 4 arm × visit terms: X'X and X'y accumulation, then a Cholesky solve). Target: within 10 × the OLS pass at
 * 1,000,000 rows. Data: invented eGFR-like rows (about rows/4.2 participants, 5 visits 12 weeks apart, two arms, a
 * participant effect plus noise), with about a third of participants leaving after a random visit so there are
 * several missingness patterns. The timed fit
 * includes turning the rows into one row per participant.
 */
import { fitRepeated, type RepeatedData } from '../src/core/model/repeated';
import { mulberry32 as seeded } from '../scripts/random';
import type { BenchEntry } from './types';
import { best, solveNormalEquations } from './timing';

const VISITS = ['Week 0', 'Week 12', 'Week 24', 'Week 36', 'Week 48'];

interface LongRows {
  readonly y: Float64Array;
  readonly subject: Int32Array;
  readonly visit: Int32Array;
  readonly arm: Int32Array;
  readonly nSubjects: number;
}

/** Invented rows with dropout: participant i keeps visits 0..last_i (last_i < 4 for about a third). */
function rowsWithDropout(rows: number, seed: number): LongRows {
  const u = seeded(seed);
  const z = (): number => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  // 4.175 visits per participant on average (0.67 · 5 + 0.33 · 2.5), so the rows come out near `rows`.
  const nSubjects = Math.max(2, Math.round(rows / 4.175));
  const y: number[] = [];
  const subject: number[] = [];
  const visit: number[] = [];
  const arm: number[] = [];
  for (let i = 0; i < nSubjects; i++) {
    const a = i % 2;
    const ui = 10 * z();
    const last = u() < 0.33 ? Math.floor(u() * 4) : 4;
    for (let v = 0; v <= last; v++) {
      y.push(60 + ui - 1.3 * v + a * 0.6 * v + 4 * z());
      subject.push(i);
      visit.push(v);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), subject: Int32Array.from(subject), visit: Int32Array.from(visit), arm: Int32Array.from(arm), nSubjects };
}

function wide(l: LongRows): RepeatedData {
  const V = VISITS.length;
  const y = new Float64Array(l.nSubjects * V).fill(NaN);
  const armIndex = new Int32Array(l.nSubjects);
  for (let r = 0; r < l.y.length; r++) {
    y[l.subject[r]! * V + l.visit[r]!] = l.y[r]!;
    armIndex[l.subject[r]!] = l.arm[r]!;
  }
  return { visits: VISITS, nSubjects: l.nSubjects, y, armIndex, arms: ['Placebo', 'Drug'], baseline: null };
}

/** OLS over the same rows with the model's 10 fixed-effect columns (reference-level coding). */
function olsCells(l: LongRows): Float64Array {
  const p = 10;
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  const x = new Float64Array(p);
  for (let r = 0; r < l.y.length; r++) {
    x.fill(0);
    const a = l.arm[r]!;
    const v = l.visit[r]!;
    x[0] = 1;
    x[1] = a;
    if (v > 0) {
      x[1 + v] = 1;
      if (a === 1) x[5 + v] = 1;
    }
    const yr = l.y[r]!;
    for (let i = 0; i < p; i++) {
      const xi = x[i]!;
      if (xi === 0) continue;
      xty[i] = xty[i]! + xi * yr;
      for (let j = 0; j <= i; j++) xtx[i * p + j] = xtx[i * p + j]! + xi * x[j]!;
    }
  }
  return solveNormalEquations(xtx, xty, p);
}



/** The repeated-measures entry at `rows` generated rows (best of `runs`). */
export function runRepeatedBench(rows: number, runs: number, peakMB: () => number): BenchEntry {
  const warm = rowsWithDropout(5_000, 3);
  fitRepeated(wide(warm), { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 });
  olsCells(warm);
  const l = rowsWithDropout(rows, 2026);
  const ols = best(runs, () => olsCells(l));
  const fit = best(runs, () => fitRepeated(wide(l), { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 }));
  if (fit.value.status === 'failed') throw new Error(`benchmark fit failed: ${fit.value.message}`);
  return { name: 'repeated (UN), KR', rows: l.y.length, seconds: fit.seconds, baselineSeconds: ols.seconds, ratio: fit.seconds / ols.seconds, peakMB: peakMB() };
}
