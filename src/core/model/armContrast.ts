/**
 * The difference between an arm and the reference arm at a given time, from fixed effects and their covariance:
 * L'β with L = 1 on the arm's term and t on its arm × time term (every other term, covariates included, cancels), its
 * standard error √(L'ΣL) and a Wald interval and p from the normal distribution. For models whose inference is by the
 * normal distribution (the GEE with the sandwich covariance, Liang & Zeger 1986; the logistic model by maximum
 * likelihood). Cost O(contrast days · arms).
 * Example: β_arm 2, β_armTime 0.5, Var 1, 0.04, Cov −0.1 at t = 3 → estimate 3.5, SE √(1 + 9 · 0.04 − 2 · 3 · 0.1) = 0.8718.
 */
import { offsetOfStudyDay } from '../intake/dayOffset';
import { boundedP, normalQuantile, normalUpperTail } from './distributions';
import { DAYS_PER_TIME_UNIT } from './fit';
import type { ContrastDay, TermKind, TimeUnit } from './types';

export interface ArmContrast {
  readonly arm: string;
  readonly label: string;
  /** The scheduled visit's target day (study day). */
  readonly day: number;
  /** Time in the model's unit from study day 1. */
  readonly time: number;
  readonly estimate: number;
  readonly se: number;
  readonly z: number;
  readonly lower: number;
  readonly upper: number;
  readonly p: number;
}

/** One contrast per arm after the reference and per contrast day; empty without arm terms. */
export function armContrasts(
  terms: readonly { readonly kind: TermKind; readonly arm: string | null }[],
  beta: readonly number[],
  covariance: readonly number[],
  days: readonly ContrastDay[],
  timeUnit: TimeUnit,
  level: number,
): ArmContrast[] {
  const p = terms.length;
  const zq = normalQuantile(0.5 + level / 2);
  const out: ArmContrast[] = [];
  const arms = terms.filter((t) => t.kind === 'arm' && t.arm !== null).map((t) => t.arm!);
  for (const cd of days) {
    const time = offsetOfStudyDay(cd.day) / DAYS_PER_TIME_UNIT[timeUnit];
    for (const arm of arms) {
      const l = new Float64Array(p);
      terms.forEach((t, j) => {
        if (t.arm !== arm) return;
        if (t.kind === 'arm') l[j] = 1;
        else if (t.kind === 'armTime') l[j] = time;
      });
      let estimate = 0;
      let variance = 0;
      for (let a = 0; a < p; a++) {
        if (l[a] === 0) continue;
        estimate += l[a]! * beta[a]!;
        for (let b = 0; b < p; b++) if (l[b] !== 0) variance += l[a]! * l[b]! * covariance[a * p + b]!;
      }
      const se = Math.sqrt(variance);
      const z = estimate / se;
      out.push({ arm, label: cd.label, day: cd.day, time, estimate, se, z, lower: estimate - zq * se, upper: estimate + zq * se, p: boundedP(2 * normalUpperTail(Math.abs(z))) });
    }
  }
  return out;
}
