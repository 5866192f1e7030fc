/**
 * Maximises the quadrature log-likelihood ℓ(θ), θ = (β, σ): Newton steps from the fixed-node derivatives
 * (objective.ts) with a step-halving line search on ℓ, then Newton polishing with a central-difference gradient of ℓ
 * itself (so the maximum is that of the adaptive-quadrature likelihood, e.g. of the Laplace approximation for one
 * node, not of its fixed-node stand-in), and finally a central-difference Hessian of ℓ for the standard errors.
 */
import { cholesky, cholInverse, cholSolve } from '../dense';
import type { Objective } from './objective';

export interface Maximum {
  readonly theta: Float64Array;
  readonly logLik: number;
  /** Inverse of −∂²ℓ/∂θ∂θ' (central differences), or null when not positive definite. */
  readonly covariance: Float64Array | null;
  readonly iterations: number;
  readonly converged: boolean;
  readonly message: string;
}

/** Largest |θ_j| before the fit is called off: the estimates grow without bound (separation of yes and no). */
const THETA_LIMIT = 40;

export function maximise(obj: Objective, start: Float64Array, maxIterations = 20): Maximum {
  const q = start.length;
  let theta: Float64Array = Float64Array.from(start);
  let iterations = 0;
  // Phase 1: fixed-node Newton steps while they still raise ℓ.
  for (; iterations < maxIterations; iterations++) {
    const d = obj.derivatives(theta);
    const moved = lineSearch(obj, theta, newtonStep(d.hess, d.grad, q), d.value);
    if (moved === null) break;
    theta = moved.theta;
    if (theta.some((v) => !(Math.abs(v) < THETA_LIMIT))) return separated(obj, theta, iterations);
    if (moved.value - d.value < 1e-10 * (1 + Math.abs(d.value))) break;
  }
  // Phase 2: quasi-Newton steps on ℓ itself: central-difference gradient, the metric started at the fixed-node
  // Hessian and updated by BFGS (Nocedal & Wright 2006, §6.1), since the quadrature error makes the two differ.
  let converged = false;
  const start0 = obj.derivatives(theta);
  let metric: Float64Array = start0.hess.map((v) => -v);
  let g: Float64Array = numericGradient(obj, theta);
  let value = start0.value;
  for (let it = 0; it < 50; it++, iterations++) {
    const step = newtonStep(metric.map((v) => -v), g, q);
    const decrement = dot(step, g, q);
    if (decrement < 1e-10 + 1e-13 * Math.abs(value)) {
      converged = true;
      break;
    }
    const moved = lineSearch(obj, theta, step, value);
    if (moved === null) {
      // No ascent along the step: ℓ is flat to rounding here; accept when the predicted gain is that small.
      converged = decrement < 1e-7 * (1 + Math.abs(value));
      break;
    }
    const gNew = numericGradient(obj, moved.theta);
    const s = moved.theta.map((v, j) => v - theta[j]!);
    const yv = g.map((v, j) => v - gNew[j]!); // −(change of the gradient of ℓ): positive curvature for a maximum
    metric = bfgsUpdate(metric, s, yv, q);
    theta = moved.theta;
    value = moved.value;
    g = gNew;
    if (theta.some((v) => !(Math.abs(v) < THETA_LIMIT))) return separated(obj, theta, iterations);
  }
  const logLik = obj.value(theta);
  const info = numericHessian(obj, theta).map((v) => -v);
  const l = cholesky(info, q);
  const message = converged ? `Converged in ${iterations} Newton steps.` : `The estimates had not settled after ${iterations} Newton steps.`;
  return { theta, logLik, covariance: l === null ? null : cholInverse(l, q), iterations, converged, message };
}

function separated(obj: Objective, theta: Float64Array, iterations: number): Maximum {
  return { theta, logLik: obj.value(theta), covariance: null, iterations, converged: false, message: 'The estimates grow without bound: yes and no answers are (almost) separated by the terms of the model.' };
}

