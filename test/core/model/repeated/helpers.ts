/**
 * Test helpers for the repeated-measures model: invented, seeded data (kidney-function scenario: eGFR every 12 weeks,
 * two arms, dropout) and an independent dense REML/ML fit written straight from the textbook formulas with full n × n
 * matrices (ml-matrix). Nothing from src/ is used by the dense fit: the design matrix, V, P, the score, the expected
 * information, Fisher scoring in the element-wise σ_jk (not the engine's Cholesky parametrisation) and Kenward–Roger's
 * Φ_A and df are all built here.
 */
import { CholeskyDecomposition, inverse, Matrix } from 'ml-matrix';
import { mulberry32 } from '../../../../scripts/random';
import type { RepeatedData } from '../../../../src/core/model/repeated';

/** Invented trial: n participants, visits at weeks 0, 12, 24, ...; arm alternates; each participant may stop early
 * (dropout after any visit with probability `drop`) and miss a middle visit now and then (probability `skip`). */
export function inventedTrial(n: number, nVisits: number, seed: number, drop: number, skip: number, baseline: boolean): RepeatedData {
  const u = mulberry32(seed);
  const z = (): number => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  const visits = Array.from({ length: nVisits }, (_, v) => `Week ${12 * v}`);
  const y = new Float64Array(n * nVisits).fill(NaN);
  const armIndex = new Int32Array(n);
  const base = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = i % 2;
    armIndex[i] = a;
    base[i] = 55 + 12 * z();
    const ui = 8 * z();
    let e = 0;
    for (let v = 0; v < nVisits; v++) {
      e = 0.6 * e + 3 * z(); // autocorrelated error: a non-trivial unstructured Σ
      if (v > 0 && u() < skip) continue;
      y[i * nVisits + v] = (baseline ? 0.8 * base[i]! + 10 : 55) + ui - 0.9 * v + (a === 1 ? 0.7 * v : 0) + e;
      if (v > 0 && u() < drop) break;
    }
  }
  return { visits, visitDays: visits.map((_, v) => 1 + 84 * v), nSubjects: n, y, armIndex, arms: ['Placebo', 'Drug'], baseline: baseline ? { name: 'Baseline eGFR', values: base } : null };
}

interface Long {
  readonly y: Matrix;
  readonly X: Matrix;
  readonly subject: number[];
  readonly visit: number[];
}

/** Long format with the design matrix in reference-level coding: intercept, arm, visit, arm × visit, baseline,
 * baseline × visit (the order of the engine's fixedEffects). */
export function longForm(d: RepeatedData): Long {
  const V = d.visits.length;
  const A = d.armIndex === null ? 1 : d.arms.length;
  const rows: number[][] = [];
  const ys: number[] = [];
  const subject: number[] = [];
  const visit: number[] = [];
  for (let i = 0; i < d.nSubjects; i++) {
    for (let v = 0; v < V; v++) {
      const yv = d.y[i * V + v]!;
      if (Number.isNaN(yv)) continue;
      const a = d.armIndex === null ? 0 : d.armIndex[i]!;
      const x: number[] = [1];
      for (let k = 1; k < A; k++) x.push(a === k ? 1 : 0);
      for (let w = 1; w < V; w++) x.push(v === w ? 1 : 0);
      for (let k = 1; k < A; k++) for (let w = 1; w < V; w++) x.push(a === k && v === w ? 1 : 0);
      if (d.baseline !== null) {
        const b = d.baseline.values[i]!;
        x.push(b);
        for (let w = 1; w < V; w++) x.push(v === w ? b : 0);
      }
      rows.push(x);
      ys.push(yv);
      subject.push(i);
      visit.push(v);
    }
  }
  return { y: Matrix.columnVector(ys), X: new Matrix(rows), subject, visit };
}

export interface DenseFit {
  readonly logLik: number;
  readonly beta: number[];
  readonly sigma: number[][];
  /** Kenward–Roger SE and df of a contrast of β. */
  readonly kr: (l: number[]) => { se: number; df: number };
}

