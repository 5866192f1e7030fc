/**
 * The fast per-participant kernel (kernel.ts: with logs per node, and summed relative to h at the mode) against the plain per-row reference (participant.ts), and the grouping of
 * identical participants (patterns.ts) against the ungrouped likelihood. Both are exact rewritings (the same sums in
 * another order, e^{a+b} = e^a e^b, Σ log(1 + e_r) = log Π (1 + e_r)), so the tolerances only cover rounding:
 * 1e-12 absolute on log L_i of size ≲ 1e3 (a few ulp per row), 1e-12 relative on whole-data sums.
 * Data: invented and seeded (scripts/random.ts).
 */
import { describe, expect, it } from 'vitest';
import { hermiteRule } from '../../../../src/core/model/logistic';
import { groupRows } from '../../../../src/core/model/logistic/fitLogistic';
import { fillRowExpInPlace, logLikAtMode, logLikFast, modeInPlace, nodeConstants, nodeWeights, type RowExp } from '../../../../src/core/model/logistic/kernel';
import { makeObjective } from '../../../../src/core/model/logistic/objective';
import { expit, findMode, logBernoulli, participantLogLik } from '../../../../src/core/model/logistic/participant';
import { groupPatterns } from '../../../../src/core/model/logistic/patterns';
import { mulberry32 } from '../../../../scripts/random';

function rowsOf(eta: Float64Array): RowExp {
  const rows = { eta, up: new Float64Array(eta.length), down: new Float64Array(eta.length) };
  fillRowExpInPlace(rows);
  return rows;
}

function both(eta: Float64Array, y: Float64Array, sigma: number, nodes: number): { fast: number; plain: number; mFast: number; mPlain: number; tauFast: number; tauPlain: number } {
  const idx = Int32Array.from(y, (_, i) => i);
  const rule = hermiteRule(nodes);
  const md = findMode(eta, y, idx, 0, y.length, sigma, 0);
  const plain = participantLogLik(eta, y, idx, 0, y.length, sigma, rule, md.mode, md.tau);
  const rows = rowsOf(eta);
  const out = new Float64Array(3);
  modeInPlace(rows, y, idx, 0, y.length, sigma, 0, out);
  const fast = logLikFast(rows, y, idx, 0, y.length, sigma, rule.nodes, nodeConstants(rule), out[0]!, out[1]!, new Float64Array(nodes));
  const atMode = logLikAtMode(rows, y, idx, 0, y.length, sigma, rule.nodes, nodeConstants(rule), nodeWeights(rule), out[0]!, out[1]!, out[2]!, new Float64Array(nodes));
  expect(Math.abs(atMode - plain)).toBeLessThan(1e-12 * (1 + Math.abs(plain)));
  return { fast, plain, mFast: out[0]!, mPlain: md.mode, tauFast: out[1]!, tauPlain: md.tau };
}

describe('the fast participant kernel equals the per-row reference', () => {
  const u = mulberry32(13);
  const cases: [string, number, number, number][] = [];
  for (const n of [1, 5, 40]) for (const sigma of [0, 0.5, 3, 10]) cases.push([`n = ${n}, σ = ${sigma}`, n, sigma, n * 100 + sigma]);
  it.each(cases)('%s: same mode, scale and log L_i (25 nodes) to rounding', (_name, n, sigma) => {
    const eta = Float64Array.from({ length: n }, () => 16 * u() - 8);
    const y = Float64Array.from({ length: n }, () => (u() < 0.4 ? 1 : 0));
    const r = both(eta, y, sigma, 25);
    expect(Math.abs(r.mFast - r.mPlain)).toBeLessThan(1e-11 * (1 + Math.abs(r.mPlain)));
    expect(Math.abs(r.tauFast - r.tauPlain)).toBeLessThan(1e-12 * r.tauPlain);
    expect(Math.abs(r.fast - r.plain)).toBeLessThan(1e-12 * (1 + Math.abs(r.plain)));
  });

  it('rows with |η| above the factored range and large σ (direct exponentials) agree and stay finite', () => {
    const eta = Float64Array.of(-400, 350, 1, -2, 500);
    const y = Float64Array.of(1, 0, 1, 0, 1);
    for (const sigma of [0.1, 40, 400]) {
      const r = both(eta, y, sigma, 25);
      expect(Number.isFinite(r.fast)).toBe(true);
      expect(Math.abs(r.fast - r.plain)).toBeLessThan(1e-12 * (1 + Math.abs(r.plain)));
    }
  });

  it('3,000 rows: the running product is folded into the log before it overflows', () => {
    const eta = new Float64Array(3000).fill(0.1);
    const y = new Float64Array(3000); // every answer no: each factor 1 + e^{-0.1} ≈ 1.9, product 1.9^3000 ≫ 1e308
    const r = both(eta, y, 0.7, 9);
    expect(Number.isFinite(r.fast)).toBe(true);
    expect(Math.abs(r.fast - r.plain)).toBeLessThan(1e-12 * Math.abs(r.plain));
  });
});

