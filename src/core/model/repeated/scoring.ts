/**
 * Fisher scoring for the unstructured covariance, parametrised by its Cholesky factor Σ = L L' with the log of each
 * diagonal entry, so every step stays positive definite (Pinheiro & Bates 1996, "Unconstrained parametrizations for
 * variance-covariance matrices"). The score and expected information in σ_jk (likelihood.ts) are carried to λ by the
 * chain rule, g_λ = J'g_σ and I_λ = J'I_σJ with J = ∂σ/∂λ; the step I_λ⁻¹g_λ is halved until ℓ does not fall.
 * With many missing visits the expected information can differ enough from the observed curvature that scoring only
 * creeps near the optimum, so once the scoring step's predicted gain g'I⁻¹g falls below 1e-6 each step tries Newton's
 * method in σ_jk first, with the Hessian from central differences of the analytic score (step 1e-5 on the scaled data;
 * Nocedal & Wright 2006, §8.1), kept when Σ stays positive definite and ℓ does not fall.
 * Stops when no parameter moves more than 1e-10 (the parameters are of order one on the scaled data), or with status
 * 'failed' after maxIterations steps or when the information is singular. Cost per step: one derivative evaluation,
 * plus 2R likelihood evaluations for a Newton step.
 */
import { cholesky, cholSolve } from '../dense';
import type { FitMethod } from '../types';
import type { Grouped } from './groups';
import { derivatives, evaluate, gradientOnly, paramPairs, type Evaluation } from './likelihood';

export interface ScoringResult {
  readonly sigma: Float64Array;
  readonly ev: Evaluation;
  readonly iterations: number;
  readonly converged: boolean;
  readonly message: string;
}

/** Σ = L L' from λ (λ_r for pair (j, k) is L[k][j], log of it on the diagonal). */
export function sigmaOf(lambda: Float64Array, V: number): { sigma: Float64Array; L: Float64Array } {
  const pairs = paramPairs(V);
  const L = new Float64Array(V * V);
  for (let r = 0; r < lambda.length; r++) {
    const j = pairs.j[r]!;
    const k = pairs.k[r]!;
    L[k * V + j] = j === k ? Math.exp(lambda[r]!) : lambda[r]!;
  }
  const sigma = new Float64Array(V * V);
  for (let a = 0; a < V; a++) {
    for (let b = 0; b <= a; b++) {
      let s = 0;
      for (let c = 0; c <= b; c++) s += L[a * V + c]! * L[b * V + c]!;
      sigma[a * V + b] = s;
      sigma[b * V + a] = s;
    }
  }
  return { sigma, L };
}

/** λ of a positive definite Σ, or null. */
export function lambdaOf(sigma: Float64Array, V: number): Float64Array | null {
  const L = cholesky(sigma, V);
  if (L === null) return null;
  const pairs = paramPairs(V);
  return Float64Array.from(pairs.j, (j, r) => {
    const k = pairs.k[r]!;
    return j === k ? Math.log(L[k * V + j]!) : L[k * V + j]!;
  });
}

/** J[σ_r, λ_s] = ∂σ_r/∂λ_s, R × R row-major. */
function jacobian(L: Float64Array, V: number): Float64Array {
  const pairs = paramPairs(V);
  const R = pairs.j.length;
  const J = new Float64Array(R * R);
  for (let s = 0; s < R; s++) {
    // λ_s is L[a][b] (row a ≥ column b); ∂Σ/∂L_ab = E_ab L' + L E_ba, entry (x, y) = δ_xa L_yb + L_xb δ_ya.
    const b = pairs.j[s]!;
    const a = pairs.k[s]!;
    const scale = a === b ? L[a * V + a]! : 1;
    for (let y = 0; y < V; y++) {
      const lyb = L[y * V + b]!;
      if (lyb === 0) continue;
      const r = pairs.index[a * V + y]!;
      // σ_(a,y) gains L_yb (twice when y = a: both terms of the sum).
      J[r * R + s] = J[r * R + s]! + (y === a ? 2 : 1) * lyb * scale;
    }
  }
  return J;
}

