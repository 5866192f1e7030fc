import { describe, expect, it } from 'vitest';
import type { ModelData } from '../../../src/core/model';
import { buildDesign } from '../../../src/core/model/design';
import { sufficientStatsFast } from '../../../src/core/model/armSumsPass';
import { sufficientStats, type SufficientStats } from '../../../src/core/model/sufficient';
import { normals, seeded } from './helpers';

/** Invented: 3 arms, 40 subjects with 1–6 visits. */
function data(shuffle: boolean): ModelData {
  const u = seeded(99);
  const z = normals(u);
  const rows: [number, number, number, number][] = [];
  for (let i = 0; i < 40; i++) {
    const a = i % 3;
    const n = 1 + Math.floor(u() * 6);
    for (let j = 0; j < n; j++) rows.push([50 + z() * 5 + j, j * 3 + u(), i, a]);
  }
  if (shuffle) rows.sort(() => u() - 0.5);
  return {
    y: Float64Array.from(rows, (r) => r[0]),
    time: Float64Array.from(rows, (r) => r[1]),
    subject: Int32Array.from(rows, (r) => r[2]),
    nSubjects: 40,
    armIndex: Int32Array.from(rows, (r) => r[3]),
    arms: ['A', 'B', 'C'],
    covariates: [],
  };
}

function expectSame(a: SufficientStats, b: SufficientStats): void {
  // Relative 1e-12: the same sums accumulated in a different order differ by rounding only.
  const close = (x: ArrayLike<number>, y: ArrayLike<number>): void => {
    expect(x.length).toBe(y.length);
    for (let i = 0; i < x.length; i++) expect(Math.abs(x[i]! - y[i]!)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(y[i]!)));
  };
  close(a.xtx, b.xtx);
  close(a.xty, b.xty);
  close([a.yty, a.tMin, a.tMax, a.nSubjects], [b.yty, b.tMin, b.tMax, b.nSubjects]);
  close(a.sizes, b.sizes);
  close(a.m, b.m);
  close(a.S, b.S);
  close(a.c, b.c);
  close(a.q, b.q);
  const beta = Float64Array.from({ length: a.p }, (_, i) => 0.5 + i);
  for (let s = 0; s < 40; s++) expect(a.xbSum(s, beta)).toBeCloseTo(b.xbSum(s, beta), 9);
}

describe('the fast data pass equals the general one (exact identity, rounding aside)', () => {
  for (const shuffle of [false, true]) {
    it(`three arms, ${shuffle ? 'rows in random order (per-subject arrays)' : 'rows grouped by subject (running sums)'}`, () => {
      const d = data(shuffle);
      const design = buildDesign(d, false);
      const fast = sufficientStatsFast(d.y, d.time, d.subject, d.nSubjects, d.armIndex, design);
      expect(fast).not.toBeNull();
      expectSame(fast!, sufficientStats(d.y, d.subject, d.nSubjects, design, d.time));
    });
  }
  it('returns null when a subject appears in two arms, so the caller takes the general pass', () => {
    const d = data(false);
    const arm = Int32Array.from(d.armIndex!);
    let r = 1;
    while (d.subject[r] !== d.subject[r - 1]) r++; // the first subject with two rows
    arm[r] = (arm[r - 1]! + 1) % 3;
    const dd = { ...d, armIndex: arm };
    const design = buildDesign(dd, false);
    expect(sufficientStatsFast(dd.y, dd.time, dd.subject, dd.nSubjects, dd.armIndex, design)).toBeNull();
  });
});
