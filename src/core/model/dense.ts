/**
 * Small dense symmetric linear algebra on row-major Float64Array matrices (p x p, p small). Hand-written for the hot
 * paths of the model; each routine allocates only its result.
 */

/**
 * Cholesky factor L (lower, row-major) of a symmetric positive definite matrix, or null when a pivot is not positive.
 * Golub & Van Loan 2013, Matrix Computations (the outer-product Cholesky). Cost O(p^3 / 3).
 * Example: cholesky(Float64Array.of(4, 2, 2, 5), 2) -> [2, 0, 1, 2].
 */
export function cholesky(a: Float64Array, p: number): Float64Array | null {
  const l = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    let d = a[j * p + j]!;
    for (let k = 0; k < j; k++) d -= l[j * p + k]! * l[j * p + k]!;
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    l[j * p + j] = ljj;
    for (let i = j + 1; i < p; i++) {
      let s = a[i * p + j]!;
      for (let k = 0; k < j; k++) s -= l[i * p + k]! * l[j * p + k]!;
      l[i * p + j] = s / ljj;
    }
  }
  return l;
}

/** log det of A from its Cholesky factor: 2 Σ log L_jj. Example: for L = [2,0,1,2], 2 log 4 = 2.7726. */
export function cholLogDet(l: Float64Array, p: number): number {
  let s = 0;
  for (let j = 0; j < p; j++) s += Math.log(l[j * p + j]!);
  return 2 * s;
}

/** Solves A x = b given the Cholesky factor L of A (forward then back substitution). Cost O(p^2). */
export function cholSolve(l: Float64Array, p: number, b: Float64Array): Float64Array {
  const x = Float64Array.from(b);
  for (let i = 0; i < p; i++) {
    let s = x[i]!;
    for (let k = 0; k < i; k++) s -= l[i * p + k]! * x[k]!;
    x[i] = s / l[i * p + i]!;
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = x[i]!;
    for (let k = i + 1; k < p; k++) s -= l[k * p + i]! * x[k]!;
    x[i] = s / l[i * p + i]!;
  }
  return x;
}

/** A⁻¹ from the Cholesky factor L of A, column by column. Cost O(p^3). Example: for A = [4,2,2,5] -> [5,-2,-2,4]/16. */
export function cholInverse(l: Float64Array, p: number): Float64Array {
  const inv = new Float64Array(p * p);
  const e = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    e.fill(0);
    e[j] = 1;
    const col = cholSolve(l, p, e);
    for (let i = 0; i < p; i++) inv[i * p + j] = col[i]!;
  }
  return inv;
}

/** C = A B for p x p matrices. Cost O(p^3). */
export function matMul(a: Float64Array, b: Float64Array, p: number): Float64Array {
  const c = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < p; k++) {
      const aik = a[i * p + k]!;
      if (aik === 0) continue;
      for (let j = 0; j < p; j++) c[i * p + j] = c[i * p + j]! + aik * b[k * p + j]!;
    }
  }
  return c;
}

/** tr(A B) for p x p matrices, without forming the product. Cost O(p^2). */
export function traceProduct(a: Float64Array, b: Float64Array, p: number): number {
  let s = 0;
  for (let i = 0; i < p; i++) for (let k = 0; k < p; k++) s += a[i * p + k]! * b[k * p + i]!;
  return s;
}

/** x' A y for a p x p matrix. Cost O(p^2). */
export function quadForm(x: ArrayLike<number>, a: Float64Array, y: ArrayLike<number>, p: number): number {
  let s = 0;
  for (let i = 0; i < p; i++) {
    const xi = x[i]!;
    if (xi === 0) continue;
    for (let j = 0; j < p; j++) s += xi * a[i * p + j]! * y[j]!;
  }
  return s;
}

/** A x for a p x p matrix. Cost O(p^2). */
export function matVec(a: Float64Array, x: ArrayLike<number>, p: number): Float64Array {
  const out = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let s = 0;
    for (let j = 0; j < p; j++) s += a[i * p + j]! * x[j]!;
    out[i] = s;
  }
  return out;
}

/** Inverse of a symmetric positive definite matrix, or null when it is not positive definite. Cost O(p^3). */
export function spdInverse(a: Float64Array, p: number): Float64Array | null {
  const l = cholesky(a, p);
  return l === null ? null : cholInverse(l, p);
}
