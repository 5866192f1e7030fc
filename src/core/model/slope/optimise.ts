/**
 * Maximises the profiled likelihood of the slope model (profile.ts) over D = LL' with L lower triangular in the
 * log-Cholesky parametrisation θ = (log L11, L21, log L22) (Pinheiro & Bates 1996, Statistics and Computing 6:289–296),
 * by Newton steps on the exact Hessian (curvature.ts; made positive definite by a multiple of the identity where it is
 * not, Nocedal & Wright 2006, sec. 3.4) with a backtracking Armijo line search whose trials need the value only, so an
 * iteration costs one value pass and one derivative pass over the participants. BFGS (Nocedal & Wright 2006, ch. 6)
 * on the analytic gradient is kept as the fallback should Newton not converge. Starting point: the method-of-moments
 * estimate (start.ts), else the best of a small grid of diagonal D.
 * The boundary (singular G) lies at L22 → 0 (rank one) or L → 0 (G = 0), where θ runs off to −∞; when the free fit
 * comes close to it, the fit is repeated on the boundary itself (L22 = 0 with θ = (log L11, L21), then G = 0) and the
 * boundary fit is kept when its likelihood is as high, so a boundary estimate is exact rather than a slow crawl.
 */
import { cholesky, cholSolve } from '../dense';
import type { FitMethod } from '../types';
import { slopeCurvature } from './curvature';
import { momentStart } from './start';
import { slopeProfile, type RelativeG, type SlopeProfile } from './profile';
import type { SlopeSums } from './sums';

export type SlopeShape = 'full' | 'rank-one' | 'zero';

export interface SlopeEstimate {
  readonly point: SlopeProfile | null;
  readonly D: RelativeG;
  readonly shape: SlopeShape;
  readonly iterations: number;
  readonly converged: boolean;
}

/** D from θ for each shape, and dℓ/dθ from dℓ/dD (chain rule through D11 = l1², D12 = l1 l2, D22 = l2² + l3²). */
function dOf(shape: SlopeShape, th: readonly number[]): RelativeG {
  if (shape === 'zero') return [0, 0, 0];
  const l1 = Math.exp(th[0]!);
  const l2 = th[1]!;
  const l3 = shape === 'full' ? Math.exp(th[2]!) : 0;
  return [l1 * l1, l1 * l2, l2 * l2 + l3 * l3];
}

function gradTheta(shape: SlopeShape, th: readonly number[], g: readonly [number, number, number]): number[] {
  const l1 = Math.exp(th[0]!);
  const l2 = th[1]!;
  const out = [g[0] * 2 * l1 * l1 + g[1] * l1 * l2, g[1] * l1 + g[2] * 2 * l2];
  if (shape === 'full') {
    const l3 = Math.exp(th[2]!);
    out.push(g[2] * 2 * l3 * l3);
  }
  return out;
}

/** θ of a positive-definite D (its Cholesky factor); rank-one θ from the first column. */
export function thetaOf(D: RelativeG, shape: SlopeShape): number[] {
  const l1 = Math.sqrt(Math.max(D[0], 1e-300));
  const l2 = D[1] / l1;
  const th = [Math.log(l1), l2];
  if (shape === 'full') th.push(Math.log(Math.sqrt(Math.max(D[2] - l2 * l2, 1e-300))));
  return th;
}

/** Largest step in θ per iteration: keeps exp(θ) finite and the line search sensible. */
const MAX_STEP = 4;
const FIRST_STEP = 0.25;
const MAX_ITER = 400;

interface BfgsResult {
  readonly theta: number[];
  readonly point: SlopeProfile;
  readonly iterations: number;
  readonly converged: boolean;
}