describe('findMode reaches its tolerance (regression: near the mode, rounding-level falls in h rejected every step)', () => {
  it('the Newton step left at the returned mode is below 1e-12 (1 + |m|) for 200 invented participants', () => {
    const u = mulberry32(99);
    for (let c = 0; c < 200; c++) {
      const n = 1 + Math.floor(u() * 12);
      const eta = Float64Array.from({ length: n }, () => 10 * u() - 5);
      const y = Float64Array.from({ length: n }, () => (u() < 0.5 ? 1 : 0));
      const sigma = 6 * u();
      const idx = Int32Array.from(y, (_, i) => i);
      const md = findMode(eta, y, idx, 0, n, sigma, 0.3);
      // h'(m) = −m + σ Σ (y − π), −h''(m) = 1 + σ² Σ π(1 − π), written out here with expit.
      let g = -md.mode;
      let curv = 1;
      eta.forEach((e, j) => {
        const pr = expit(e + sigma * md.mode);
        g += sigma * (y[j]! - pr);
        curv += sigma * sigma * pr * (1 - pr);
      });
      expect(Math.abs(g / curv)).toBeLessThan(1e-12 * (1 + Math.abs(md.mode)));
    }
  });
});

/** Invented data: `n` participants, 4 visits on a fixed schedule, 2 arms, answers drawn per row; p = 3 (1, arm, time). */
function invented(n: number, seed: number): { p: number; x: Float64Array; y: Float64Array; subject: Int32Array } {
  const u = mulberry32(seed);
  const p = 3;
  const x = new Float64Array(n * 4 * p);
  const y = new Float64Array(n * 4);
  const subject = new Int32Array(n * 4);
  for (let i = 0; i < n; i++) {
    for (let v = 0; v < 4; v++) {
      const r = i * 4 + v;
      x[r * p] = 1;
      x[r * p + 1] = i % 2;
      x[r * p + 2] = v / 3;
      y[r] = u() < 0.35 + 0.1 * v ? 1 : 0;
      subject[r] = i;
    }
  }
  return { p, x, y, subject };
}

describe('participants grouped by (design rows, answers)', () => {
  it('the grouped likelihood, gradient and Hessian equal the ungrouped ones (exact regrouping of the sum)', () => {
    const d = invented(300, 5);
    const { order, start } = groupRows(d.subject, 300);
    const plain = { p: d.p, x: d.x, y: d.y, order, start };
    const grouped = groupPatterns(plain);
    expect(grouped.count.length).toBeLessThan(300); // 2 arms × 16 answer patterns ≤ 32 patterns
    expect(grouped.count.reduce((a, b) => a + b, 0)).toBe(300);
    const rule = hermiteRule(15);
    const theta = Float64Array.of(-0.4, 0.3, 0.8, 1.3);
    const a = makeObjective(plain, rule);
    const b = makeObjective(grouped, rule);
    const va = a.value(theta);
    expect(Math.abs(b.value(theta) - va)).toBeLessThan(1e-12 * Math.abs(va));
    const da = a.derivatives(theta);
    const db = b.derivatives(theta);
    da.grad.forEach((g, j) => expect(Math.abs(db.grad[j]! - g)).toBeLessThan(1e-10 * (1 + Math.abs(g))));
    da.hess.forEach((h, j) => expect(Math.abs(db.hess[j]! - h)).toBeLessThan(1e-10 * (1 + Math.abs(h))));
  });

  it('keys are exact: one changed answer, or a time one ulp away, makes a new pattern', () => {
    const d = invented(2, 1);
    // Both participants the same arm and answers first.
    for (let v = 0; v < 4; v++) {
      d.x[(4 + v) * d.p + 1] = 0;
      d.y[4 + v] = d.y[v]!;
    }
    const { order, start } = groupRows(d.subject, 2);
    expect(groupPatterns({ p: d.p, x: d.x, y: d.y, order, start }).count).toEqual(Float64Array.of(2));
    const y2 = Float64Array.from(d.y);
    y2[7] = 1 - y2[7]!;
    expect(groupPatterns({ p: d.p, x: d.x, y: y2, order, start }).count).toEqual(Float64Array.of(1, 1));
    const x2 = Float64Array.from(d.x);
    x2[7 * d.p + 2] = x2[7 * d.p + 2]! * (1 + Number.EPSILON);
    expect(groupPatterns({ p: d.p, x: x2, y: d.y, order, start }).count).toEqual(Float64Array.of(1, 1));
  });
});

