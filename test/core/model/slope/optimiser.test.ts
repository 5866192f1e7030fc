/**
 * The slope model's optimiser (optimise.ts: a method-of-moments start, then Newton steps on the exact Hessian) reaches
 * the same optimum as a long, careful run of a different method: Nelder–Mead simplex search (Nelder & Mead 1965,
 * Computer Journal 7:308–313) on the value of the profiled likelihood only, restarted from its own best point until
 * it stops improving, with a tight tolerance, written here and sharing no code with the optimiser but slopeProfile.
 * Interior data sets (grouped and general layouts, REML and ML) and boundary ones (slopes that do not vary; intercepts
 * and slopes perfectly correlated), where the careful run is made on the boundary (rank one: θ = (log L11, L21)).
 * Tolerances: the simplex stops when its values agree to 1e-15 relative (or its points to 1e-12 in θ), so it is at the optimum to about 1e-13 in
 * the log-likelihood and, the log-likelihood being quadratic near the optimum, to about √1e-13 ≈ 3e-7 relative in D;
 * we ask 1e-10 relative in the log-likelihood and 1e-4 relative in D (as the outside-library checks, reference.test.ts).
 */
import { describe, expect, it } from 'vitest';
import type { FitMethod, ModelData } from '../../../../src/core/model';
import { buildDesign } from '../../../../src/core/model/design';
import { estimateSlopeG } from '../../../../src/core/model/slope/optimise';
import { slopeProfile, type RelativeG } from '../../../../src/core/model/slope/profile';
import { slopeSums, type SlopeSums } from '../../../../src/core/model/slope/sums';
import { normals, seeded } from '../helpers';

type Kind = 'interior' | 'no-slope-variation' | 'perfect-correlation';

/** Invented data: m participants in 3 arms, 2–6 visits at irregular times, random effects as `kind` says. */
function trial(kind: Kind, seed: number, withCovariate = false, m = 60): ModelData {
  const u = seeded(seed);
  const z = normals(u);
  const y: number[] = [], time: number[] = [], subject: number[] = [], arm: number[] = [], base: number[] = [];
  for (let i = 0; i < m; i++) {
    const nv = 2 + ((i * 3) % 5);
    const u0 = 3 * z();
    const u1 = kind === 'interior' ? 0.1 * u0 + 1.2 * z() : kind === 'perfect-correlation' ? 0.3 * u0 : 0;
    const b = 40 + 10 * u();
    for (let j = 0; j < nv; j++) {
      const t = j * 2 + 0.5 * u();
      y.push(50 + (withCovariate ? 0.2 * b : 0) - 0.5 * t + (i % 3) * 0.3 * t + u0 + u1 * t + z());
      time.push(t);
      subject.push(i);
      arm.push(i % 3);
      base.push(b);
    }
  }
  return {
    y: Float64Array.from(y),
    time: Float64Array.from(time),
    subject: Int32Array.from(subject),
    nSubjects: m,
    armIndex: Int32Array.from(arm),
    arms: ['Placebo', 'Low', 'High'],
    covariates: withCovariate ? [{ name: 'Baseline', kind: 'numeric', values: Float64Array.from(base) }] : [],
  };
}

/** D from log-Cholesky θ: 3 entries (full) or 2 (rank one, L22 = 0). */
function dOf(th: readonly number[]): RelativeG {
  const l1 = Math.exp(th[0]!);
  const l2 = th[1]!;
  const l3 = th.length === 3 ? Math.exp(th[2]!) : 0;
  return [l1 * l1, l1 * l2, l2 * l2 + l3 * l3];
}