/** BFGS on −ℓ(θ) from θ0. Null when the start cannot be evaluated. */
function bfgs(s: SlopeSums, method: FitMethod, shape: SlopeShape, theta0: readonly number[]): BfgsResult | null {
  const k = theta0.length;
  const evalAt = (th: readonly number[]): { pt: SlopeProfile; g: number[] } | null => {
    const pt = slopeProfile(s, dOf(shape, th), method, true);
    if (pt === null || !Number.isFinite(pt.logLik)) return null;
    return { pt, g: gradTheta(shape, th, pt.gradient!).map((v) => -v) };
  };
  let th = [...theta0];
  let cur = evalAt(th);
  if (cur === null) return null;
  // H: inverse-Hessian approximation of −ℓ, row-major k × k.
  let H = identity(k);
  let scaled = false;
  for (let iter = 1; iter <= MAX_ITER; iter++) {
    const g = cur.g;
    let d = new Array<number>(k).fill(0);
    for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) d[i] = d[i]! - H[i * k + j]! * g[j]!;
    let slope = dot(g, d);
    if (!(slope < 0)) {
      H = identity(k);
      d = g.map((v) => -v);
      slope = dot(g, d);
    }
    // Newton decrement: at convergence −ℓ is within gHg/2 of its minimum; stop when that is below rounding.
    const f0 = -cur.pt.logLik;
    if (-slope <= 1e-13 * (1 + Math.abs(f0))) return { theta: th, point: cur.pt, iterations: iter, converged: true };
    const big = Math.max(...d.map(Math.abs));
    // Before the first update H is the identity, so the step has the gradient's size: start it at FIRST_STEP in θ.
    const cap = scaled ? MAX_STEP : FIRST_STEP;
    let step = big > cap ? cap / big : 1;
    let next: { pt: SlopeProfile; g: number[] } | null = null;
    let thNext = th;
    for (let tries = 0; tries < 60; tries++) {
      thNext = th.map((v, i) => v + step * d[i]!);
      const cand = evalAt(thNext);
      if (cand !== null && -cand.pt.logLik <= f0 + 1e-4 * step * slope) {
        next = cand;
        break;
      }
      step *= 0.5;
    }
    if (next === null) {
      // No decrease along a descent direction: at the optimum to within rounding when the gradient is small.
      const gmax = Math.max(...g.map(Math.abs));
      return { theta: th, point: cur.pt, iterations: iter, converged: gmax <= 1e-5 * (1 + Math.abs(f0)) };
    }
    const sv = thNext.map((v, i) => v - th[i]!);
    const yv = next.g.map((v, i) => v - g[i]!);
    const sy = dot(sv, yv);
    if (sy > 1e-300) {
      if (!scaled) {
        // Shanno–Phua scaling of the first approximation.
        const scale = sy / dot(yv, yv);
        H = identity(k).map((v) => v * scale);
        scaled = true;
      }
      H = bfgsUpdate(H, sv, yv, sy, k);
    }
    const fall = f0 - -next.pt.logLik;
    th = thNext;
    cur = next;
    if (fall >= 0 && fall <= 1e-15 * (1 + Math.abs(f0)) && Math.max(...next.g.map(Math.abs)) <= 1e-7 * (1 + Math.abs(f0))) {
      return { theta: th, point: cur.pt, iterations: iter, converged: true };
    }
  }
  return { theta: th, point: cur.pt, iterations: MAX_ITER, converged: false };
}

/**
 * The Hessian of ℓ(θ) from ℓ's gradient gD and Hessian HD in D (chain rule through D11 = l1², D12 = l1 l2,
 * D22 = l2² + l3², l1 = e^θ0, l2 = θ1, l3 = e^θ2): J'·HD·J + Σ_k gD_k ∇²D_k. k × k row-major.
 */
function hessianTheta(shape: SlopeShape, th: readonly number[], gD: readonly number[], HD: Float64Array): Float64Array {
  const k = th.length;
  const l1 = Math.exp(th[0]!);
  const l2 = th[1]!;
  const l3sq = shape === 'full' ? Math.exp(2 * th[2]!) : 0;
  // J: rows D11, D12, D22; columns θ.
  const J = [2 * l1 * l1, 0, 0, l1 * l2, l1, 0, 0, 2 * l2, 2 * l3sq];
  const out = new Float64Array(k * k);
  for (let a = 0; a < k; a++) {
    for (let b = 0; b < k; b++) {
      let v = 0;
      for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) v += J[3 * r + a]! * HD[3 * r + c]! * J[3 * c + b]!;
      out[a * k + b] = v;
    }
  }
  out[0] = out[0]! + gD[0]! * 4 * l1 * l1 + gD[1]! * l1 * l2;
  out[1] = out[1]! + gD[1]! * l1;
  out[k] = out[k]! + gD[1]! * l1;
  out[k + 1] = out[k + 1]! + 2 * gD[2]!;
  if (k === 3) out[8] = out[8]! + 4 * l3sq * gD[2]!;
  return out;
}

/**
 * The Newton direction for −ℓ: solves (−H + μI) d = g with the smallest μ ≥ 0 tried (0, then 1e-10 of the largest
 * diagonal entry, growing fourfold, so μ is at most four times the shift the matrix needs) that makes the matrix positive definite; null when none does.
 */