/**
 * The fixed-node gradient and Hessian written out the plain way (per node, per row, the q × q outer products) with
 * the reference mode and expit/logBernoulli, against derivatives.ts (rows-outer sums of the same terms).
 */
function plainDerivatives(p: number, x: Float64Array, y: Float64Array, subject: Int32Array, nSubjects: number, theta: Float64Array, nodes: number): { value: number; grad: Float64Array; hess: Float64Array } {
  const rule = hermiteRule(nodes);
  const q = p + 1;
  const sigma = theta[p]!;
  const eta = Float64Array.from(y, (_, r) => {
    let s = 0;
    for (let j = 0; j < p; j++) s += x[r * p + j]! * theta[j]!;
    return s;
  });
  const grad = new Float64Array(q);
  const hess = new Float64Array(q * q);
  let value = 0;
  for (let i = 0; i < nSubjects; i++) {
    const rowsOfI = Int32Array.from(Array.from(subject.keys()).filter((r) => subject[r] === i));
    const md = findMode(eta, y, rowsOfI, 0, rowsOfI.length, sigma, 0);
    const lw: number[] = [];
    const gks: Float64Array[] = [];
    const hks: Float64Array[] = [];
    rule.nodes.forEach((xk, k) => {
      const z = md.mode + Math.SQRT2 * md.tau * xk;
      let f = Math.log(rule.weights[k]!) + xk * xk - 0.5 * z * z;
      const g = new Float64Array(q);
      const h = new Float64Array(q * q);
      for (const r of rowsOfI) {
        const e = eta[r]! + sigma * z;
        const pr = expit(e);
        f += logBernoulli(y[r]!, e);
        const v = [...Array.from({ length: p }, (_, j) => x[r * p + j]!), z];
        for (let a = 0; a < q; a++) {
          g[a] = g[a]! + (y[r]! - pr) * v[a]!;
          for (let b = 0; b < q; b++) h[a * q + b] = h[a * q + b]! - pr * (1 - pr) * v[a]! * v[b]!;
        }
      }
      lw.push(f);
      gks.push(g);
      hks.push(h);
    });
    const top = Math.max(...lw);
    const post = lw.map((f) => Math.exp(f - top));
    const s = post.reduce((a, b) => a + b, 0);
    value += top + Math.log(s) + Math.log(Math.SQRT2 * md.tau) - 0.5 * Math.log(2 * Math.PI);
    const gi = new Float64Array(q);
    post.forEach((w, k) => gks[k]!.forEach((g, a) => (gi[a] = gi[a]! + (w / s) * g)));
    for (let a = 0; a < q; a++) {
      grad[a] = grad[a]! + gi[a]!;
      for (let b = 0; b < q; b++) {
        let hab = 0;
        post.forEach((w, k) => (hab += (w / s) * (hks[k]![a * q + b]! + gks[k]![a]! * gks[k]![b]!)));
        hess[a * q + b] = hess[a * q + b]! + hab - gi[a]! * gi[b]!;
      }
    }
  }
  return { value, grad, hess };
}

describe('fixed-node derivatives, rows-outer (derivatives.ts), equal the plain per-node sums', () => {
  it.each([[0.2], [1.5], [4]])('σ = %s: value, gradient and Hessian to 1e-10 relative', (sigma) => {
    const d = invented(40, 21);
    for (let r = 0; r < d.y.length; r++) d.x[r * d.p + 2] = d.x[r * d.p + 2]! + 0.01 * (r % 7); // not a fixed schedule
    const theta = Float64Array.of(-0.3, 0.4, 0.9, sigma);
    const { order, start } = groupRows(d.subject, 40);
    const fast = makeObjective({ p: d.p, x: d.x, y: d.y, order, start }, hermiteRule(11)).derivatives(theta);
    const plain = plainDerivatives(d.p, d.x, d.y, d.subject, 40, theta, 11);
    expect(Math.abs(fast.value - plain.value)).toBeLessThan(1e-12 * Math.abs(plain.value));
    plain.grad.forEach((g, j) => expect(Math.abs(fast.grad[j]! - g)).toBeLessThan(1e-10 * (1 + Math.abs(g))));
    plain.hess.forEach((h, j) => expect(Math.abs(fast.hess[j]! - h)).toBeLessThan(1e-10 * (1 + Math.abs(h))));
  });
});
