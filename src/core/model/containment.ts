/**
 * The between/within ("containment") degrees of freedom of the random-intercept model: a column of the design that is
 * constant within every participant (the intercept, the arm indicators, a covariate measured once) is a
 * between-participant column; any other (time, arm × time, a covariate that changes from visit to visit) is a
 * within-participant column. Between-participant terms get participants − (between columns) degrees of freedom,
 * within-participant terms get measurements − participants − (within columns), as in a split-plot analysis of variance
 * (the between/within method for mixed models; common practice, cited from memory). A contrast that involves columns of both kinds gets the smaller of the two (the cautious choice;
 * common practice). Cost O(K p) from the pooled sums; no pass over the rows.
 */
import type { SufficientStats } from './sufficient';

export interface ContainmentDf {
  /** Per design column: true when the column is constant within every participant. */
  readonly between: readonly boolean[];
  readonly betweenDf: number;
  readonly withinDf: number;
  /** The df of a contrast l (original coordinates): betweenDf when l touches only between columns, withinDf when only
   * within columns, the smaller of the two when both. */
  readonly dfOf: (l: ArrayLike<number>) => number;
}

/**
 * A column's within-participant sum of squares is Σ_i Σ_j x_ij² − Σ_i (Σ_j x_ij)²/n_i = X'X_jj − Σ_k (S_k)_jj / n_k;
 * it is zero exactly when the column is constant within every participant. Rounding leaves about ε·X'X_jj, so a
 * remainder below WITHIN_TOL·X'X_jj counts as zero.
 * Example: intercept, arm, time for 4 participants, 3 visits each -> between [true, true, false], betweenDf 4 − 2 = 2,
 * withinDf 12 − 4 − 1 = 7.
 */
export function containmentDf(st: SufficientStats): ContainmentDf {
  const p = st.p;
  const between: boolean[] = [];
  for (let j = 0; j < p; j++) {
    const total = st.xtx[j * p + j]!;
    let pooled = 0;
    for (let k = 0; k < st.sizes.length; k++) pooled += st.S[k * p * p + j * p + j]! / st.sizes[k]!;
    between.push(total - pooled <= WITHIN_TOL * total);
  }
  const nBetween = between.filter((b) => b).length;
  const betweenDf = st.nSubjects - nBetween;
  const withinDf = st.nObs - st.nSubjects - (p - nBetween);
  const dfOf = (l: ArrayLike<number>): number => {
    let usesBetween = false;
    let usesWithin = false;
    for (let j = 0; j < p; j++) {
      if (l[j] === 0) continue;
      if (between[j]) usesBetween = true;
      else usesWithin = true;
    }
    if (usesBetween && usesWithin) return Math.min(betweenDf, withinDf);
    return usesWithin ? withinDf : betweenDf;
  };
  return { between, betweenDf, withinDf, dfOf };
}

/** Relative size below which a within-participant sum of squares is rounding (about 1e4 · ε, ε = 2.2e-16). */
const WITHIN_TOL = 1e-12;
