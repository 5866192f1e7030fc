/**
 * Exact identities of the repeated-measures model with an unstructured covariance on complete data (every participant
 * has a value at every visit; arms of unequal size):
 *  - the model is then the multivariate linear model with one mean vector per arm, so the REML (and ML) arm × visit
 *    means are the observed cell means, and REML Σ̂ is the pooled within-arm sample covariance
 *    S = Σ_a Σ_i (y_i − ȳ_a)(y_i − ȳ_a)' / (n − arms) (ML: the same sums / n) (exact identity: Anderson 2003,
 *    An Introduction to Multivariate Statistical Analysis, ch. 8 — chapter from memory);
 *  - a contrast whose variance is one multiple of c'Σc (a difference of arms at one visit, a visit contrast within an
 *    arm, an arm × visit interaction) has c'Sc ~ c'Σc χ²(n − arms)/(n − arms), so Satterthwaite's and Kenward–Roger's
 *    df are exactly n − arms (exact identity);
 *  - Satterthwaite SE of the difference at visit v is sqrt(S_vv (1/n_a + 1/n_0)) (exact identity).
 * Tolerance 1e-9 relative: the scoring stops when Σ's parameters move less than 1e-10 (scaled units).
 */
import { describe, expect, it } from 'vitest';
import { DegenerateDataError, ModelInputError } from '../../../../src/core/model';
import { fitRepeated, type RepeatedData } from '../../../../src/core/model/repeated';
import { inventedTrial } from './helpers';

function close(a: number, b: number, rel: number): void {
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(b)));
}

/** Complete data, three arms of sizes 7, 6 and 8, four visits (invented). */
function complete(): RepeatedData {
  const d = inventedTrial(21, 4, 3, 0, 0, false);
  const armIndex = Int32Array.from({ length: 21 }, (_, i) => (i < 7 ? 0 : i < 13 ? 1 : 2));
  return { ...d, armIndex, arms: ['Placebo', 'Low dose', 'High dose'] };
}

function cellStats(d: RepeatedData): { mean: number[][]; S: number[][]; n: number[] } {
  const V = d.visits.length;
  const A = d.arms.length;
  const n = new Array<number>(A).fill(0);
  const mean = Array.from({ length: A }, () => new Array<number>(V).fill(0));
  for (let i = 0; i < d.nSubjects; i++) {
    const a = d.armIndex![i]!;
    n[a]!++;
    for (let v = 0; v < V; v++) mean[a]![v]! += d.y[i * V + v]!;
  }
  mean.forEach((row, a) => row.forEach((_, v) => (row[v] = row[v]! / n[a]!)));
  const S = Array.from({ length: V }, () => new Array<number>(V).fill(0));
  for (let i = 0; i < d.nSubjects; i++) {
    const a = d.armIndex![i]!;
    for (let j = 0; j < V; j++) for (let k = 0; k < V; k++) S[j]![k]! += (d.y[i * V + j]! - mean[a]![j]!) * (d.y[i * V + k]! - mean[a]![k]!);
  }
  return { mean, S, n };
}

