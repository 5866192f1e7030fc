import { describe, expect, it } from 'vitest';
import { fitRandomIntercept, type ModelData } from '../../../src/core/model';
import { buildDesign } from '../../../src/core/model/design';
import { sufficientStatsFast } from '../../../src/core/model/armSumsPass';
import { sufficientStatsCovariates } from '../../../src/core/model/covariatePass';
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
  // 9 digits on sums of order 1e3–1e4: the same sums in another order, rounding only.
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

describe('the covariate pass equals the general one (exact identity, rounding aside)', () => {
  /** Invented: the three-arm data plus a per-subject baseline and a row-level numeric covariate. */
  function withCovariates(d: ModelData, q: 1 | 2): ModelData {
    const u = seeded(5);
    const base = Array.from({ length: d.nSubjects }, () => 40 + 40 * u());
    const covariates: ModelData['covariates'] = [
      { name: 'Baseline', kind: 'numeric', values: Float64Array.from(d.subject, (s) => base[s]!) },
      { name: 'Weight', kind: 'numeric', values: Float64Array.from(d.y, () => 60 + 30 * u()) },
    ];
    return { ...d, covariates: covariates.slice(0, q) };
  }
  for (const q of [1, 2] as const) {
    for (const blinded of [false, true]) {
      it(`${q} numeric covariate${q > 1 ? 's' : ''}, ${blinded ? 'blinded (no arm terms)' : 'three arms'}, rows grouped by subject`, () => {
        const d0 = withCovariates(data(false), q);
        const d = blinded ? { ...d0, armIndex: null, arms: [] } : d0;
        const design = buildDesign(d, false);
        const fast = sufficientStatsCovariates(d, design);
        expect(fast).not.toBeNull();
        expectSame(fast!, sufficientStats(d.y, d.subject, d.nSubjects, design, d.time));
      });
    }
  }
  it('returns null for rows not grouped by subject, a subject in two arms, a non-finite value or a categorical covariate', () => {
    const grouped = withCovariates(data(false), 1);
    const shuffled = withCovariates(data(true), 1);
    expect(sufficientStatsCovariates(shuffled, buildDesign(shuffled, false))).toBeNull();
    const arm = Int32Array.from(grouped.armIndex!);
    arm[1] = (arm[0]! + 1) % 3; // subject 0 has at least two rows (seeded data): its second row changes arm
    expect(grouped.subject[1]).toBe(grouped.subject[0]);
    const twoArms = { ...grouped, armIndex: arm };
    expect(sufficientStatsCovariates(twoArms, buildDesign(twoArms, false))).toBeNull();
    const y = Float64Array.from(grouped.y);
    y[7] = NaN;
    const missing = { ...grouped, y };
    expect(sufficientStatsCovariates(missing, buildDesign(missing, false))).toBeNull();
    const cat: ModelData = { ...grouped, covariates: [{ name: 'Region', kind: 'categorical', values: Array.from(grouped.y, (_, i) => (i % 2 === 0 ? 'N' : 'S')), levels: ['N', 'S'] }] };
    expect(sufficientStatsCovariates(cat, buildDesign(cat, false))).toBeNull();
  });
  it('the fit is the same whichever pass runs: grouped rows (covariate pass) and shuffled rows (general pass)', () => {
    const d = withCovariates(data(false), 2);
    const u = seeded(17);
    const perm = Array.from(d.y, (_, i) => i).sort(() => u() - 0.5);
    const pick = <T extends Float64Array | Int32Array>(a: T): T => a.map((_, i) => a[perm[i]!]!) as T;
    const shuffled: ModelData = {
      ...d,
      y: pick(d.y),
      time: pick(d.time),
      subject: pick(d.subject),
      armIndex: pick(d.armIndex!),
      covariates: d.covariates.map((c) => (c.kind === 'numeric' ? { ...c, values: pick(c.values) } : c)),
    };
    expect(sufficientStatsCovariates(shuffled, buildDesign(shuffled, false))).toBeNull(); // so the general pass runs
    const opts = { method: 'reml', dfMethod: 'kenward-roger', level: 0.95, timeUnit: 'month', contrastDays: [] } as const;
    const a = fitRandomIntercept(d, opts);
    const b = fitRandomIntercept(shuffled, opts);
    // 1e-8 relative: same sufficient statistics up to summation order, then the same optimiser.
    a.fixedEffects.forEach((fe, j) => {
      expect(Math.abs(fe.estimate - b.fixedEffects[j]!.estimate)).toBeLessThan(1e-8 * Math.max(1, Math.abs(fe.estimate)));
      expect(Math.abs(fe.se - b.fixedEffects[j]!.se)).toBeLessThan(1e-8 * fe.se);
    });
  });
  it('a missing value with a covariate still gets the row-by-row message naming the observation', () => {
    const d = withCovariates(data(false), 1);
    const y = Float64Array.from(d.y);
    y[7] = NaN;
    expect(() => fitRandomIntercept({ ...d, y }, { method: 'reml', dfMethod: 'residual', level: 0.95, timeUnit: 'month', contrastDays: [] })).toThrow(
      /observation 8 is not a finite number/,
    );
  });
});
