/**
 * Gauss–Hermite rules from the Golub–Welsch eigenproblem. Sources: the closed forms for 2 and 3 nodes (the zeros of
 * H_2 = 4x² − 2 and H_3 = 8x³ − 12x, weights √π/2; 2√π/3 and √π/6 — exact); Abramowitz & Stegun 1964, Handbook of
 * Mathematical Functions, table 25.10 (abscissas and weights for ∫ e^{−x²} f(x) dx; the values below are from memory
 * of that table, to the digits given); and the exact moments ∫ x^{2m} e^{−x²} dx = Γ(m + ½), integrated exactly by an
 * n-node rule for 2m ≤ 2n − 1 (exact identity).
 */
import { describe, expect, it } from 'vitest';
import { hermiteRule } from '../../../../src/core/model/logistic';

const SQRT_PI = Math.sqrt(Math.PI);

function expectRule(n: number, table: readonly (readonly [number, number])[], tol: number): void {
  const r = hermiteRule(n);
  for (const [x, w] of table) {
    const k = r.nodes.findIndex((v) => Math.abs(v - x) < 1e-6);
    expect(k, `node ${x}`).toBeGreaterThanOrEqual(0);
    expect(Math.abs(r.nodes[k]! - x)).toBeLessThanOrEqual(tol * Math.max(1, x));
    expect(Math.abs(r.weights[k]! - w)).toBeLessThanOrEqual(tol * w);
  }
}

describe('hermiteRule', () => {
  it('1 node is x = 0 with weight √π (the Laplace approximation)', () => {
    const r = hermiteRule(1);
    expect(Array.from(r.nodes)).toEqual([0]);
    expect(r.weights[0]).toBeCloseTo(SQRT_PI, 15);
  });

  it('2 and 3 nodes equal the closed forms (exact)', () => {
    expectRule(2, [[Math.SQRT1_2, SQRT_PI / 2], [-Math.SQRT1_2, SQRT_PI / 2]], 1e-15);
    expectRule(3, [[0, (2 * SQRT_PI) / 3], [Math.sqrt(1.5), SQRT_PI / 6], [-Math.sqrt(1.5), SQRT_PI / 6]], 1e-15);
  });

  it('5, 10 and 20 nodes match Abramowitz & Stegun table 25.10 (from memory, 13 to 15 digits)', () => {
    expectRule(5, [[0, 0.945308720482942], [0.958572464613819, 0.393619323152241], [2.020182870456086, 0.019953242059046]], 1e-13);
    expectRule(10, [[0.342901327223705, 0.610862633735326], [1.036610829789514, 0.240138611082315], [1.756683649299882, 0.033874394455481], [2.532731674232790, 0.001343645746781], [3.436159118837738, 7.64043285523e-6]], 1e-12);
    expectRule(20, [[0.245340708300901, 0.462243669600610], [5.387480890011233, 2.229393645534e-13]], 1e-12);
  });

  it('integrates x^{2m} e^{−x²} exactly to Γ(m + ½) for 2m ≤ 2n − 1, and odd moments to 0 (exact identity)', () => {
    for (const n of [4, 9, 15, 25, 40]) {
      const r = hermiteRule(n);
      let gamma = SQRT_PI; // Γ(½)
      for (let m = 0; 2 * m <= 2 * n - 1 && m <= 12; m++) {
        let even = 0;
        let odd = 0;
        r.nodes.forEach((x, k) => {
          even += r.weights[k]! * x ** (2 * m);
          odd += r.weights[k]! * x ** (2 * m + 1);
        });
        expect(Math.abs(even - gamma)).toBeLessThanOrEqual(1e-12 * gamma);
        expect(Math.abs(odd)).toBeLessThanOrEqual(1e-12 * gamma * Math.max(1, n));
        gamma *= m + 0.5;
      }
    }
  });

  it('refuses a number of nodes that is not a positive integer', () => {
    expect(() => hermiteRule(0)).toThrow(RangeError);
    expect(() => hermiteRule(2.5)).toThrow(RangeError);
  });
});