function pairsOf(V: number): [number, number][] {
  const out: [number, number][] = [];
  for (let j = 0; j < V; j++) for (let k = j; k < V; k++) out.push([j, k]);
  return out;
}

/** ∂V/∂σ_jk of the n × n V as its list of non-zero cells (s, t), each 1: rows s and t belong to one participant at
 * visits j and k (either order). */
function dV(L: Long, j: number, k: number): [number, number][] {
  const n = L.subject.length;
  const out: [number, number][] = [];
  for (let s = 0; s < n; s++) {
    for (let t = 0; t < n; t++) {
      if (L.subject[s] !== L.subject[t]) continue;
      const a = L.visit[s]!;
      const b = L.visit[t]!;
      if ((a === j && b === k) || (a === k && b === j)) out.push([s, t]);
    }
  }
  return out;
}

function logDet(M: Matrix): number {
  const L = new CholeskyDecomposition(M).lowerTriangularMatrix;
  let s = 0;
  for (let i = 0; i < M.rows; i++) s += 2 * Math.log(L.get(i, i));
  return s;
}

/** tr(A E_a B E_b) summed over the cells of two ∂V matrices: Σ A[w][s] B[t][u] for (s, t) in a, (u, w) in b. */
function trPair(A: number[][], B: number[][], a: [number, number][], b: [number, number][]): number {
  let sum = 0;
  for (const [s, t] of a) for (const [u, w] of b) sum += A[w]![s]! * B[t]![u]!;
  return sum;
}

