/**
 * Test helpers for the model engine: a seeded generator, small data builders, the usual fit options, one-way ANOVA
 * mean squares, and a dense Kenward–Roger evaluation shared by the reference checks.
 */
import { Matrix, inverse } from 'ml-matrix';
import type { FitMethod, FitOptions, ModelData } from '../../../src/core/model';

/** Mulberry32, a small seeded uniform generator (common practice for reproducible tests); one copy in scripts/random.ts. */
export { mulberry32 as seeded } from '../../../scripts/random';

/** Standard normal draws by Box–Muller from a uniform generator. */
export function normals(u: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
}

/** One-way layout: groups of values, one subject per group, time all zero, no arms. */
export function oneWay(groups: readonly (readonly number[])[]): ModelData {
  const y: number[] = [];
  const s: number[] = [];
  groups.forEach((g, i) => g.forEach((v) => { y.push(v); s.push(i); }));
  return { y: Float64Array.from(y), time: new Float64Array(y.length), subject: Int32Array.from(s), nSubjects: groups.length, armIndex: null, arms: [], covariates: [] };
}

/** Ultrasonic travel times along 6 rails, 3 each (Devore 2000, Probability and Statistics for Engineering and the Sciences). */
export const RAILS = [
  [55, 53, 54], [26, 37, 32], [78, 91, 85], [92, 100, 96], [49, 51, 50], [80, 85, 83],
];

/** Dyestuff yield, 6 batches x 5 (Davies 1947, Statistical Methods in Research and Production). */
export const DYESTUFF = [
  [1545, 1440, 1440, 1520, 1580], [1540, 1555, 1490, 1560, 1495], [1595, 1550, 1605, 1510, 1560],
  [1445, 1440, 1595, 1465, 1545], [1595, 1630, 1515, 1635, 1625], [1520, 1455, 1450, 1480, 1445],
];

/** The options most tests fit with: REML, Kenward–Roger df, 95% intervals, months, no contrast days; `over` changes any. */
export function fitOptions(over: Partial<FitOptions> = {}): FitOptions {
  return { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'month', contrastDays: [], ...over };
}

/** fitOptions for the one-way random-effects model (design 'intercept-only'), by REML unless told. */
export function oneWayOptions(method: FitMethod = 'reml'): FitOptions {
  return fitOptions({ method, design: 'intercept-only' });
}

export interface Anova {
  /** Groups. */
  readonly a: number;
  /** Values per group. */
  readonly n: number;
  /** All values, a·n. */
  readonly N: number;
  readonly grand: number;
  /** Between-group mean square SSB/(a − 1). */
  readonly msb: number;
  /** Within-group mean square SSW/(a(n − 1)). */
  readonly msw: number;
}

/** One-way ANOVA mean squares of balanced groups (exact arithmetic on the data; every group as long as the first). */
export function balancedAnova(groups: readonly (readonly number[])[]): Anova {
  const a = groups.length;
  const n = groups[0]!.length;
  const means = groups.map((g) => g.reduce((s, v) => s + v, 0) / n);
  const grand = means.reduce((s, v) => s + v, 0) / a;
  const ssb = n * means.reduce((s, m) => s + (m - grand) ** 2, 0);
  const ssw = groups.reduce((s, g, i) => s + g.reduce((t, v) => t + (v - means[i]!) ** 2, 0), 0);
  return { a, n, N: a * n, grand, msb: ssb / (a - 1), msw: ssw / (a * (n - 1)) };
}

export interface DenseKenwardRoger {
  /** The GLS estimate β̂ = ΦX'Σ⁻¹y. */
  readonly beta: Matrix;
  /** Φ = (X'Σ⁻¹X)⁻¹, the unadjusted covariance of β̂. */
  readonly phi: Matrix;
  /** Φ_A, the Kenward–Roger adjusted covariance of β̂. */
  readonly phiA: Matrix;
  /** The denominator df m. */
  readonly m: number;
  /** The scale λ of the F statistic. */
  readonly lambda: number;
}

