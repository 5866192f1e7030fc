import type { IntakeTable } from '../intake/types';
import { compareModels, DegenerateDataError, fitFromTable, fitSlopeFromTable, ModelInputError, RankDeficiencyError, type ModelComparison } from '../model';
import type { FitOptions, ModelFit, ModelKind } from '../model/types';
import { dfMethodNote } from '../report/dfNotes';
import type { SensitivityRun } from '../report/sensitivityReport';
import type { StudyDays, VisitTiming } from '../schedule/types';
import { contrastDays, modelRows, observedMeans, orderedArms } from './modelData';
import type { ObservedMean } from './modelData';
import { sensitivityRuns } from './sensitivity';
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
  /** The refits with nominal time and on on-time visits only (empty when the main model was not fitted). */
  readonly sensitivity: readonly SensitivityRun[];
  /** The model comparison (every model fitted to the main rows, the slope test); null when the main model was not fitted. */
  readonly comparison: ModelComparison | null;
}

/**
 * The fitting stage: fitFromTable on the rows modelRows picks (all valid rows, or only each scheduled visit's record),
 * with contrasts at every scheduled visit's target day (the default; at a baseline on day 1 it is the arm term itself), and the observed means per
 * scheduled visit (by arm in unblinded mode). A design the engine refuses (no usable rows, one participant, one
 * measurement per participant, values that do not vary or vary below their floating-point resolution, magnitudes out of
 * range, not of full rank, numbers that fail the engine's checks) and a fit that did not converge are properties of
 * the data: fit null and the engine's reason as `note`, never a model with wrong numbers. When the main model is
 * fitted, the two sensitivity refits (sensitivity.ts) follow the same path, with the same model (settings.model), and
 * the other of the random-intercept and the random intercept and slope models is fitted to the main rows for the model
 * comparison (absent, with a note, when it cannot be). Cost: O(rows) plus four engine passes.
 */
export function fitStage(table: IntakeTable, days: StudyDays, timing: VisitTiming, settings: AnalysisSettings): FitStage {
  const include = modelRows(table, timing, settings.scheduledOnly);
  const notes: string[] = [];
  const unblinded = settings.mode === 'unblinded';
  // runAnalysis has already refused a reference arm that is not in the data (unknownReferenceArm).
  const referenceArm = unblinded ? settings.referenceArm : undefined;
  let fit: ModelFit | null = null;
  let note: string | null = table.mapping.value === undefined ? 'no column is mapped to the value' : null;
  let sensitivity: SensitivityRun[] = [];
  let comparison: ModelComparison | null = null;
  // The linear mixed model of this stage: the slope model when chosen, else the random-intercept model (also when the
  // run reports the visit-by-visit model, GEE or the yes/no model, which have stages of their own).
  const kind: ModelKind = settings.model === 'slope' ? 'slope' : 'intercept';
  if (note === null) {
    const options: FitOptions & { referenceArm?: string } = {
      method: settings.method,
      dfMethod: settings.dfMethod,
      level: settings.level,
      timeUnit: settings.timeUnit,
      contrastDays: contrastDays(settings.schedule),
      residuals: settings.perSubject,
      ...(referenceArm === undefined ? {} : { referenceArm }),
    };
    const fitterOf = (k: ModelKind): typeof fitFromTable => (k === 'slope' ? fitSlopeFromTable : fitFromTable);
    const tryKind = (k: ModelKind, offsets: Float64Array, rows: Uint8Array, opts: typeof options): { fit: ModelFit | null; note: string | null } => {
      try {
        const f = fitterOf(k)(table, offsets, rows, opts);
        // A fit that did not converge has no numbers to show: no model, the engine's reason as the note.
        return f.status === 'failed' ? { fit: null, note: `the fit did not converge: ${f.message}` } : { fit: f, note: null };
      } catch (e) {
        if (!(e instanceof ModelInputError || e instanceof RankDeficiencyError || e instanceof DegenerateDataError)) throw e;
        return { fit: null, note: e.message };
      }
    };
    const tryFit = (offsets: Float64Array, rows: Uint8Array, opts: typeof options): { fit: ModelFit | null; note: string | null } => tryKind(kind, offsets, rows, opts);
    ({ fit, note } = tryFit(days.offsets, include, options));
    if (fit !== null) {
      sensitivity = sensitivityRuns(days, timing, settings.schedule, include, options, tryFit);
      // The model comparison: the other of the intercept and slope models on the same rows, when it can be fitted.
      const other: ModelKind = kind === 'slope' ? 'intercept' : 'slope';
      let otherFit: ModelFit | null = null;
      let otherNote: string | null = null;
      try {
        ({ fit: otherFit, note: otherNote } = tryKind(other, days.offsets, include, { ...options, residuals: false }));
      } catch (e) {
        // The comparison is secondary: whatever goes wrong in it must not cost the run its main model.
        otherNote = e instanceof Error ? e.message : String(e);
      }
      if (otherFit === null && otherNote !== null) notes.push(`The ${other === 'slope' ? 'random intercept and slope' : 'random-intercept'} model could not be fitted for the model comparison: ${otherNote.trim().replace(/\.+$/, '')}.`);
      const fits = [{ kind, fit }, ...(otherFit === null ? [] : [{ kind: other, fit: otherFit }])].sort((a, b) => (a.kind === 'intercept' ? -1 : b.kind === 'intercept' ? 1 : 0));
      comparison = compareModels(fits, settings.level);
      const dfNote = dfMethodNote(settings.method, settings.dfMethod);
      if (dfNote !== null) notes.push(dfNote);
    }
  }
  const arms = unblinded ? (fit?.arms ?? orderedArms(table.arms, referenceArm)) : [];
  return { fit, note, arms, means: observedMeans(table, timing, settings.schedule, include, arms), notes, sensitivity, comparison };
}
