import { readTable } from '../intake/readTable';
import type { Issue } from '../intake/types';
import { fitRandomIntercept } from '../model';
import type { ModelFit } from '../model/types';
import { fingerprintCells } from '../report/fingerprint';
import { summarizeTiming } from '../report/summarizeTiming';
import { timingSheets } from '../report/timingSheets';
import type { SheetSpec } from '../report/types';
import { classifyVisits, computeStudyDays, dayNumberFromIso, NO_STATUS } from '../schedule';
import type { CellValue } from '../intake/types';
import { excludedRows } from './excludedRows';
import { fromScheduleIssues, modelNotFitted } from './issues';
import { buildModelData, contrastDays, modelRows, observedMeans, orderedArms } from './modelData';
import type { ObservedMean } from './modelData';
import { resultsJson } from './resultsJson';
import { modelOutputs, recordSheet, timingJson } from './reportParts';
import type { AnalysisOutput, AnalysisSettings, RunHooks, Stage } from './types';

/** Raised inside a run when the hooks' signal is aborted between stages. */
const CANCELLED: AnalysisOutput = { ok: false, issues: [], cancelled: true };

/** The least a model needs: two subjects and more observations than subjects, else the fit is not tried. */
function modelBlocker(nSubjects: number, nObs: number, valueMapped: boolean): string | null {
  if (!valueMapped) return 'no column is mapped to the value';
  if (nObs === 0) return 'no row has everything the model needs';
  if (nSubjects < 2) return 'the model needs at least two subjects with usable rows';
  if (nObs <= nSubjects) return 'the model needs more measurements than subjects (some subjects measured more than once)';
  return null;
}

/**
 * Runs one analysis from cells to sheet specs and JSON (SPEC §3–§7), in four stages:
 * reading (readTable with the mapping, mode and date system), windowing (computeStudyDays, classifyVisits with the
 * cut-off), fitting (fitRandomIntercept on every row usable for the model — or only rows matched to scheduled visits
 * when settings.scheduledOnly — with contrasts at each scheduled visit's target day after the first, and observed means
 * per scheduled visit, by arm when unblinded) and writing (timing sheets, model sheets, the analysis record last; JSON).
 * Between stages it reports progress, yields to the front end and stops with { ok: false, cancelled: true } when
 * hooks.signal is aborted. Errors in the data give { ok: false, issues } with cell addresses; a model that cannot be
 * fitted leaves the visit-timing results standing (JSON model: null and a 'model-not-fitted' warning).
 * Cost: O(rows) for intake and windowing plus the model engine's one pass; never an n×n matrix.
 *
 * Example: runAnalysis(cells, { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded', schedule, … })
 * → { ok: true, sheets: [Visit timing, Visit deviations, Visits due, Model …, Analysis record], json: { tool, input, … } }
 */
export async function runAnalysis(
  cells: readonly (readonly CellValue[])[],
  settings: AnalysisSettings,
  hooks: RunHooks = {},
): Promise<AnalysisOutput> {
  const enter = async (stage: Stage): Promise<boolean> => {
    if (hooks.signal?.aborted) return false;
    hooks.onStage?.(stage);
    if (hooks.yieldControl) await hooks.yieldControl();
    return !hooks.signal?.aborted;
  };

  if (!(await enter('reading'))) return CANCELLED;
  const place = { sheet: settings.sheet, topLeft: settings.topLeft };
  const read = readTable(cells, {
    sheet: settings.sheet,
    topLeft: settings.topLeft,
    dateSystem: settings.dateSystem,
    mode: settings.mode,
    ...(settings.mapping === undefined ? {} : { mapping: settings.mapping }),
    ...(settings.numericText === undefined ? {} : { numericText: settings.numericText }),
  });
  if (!read.ok) return { ok: false, issues: read.issues };
  const table = read.table;
  if (settings.schedule.length === 0) {
    throw new RangeError('runAnalysis: the schedule has no visits (read it with parseSchedule and check ok first).');
  }

  if (!(await enter('windowing'))) return CANCELLED;
  const dated = table.timeKind === 'date';
  let cutoff: number | undefined;
  const notes: string[] = [];
  if (settings.cutoff !== undefined) {
    const day = dayNumberFromIso(settings.cutoff);
    if (Number.isNaN(day)) throw new RangeError(`runAnalysis: cutoff "${settings.cutoff}" is not a date written YYYY-MM-DD.`);
    if (dated) cutoff = day;
    else notes.push(`The cut-off ${settings.cutoff} is a calendar date, but the data carry study days only; each subject's last record serves as the cut-off instead.`);
  }
  const days = computeStudyDays(table, settings.schedule, place);
  const timing = classifyVisits(table, days, settings.schedule, { place, ...(cutoff === undefined ? {} : { cutoff }) });
  const issues: Issue[] = [...read.issues, ...fromScheduleIssues([...days.issues, ...timing.issues])];
  const summary = summarizeTiming({ table, schedule: settings.schedule, days, timing });

  if (!(await enter('fitting'))) return CANCELLED;
  const include = modelRows(table, timing, settings.scheduledOnly);
  const arms = settings.mode === 'unblinded' ? orderedArms(table.arms, settings.referenceArm) : [];
  const data = buildModelData(table, days, include, arms, settings.timeUnit);
  const means: ObservedMean[] = observedMeans(table, timing, settings.schedule, include, arms);
  let fit: ModelFit | null = null;
  let modelNote: string | null = modelBlocker(data.nSubjects, data.y.length, table.mapping.value !== undefined);
  if (modelNote === null) {
    try {
      fit = fitRandomIntercept(data, {
        method: settings.method,
        dfMethod: settings.dfMethod,
        level: settings.level,
        timeUnit: settings.timeUnit,
        contrastDays: contrastDays(settings.schedule),
        residuals: settings.perSubject,
      });
    } catch (e) {
      // The engine throws on a design it cannot estimate (e.g. a covariate constant within the data); that is a
      // property of these data, reported as such, not a crash of the run.
      modelNote = e instanceof Error ? e.message : String(e);
    }
  }
  if (modelNote !== null && table.mapping.value !== undefined) issues.push(modelNotFitted(modelNote));

  if (!(await enter('writing'))) return CANCELLED;
  const excluded = excludedRows(issues);
  const fingerprint = fingerprintCells(cells);
  const sheets: SheetSpec[] = [...timingSheets(summary)];
  const model = modelOutputs({ fit, means, settings, table, nRows: data.y.length, modelNote });
  sheets.push(...model.sheets);
  sheets.push(recordSheet({ settings, table, issues, excluded, fingerprint, summary, fit, modelNote, notes }));
  const json = resultsJson({
    settings,
    table,
    fingerprint,
    excluded,
    usedForTiming: countOnes(table.usableTiming, (i) => Number.isFinite(days.studyDays[i]!) && timing.rowStatus[i] !== NO_STATUS),
    usedForModel: data.y.length,
    visits: timingJson(summary),
    model: model.json,
    modelNote,
    notes,
    issues,
    cutoff: summary.cutoff,
    cutoffRule: summary.cutoffRule,
  });
  return { ok: true, issues, excluded, sheets, json };
}

function countOnes(flags: Uint8Array, also: (i: number) => boolean): number {
  let n = 0;
  for (let i = 0; i < flags.length; i++) if (flags[i] === 1 && also(i)) n++;
  return n;
}
