/**
 * One participant's marginal likelihood by adaptive Gauss–Hermite quadrature against direct numerical integration:
 * (1) the committed values of test/reference/logistic_quadrature.py (scipy integrate.quad, relative tolerance 1e-13);
 * (2) the trapezoid rule written out here on [−40, 40] with step 1/64 — for an analytic integrand decaying like
 *     e^{−z²/2} the trapezoid rule's error is exponentially small in 1/step (Trefethen & Weideman 2014, SIAM Review
 *     56:385–458), far below 1e-12 here. Agreement to 1e-10 (the bar) with 25 nodes, and convergence as the
 *     number of nodes grows. Case 2 (σ = 3, five yes and one no) has an integrand with exponential rather than Gaussian
 *     flanks, where adaptive Gauss–Hermite converges slowly: 25 nodes are 1e-7 off and 50 nodes reach 1e-11, so that
 *     case is held to 1e-10 at 50 nodes. One node equals the Laplace approximation τ e^{h(m)} (exact identity).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { hermiteRule } from '../../../../src/core/model/logistic';
import { findMode, logBernoulli, participantLogLik } from '../../../../src/core/model/logistic/participant';

interface One { eta: number[]; y: number[]; sigma: number; logLik: number }
const fixture = JSON.parse(readFileSync(new URL('../../../reference/logistic-quadrature.json', import.meta.url), 'utf8')) as { participants: One[] };

function aghq(one: One, nodes: number): number {
  const eta = Float64Array.from(one.eta);
  const y = Float64Array.from(one.y);
  const idx = Int32Array.from(one.y, (_, i) => i);
  const m = findMode(eta, y, idx, 0, y.length, one.sigma, 0);
  return participantLogLik(eta, y, idx, 0, y.length, one.sigma, hermiteRule(nodes), m.mode, m.tau);
}

function trapezoid(one: One): number {
  const step = 1 / 64;
  let s = 0;
  for (let z = -40; z <= 40; z += step) {
    let l = -0.5 * z * z;
    one.eta.forEach((e, j) => (l += logBernoulli(one.y[j]!, e + one.sigma * z)));
    s += Math.exp(l);
  }
  return Math.log((s * step) / Math.sqrt(2 * Math.PI));
}

describe('one participant\'s log-likelihood', () => {
  it.each(fixture.participants.map((o, i) => [i, o, i === 2 ? 50 : 25] as const))('case %i: %i nodes agree with scipy quad and the trapezoid rule to 1e-10', (_i, one, nodes) => {
    const v = aghq(one, nodes);
    expect(Math.abs(v - one.logLik)).toBeLessThan(1e-10);
    expect(Math.abs(v - trapezoid(one))).toBeLessThan(1e-10);
  });

  it('converges as the number of nodes grows (1 to 50 nodes: the error never grows and ends below 1e-10)', () => {
    const one = fixture.participants[2]!; // σ = 3, six answers: the hardest case
    const exact = trapezoid(one);
    const errors = [1, 3, 5, 7, 10, 15, 20, 25, 30, 40, 50].map((n) => Math.abs(aghq(one, n) - exact));
    for (let k = 1; k < errors.length; k++) expect(errors[k]!).toBeLessThanOrEqual(errors[k - 1]! + 1e-14);
    expect(errors[0]!).toBeGreaterThan(1e-2); // Laplace is visibly off for σ = 3 and six answers
    expect(errors[7]!).toBeGreaterThan(1e-9); // 25 nodes: still 1e-7 off here
    expect(errors[10]!).toBeLessThan(1e-10);
  });

  it('one node is the Laplace approximation τ e^{h(m)}', () => {
    const one = fixture.participants[0]!;
    const eta = Float64Array.from(one.eta);
    const y = Float64Array.from(one.y);
    const idx = Int32Array.of(0, 1, 2);
    const m = findMode(eta, y, idx, 0, 3, one.sigma, 0);
    let h = -0.5 * m.mode * m.mode;
    one.eta.forEach((e, j) => (h += logBernoulli(one.y[j]!, e + one.sigma * m.mode)));
    expect(Math.abs(aghq(one, 1) - (Math.log(m.tau) + h))).toBeLessThan(1e-14);
  });
});
