import type { IntakeTable } from '../intake/types';
import type { ContrastDay } from '../model/types';
import { NO_STATUS, STATUS_CODE } from '../schedule/types';
import type { ScheduleVisit, VisitTiming } from '../schedule/types';

/** Which rows enter the model: rows that took part in visit timing (so a study day is known) and are usable for the
 * model; with scheduledOnly, only the record matched to each scheduled visit (on time, early or late). */
export function modelRows(table: IntakeTable, timing: VisitTiming, scheduledOnly: boolean): Uint8Array {
  const include = new Uint8Array(table.nRows);
  const { onTime, early, late } = STATUS_CODE;
  for (let i = 0; i < table.nRows; i++) {
    const st = timing.rowStatus[i]!;
    if (st === NO_STATUS || table.usableModel[i] !== 1) continue;
    if (scheduledOnly && st !== onTime && st !== early && st !== late) continue;
    include[i] = 1;
  }
  return include;
}

/** Arms with the reference first (the chosen one, else the first in order of appearance). */
export function orderedArms(arms: readonly string[], referenceArm: string | undefined): string[] {
  if (referenceArm === undefined || !arms.includes(referenceArm)) return [...arms];
  return [referenceArm, ...arms.filter((a) => a !== referenceArm)];
}

/** Contrast days: every scheduled visit's target day, the baseline visit included (there the difference is the arm
 * term itself when the baseline is study day 1), in order of target day. */
export function contrastDays(schedule: readonly ScheduleVisit[]): ContrastDay[] {
  const sorted = [...schedule].sort((a, b) => a.targetDay - b.targetDay);
  return sorted.map((v) => ({ label: v.label, day: v.targetDay }));
}

/** Observed mean of the value at one scheduled visit (pooled, or for one arm). */
export interface ObservedMean {
  readonly visit: string;
  readonly targetDay: number;
  readonly arm: string | null;
  readonly n: number;
  readonly mean: number;
  readonly sd: number;
}

/**
 * Observed means per scheduled visit (per arm when arms are given) over each subject's matched record of that visit
 * (on time, early or late) among the model's rows. sd is the sample standard deviation (n − 1 divisor; NaN for n < 2).
 * Cost O(subjects · visits).
 */
export function observedMeans(
  table: IntakeTable,
  timing: VisitTiming,
  schedule: readonly ScheduleVisit[],
  include: Uint8Array,
  arms: readonly string[],
): ObservedMean[] {
  const groups: (string | null)[] = arms.length > 0 && table.arm !== null ? [...arms] : [null];
  const V = schedule.length;
  const out: ObservedMean[] = [];
  const order = Array.from({ length: V }, (_, k) => k).sort((a, b) => schedule[a]!.targetDay - schedule[b]!.targetDay);
  for (const k of order) {
    for (const g of groups) {
      let n = 0;
      let mean = 0;
      let m2 = 0;
      for (let s = 0; s < timing.nSubjects; s++) {
        const r = timing.slotRow[s * V + k]!;
        if (r < 0 || include[r] !== 1) continue;
        if (g !== null && table.arm![r] !== g) continue;
        const v = table.value[r]!;
        n++;
        const d = v - mean; // Welford (1962) running mean and sum of squares
        mean += d / n;
        m2 += d * (v - mean);
      }
      out.push({ visit: schedule[k]!.label, targetDay: schedule[k]!.targetDay, arm: g, n, mean: n > 0 ? mean : NaN, sd: n > 1 ? Math.sqrt(m2 / (n - 1)) : NaN });
    }
  }
  return out;
}