/** θ + t·step for the largest t in 1, ½, ¼, … that does not lower ℓ (to within rounding), or null. */
function lineSearch(obj: Objective, theta: Float64Array, step: Float64Array, current: number): { theta: Float64Array; value: number } | null {
  let t = 1;
  for (let h = 0; h < 40; h++) {
    const next = theta.map((v, j) => v + t * step[j]!);
    const value = obj.value(next);
    if (value >= current - 1e-13 * Math.abs(current)) return { theta: next, value };
    t /= 2;
  }
  return null;
}

/** BFGS update of a positive definite curvature matrix B with step s and curvature pair y (skipped unless s'y > 0). */
function bfgsUpdate(b: Float64Array, s: Float64Array, y: Float64Array, q: number): Float64Array {
  const sy = dot(s, y, q);
  if (!(sy > 1e-12 * Math.sqrt(dot(s, s, q) * dot(y, y, q)))) return b;
  const bs = new Float64Array(q);
  for (let i = 0; i < q; i++) for (let j = 0; j < q; j++) bs[i] = bs[i]! + b[i * q + j]! * s[j]!;
  const sbs = dot(s, bs, q);
  const out = Float64Array.from(b);
  for (let i = 0; i < q; i++) for (let j = 0; j < q; j++) out[i * q + j] = out[i * q + j]! - (bs[i]! * bs[j]!) / sbs + (y[i]! * y[j]!) / sy;
  return out;
}

/** s = (−H)⁻¹ g, with −H + λI (λ growing) when −H is not positive definite. */
function newtonStep(hess: Float64Array, grad: Float64Array, q: number): Float64Array {
  let lambda = 0;
  let scale = 0;
  for (let j = 0; j < q; j++) scale = Math.max(scale, Math.abs(hess[j * q + j]!));
  for (let tries = 0; tries < 60; tries++) {
    const m = hess.map((v) => -v);
    for (let j = 0; j < q; j++) m[j * q + j] = m[j * q + j]! + lambda;
    const l = cholesky(m, q);
    if (l !== null) return cholSolve(l, q, grad);
    lambda = lambda === 0 ? 1e-8 * (scale + 1) : lambda * 10;
  }
  return grad.map((v) => v / (scale + 1));
}

function dot(a: Float64Array, b: Float64Array, q: number): number {
  let s = 0;
  for (let j = 0; j < q; j++) s += a[j]! * b[j]!;
  return s;
}

/** Central differences with steps 1e-5 · max(1, |θ_j|): truncation O(h²) ≈ 1e-10 relative. */
function numericGradient(obj: Objective, theta: Float64Array): Float64Array {
  const q = theta.length;
  const g = new Float64Array(q);
  for (let j = 0; j < q; j++) {
    const h = 1e-5 * Math.max(1, Math.abs(theta[j]!));
    const up = Float64Array.from(theta);
    const down = Float64Array.from(theta);
    up[j] = up[j]! + h;
    down[j] = down[j]! - h;
    g[j] = (obj.value(up) - obj.value(down)) / (2 * h);
  }
  return g;
}

/** Central-difference Hessian with steps 1e-4 · max(1, |θ_j|) (truncation ≈ 1e-8, rounding ≈ ε|ℓ|/h²). */
function numericHessian(obj: Objective, theta: Float64Array): Float64Array {
  const q = theta.length;
  const hs = Array.from(theta, (v) => 1e-4 * Math.max(1, Math.abs(v)));
  const at = (da: number, a: number, db: number, b: number): number => {
    const t = Float64Array.from(theta);
    t[a] = t[a]! + da * hs[a]!;
    t[b] = t[b]! + db * hs[b]!;
    return obj.value(t);
  };
  const out = new Float64Array(q * q);
  const f0 = obj.value(theta);
  for (let a = 0; a < q; a++) {
    out[a * q + a] = (at(1, a, 1, a) - 2 * f0 + at(-1, a, -1, a)) / (4 * hs[a]! * hs[a]!);
    for (let b = 0; b < a; b++) {
      const v = (at(1, a, 1, b) - at(1, a, -1, b) - at(-1, a, 1, b) + at(-1, a, -1, b)) / (4 * hs[a]! * hs[b]!);
      out[a * q + b] = v;
      out[b * q + a] = v;
    }
  }
  return out;
}