function newtonDirection(gf: readonly number[], Hf: Float64Array, k: number): number[] | null {
  let big = 0;
  for (let i = 0; i < k; i++) big = Math.max(big, Math.abs(Hf[i * k + i]!));
  if (!(big > 0) || !Number.isFinite(big)) return null;
  for (let mu = 0; mu <= big * 1e6; mu = mu === 0 ? big * 1e-10 : mu * 4) {
    const m = Float64Array.from(Hf);
    for (let i = 0; i < k; i++) m[i * k + i] = m[i * k + i]! + mu;
    const l = cholesky(m, k);
    if (l === null) continue;
    const d = cholSolve(l, k, Float64Array.from(gf));
    return Array.from(d, (v) => -v);
  }
  return null;
}

/** Newton on −ℓ(θ) from θ0 (see the file comment). Null when the start cannot be evaluated. */
function newton(s: SlopeSums, method: FitMethod, shape: SlopeShape, theta0: readonly number[]): BfgsResult | null {
  const k = theta0.length;
  const valueAt = (th: readonly number[]): SlopeProfile | null => {
    const pt = slopeProfile(s, dOf(shape, th), method, false);
    return pt === null || !Number.isFinite(pt.logLik) ? null : pt;
  };
  let th = [...theta0];
  let pt = valueAt(th);
  if (pt === null) return null;
  for (let iter = 1; iter <= MAX_NEWTON; iter++) {
    const D = dOf(shape, th);
    const c = slopeCurvature(s, D, method, pt);
    const gf = gradTheta(shape, th, c.gradient).map((v) => -v);
    const Hf = hessianTheta(shape, th, c.gradient, c.hessian).map((v) => -v);
    const f0 = -pt.logLik;
    const d = newtonDirection(gf, Hf, k) ?? gf.map((v) => -v);
    const slope = dot(gf, d);
    // Newton decrement: −ℓ is within −g'd/2 of its minimum; stop when that is below rounding.
    if (-slope <= 1e-13 * (1 + Math.abs(f0))) return { theta: th, point: pt, iterations: iter, converged: true };
    if (!(slope < 0)) return { theta: th, point: pt, iterations: iter, converged: false };
    const big = Math.max(...d.map(Math.abs));
    let step = big > MAX_STEP ? MAX_STEP / big : 1;
    let next: SlopeProfile | null = null;
    let thNext = th;
    // Halve until the Armijo condition holds, while the step still moves θ.
    while (step * big > 1e-13 * (1 + Math.max(...th.map(Math.abs)))) {
      thNext = th.map((v, i) => v + step * d[i]!);
      const cand = valueAt(thNext);
      if (cand !== null && -cand.logLik <= f0 + 1e-4 * step * slope) {
        next = cand;
        break;
      }
      step *= 0.5;
    }
    // No decrease along a descent direction, or none beyond rounding: at the optimum to within rounding when the
    // decrement is small.
    const stalled = next === null || f0 - -next.logLik <= 1e-15 * (1 + Math.abs(f0));
    if (stalled && -slope <= 1e-9 * (1 + Math.abs(f0))) {
      return next === null ? { theta: th, point: pt, iterations: iter, converged: true } : { theta: thNext, point: next, iterations: iter, converged: true };
    }
    if (next === null) return { theta: th, point: pt, iterations: iter, converged: false };
    th = thNext;
    pt = next;
  }
  return { theta: th, point: pt, iterations: MAX_NEWTON, converged: false };
}

const MAX_NEWTON = 100;

/** Newton from θ0, then BFGS from the same θ0 should Newton fail or not converge. */
function maximise(s: SlopeSums, method: FitMethod, shape: SlopeShape, theta0: readonly number[]): BfgsResult | null {
  const r = newton(s, method, shape, theta0);
  if (r !== null && r.converged) return r;
  const b = bfgs(s, method, shape, theta0);
  if (b === null) return r;
  return { ...b, iterations: b.iterations + (r?.iterations ?? 0) };
}

function identity(k: number): number[] {
  const m = new Array<number>(k * k).fill(0);
  for (let i = 0; i < k; i++) m[i * k + i] = 1;
  return m;
}

const dot = (a: readonly number[], b: readonly number[]): number => a.reduce((t, v, i) => t + v * b[i]!, 0);

