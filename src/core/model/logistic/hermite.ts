/**
 * Gauss–Hermite nodes and weights for ∫ e^{−x²} f(x) dx ≈ Σ_k w_k f(x_k), by the Golub–Welsch method (Golub & Welsch
 * 1969): the nodes are the eigenvalues of the symmetric tridiagonal Jacobi matrix with zero diagonal and off-diagonal
 * b_k = √(k/2), k = 1 … n − 1; the weight of node x is μ₀ v₀², μ₀ = √π, v the normalised eigenvector. The eigenvalues
 * come from the implicit symmetric QR iteration with Wilkinson shifts (Golub & Van Loan 2013, §8.3); each node is then
 * polished by Newton steps on the orthonormal polynomial q_n, and the eigenvector, whose entries are known to be
 * q_0(x), …, q_{n−1}(x), gives v₀² = 1 / Σ_j q_j(x)², which keeps full relative precision in the tiny outer weights.
 * Cost O(n²).
 */

export interface HermiteRule {
  /** Nodes in increasing order. */
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

/**
 * Example: hermiteRule(2) -> nodes ±0.70710678, weights 0.88622693 each (= √π / 2); hermiteRule(1) -> [0], [√π].
 */
export function hermiteRule(n: number): HermiteRule {
  if (!Number.isInteger(n) || n < 1 || n > 200) throw new RangeError(`the number of nodes must be an integer from 1 to 200, got ${n}.`);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  for (let k = 1; k < n; k++) e[k - 1] = Math.sqrt(k / 2);
  tridiagonalEigenvalues(d, e, n);
  const nodes = Float64Array.from(d).sort();
  const weights = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let x = nodes[k]!;
    for (let step = 0; step < 3; step++) {
      const { qn, dqn } = orthonormal(x, n);
      if (dqn === 0) break;
      x -= qn / dqn;
    }
    nodes[k] = x;
    weights[k] = Math.sqrt(Math.PI) / orthonormal(x, n).sumSq;
  }
  // Symmetry about zero is exact for this rule; enforce it against rounding.
  for (let k = 0; k < Math.floor(n / 2); k++) {
    const x = (nodes[n - 1 - k]! - nodes[k]!) / 2;
    const w = (weights[k]! + weights[n - 1 - k]!) / 2;
    nodes[k] = -x;
    nodes[n - 1 - k] = x;
    weights[k] = w;
    weights[n - 1 - k] = w;
  }
  if (n % 2 === 1) nodes[(n - 1) / 2] = 0;
  return { nodes, weights };
}

/**
 * q_0 … q_n at x (orthonormal for the weight e^{−x²}/√π: q_0 = 1, b_{k+1} q_{k+1} = x q_k − b_k q_{k−1}), with
 * Σ_{j<n} q_j², q_n and its derivative.
 */
function orthonormal(x: number, n: number): { qn: number; dqn: number; sumSq: number } {
  let qPrev = 0;
  let q = 1;
  let dPrev = 0;
  let dq = 0;
  let sumSq = 0;
  for (let k = 0; k < n; k++) {
    sumSq += q * q;
    const bk = Math.sqrt(k / 2);
    const bNext = Math.sqrt((k + 1) / 2);
    const qNext = (x * q - bk * qPrev) / bNext;
    const dNext = (q + x * dq - bk * dPrev) / bNext;
    qPrev = q;
    q = qNext;
    dPrev = dq;
    dq = dNext;
  }
  return { qn: q, dqn: dq, sumSq };
}

/**
 * Eigenvalues of the symmetric tridiagonal matrix with diagonal d and off-diagonal e (e[k] couples k and k + 1),
 * in place into d, by implicit QR steps with Wilkinson shifts and deflation. Cost O(n²).
 */
function tridiagonalEigenvalues(d: Float64Array, e: Float64Array, n: number): void {
  let hi = n - 1;
  let guard = 0;
  while (hi > 0) {
    if (++guard > 100 * n) throw new Error('tridiagonal eigenvalues did not converge.');
    // Deflate negligible off-diagonal entries at the bottom.
    if (Math.abs(e[hi - 1]!) <= Number.EPSILON * (Math.abs(d[hi - 1]!) + Math.abs(d[hi]!))) {
      e[hi - 1] = 0;
      hi--;
      continue;
    }
    let lo = hi - 1;
    while (lo > 0 && Math.abs(e[lo - 1]!) > Number.EPSILON * (Math.abs(d[lo - 1]!) + Math.abs(d[lo]!))) lo--;
    // Wilkinson shift from the trailing 2 × 2 block.
    const delta = (d[hi - 1]! - d[hi]!) / 2;
    const b2 = e[hi - 1]! * e[hi - 1]!;
    const mu = d[hi]! - b2 / (delta + (delta >= 0 ? 1 : -1) * Math.sqrt(delta * delta + b2));
    let x = d[lo]! - mu;
    let z = e[lo]!;
    for (let k = lo; k < hi; k++) {
      const r = Math.hypot(x, z);
      const c = x / r;
      const s = -z / r;
      if (k > lo) e[k - 1] = r;
      const dk = d[k]!;
      const dk1 = d[k + 1]!;
      const ek = e[k]!;
      // G' T G on rows/columns k, k + 1.
      d[k] = c * c * dk - 2 * c * s * ek + s * s * dk1;
      d[k + 1] = s * s * dk + 2 * c * s * ek + c * c * dk1;
      e[k] = c * s * (dk - dk1) + (c * c - s * s) * ek;
      if (k < hi - 1) {
        x = e[k]!;
        z = -s * e[k + 1]!;
        e[k + 1] = c * e[k + 1]!;
      }
    }
  }
}
