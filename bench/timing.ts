/** Small pieces the benchmark scripts share: wall-clock seconds, best of n runs, and the solve that ends each
 * script's baseline OLS pass. */

/** Seconds since `t0` (from process.hrtime.bigint()). */
export const seconds = (t0: bigint): number => Number(process.hrtime.bigint() - t0) / 1e9;

/** The best of `times` runs (the machine is shared; the fastest run is the least disturbed), with the last value. */
export function best<T>(times: number, f: () => T): { seconds: number; value: T } {
  let bestS = Infinity;
  let value: T | undefined;
  for (let k = 0; k < times; k++) {
    const t0 = process.hrtime.bigint();
    value = f();
    bestS = Math.min(bestS, seconds(t0));
  }
  return { seconds: bestS, value: value as T };
}

/** Solves X'X b = X'y from the lower triangle of X'X (p × p, row-major) by Cholesky and two triangular solves:
 * the last step of a baseline OLS pass. O(p³). */
export function solveNormalEquations(xtx: Float64Array, xty: Float64Array, p: number): Float64Array {
  const l = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    let s = xtx[j * p + j]!;
    for (let k = 0; k < j; k++) s -= l[j * p + k]! ** 2;
    const d0 = Math.sqrt(Math.max(s, 1e-300));
    l[j * p + j] = d0;
    for (let i = j + 1; i < p; i++) {
      let v = xtx[i * p + j]!;
      for (let k = 0; k < j; k++) v -= l[i * p + k]! * l[j * p + k]!;
      l[i * p + j] = v / d0;
    }
  }
  const b = Float64Array.from(xty);
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < i; k++) b[i] = b[i]! - l[i * p + k]! * b[k]!;
    b[i] = b[i]! / l[i * p + i]!;
  }
  for (let i = p - 1; i >= 0; i--) {
    for (let k = i + 1; k < p; k++) b[i] = b[i]! - l[k * p + i]! * b[k]!;
    b[i] = b[i]! / l[i * p + i]!;
  }
  return b;
}
