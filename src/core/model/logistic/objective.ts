/**
 * The log-likelihood of the random-intercept logistic model over all participants, ℓ(β, σ) = Σ_i log L_i with
 * L_i = ∫ Π_j p(y_ij | x_ij'β + σz) φ(z) dz by adaptive Gauss–Hermite quadrature (participant.ts), and its gradient
 * and Hessian with the quadrature nodes held where the adaptation put them (used to choose Newton steps; the step
 * is then judged on ℓ itself). σ enters as u = σz, so ℓ is smooth through σ = 0 and even in σ.
 * Cost per evaluation O(N · (Newton steps + nodes)); derivatives O(N · nodes · q²), q = p + 1.
 */
import type { HermiteRule } from './hermite';
import { fillRowExpInPlace, logLikFast, modeInPlace, nodeConstants } from './kernel';
import { expit, logBernoulli } from './participant';

export interface Grouped {
  readonly p: number;
  /** Dense design, row-major N × p. */
  readonly x: Float64Array;
  readonly y: Float64Array;
  /** Row indices grouped by participant: participant g's rows are order[start[g] .. start[g + 1]). */
  readonly order: Int32Array;
  readonly start: Int32Array;
  /** Participants each group stands for (patterns.ts); 1 each when absent. */
  readonly count?: Float64Array;
}

export interface Objective {
  /** ℓ at θ = (β, σ); updates the stored modes (warm starts for the next call). */
  readonly value: (theta: Float64Array) => number;
  /** ℓ, gradient (length q) and Hessian (q × q) with nodes fixed at θ's adaptive positions. */
  readonly derivatives: (theta: Float64Array) => { value: number; grad: Float64Array; hess: Float64Array };
}

/** Builds the objective for the grouped data and a quadrature rule. */
export function makeObjective(g: Grouped, rule: HermiteRule): Objective {
  const { p, x, y, order, start, count } = g;
  const N = y.length;
  const nG = start.length - 1;
  const q = p + 1;
  const eta = new Float64Array(N);
  const rows = { eta, up: new Float64Array(N), down: new Float64Array(N) };
  const modes = new Float64Array(nG);
  const consts = nodeConstants(rule);
  const terms = new Float64Array(rule.nodes.length);
  const mt = new Float64Array(2);
  const fillEta = (theta: Float64Array): void => {
    for (let r = 0; r < N; r++) {
      let s = 0;
      for (let j = 0; j < p; j++) s += x[r * p + j]! * theta[j]!;
      eta[r] = s;
    }
  };
  const value = (theta: Float64Array): number => {
    fillEta(theta);
    fillRowExpInPlace(rows);
    const sigma = theta[p]!;
    let total = 0;
    for (let i = 0; i < nG; i++) {
      const lo = start[i]!;
      const hi = start[i + 1]!;
      if (hi === lo) continue;
      modeInPlace(rows, y, order, lo, hi, sigma, modes[i]!, mt);
      modes[i] = mt[0]!;
      const li = logLikFast(rows, y, order, lo, hi, sigma, rule.nodes, consts, mt[0]!, mt[1]!, terms);
      total += count === undefined ? li : count[i]! * li;
    }
    return total;
  };
  const derivatives = (theta: Float64Array): { value: number; grad: Float64Array; hess: Float64Array } => {
    fillEta(theta);
    fillRowExpInPlace(rows);
    const sigma = theta[p]!;
    const K = rule.nodes.length;
    const grad = new Float64Array(q);
    const hess = new Float64Array(q * q);
    const logw = new Float64Array(K);
    const post = new Float64Array(K);
    const gk = new Float64Array(K * q);
    const hk = new Float64Array(K * q * q);
    const zs = new Float64Array(K);
    const gi = new Float64Array(q);
    const v = new Float64Array(q);
    let total = 0;
    for (let i = 0; i < nG; i++) {
      const lo = start[i]!;
      const hi = start[i + 1]!;
      if (hi === lo) continue;
      modeInPlace(rows, y, order, lo, hi, sigma, modes[i]!, mt);
      const md = { mode: mt[0]!, tau: mt[1]! };
      modes[i] = md.mode;
      const c = count === undefined ? 1 : count[i]!;
      gk.fill(0);
      hk.fill(0);
      let top = -Infinity;
      for (let k = 0; k < K; k++) {
        const xk = rule.nodes[k]!;
        const z = md.mode + Math.SQRT2 * md.tau * xk;
        zs[k] = z;
        let f = Math.log(rule.weights[k]!) + xk * xk - 0.5 * z * z;
        for (let t = lo; t < hi; t++) {
          const r = order[t]!;
          const e = eta[r]! + sigma * z;
          const pr = expit(e);
          const yr = y[r]!;
          f += logBernoulli(yr, e);
          const resid = yr - pr;
          const wgt = pr * (1 - pr);
          for (let j = 0; j < p; j++) v[j] = x[r * p + j]!;
          v[p] = z;
          for (let a = 0; a < q; a++) {
            gk[k * q + a] = gk[k * q + a]! + resid * v[a]!;
            const va = wgt * v[a]!;
            if (va === 0) continue;
            for (let b = 0; b <= a; b++) hk[k * q * q + a * q + b] = hk[k * q * q + a * q + b]! - va * v[b]!;
          }
        }
        logw[k] = f;
        if (f > top) top = f;
      }
      let s = 0;
      for (let k = 0; k < K; k++) {
        post[k] = Math.exp(logw[k]! - top);
        s += post[k]!;
      }
      total += c * (top + Math.log(s) + Math.log(Math.SQRT2 * md.tau) - 0.5 * Math.log(2 * Math.PI));
      gi.fill(0);
      for (let k = 0; k < K; k++) {
        post[k] = post[k]! / s;
        for (let a = 0; a < q; a++) gi[a] = gi[a]! + post[k]! * gk[k * q + a]!;
      }
      for (let a = 0; a < q; a++) {
        grad[a] = grad[a]! + c * gi[a]!;
        for (let b = 0; b <= a; b++) {
          let hab = 0;
          for (let k = 0; k < K; k++) hab += post[k]! * (hk[k * q * q + a * q + b]! + gk[k * q + a]! * gk[k * q + b]!);
          hess[a * q + b] = hess[a * q + b]! + c * (hab - gi[a]! * gi[b]!);
        }
      }
    }
    for (let a = 0; a < q; a++) for (let b = 0; b < a; b++) hess[b * q + a] = hess[a * q + b]!;
    return { value: total, grad, hess };
  };
  return { value, derivatives };
}
