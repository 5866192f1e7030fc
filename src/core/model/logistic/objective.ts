/**
 * The log-likelihood of the random-intercept logistic model over all participants, ℓ(β, σ) = Σ_i log L_i with
 * L_i = ∫ Π_j p(y_ij | x_ij'β + σz) φ(z) dz by adaptive Gauss–Hermite quadrature (kernel.ts), and its gradient
 * and Hessian with the quadrature nodes held where the adaptation put them (used to choose Newton steps; the step
 * is then judged on ℓ itself). σ enters as u = σz, so ℓ is smooth through σ = 0 and even in σ.
 * Each group of rows is a participant, or a pattern of identical participants with its count (patterns.ts).
 * Cost per evaluation O(N · (Newton steps + nodes)) flops but O(N + groups · nodes) exp/log calls; derivatives
 * O(N · nodes · p + N p²) (derivatives.ts), q = p + 1.
 */
import type { HermiteRule } from './hermite';
import { fillRowExpInPlace, logLikAtMode, modeInPlace, nodeConstants, nodeWeights } from './kernel';
import { addParticipantDerivatives, derivativeScratch } from './derivatives';

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
  const mt = new Float64Array(3);
  const weights = nodeWeights(rule);
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
      const li = logLikAtMode(rows, y, order, lo, hi, sigma, rule.nodes, consts, weights, mt[0]!, mt[1]!, mt[2]!, terms);
      total += count === undefined ? li : count[i]! * li;
    }
    return total;
  };
  let maxRows = 0;
  for (let i = 0; i < nG; i++) maxRows = Math.max(maxRows, start[i + 1]! - start[i]!);
  const scratch = derivativeScratch(rule.nodes.length, maxRows, q);
  const derivatives = (theta: Float64Array): { value: number; grad: Float64Array; hess: Float64Array } => {
    fillEta(theta);
    fillRowExpInPlace(rows);
    const sigma = theta[p]!;
    const grad = new Float64Array(q);
    const hess = new Float64Array(q * q);
    let total = 0;
    for (let i = 0; i < nG; i++) {
      const lo = start[i]!;
      const hi = start[i + 1]!;
      if (hi === lo) continue;
      modeInPlace(rows, y, order, lo, hi, sigma, modes[i]!, mt);
      modes[i] = mt[0]!;
      const c = count === undefined ? 1 : count[i]!;
      total += c * addParticipantDerivatives(rows, x, p, y, order, lo, hi, sigma, rule.nodes, consts, mt[0]!, mt[1]!, c, grad, hess, scratch);
    }
    for (let a = 0; a < q; a++) for (let b = 0; b < a; b++) hess[b * q + a] = hess[a * q + b]!;
    return { value: total, grad, hess };
  };
  return { value, derivatives };
}