/** H ← (I − ρ s y')H(I − ρ y s') + ρ s s', ρ = 1/(y's). */
function bfgsUpdate(H: number[], s: number[], y: number[], sy: number, k: number): number[] {
  const rho = 1 / sy;
  const Hy = new Array<number>(k).fill(0);
  for (let i = 0; i < k; i++) for (let j = 0; j < k; j++) Hy[i] = Hy[i]! + H[i * k + j]! * y[j]!;
  const yHy = dot(y, Hy);
  const out = new Array<number>(k * k);
  for (let i = 0; i < k; i++) {
    for (let j = 0; j < k; j++) {
      out[i * k + j] = H[i * k + j]! - rho * (Hy[i]! * s[j]! + s[i]! * Hy[j]!) + (rho * rho * yHy + rho) * s[i]! * s[j]!;
    }
  }
  return out;
}

/** Relative size of D's smallest eigenvalue below which the free fit is compared with the boundary fit. */
const NEAR_SINGULAR = 1e-4;
/** Size of D (relative to σ², on the scaled time) below which G = 0 is tried too. */
const NEAR_ZERO = 1e-6;

function eigen2(D: RelativeG): [number, number] {
  const tr = D[0] + D[2];
  const disc = Math.sqrt(Math.max(0, ((D[0] - D[2]) / 2) ** 2 + D[1] * D[1]));
  return [tr / 2 - disc, tr / 2 + disc];
}

/**
 * The REML or ML estimate of D. `start` optionally gives D to start from (else a grid of diagonal D).
 * Example: data simulated with G = [[4, 0.5], [0.5, 1]], σ² = 1 -> shape 'full', D near G/σ² on the scaled time.
 */
export function estimateSlopeG(s: SlopeSums, method: FitMethod, start?: RelativeG): SlopeEstimate {
  const moments = start === undefined ? momentStart(s) : null;
  let best: RelativeG = start ?? moments ?? gridStart(s, method);
  let full = maximise(s, method, 'full', thetaOf(best, 'full'));
  if (full === null && moments !== null) {
    // The moment estimate could not be evaluated: start from the grid instead.
    best = gridStart(s, method);
    full = maximise(s, method, 'full', thetaOf(best, 'full'));
  }
  const candidates: { r: BfgsResult | null; shape: SlopeShape }[] = [];
  candidates.push({ r: full, shape: 'full' });
  let iterations = full?.iterations ?? 0;
  const fullD = full === null ? best : dOf('full', full.theta);
  const [lo, hi] = eigen2(fullD);
  if (full === null || lo <= NEAR_SINGULAR * hi) {
    const rank1 = maximise(s, method, 'rank-one', thetaOf(fullD, 'rank-one'));
    iterations += rank1?.iterations ?? 0;
    candidates.push({ r: rank1, shape: 'rank-one' });
    const r1D = rank1 === null ? fullD : dOf('rank-one', rank1.theta);
    if (full === null || Math.max(hi, r1D[0] + r1D[2]) <= NEAR_ZERO || r1D[0] + r1D[2] <= NEAR_ZERO) {
      const pt = slopeProfile(s, [0, 0, 0], method, true);
      if (pt !== null) candidates.push({ r: { theta: [], point: pt, iterations: 0, converged: true }, shape: 'zero' });
    }
  }
  // Highest likelihood wins; a boundary fit wins ties (within rounding), being the exact form of the same optimum.
  let pick: { r: BfgsResult; shape: SlopeShape } | null = null;
  for (const c of candidates) {
    if (c.r === null) continue;
    if (pick === null) {
      pick = { r: c.r, shape: c.shape };
      continue;
    }
    const tol = 1e-9 * (1 + Math.abs(pick.r.point.logLik));
    if (c.r.point.logLik >= pick.r.point.logLik - tol) pick = { r: c.r, shape: c.shape };
  }
  if (pick === null) return { point: null, D: [NaN, NaN, NaN], shape: 'full', iterations, converged: false };
  return { point: pick.r.point, D: dOf(pick.shape, pick.r.theta), shape: pick.shape, iterations, converged: pick.r.converged };
}

/** The best of a small grid of diagonal D (the start when the moment estimate cannot be made or evaluated). */
function gridStart(s: SlopeSums, method: FitMethod): RelativeG {
  let best: RelativeG = [0.5, 0, 0.5];
  let bestL = -Infinity;
  for (const a of [0.05, 0.5, 5]) {
    for (const b of [0.02, 0.2, 2]) {
      const pt = slopeProfile(s, [a, 0, b], method, false);
      if (pt !== null && pt.logLik > bestL) {
        bestL = pt.logLik;
        best = [a, 0, b];
      }
    }
  }
  return best;
}
