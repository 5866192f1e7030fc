import type { IntakeTable } from '../intake/types';
import type { ContrastDay, ModelData } from '../model/types';
import { NO_STATUS, STATUS_CODE } from '../schedule/types';
import type { ScheduleVisit, StudyDays, VisitTiming } from '../schedule/types';
import { DAYS_PER_UNIT } from './types';
import type { TimeUnit } from './types';

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

/**
 * The model's columns for the included rows: value, time = (study day − 1) / days per unit (SPEC §3), subjects
 * renumbered 0..S−1 in order of first appearance, arm index (0 = reference) in unblinded mode, covariates subset.
 * Cost O(rows).
 * Example: study days 1 and 85 with unit 'week' → time 0 and 12.
 */
export function buildModelData(
  table: IntakeTable,
  days: StudyDays,
  include: Uint8Array,
  arms: readonly string[],
  timeUnit: TimeUnit,
): ModelData {
  let n = 0;
  for (let i = 0; i < include.length; i++) n += include[i]!;
  const y = new Float64Array(n);
  const time = new Float64Array(n);
  const subject = new Int32Array(n);
  const unblinded = table.mode === 'unblinded' && table.arm !== null && arms.length > 0;
  const armIndex = unblinded ? new Int32Array(n) : null;
  const armOf = new Map(arms.map((a, k) => [a, k]));
  const renumber = new Map<number, number>();
  const ids: string[] = [];
  const picked: number[] = [];
  const unit = DAYS_PER_UNIT[timeUnit];
  let j = 0;
  for (let i = 0; i < include.length; i++) {
    if (include[i] !== 1) continue;
    const s = table.subjectIndex[i]!;
    let k = renumber.get(s);
    if (k === undefined) {
      k = renumber.size;
      renumber.set(s, k);
      ids.push(table.subjectIds[s]!);
    }
    y[j] = table.value[i]!;
    time[j] = (days.studyDays[i]! - 1) / unit;
    subject[j] = k;
    if (armIndex) armIndex[j] = armOf.get(table.arm![i]!) ?? 0;
    picked.push(i);
    j++;
  }
  const covariates = table.covariates.map((c) =>
    c.kind === 'numeric'
      ? { name: c.name, kind: 'numeric' as const, values: Float64Array.from(picked, (i) => c.values[i]!) }
      : { name: c.name, kind: 'categorical' as const, values: picked.map((i) => c.values[i]!), levels: c.levels },
  );
  return { y, time, subject, nSubjects: renumber.size, armIndex, arms: unblinded ? [...arms] : [], covariates, subjectIds: ids };
}

/** Contrast days: each scheduled visit's target day except the first (baseline) visit, in order of target day. */
export function contrastDays(schedule: readonly ScheduleVisit[]): ContrastDay[] {
  const sorted = [...schedule].sort((a, b) => a.targetDay - b.targetDay);
  return sorted.slice(1).map((v) => ({ label: v.label, day: v.targetDay }));
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
