/**
 * The fitting and writing of the model chosen with `model: 'gee' | 'logistic'` (settings.model), beside the
 * random-intercept model that every run fits: the same rows (modelRows), the same fixed effects, its own sheet and
 * the JSON `model` section. A model that cannot be fitted gives a sheet that says why and `model: null`.
 */
import type { IntakeTable } from '../intake/types';
import { DegenerateDataError, ModelInputError, RankDeficiencyError } from '../model';
import { fitGee } from '../model/gee';
import { fitLogistic } from '../model/logistic';
import { modelDataFromTable } from '../model/fromTable';
import type { ModelFit } from '../model/types';
import { modelNotFittedSheet } from '../report/modelSheet';
import { geeJson, geeSheet } from '../report/geeSheet';
import { logisticJson, logisticSheet } from '../report/logisticSheet';
import type { SheetSpec } from '../report/types';
import type { StudyDays, VisitTiming } from '../schedule/types';
import { contrastDays, modelRows } from './modelData';
import { yesNoTable } from './responder';
import type { AnalysisSettings } from './types';

export interface OtherModel {
  readonly sheets: readonly SheetSpec[];
  /** The JSON `model` section, null when the model was not fitted. */
  readonly json: Record<string, unknown> | null;
  /** Why the model was not fitted, else null. */
  readonly note: string | null;
  readonly nObservations: number;
}

/** Null unless settings.model is 'gee' or 'logistic'. `intercept` is the random-intercept fit of the same run (for the comparison list). */
export function otherModelStage(table: IntakeTable, days: StudyDays, timing: VisitTiming, settings: AnalysisSettings, intercept: ModelFit | null): OtherModel | null {
  const kind = settings.model;
  if (kind !== 'gee' && kind !== 'logistic') return null;
  const notFitted = (note: string): OtherModel => ({ sheets: [modelNotFittedSheet(note, settings.mode)], json: null, note, nObservations: 0 });
  if (table.mapping.value === undefined && table.responder === undefined) return notFitted('no column is mapped to the value');
  const referenceArm = settings.mode === 'unblinded' ? settings.referenceArm : undefined;
  try {
    if (kind === 'gee') {
      const data = modelDataFromTable(table, days.offsets, modelRows(table, timing, settings.scheduledOnly), settings.timeUnit, referenceArm);
      if (data.y.length === 0) return notFitted('no row has everything the model needs (value, study day, participant and, when unblinded, arm)');
      const fit = fitGee(data, { level: settings.level, timeUnit: settings.timeUnit, contrastDays: contrastDays(settings.schedule) });
      const comparison = [
        ...(intercept === null ? [] : [{ kind: 'intercept', logLik: intercept.logLik, aic: intercept.aic, bic: intercept.bic, nParameters: intercept.nParameters }]),
        { kind: 'gee', logLik: null, aic: null, bic: null, nParameters: fit.terms.length + 2 },
      ];
      return { sheets: [geeSheet(fit, settings.mode)], json: { ...geeJson(fit), comparison }, note: null, nObservations: fit.nObservations };
    }
    const yn = yesNoTable(table, settings);
    if (!yn.ok) return notFitted(yn.problem);
    const data = modelDataFromTable(yn.table, days.offsets, modelRows(yn.table, timing, settings.scheduledOnly), settings.timeUnit, referenceArm);
    if (data.y.length === 0) return notFitted('no row has everything the model needs (value, study day, participant and, when unblinded, arm)');
    const fit = fitLogistic(data, { level: settings.level, timeUnit: settings.timeUnit, contrastDays: contrastDays(settings.schedule) });
    const comparison = [{ kind: 'logistic', logLik: fit.logLik, aic: fit.aic, bic: fit.bic, nParameters: fit.nParameters }];
    const json = { ...logisticJson(fit, yn.words), rowsWithoutAnswer: yn.withoutAnswer, comparison };
    return { sheets: [logisticSheet(fit, settings.mode, yn.words)], json, note: null, nObservations: fit.nObservations };
  } catch (e) {
    if (!(e instanceof ModelInputError || e instanceof RankDeficiencyError || e instanceof DegenerateDataError)) throw e;
    return notFitted(e.message);
  }
}
