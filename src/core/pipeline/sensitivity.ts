/**
 * What the visit deviations cost (sensitivity, one run): the main model refitted (a) with nominal time — each record
 * matched to a scheduled visit (on time, early, late or repeat) placed at that visit's target day, unscheduled records
 * left out — and (b) on the on-time visits only. Each refit takes the main fit's rows and options and the same path
 * as the main fit, so data that cannot give a model leave that refit absent with the engine's reason.
 * Cost: two more engine passes, O(rows) each.
 */
import { offsetOfStudyDay } from '../intake/dayOffset';
import type { FitOptions, ModelFit } from '../model/types';
import type { SensitivityRun } from '../report/sensitivityReport';
import { STATUS_CODE } from '../schedule/types';
import type { ScheduleVisit, StudyDays, VisitTiming } from '../schedule/types';

/** Fits the rows `include` picks at the given offsets: the fit, or null and the reason. */
export type TryFit = (offsets: Float64Array, include: Uint8Array, options: FitOptions & { referenceArm?: string }) => { fit: ModelFit | null; note: string | null };

/** Calendar offset of each row's matched scheduled visit's target day; NaN for unscheduled rows and rows out of timing. */
export function nominalOffsets(timing: VisitTiming, schedule: readonly ScheduleVisit[]): Float64Array {
  const out = new Float64Array(timing.rowVisit.length).fill(NaN);
  for (let i = 0; i < out.length; i++) {
    const v = timing.rowVisit[i]!;
    if (v >= 0) out[i] = offsetOfStudyDay(schedule[v]!.targetDay);
  }
  return out;
}

/** The main fit's rows that are on time. */
export function onTimeRows(include: Uint8Array, timing: VisitTiming): Uint8Array {
  const out = new Uint8Array(include.length);
  for (let i = 0; i < include.length; i++) if (include[i] === 1 && timing.rowStatus[i] === STATUS_CODE.onTime) out[i] = 1;
  return out;
}

/** The two refits, in the order nominal time, on-time only. */
export function sensitivityRuns(
  days: StudyDays,
  timing: VisitTiming,
  schedule: readonly ScheduleVisit[],
  include: Uint8Array,
  options: FitOptions & { referenceArm?: string },
  tryFit: TryFit,
): SensitivityRun[] {
  const opts = { ...options, residuals: false };
  const nominal = tryFit(nominalOffsets(timing, schedule), include, opts);
  const onTime = tryFit(days.offsets, onTimeRows(include, timing), opts);
  return [
    { analysis: 'nominal-time', ...nominal },
    { analysis: 'on-time-only', ...onTime },
  ];
}
