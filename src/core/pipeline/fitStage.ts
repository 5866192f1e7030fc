import type { IntakeTable } from '../intake/types';
import { DegenerateDataError, fitFromTable, ModelInputError, RankDeficiencyError } from '../model';
import type { ModelFit } from '../model/types';
import type { StudyDays, VisitTiming } from '../schedule/types';
import { contrastDays, modelRows, observedMeans, orderedArms } from './modelData';
import type { ObservedMean } from './modelData';
import type { AnalysisSettings } from './types';

export interface FitStage {
  /** Null when the model was not fitted; `note` then says why. */
  readonly fit: ModelFit | null;
  readonly note: string | null;
  /** Arms in the model's order (reference first) in unblinded mode, else empty. */
  readonly arms: readonly string[];
  readonly means: readonly ObservedMean[];
  /** Plain sentences for the record and the JSON (e.g. a reference arm that is not in the data). */
  readonly notes: readonly string[];
}

/**
 * The fitting stage: fitFromTable on the rows modelRows picks (all valid rows, or only each scheduled visit's record),
 * with contrasts at every scheduled visit's target day (the default; at a baseline on day 1 it is the arm term itself), and the observed means per
 * scheduled visit (by arm in unblinded mode). A design the engine refuses (no usable rows, one participant, one
 * measurement per participant, values that do not vary or vary below their floating-point resolution, magnitudes out of
 * range, not of full rank, numbers that fail the engine's checks) and a fit that did not converge are properties of
 * the data: fit null and the engine's reason as `note`, never a model with wrong numbers. Cost: O(rows) plus the engine's pass.
 */
export function fitStage(table: IntakeTable, days: StudyDays, timing: VisitTiming, settings: AnalysisSettings): FitStage {
  const include = modelRows(table, timing, settings.scheduledOnly);
  const notes: string[] = [];
  const unblinded = settings.mode === 'unblinded';
  // runAnalysis has already refused a reference arm that is not in the data (unknownReferenceArm).
  const referenceArm = unblinded ? settings.referenceArm : undefined;
  let fit: ModelFit | null = null;
  let note: string | null = table.mapping.value === undefined ? 'no column is mapped to the value' : null;
  if (note === null) {
    try {
      fit = fitFromTable(table, days.offsets, include, {
        method: settings.method,
        dfMethod: settings.dfMethod,
        level: settings.level,
        timeUnit: settings.timeUnit,
        contrastDays: contrastDays(settings.schedule),
        residuals: settings.perSubject,
        ...(referenceArm === undefined ? {} : { referenceArm }),
      });
    } catch (e) {
      if (!(e instanceof ModelInputError || e instanceof RankDeficiencyError || e instanceof DegenerateDataError)) throw e;
      note = e.message;
    }
    // A fit that did not converge has no numbers to show: no model, the engine's reason as the note.
    if (fit !== null && fit.status === 'failed') {
      note = `the fit did not converge: ${fit.message}`;
      fit = null;
    }
  }
  const arms = unblinded ? (fit?.arms ?? orderedArms(table.arms, referenceArm)) : [];
  return { fit, note, arms, means: observedMeans(table, timing, settings.schedule, include, arms), notes };
}