describe('repeated-measures model on complete data: exact identities', () => {
  const d = complete();
  const { mean, S, n } = cellStats(d);
  const N = d.nSubjects;
  const A = d.arms.length;
  const V = d.visits.length;

  it('REML means are the observed arm × visit means and Σ̂ is the pooled within-arm covariance (divisor n − arms)', () => {
    const fit = fitRepeated(d, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 });
    expect(fit.status).toBe('converged');
    expect(fit.patterns).toEqual([{ visits: d.visits, n: N }]);
    for (const m of fit.means) close(m.estimate, mean[d.arms.indexOf(m.arm!)]![d.visits.indexOf(m.visit)]!, 1e-9);
    for (let j = 0; j < V; j++) for (let k = 0; k < V; k++) close(fit.covariance[j]![k]!, S[j]![k]! / (N - A), 1e-9);
  });

  it('ML Σ̂ is the same sums divided by n', () => {
    const fit = fitRepeated(d, { method: 'ml', dfMethod: 'satterthwaite', level: 0.95 });
    for (let j = 0; j < V; j++) for (let k = 0; k < V; k++) close(fit.covariance[j]![k]!, S[j]![k]! / N, 1e-9);
  });

  it('Kenward–Roger and Satterthwaite df of every fixed effect and every visit difference are participants − arms', () => {
    for (const dfMethod of ['kenward-roger', 'satterthwaite'] as const) {
      const fit = fitRepeated(d, { method: 'reml', dfMethod, level: 0.95 });
      for (const e of fit.fixedEffects) close(e.df, N - A, 1e-8);
      expect(fit.treatmentEffects.length).toBe((A - 1) * V);
      for (const t of fit.treatmentEffects) close(t.df, N - A, 1e-8);
    }
  });

  it('Satterthwaite SE of a difference at a visit is sqrt(S_vv (1/n_a + 1/n_0)), estimate the difference of cell means', () => {
    const fit = fitRepeated(d, { method: 'reml', dfMethod: 'satterthwaite', level: 0.95 });
    for (const t of fit.treatmentEffects) {
      const a = d.arms.indexOf(t.arm);
      const v = d.visits.indexOf(t.visit);
      close(t.estimate, mean[a]![v]! - mean[0]![v]!, 1e-9);
      close(t.se, Math.sqrt((S[v]![v]! / (N - A)) * (1 / n[a]! + 1 / n[0]!)), 1e-9);
    }
    expect(fit.treatmentEffects.filter((t) => t.last).map((t) => t.visit)).toEqual([d.visits[V - 1], d.visits[V - 1]]);
  });

  it('between/within df: participants − between terms, values − participants − within terms', () => {
    const fit = fitRepeated(d, { method: 'reml', dfMethod: 'containment', level: 0.95 });
    expect(fit.containment).toEqual({ betweenDf: N - A, withinDf: N * V - N - (A * V - A) });
    const armTerm = fit.fixedEffects.find((e) => e.kind === 'arm')!;
    const visitTerm = fit.fixedEffects.find((e) => e.kind === 'visit')!;
    expect(armTerm.df).toBe(N - A);
    expect(visitTerm.df).toBe(N * V - N - (A * V - A));
    // A difference at a later visit touches arm (between) and arm × visit (within): the smaller df.
    expect(fit.treatmentEffects.find((t) => t.last)!.df).toBe(Math.min(N - A, N * V - N - (A * V - A)));
  });

  it('is equivariant under y → 1e6·y + 1e3: means and SEs scale, df and correlations do not change', () => {
    const fit = fitRepeated(d, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 });
    const big = fitRepeated({ ...d, y: d.y.map((x) => 1e6 * x + 1e3) }, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 });
    fit.means.forEach((m, k) => close(big.means[k]!.estimate, 1e6 * m.estimate + 1e3, 1e-9 * 1e6));
    fit.treatmentEffects.forEach((t, k) => {
      close(big.treatmentEffects[k]!.se, 1e6 * t.se, 1e-9 * 1e6);
      close(big.treatmentEffects[k]!.df, t.df, 1e-8);
    });
    close(big.correlation[0]![1]!, fit.correlation[0]![1]!, 1e-9);
  });
});

describe('repeated-measures model: misuse and data that cannot give a model', () => {
  it('refuses an arm × visit cell without any value, naming the arm and the visit', () => {
    const d = inventedTrial(10, 3, 1, 0, 0, false);
    const y = Float64Array.from(d.y);
    for (let i = 1; i < 10; i += 2) y[i * 3 + 2] = NaN; // no Drug value at the last visit
    expect(() => fitRepeated({ ...d, y }, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 })).toThrow(/arm "Drug" has a value at visit "Week 24"/);
    expect(() => fitRepeated({ ...d, y }, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 })).toThrow(ModelInputError);
  });

  it('refuses one participant, values that do not vary, and wrong shapes', () => {
    const d = inventedTrial(2, 3, 1, 0, 0, false);
    const one = { ...d, y: Float64Array.from(d.y, (x, i) => (i >= 3 ? NaN : x)) };
    expect(() => fitRepeated(one, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 })).toThrow(DegenerateDataError);
    const flat = { ...inventedTrial(8, 3, 1, 0, 0, false), armIndex: null, arms: [] };
    expect(() => fitRepeated({ ...flat, y: flat.y.map(() => 5) }, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 })).toThrow(DegenerateDataError);
    expect(() => fitRepeated({ ...flat, y: flat.y.slice(1) }, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 })).toThrow(ModelInputError);
  });

  it('does not change its input', () => {
    const d = inventedTrial(12, 3, 2, 0.2, 0.1, true);
    const copy = Float64Array.from(d.y);
    fitRepeated(d, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 });
    expect(Array.from(d.y)).toEqual(Array.from(copy));
  });
});