/** Nelder–Mead on f, restarted from its best point until a restart gains nothing; standard coefficients 1, 2, ½, ½. */
function nelderMead(f: (x: readonly number[]) => number, x0: readonly number[]): { x: number[]; f: number } {
  const k = x0.length;
  let best = { x: [...x0], f: f(x0) };
  for (let restart = 0; restart < 10; restart++) {
    const simplex = [best.x, ...best.x.map((_, j) => best.x.map((v, i) => (i === j ? v + 0.5 : v)))].map((x) => ({ x, f: f(x) }));
    for (let iter = 0; iter < 4_000; iter++) {
      simplex.sort((a, b) => a.f - b.f);
      const lo = simplex[0]!;
      const hi = simplex[k]!;
      if (Math.abs(hi.f - lo.f) <= 1e-15 * Math.abs(lo.f)) break;
      let size = 0;
      for (const p of simplex) for (let i = 0; i < k; i++) size = Math.max(size, Math.abs(p.x[i]! - lo.x[i]!));
      if (size <= 1e-12) break;
      const centre = lo.x.map((_, i) => simplex.slice(0, k).reduce((t, p) => t + p.x[i]!, 0) / k);
      const at = (c: number): { x: number[]; f: number } => {
        const x = centre.map((v, i) => v + c * (hi.x[i]! - v));
        return { x, f: f(x) };
      };
      const r = at(-1);
      if (r.f < lo.f) {
        const e = at(-2);
        simplex[k] = e.f < r.f ? e : r;
      } else if (r.f < simplex[k - 1]!.f) {
        simplex[k] = r;
      } else {
        const c = r.f < hi.f ? at(-0.5) : at(0.5);
        if (c.f < Math.min(r.f, hi.f)) simplex[k] = c;
        else for (let j = 1; j <= k; j++) simplex[j] = { x: simplex[j]!.x.map((v, i) => lo.x[i]! + 0.5 * (v - lo.x[i]!)), f: NaN };
        for (let j = 1; j <= k; j++) if (Number.isNaN(simplex[j]!.f)) simplex[j]!.f = f(simplex[j]!.x);
      }
    }
    simplex.sort((a, b) => a.f - b.f);
    const gained = best.f - simplex[0]!.f;
    best = { x: simplex[0]!.x, f: simplex[0]!.f };
    if (restart > 0 && !(gained > 1e-15 * Math.abs(best.f))) break;
  }
  return best;
}

/** The careful run: −ℓ minimised over θ (full or rank one) from a few starts; the best kept. */
function careful(s: SlopeSums, method: FitMethod, rankOne: boolean, starts = 3): { logLik: number; D: RelativeG } {
  const f = (th: readonly number[]): number => {
    const pt = slopeProfile(s, dOf(th), method, false);
    return pt === null || !Number.isFinite(pt.logLik) ? Infinity : -pt.logLik;
  };
  let best = { x: [0], f: Infinity };
  for (const th0 of (rankOne ? [[-1, 0], [0.5, 0.2], [-3, -0.1]] : [[-1, 0, -1], [0.5, 0.2, -2], [-3, -0.1, 0]]).slice(0, starts)) {
    const r = nelderMead(f, th0);
    if (r.f < best.f) best = r;
  }
  return { logLik: -best.f, D: dOf(best.x) };
}

const sumsOf = (d: ModelData): SlopeSums => slopeSums(d, buildDesign(d, false));

function expectSameD(a: RelativeG, b: RelativeG): void {
  const scale = Math.max(...b.map(Math.abs));
  for (let k = 0; k < 3; k++) expect(Math.abs(a[k]! - b[k]!)).toBeLessThanOrEqual(1e-4 * scale);
}

describe('slope model optimiser: the moment start and Newton reach the optimum of a long, careful run', () => {
  for (const [seed, withCovariate] of [[3, false], [8, false], [5, true]] as const) {
    for (const method of ['reml', 'ml'] as const) {
      it(`interior optimum, ${withCovariate ? 'general' : 'grouped'} layout, seed ${seed}, ${method}: same log-likelihood (1e-10) and D (1e-4)`, () => {
        const s = sumsOf(trial('interior', seed, withCovariate));
        const est = estimateSlopeG(s, method);
        expect(est.converged).toBe(true);
        expect(est.shape).toBe('full');
        const ref = careful(s, method, false);
        expect(Math.abs(est.point!.logLik - ref.logLik)).toBeLessThanOrEqual(1e-10 * Math.abs(ref.logLik));
        expectSameD(est.D, ref.D);
      });
    }
  }

  for (const kind of ['no-slope-variation', 'perfect-correlation'] as const) {
    for (const method of ['reml', 'ml'] as const) {
      it(`boundary optimum (${kind}), ${method}: a boundary shape, at least the careful full run's log-likelihood, the careful rank-one run's optimum`, () => {
        const s = sumsOf(trial(kind, 21));
        const est = estimateSlopeG(s, method);
        expect(est.converged).toBe(true);
        expect(est.shape).not.toBe('full');
        const free = careful(s, method, false, 1);
        // The free run can only approach the boundary from inside: ours is at least as high, up to rounding.
        expect(est.point!.logLik).toBeGreaterThanOrEqual(free.logLik - 1e-10 * Math.abs(free.logLik));
        if (est.shape === 'rank-one') {
          const ref = careful(s, method, true);
          expect(Math.abs(est.point!.logLik - ref.logLik)).toBeLessThanOrEqual(1e-10 * Math.abs(ref.logLik));
          expectSameD(est.D, ref.D);
        }
      });
    }
  }
});
