/** Numerical rank of a design from its cross-product matrix, naming the dependent columns. */

export interface RankCheck {
  readonly rank: number;
  /** Empty when of full rank; otherwise the indices of one dependent set of columns (a null vector's support). */
  readonly dependent: readonly number[];
}

/**
 * Checks X'X for linear dependence with a diagonally pivoted Cholesky factorisation of the scaled cross-product
 * matrix D^-1/2 X'X D^-1/2 (unit diagonal), Higham 2002, Accuracy and Stability of Numerical Algorithms (Cholesky with complete pivoting).
 * A remaining pivot below `tol` (default 1e-10, well above rounding in a unit-diagonal matrix yet far below any real
 * signal) marks a dependent column; the columns with non-negligible weight in the corresponding null vector are
 * returned. Cost O(p^3).
 * Example: for X = [1 1; 1 1] (two equal columns) -> { rank: 1, dependent: [0, 1] }.
 */
export function checkRank(xtx: Float64Array, p: number, tol = 1e-10): RankCheck {
  const a = new Float64Array(p * p);
  const scale = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    const d = xtx[i * p + i]!;
    scale[i] = d > 0 ? 1 / Math.sqrt(d) : 0;
  }
  for (let i = 0; i < p; i++) for (let j = 0; j < p; j++) a[i * p + j] = xtx[i * p + j]! * scale[i]! * scale[j]!;
  // A column of zeros is dependent on its own.
  for (let i = 0; i < p; i++) if (scale[i] === 0) return { rank: p - 1, dependent: [i] };

  const perm = Array.from({ length: p }, (_, i) => i);
  const l = new Float64Array(p * p); // row-major, in pivoted order
  const diag = new Float64Array(p);
  for (let i = 0; i < p; i++) diag[i] = a[i * p + i]!;
  let rank = 0;
  for (let k = 0; k < p; k++) {
    let best = k;
    for (let i = k + 1; i < p; i++) if (diag[perm[i]!]! > diag[perm[best]!]!) best = i;
    if (!(diag[perm[best]!]! > tol)) break;
    [perm[k], perm[best]] = [perm[best]!, perm[k]!];
    for (let m = 0; m < k; m++) {
      const tmp = l[k * p + m]!;
      l[k * p + m] = l[best * p + m]!;
      l[best * p + m] = tmp;
    }
    const pk = perm[k]!;
    const lkk = Math.sqrt(diag[pk]!);
    l[k * p + k] = lkk;
    for (let i = k + 1; i < p; i++) {
      const pi = perm[i]!;
      let s = a[pi * p + pk]!;
      for (let m = 0; m < k; m++) s -= l[i * p + m]! * l[k * p + m]!;
      const lik = s / lkk;
      l[i * p + k] = lik;
      diag[pi] = diag[pi]! - lik * lik;
    }
    rank++;
  }
  if (rank === p) return { rank, dependent: [] };
  // Null vector: the first dropped column d expressed through the kept ones K. With A_KK = L11 L11' and
  // A_Kd = L11 l_d (l_d = row r of L), A_KK c = A_Kd reduces to L11' c = l_d (back substitution).
  const r = rank;
  const coef = new Float64Array(r);
  for (let i = r - 1; i >= 0; i--) {
    let s = l[r * p + i]!;
    for (let m = i + 1; m < r; m++) s -= l[m * p + i]! * coef[m]!;
    coef[i] = s / l[i * p + i]!;
  }
  const dependent = [perm[r]!];
  for (let i = 0; i < r; i++) if (Math.abs(coef[i]!) > 1e-6) dependent.push(perm[i]!);
  dependent.sort((x, y) => x - y);
  return { rank, dependent };
}