/** Dense REML (or ML) fit by Fisher scoring in σ_jk, from a diagonal start, with step halving. */
export function denseFit(d: RepeatedData, method: 'reml' | 'ml'): DenseFit {
  const L = longForm(d);
  const V = d.visits.length;
  const n = L.subject.length;
  const p = L.X.columns;
  const pairs = pairsOf(V);
  const R = pairs.length;
  const Vr = pairs.map(([j, k]) => dV(L, j, k));
  const build = (s: number[]): Matrix => {
    const M = Matrix.zeros(n, n);
    for (let r = 0; r < R; r++) for (const [a, b] of Vr[r]!) M.set(a, b, s[r]!);
    return M;
  };
  const evalAt = (s: number[]): { ll: number; Vi: number[][]; P: number[][]; beta: Matrix; phi: Matrix; ViX: Matrix; ViM: Matrix } | null => {
    const Vm = build(s);
    const ch = new CholeskyDecomposition(Vm);
    if (!ch.isPositiveDefinite()) return null;
    const Vi = inverse(Vm);
    const ViX = Vi.mmul(L.X);
    const A0 = L.X.transpose().mmul(ViX);
    const A = A0.clone().add(A0.transpose()).mul(0.5); // symmetric up to rounding
    const phi = inverse(A);
    const beta = phi.mmul(ViX.transpose().mmul(L.y));
    const r = L.y.clone().sub(L.X.mmul(beta));
    const q = r.transpose().mmul(Vi).mmul(r).get(0, 0);
    const P = Vi.clone().sub(ViX.mmul(phi).mmul(ViX.transpose()));
    const ll = method === 'ml' ? -0.5 * (n * Math.log(2 * Math.PI) + logDet(Vm) + q) : -0.5 * ((n - p) * Math.log(2 * Math.PI) + logDet(Vm) + logDet(A) + q);
    return { ll, Vi: Vi.to2DArray(), P: P.to2DArray(), beta, phi, ViX, ViM: Vi };
  };
  // Diagonal start: the overall sample variance on every visit.
  const ybar = L.y.mean();
  const var0 = L.y.clone().sub(ybar).pow(2).sum() / (n - 1);
  let s = pairs.map(([j, k]) => (j === k ? var0 : 0));
  let cur = evalAt(s)!;
  // Expected information ½ tr(P V_r P V_s) (REML) or ½ tr(V⁻¹V_r V⁻¹V_s) (ML).
  const infoAt = (e: typeof cur): Matrix => {
    const B = method === 'ml' ? e.Vi : e.P;
    const I = Matrix.zeros(R, R);
    for (let a = 0; a < R; a++) for (let b = 0; b < R; b++) I.set(a, b, 0.5 * trPair(B, B, Vr[a]!, Vr[b]!));
    return I;
  };
  for (let it = 0; it < 500; it++) {
    const y = L.y.to1DArray();
    const Py = cur.P.map((row) => row.reduce((acc, v, k) => acc + v * y[k]!, 0));
    const M0 = method === 'ml' ? cur.Vi : cur.P;
    // score: −½ tr(M0 V_r) + ½ (Py)' V_r (Py)
    const g = Vr.map((cells) => cells.reduce((acc, [a, b]) => acc - 0.5 * M0[b]![a]! + 0.5 * Py[a]! * Py[b]!, 0));
    const I = infoAt(cur);
    const step = inverse(I).mmul(Matrix.columnVector(g)).to1DArray();
    let t = 1;
    let next: typeof cur | null = null;
    let sNext = s;
    for (let h = 0; h < 40; h++, t /= 2) {
      sNext = s.map((x, r) => x + t * step[r]!);
      next = evalAt(sNext);
      if (next !== null && next.ll >= cur.ll - 1e-12 * Math.abs(cur.ll)) break;
      next = null;
    }
    if (next === null) break;
    const moved = Math.max(...step.map((x, r) => Math.abs(t * x) / Math.max(1, Math.abs(s[r]!))));
    s = sNext;
    cur = next;
    if (moved < 1e-12) break;
  }
  const sigma = Array.from({ length: V }, (_, j) => Array.from({ length: V }, (_, k) => s[pairs.findIndex(([a, b]) => a === Math.min(j, k) && b === Math.max(j, k))]!));
  // Kenward–Roger (1997): Φ_A = Φ + 2Φ[Σ W_rs (Q_rs − P_r Φ P_s)]Φ, W = inverse expected information, with
  // P_r = X'V⁻¹V_rV⁻¹X and Q_rs = X'V⁻¹V_rV⁻¹V_sV⁻¹X; one-row df = 2 (l'Φl)² / (g'Wg), g_r = l'Φ P_r Φ l.
  const W = inverse(infoAt(cur));
  const ViX = cur.ViX.to2DArray();
  // Y_r = V_r V⁻¹X (n × p) from the cells of V_r.
  const Yr = Vr.map((cells) => {
    const Y = Matrix.zeros(n, p);
    for (const [a, b] of cells) for (let c = 0; c < p; c++) Y.set(a, c, Y.get(a, c) + ViX[b]![c]!);
    return Y;
  });
  const Pr = Yr.map((Y) => cur.ViX.transpose().mmul(Y));
  const ViY = Yr.map((Y) => cur.ViM.mmul(Y));
  const inner = Matrix.zeros(p, p);
  for (let a = 0; a < R; a++) {
    for (let b = 0; b < R; b++) {
      const Q = Yr[a]!.transpose().mmul(ViY[b]!);
      inner.add(Q.sub(Pr[a]!.mmul(cur.phi).mmul(Pr[b]!)).mul(W.get(a, b)));
    }
  }
  const phiA = cur.phi.clone().add(cur.phi.mmul(inner).mmul(cur.phi).mul(2));
  const kr = (l: number[]): { se: number; df: number } => {
    const lv = Matrix.columnVector(l);
    const v = lv.transpose().mmul(cur.phi).mmul(lv).get(0, 0);
    const gv = Pr.map((P) => lv.transpose().mmul(cur.phi).mmul(P).mmul(cur.phi).mmul(lv).get(0, 0));
    const gw = Matrix.rowVector(gv).mmul(W).mmul(Matrix.columnVector(gv)).get(0, 0);
    return { se: Math.sqrt(lv.transpose().mmul(phiA).mmul(lv).get(0, 0)), df: (2 * v * v) / gw };
  };
  return { logLik: cur.ll, beta: cur.beta.to1DArray(), sigma, kr };
}
