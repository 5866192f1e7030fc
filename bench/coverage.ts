/**
 * `npm run bench:coverage`: how often the 95% intervals of the between-participant variance σ²_u, the
 * within-participant variance σ² and the ICC hold the true value, by simulation (fixed seed, scripts/random.ts).
 * Design like the invented demo trial: 2 arms, visits every 12 weeks for a year (study days 1, 85, 169, 253, 337, each
 * after the first a few days off target), some dropout (after each visit from the third on, 8% of the participants
 * still in leave); mean 60 − 0.45·months + 0.2·months in the second arm; σ² = 16 and σ²_u = σ²·ICC/(1 − ICC) at true
 * ICC 0, 0.05, 0.2, 0.6; 12 and 40 participants per arm; REML fits (fitRandomIntercept, the intervals of
 * varianceIntervals.ts).
 * Counting: a positive true value is covered when lower ≤ truth ≤ upper. A true σ²_u (and ICC) of 0 is covered when
 * zero is inside the interval by the rule of the interval itself: the likelihood-ratio statistic at zero is below
 * χ²₁(0.90) = 2.71 (the 50:50 χ²₀:χ²₁ mixture, Self & Liang 1987); a lower limit of 0 with zero itself excluded (the
 * statistic between 2.71 and 3.84) is a miss.
 * With R replications a coverage near 0.95 has Monte Carlo SE √(0.95·0.05/R) (0.0069 at R = 1000, so ±1.5% ≈ 2.2 SE).
 * Prints a table and writes bench/coverage-latest.json (the full table only). `npm run bench:coverage -- 200` runs 200
 * replications per cell; `-- 3000 --seed 7 --cell 40/0` one cell (40 per arm, true ICC 0) with another seed.
 */
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DegenerateDataError, fitRandomIntercept, type FitOptions, type ModelData } from '../src/core/model';
import { mulberry32 } from '../scripts/random';

const args = process.argv.slice(2);
const option = (name: string): string | undefined => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const argReps = args.filter((a, i) => i === 0 || !args[i - 1]!.startsWith('--')).map(Number).find((n) => Number.isInteger(n) && n > 0);
const REPS = argReps ?? 1000;
const SEED = Number(option('--seed') ?? 20261202);
const only = option('--cell')?.split('/').map(Number); // e.g. --cell 40/0: 40 per arm, true ICC 0
const ICCS = only === undefined ? [0, 0.05, 0.2, 0.6] : [only[1]!];
const PER_ARM = only === undefined ? [12, 40] : [only[0]!];
const SIGMA2 = 16;
const VISIT_DAYS = [1, 85, 169, 253, 337];
const DROPOUT = 0.08;
const LEVEL = 0.95;
const ZERO_CUT = 2.705543454095404; // χ²₁(0.90) = z(0.95)², z(0.95) = 1.644853626951472 (from memory; A&S Table 26.1)

const options: FitOptions = { method: 'reml', dfMethod: 'residual', level: LEVEL, timeUnit: 'month', contrastDays: [], gridPoints: 2 };

/** One simulated trial (invented). */
function simulate(u: () => number, perArm: number, s2u: number): ModelData {
  const z = (): number => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  const y: number[] = [];
  const time: number[] = [];
  const subject: number[] = [];
  const arm: number[] = [];
  const n = 2 * perArm;
  for (let i = 0; i < n; i++) {
    const a = i % 2;
    const ui = Math.sqrt(s2u) * z();
    for (let v = 0; v < VISIT_DAYS.length; v++) {
      if (v >= 3 && u() < DROPOUT) break;
      const day = VISIT_DAYS[v]! + (v === 0 ? 0 : Math.round(4 * z()));
      const t = (day - 1) / 30.4375;
      y.push(60 + ui - 0.45 * t + a * 0.2 * t + Math.sqrt(SIGMA2) * z());
      time.push(t);
      subject.push(i);
      arm.push(a);
    }
  }
  return { y: Float64Array.from(y), time: Float64Array.from(time), subject: Int32Array.from(subject), nSubjects: n, armIndex: Int32Array.from(arm), arms: ['Placebo', 'Drug'], covariates: [] };
}