export function fisherScoring(gr: Grouped, start: Float64Array, method: FitMethod, maxIterations: number): ScoringResult | null {
  const V = gr.layout.nVisits;
  const start0 = lambdaOf(start, V);
  if (start0 === null) return null;
  let lambda: Float64Array = start0;
  let cur = sigmaOf(lambda, V);
  let ev = evaluate(gr, cur.sigma, method);
  if (ev === null) return null;
  const R = lambda.length;
  for (let it = 1; it <= maxIterations; it++) {
    const d = derivatives(gr, ev, method);
    const J = jacobian(cur.L, V);
    const gl = new Float64Array(R);
    const IJ = new Float64Array(R * R);
    for (let s = 0; s < R; s++) {
      let t = 0;
      for (let r = 0; r < R; r++) t += J[r * R + s]! * d.grad[r]!;
      gl[s] = t;
    }
    // I_λ = J' I_σ J
    const tmp = new Float64Array(R * R);
    for (let r = 0; r < R; r++) {
      for (let q = 0; q < R; q++) {
        const v = d.info[r * R + q]!;
        if (v === 0) continue;
        for (let s = 0; s < R; s++) tmp[r * R + s] = tmp[r * R + s]! + v * J[q * R + s]!;
      }
    }
    for (let r = 0; r < R; r++) {
      const jr = r * R;
      for (let q = 0; q < R; q++) {
        const v = J[jr + q]!;
        if (v === 0) continue;
        for (let s = 0; s < R; s++) IJ[q * R + s] = IJ[q * R + s]! + v * tmp[jr + s]!;
      }
    }
    const Ls = cholesky(d.info, R);
    const predicted = Ls === null ? Infinity : cholSolve(Ls, R, d.grad).reduce((acc, x, r) => acc + x * d.grad[r]!, 0);
    if (predicted < 1e-6) {
      const nt = newtonStep(gr, cur.sigma, ev, d.grad, method);
      if (nt !== null) {
        const nextLambda = lambdaOf(nt.sigma, V);
        if (nextLambda !== null) {
          lambda = nextLambda;
          cur = sigmaOf(lambda, V);
          ev = nt.ev;
          if (nt.maxStep < 1e-10) return { sigma: cur.sigma, ev, iterations: it, converged: true, message: `converged after ${it} steps.` };
          continue;
        }
      }
    }
    const Li = cholesky(IJ, R);
    if (Li === null) return { sigma: cur.sigma, ev, iterations: it, converged: false, message: 'the information matrix of the covariance is singular: some pair of visits is never observed together, or a visit has too few values.' };
    const step = cholSolve(Li, R, gl);
    let t = 1;
    let accepted = false;
    for (let half = 0; half < 30; half++, t /= 2) {
      const from: Float64Array = lambda;
      const next: Float64Array = Float64Array.from(from, (x, r) => x + t * step[r]!);
      const cand = sigmaOf(next, V);
      const evn = evaluate(gr, cand.sigma, method);
      if (evn !== null && evn.logLik >= ev.logLik - 1e-12 * Math.max(1, Math.abs(ev.logLik))) {
        lambda = next;
        cur = cand;
        ev = evn;
        accepted = true;
        break;
      }
    }
    if (!accepted) return { sigma: cur.sigma, ev, iterations: it, converged: false, message: 'no step along the scoring direction raised the likelihood.' };
    let maxStep = 0;
    for (let r = 0; r < R; r++) maxStep = Math.max(maxStep, Math.abs(t * step[r]!));
    if (t === 1 && maxStep < 1e-10) return { sigma: cur.sigma, ev, iterations: it, converged: true, message: `converged after ${it} steps.` };
  }
  return { sigma: cur.sigma, ev, iterations: maxIterations, converged: false, message: `not converged after ${maxIterations} scoring steps.` };
}

/** One Newton step in σ_jk from a central-difference Hessian of the analytic score; null when the Hessian is not
 * negative definite, Σ leaves the positive definite matrices, or ℓ falls. */
function newtonStep(gr: Grouped, sigma: Float64Array, ev: Evaluation, grad: Float64Array, method: FitMethod): { sigma: Float64Array; ev: Evaluation; maxStep: number } | null {
  const V = gr.layout.nVisits;
  const pairs = paramPairs(V);
  const R = grad.length;
  const h = 1e-5;
  const negH = new Float64Array(R * R);
  const shifted = (r: number, by: number): Float64Array | null => {
    const s = Float64Array.from(sigma);
    const a = pairs.j[r]!;
    const b = pairs.k[r]!;
    s[a * V + b] = s[a * V + b]! + by;
    if (a !== b) s[b * V + a] = s[b * V + a]! + by;
    const e = evaluate(gr, s, method);
    return e === null ? null : gradientOnly(gr, e, method);
  };
  for (let r = 0; r < R; r++) {
    const up = shifted(r, h);
    const down = shifted(r, -h);
    if (up === null || down === null) return null;
    for (let q = 0; q < R; q++) negH[q * R + r] = -(up[q]! - down[q]!) / (2 * h);
  }
  for (let a = 0; a < R; a++) for (let b = 0; b < a; b++) negH[a * R + b] = negH[b * R + a] = 0.5 * (negH[a * R + b]! + negH[b * R + a]!);
  const L = cholesky(negH, R);
  if (L === null) return null;
  const step = cholSolve(L, R, grad);
  const next = Float64Array.from(sigma);
  let maxStep = 0;
  for (let r = 0; r < R; r++) {
    const a = pairs.j[r]!;
    const b = pairs.k[r]!;
    next[a * V + b] = next[a * V + b]! + step[r]!;
    if (a !== b) next[b * V + a] = next[b * V + a]! + step[r]!;
    maxStep = Math.max(maxStep, Math.abs(step[r]!));
  }
  const e = evaluate(gr, next, method);
  if (e === null || e.logLik < ev.logLik - 1e-12 * Math.max(1, Math.abs(ev.logLik))) return null;
  return { sigma: next, ev: e, maxStep };
}
