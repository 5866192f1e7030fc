/** Test helpers for the model engine: a seeded generator and small data builders. */
import type { ModelData } from '../../../src/core/model';

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