interface Cell {
  readonly icc: number;
  readonly perArm: number;
  readonly reps: number;
  /** Fits that gave no model (DegenerateDataError) or did not converge; left out of the coverage. */
  readonly noModel: number;
  readonly boundaryFits: number;
  readonly subject: number;
  readonly residual: number;
  readonly iccCoverage: number;
  /** Share of fits whose σ²_u or ICC upper limit was unbounded. */
  readonly unboundedUpper: number;
  readonly msPerFit: number;
}

const u = mulberry32(SEED);
const cells: Cell[] = [];
for (const perArm of PER_ARM) {
  for (const icc of ICCS) {
    const s2u = (SIGMA2 * icc) / (1 - icc);
    let ok = 0, noModel = 0, boundary = 0, cs = 0, cr = 0, ci = 0, unb = 0;
    const t0 = performance.now();
    for (let r = 0; r < REPS; r++) {
      const data = simulate(u, perArm, s2u);
      let v;
      try {
        const fit = fitRandomIntercept(data, options);
        if (fit.status === 'failed') {
          noModel++;
          continue;
        }
        if (fit.status === 'boundary') boundary++;
        v = fit.variance;
      } catch (e) {
        if (e instanceof DegenerateDataError) {
          noModel++;
          continue;
        }
        throw e;
      }
      ok++;
      const zeroInside = v.zeroTest!.statistic < ZERO_CUT;
      if (icc === 0 ? zeroInside : v.subjectLower <= s2u && s2u <= v.subjectUpper) cs++;
      if (icc === 0 ? zeroInside : v.iccLower <= icc && icc <= v.iccUpper) ci++;
      if (v.residualLower <= SIGMA2 && SIGMA2 <= v.residualUpper) cr++;
      if (!Number.isFinite(v.subjectUpper) || v.iccUpper === 1) unb++;
    }
    const ms = (performance.now() - t0) / REPS;
    cells.push({ icc, perArm, reps: REPS, noModel, boundaryFits: boundary / ok, subject: cs / ok, residual: cr / ok, iccCoverage: ci / ok, unboundedUpper: unb / ok, msPerFit: ms });
    process.stdout.write(`.${perArm}/${icc}`);
  }
}
process.stdout.write('\n');

const pad = (s: string, n: number): string => s.padStart(n);
const f3 = (x: number): string => x.toFixed(3);
const lines = [
  `${pad('per arm', 8)}${pad('true ICC', 9)}${pad('σ²_u', 8)}${pad('σ²', 8)}${pad('ICC', 8)}${pad('at zero', 9)}${pad('no model', 9)}${pad('ms/fit', 8)}`,
  ...cells.map((c) => `${pad(String(c.perArm), 8)}${pad(String(c.icc), 9)}${pad(f3(c.subject), 8)}${pad(f3(c.residual), 8)}${pad(f3(c.iccCoverage), 8)}${pad(f3(c.boundaryFits), 9)}${pad(String(c.noModel), 9)}${pad(c.msPerFit.toFixed(1), 8)}`),
];
process.stdout.write(`${lines.join('\n')}\n`);
process.stdout.write(
  `Coverage of 95% intervals, ${REPS} replications per row (Monte Carlo SE ≈ ${Math.sqrt((0.95 * 0.05) / REPS).toFixed(4)}); target 0.93–0.97.\n` +
    "'at zero': share of fits with the between-participant variance estimated at 0. 'no model': fits that gave no model.\n",
);
if (only === undefined) {
  const out = join(dirname(fileURLToPath(import.meta.url)), 'coverage-latest.json');
  writeFileSync(out, `${JSON.stringify({ seed: SEED, reps: REPS, level: LEVEL, sigma2: SIGMA2, visitDays: VISIT_DAYS, dropoutPerVisit: DROPOUT, method: 'reml', cells }, null, 2)}\n`);
  process.stdout.write(`Wrote ${out}\n`);
}
