/**
 * One pass over the rows for the GEE engine: the rows grouped by participant (a counting sort, so rows may come in
 * any order) and the cross products pooled by cluster size. With an exchangeable working correlation
 * R_i⁻¹ = (I − w_i J)/(1 − α), w_i = α/(1 + (n_i − 1)α) (Sherman–Morrison), every sum the estimating equations need is
 * a global cross product minus Σ_n w_n · (sum over participants of size n), so each iteration costs O(sizes · p²).
 */
import type { Design } from '../design';

export interface ClusterSums {
  readonly p: number;
  readonly nObs: number;
  /** Participants with at least one row. */
  readonly nClusters: number;
  /** X'X (row-major), X'y, y'y over all rows. */
  readonly xtx: Float64Array;
  readonly xty: Float64Array;
  readonly yty: number;
  /** Distinct cluster sizes; per size k: count, S_k = Σ s_i s_i', c_k = Σ s_i Y_i, q_k = Σ Y_i² (s_i = X_i'1, Y_i = 1'y_i). */
  readonly sizes: Int32Array;
  readonly count: Float64Array;
  readonly S: Float64Array;
  readonly c: Float64Array;
  readonly q: Float64Array;
  /** Row indices grouped by participant: participant g's rows are order[start[g] .. start[g + 1]). */
  readonly order: Int32Array;
  readonly start: Int32Array;
}

/**
 * Groups the rows and accumulates the pooled sums. Cost O(N p²) time, O(N + participants) memory.
 * Example: y = [1, 2, 3] of one participant, intercept only -> xtx [3], xty [6], yty 14, sizes [3], S [9], c [18], q [36].
 */
export function clusterSums(y: Float64Array, subject: Int32Array, nSubjects: number, design: Design): ClusterSums {
  const p = design.p;
  const N = y.length;
  const start = new Int32Array(nSubjects + 1);
  for (let r = 0; r < N; r++) start[subject[r]! + 1]! += 1;
  let maxSize = 0;
  for (let g = 0; g < nSubjects; g++) {
    maxSize = Math.max(maxSize, start[g + 1]!);
    start[g + 1] = start[g + 1]! + start[g]!;
  }
  const order = new Int32Array(N);
  const fillAt = Int32Array.from(start.subarray(0, nSubjects));
  for (let r = 0; r < N; r++) order[fillAt[subject[r]!]!++] = r;

  const slot = new Int32Array(maxSize + 1).fill(-1);
  const sizesList: number[] = [];
  for (let g = 0; g < nSubjects; g++) {
    const n = start[g + 1]! - start[g]!;
    if (n > 0 && slot[n] === -1) {
      slot[n] = 0;
      sizesList.push(n);
    }
  }
  sizesList.sort((a, b) => a - b);
  sizesList.forEach((n, k) => (slot[n] = k));
  const K = sizesList.length;
  const count = new Float64Array(K);
  const S = new Float64Array(K * p * p);
  const c = new Float64Array(K * p);
  const q = new Float64Array(K);
  const xtx = new Float64Array(p * p);
  const xty = new Float64Array(p);
  let yty = 0;
  const x = new Float64Array(p);
  const s = new Float64Array(p);
  let nClusters = 0;
  for (let g = 0; g < nSubjects; g++) {
    const a = start[g]!;
    const b = start[g + 1]!;
    if (b === a) continue;
    nClusters++;
    s.fill(0);
    let Y = 0;
    for (let t = a; t < b; t++) {
      const r = order[t]!;
      design.fillRow(r, x);
      const yr = y[r]!;
      Y += yr;
      yty += yr * yr;
      for (let i = 0; i < p; i++) {
        const xi = x[i]!;
        if (xi === 0) continue;
        s[i] = s[i]! + xi;
        xty[i] = xty[i]! + xi * yr;
        for (let j = 0; j <= i; j++) xtx[i * p + j] = xtx[i * p + j]! + xi * x[j]!;
      }
    }
    const k = slot[b - a]!;
    count[k] = count[k]! + 1;
    q[k] = q[k]! + Y * Y;
    for (let i = 0; i < p; i++) {
      const si = s[i]!;
      if (si === 0) continue;
      c[k * p + i] = c[k * p + i]! + si * Y;
      for (let j = 0; j <= i; j++) S[k * p * p + i * p + j] = S[k * p * p + i * p + j]! + si * s[j]!;
    }
  }
  symmetrise(xtx, p);
  for (let k = 0; k < K; k++) symmetrise(S.subarray(k * p * p, (k + 1) * p * p), p);
  return { p, nObs: N, nClusters, xtx, xty, yty, sizes: Int32Array.from(sizesList), count, S, c, q, order, start };
}

/** Copies the lower triangle of a p × p row-major matrix onto the upper one, in place. */
export function symmetrise(a: Float64Array, p: number): void {
  for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) a[j * p + i] = a[i * p + j]!;
}