/**
 * Kenward–Roger written out with dense n x n matrices (ml-matrix), straight from the published formulas of Kenward &
 * Roger (1997, Biometrics 53:983–997, sections 2–3 — section numbers from memory), for the contrast rows L at
 * (σ²_u, σ²): Σ = σ²_u ZZ' + σ² I, Σ_1 = ZZ', Σ_2 = I, Φ = (X'Σ⁻¹X)⁻¹, P_r = −X'Σ⁻¹Σ_rΣ⁻¹X,
 * Q_rs = X'Σ⁻¹Σ_rΣ⁻¹Σ_sΣ⁻¹X, W = inverse of the expected REML information ½ tr(ΠΣ_rΠΣ_s) with Π = Σ⁻¹ − Σ⁻¹XΦX'Σ⁻¹,
 * Φ_A = Φ + 2Φ{Σ W_rs (Q_rs − P_rΦP_s)}Φ (no R_rs: Σ is linear in θ); Θ = L'(LΦL')⁻¹L, A1 = Σ W_rs tr(ΘΦP_rΦ) tr(ΘΦP_sΦ),
 * A2 = Σ W_rs tr(ΘΦP_rΦΘΦP_sΦ), then B, g, c1–c3, E = 1/(1 − A2/ℓ), V, ρ = V/(2E²), m = 4 + (ℓ + 2)/(ℓρ − 1),
 * λ = m/(E(m − 2)). The general-ℓ formulas are used as printed, not the engine's one-row simplification. Nothing from
 * src/ is used. Cost O(n³) per inverse: for test data of tens of rows only.
 */
export function denseKenwardRoger(X: Matrix, y: Matrix, subject: Int32Array, s2u: number, s2: number, L: Matrix): DenseKenwardRoger {
  const n = X.rows;
  const S1 = new Matrix(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) S1.set(i, j, subject[i] === subject[j] ? 1 : 0);
  const S2 = Matrix.eye(n);
  const Sigma = S1.clone().mul(s2u).add(S2.clone().mul(s2));
  const Si = inverse(Sigma);
  const Xt = X.transpose();
  const Phi = inverse(Xt.mmul(Si).mmul(X));
  const beta = Phi.mmul(Xt).mmul(Si).mmul(y);
  const Sr = [S1, S2];
  const P = Sr.map((Sk) => Xt.mmul(Si).mmul(Sk).mmul(Si).mmul(X).mul(-1));
  const Q = (r: number, s: number): Matrix => Xt.mmul(Si).mmul(Sr[r]!).mmul(Si).mmul(Sr[s]!).mmul(Si).mmul(X);
  const Pi = Si.clone().sub(Si.mmul(X).mmul(Phi).mmul(Xt).mmul(Si));
  const info = new Matrix(2, 2);
  for (let r = 0; r < 2; r++) for (let s = 0; s < 2; s++) info.set(r, s, 0.5 * Pi.mmul(Sr[r]!).mmul(Pi).mmul(Sr[s]!).trace());
  const W = inverse(info);
  const inner = Matrix.zeros(X.columns, X.columns);
  for (let r = 0; r < 2; r++) for (let s = 0; s < 2; s++) inner.add(Q(r, s).sub(P[r]!.mmul(Phi).mmul(P[s]!)).mul(W.get(r, s)));
  const PhiA = Phi.clone().add(Phi.mmul(inner).mmul(Phi).mul(2));
  const ell = L.rows;
  const Theta = L.transpose().mmul(inverse(L.mmul(Phi).mmul(L.transpose()))).mmul(L);
  let A1 = 0;
  let A2 = 0;
  for (let r = 0; r < 2; r++) {
    for (let s = 0; s < 2; s++) {
      const Mr = Theta.mmul(Phi).mmul(P[r]!).mmul(Phi);
      const Ms = Theta.mmul(Phi).mmul(P[s]!).mmul(Phi);
      A1 += W.get(r, s) * Mr.trace() * Ms.trace();
      A2 += W.get(r, s) * Mr.mmul(Ms).trace();
    }
  }
  const B = (A1 + 6 * A2) / (2 * ell);
  const g = ((ell + 1) * A1 - (ell + 4) * A2) / ((ell + 2) * A2);
  const den = 3 * ell + 2 * (1 - g);
  const [c1, c2, c3] = [g / den, (ell - g) / den, (ell + 2 - g) / den];
  const E = 1 / (1 - A2 / ell);
  const V = (2 / ell) * ((1 + c1 * B) / ((1 - c2 * B) ** 2 * (1 - c3 * B)));
  const rho = V / (2 * E * E);
  const m = 4 + (ell + 2) / (ell * rho - 1);
  const lambda = m / (E * (m - 2));
  return { beta, phi: Phi, phiA: PhiA, m, lambda };
}
