/**
 * The repeated-measures model against a committed fixture from an independent REML fit in Python (Debian's
 * /usr/bin/python3 with numpy and scipy, general-purpose libraries): test/reference/repeated_reml.py invents the data
 * (30 participants, 4 visits, two arms, dropout, missed visits, a baseline covariate), builds the full n × n V and
 * maximises the REML log-likelihood over Σ's Cholesky factor (BFGS, then Newton steps on central differences), and
 * writes test/reference/repeated_reml.json.
 * Tolerances: the log-likelihood is flat at the optimum, so it agrees to 1e-9 relative; the script's optimiser works
 * from finite differences (step 1e-4), so estimates and Σ̂ agree to 1e-6 relative.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fitRepeated, type RepeatedData } from '../../../../src/core/model/repeated';

interface Fixture {
  visits: string[];
  arms: string[];
  participants: { arm: number; baseline: number; values: (number | null)[] }[];
  logLik: number;
  beta: number[];
  covariance: number[][];
}

const fx = JSON.parse(readFileSync('test/reference/repeated_reml.json', 'utf8')) as Fixture;
const V = fx.visits.length;
const data: RepeatedData = {
  visits: fx.visits,
  nSubjects: fx.participants.length,
  y: Float64Array.from(fx.participants.flatMap((p) => p.values.map((v) => (v === null ? NaN : v)))),
  armIndex: Int32Array.from(fx.participants, (p) => p.arm),
  arms: fx.arms,
  baseline: { name: 'Baseline eGFR', values: Float64Array.from(fx.participants, (p) => p.baseline) },
};

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(1, Math.abs(b));

describe('repeated-measures model against an independent REML fit in Python (numpy/scipy fixture)', () => {
  it('log-likelihood, fixed effects and Σ̂ agree', () => {
    const fit = fitRepeated(data, { method: 'reml', dfMethod: 'kenward-roger', level: 0.95 });
    expect(fit.status).toBe('converged');
    expect(rel(fit.logLik, fx.logLik)).toBeLessThan(1e-9);
    expect(fit.fixedEffects.map((f) => f.estimate)).toHaveLength(fx.beta.length);
    fit.fixedEffects.forEach((f, k) => expect(rel(f.estimate, fx.beta[k]!), f.term).toBeLessThan(1e-6));
    for (let j = 0; j < V; j++) for (let k = 0; k < V; k++) expect(rel(fit.covariance[j]![k]!, fx.covariance[j]![k]!)).toBeLessThan(1e-6);
  });
});
