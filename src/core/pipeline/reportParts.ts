/** The run's writing stage: the report layer's model sheets, model JSON and analysis record, fed from the run. */
import type { IntakeTable } from '../intake/types';
import type { ModelFit } from '../model/types';
import { analysisRecordSheet, mappingLines } from '../report/record';
import { modelJson } from '../report/modelJson';
import { DF_NAMES } from '../report/dfNotes';
import { sensitivityJson, type SensitivityRun } from '../report/sensitivityReport';
import { modelNotFittedSheet, modelSheets } from '../report/modelSheet';
import { modelSummaryText } from '../report/modelText';
import { cutoffPhrase } from '../report/timingSheets';
import type { TimingSummary } from '../report/timingTypes';
import type { SheetSpec } from '../report/types';
import type { ObservedMean } from './modelData';
import type { AnalysisSettings, ExcludedRow } from './types';

export interface ModelPartsInput {
  readonly fit: ModelFit | null;
  readonly means: readonly ObservedMean[];
  readonly settings: AnalysisSettings;
  /** Why the model was not fitted, when a value column was mapped (the user asked for a model); else null. */
  readonly notFitted: string | null;
  /** The sensitivity refits beside the main fit. */
  readonly sensitivity: readonly SensitivityRun[];
}

/** The model sheets and the JSON `model` section (the report's modelJson plus its plain-language `summary`); when the
 * model was not fitted, null and — if a model was asked for — one sheet that says why. */
export function modelOutputs({ fit, means, settings, notFitted, sensitivity }: ModelPartsInput): { sheets: SheetSpec[]; json: Record<string, unknown> | null } {
  if (fit === null) return { sheets: notFitted === null ? [] : [modelNotFittedSheet(notFitted, settings.mode)], json: null };
  const sheets = modelSheets(fit, {
    observed: means.map((m) => ({ label: m.visit, day: m.targetDay, arm: m.arm, mean: m.mean, n: m.n })),
    mode: settings.mode,
    perSubject: settings.perSubject,
    subjectIds: fit.subjects.map((s) => s.id),
    sensitivity,
  });
  return { sheets, json: { summary: modelSummaryText(fit, settings.mode), ...modelJson(fit), sensitivity: sensitivityJson(sensitivity, settings.mode) } };
}

export interface RecordInput {
  readonly settings: AnalysisSettings;
  readonly table: IntakeTable;
  readonly excluded: readonly ExcludedRow[];
  readonly fingerprint: string;
  readonly summary: TimingSummary;
  readonly rowsTiming: number;
  readonly rowsModel: number;
  readonly referenceArm: string | null;
  readonly notes: readonly string[];
}

const UNIT_WORDS = { month: 'month (30.4375 days)', week: 'week (7 days)', day: 'day' } as const;

/** The analysis record sheet (always the last sheet) for this run. */
export function recordSheet(r: RecordInput): SheetSpec {
  const s = r.settings;
  const settingLines = [
    ...(s.model === 'repeated' ? [{ name: 'Model', value: 'Visit-by-visit model (unstructured covariance) beside the random-intercept model' }] : []),
    { name: 'Estimation', value: s.method === 'reml' ? 'REML' : 'Maximum likelihood (ML)' },
    { name: 'Degrees of freedom', value: DF_NAMES[s.dfMethod] },
    { name: 'Confidence level', value: `${Math.round(s.level * 1000) / 10}%` },
    { name: 'Time unit', value: UNIT_WORDS[s.timeUnit] },
    { name: 'Rows in the model', value: s.scheduledOnly ? 'Only records matched to scheduled visits' : 'All valid rows (scheduled, early, late, unscheduled and repeat)' },
    { name: 'Per-participant sheet', value: s.perSubject ? 'Yes' : 'No' },
    ...(r.referenceArm === null ? [] : [{ name: 'Reference arm', value: r.referenceArm }]),
    ...(s.numericText === 'accept' ? [{ name: 'Numbers written as text', value: 'Accepted (text input such as CSV)' }] : []),
  ];
  return analysisRecordSheet({
    inputLabel: s.inputLabel,
    fingerprint: r.fingerprint,
    rowsRead: r.table.nRows,
    rowsTiming: r.rowsTiming,
    rowsModel: r.rowsModel,
    excluded: r.excluded,
    mapping: mappingLines(r.table.mapping, r.table.headers),
    schedule: s.schedule,
    settings: settingLines,
    cutoff: cutoffPhrase(r.summary),
    mode: s.mode,
    version: s.toolVersion ?? 'unknown',
    runAt: s.runAt,
    notes: r.notes,
  });
}
