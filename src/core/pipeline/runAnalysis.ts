import type { Issue } from '../intake/types';
import { readTable } from '../intake/readTable';
import { toCellSource, type CellInput, GridSource } from '../intake/cellSource';
import { fingerprintCells, fingerprintRows } from '../report/fingerprint';
import { summarizeTiming } from '../report/summarizeTiming';
import { timingJson } from '../report/timingJson';
import { modelTechnicalNotes } from '../report/modelSheet';
import { summarySheet } from '../report/summarySheet';
import { timingSheets } from '../report/timingSheets';
import type { SheetSpec } from '../report/types';
import { classifyVisits, computeStudyDays, dayNumberFromIso, isoDate, NO_STATUS } from '../schedule';
import { PipelineUsageError } from './errors';
import { excludedRows } from './excludedRows';
import { fitStage } from './fitStage';
import { otherModelStage } from './otherModelStage';
import { fromScheduleIssues, modelNotFitted, unknownReferenceArm } from './issues';
import { modelOutputs, recordSheet } from './reportParts';
import { repeatedModelJson, repeatedStage } from './repeatedStage';
import { resultsJson } from './resultsJson';
import { stopJson } from './stopJson';
import { dateReadingNote } from './dateNotes';
import { implausibleDates } from './implausibleDates';
import type { AnalysisOutput, AnalysisSettings, RunHooks, Stage } from './types';

/** What a run returns when the hooks' signal is aborted between stages. */
const CANCELLED: AnalysisOutput = { ok: false, issues: [], cancelled: true };

/**
 * Runs one analysis from cells to sheet specs and JSON (SPEC §3–§7), in four stages:
 * reading (readTable with the mapping, mode, date system and date order; how numeric dates were read goes into the notes), windowing (computeStudyDays, classifyVisits with the
 * cut-off), fitting (fitFromTable on every row usable for the model — or only rows matched to scheduled visits
 * when settings.scheduledOnly — with contrasts at each scheduled visit's target day after the first, and observed means
 * per scheduled visit, by arm when unblinded) and writing (the summary sheet first, then timing sheets, model sheets, the analysis record last; JSON).
 * Between stages it reports progress, yields to the front end and stops with { ok: false, cancelled: true } when
 * hooks.signal is aborted. Errors in the data give { ok: false, issues, json } with cell addresses (json: stopJson); a model that cannot be
 * fitted leaves the visit-timing results standing (JSON model: null and a 'model-not-fitted' warning). Misuse (an
 * empty schedule, a cut-off that is not a date) throws PipelineUsageError.
 * Cost: O(rows) for intake and windowing plus the model engine's one pass; never an n×n matrix.
 *
 * Example: runAnalysis(cells, { sheet: 'Visits', topLeft: 'A1', dateSystem: 1900, mode: 'blinded', schedule, … })
 * → { ok: true, sheets: [Summary, Visit timing, Visit deviations, Visits due, Model …, Analysis record], json: { tool, input, … } }
 */
export async function runAnalysis(
  input: CellInput,
  settings: AnalysisSettings,
  hooks: RunHooks = {},
): Promise<AnalysisOutput> {
  const enter = async (stage: Stage): Promise<boolean> => {
    if (hooks.signal?.aborted) return false;
    hooks.onStage?.(stage);
    if (hooks.yieldControl) await hooks.yieldControl();
    return !hooks.signal?.aborted;
  };

  if (settings.schedule.length === 0) throw new PipelineUsageError('the schedule has no visits', 'read it with parseSchedule and check ok first');
  const cutoffDay = settings.cutoff === undefined ? undefined : dayNumberFromIso(settings.cutoff);
  if (cutoffDay !== undefined && Number.isNaN(cutoffDay)) throw new PipelineUsageError('the cut-off must be a real date written YYYY-MM-DD', settings.cutoff ?? '');
  if (settings.cutoffDay !== undefined && (!Number.isInteger(settings.cutoffDay) || settings.cutoffDay === 0)) {
    throw new PipelineUsageError('the cut-off study day must be a whole number other than 0', String(settings.cutoffDay));
  }

  if (!(await enter('reading'))) return CANCELLED;
  const place = { sheet: settings.sheet, topLeft: settings.topLeft };
  const cells = toCellSource(input);
  const read = readTable(cells, {
    sheet: settings.sheet,
    topLeft: settings.topLeft,
    dateSystem: settings.dateSystem,
    mode: settings.mode,
    ...(settings.mapping === undefined ? {} : { mapping: settings.mapping }),
    ...(settings.numericText === undefined ? {} : { numericText: settings.numericText }),
    ...(settings.dateOrder === undefined ? {} : { dateOrder: settings.dateOrder }),
  });
  const stop = (issues: readonly Issue[]): AnalysisOutput => ({ ok: false, issues, json: stopJson(cells.rowCount - 1, settings, issues) });
  if (!read.ok) return stop(read.issues);
  const table = read.table;
  const wrongReference = unknownReferenceArm(table.arms, settings);
  if (wrongReference !== null) return stop([...read.issues, wrongReference]);

  if (!(await enter('windowing'))) return CANCELLED;
  const notes: string[] = [...(settings.fileNotes ?? []), ...(table.dateReadings ?? []).map(dateReadingNote)];
  // A calendar cut-off applies to dated data; a study-day cut-off to study-day data.
  const cutoff = table.timeKind === 'date' ? cutoffDay : settings.cutoffDay;
  if (cutoffDay !== undefined && table.timeKind !== 'date') {
    notes.push(`The cut-off ${settings.cutoff ?? ''} is a calendar date, but the data carry study days only; ${settings.cutoffDay === undefined ? "each participant's last record serves as the cut-off instead" : `the cut-off study day ${settings.cutoffDay} is used`}.`);
  }
  if (settings.cutoffDay !== undefined && table.timeKind === 'date') {
    notes.push(`The cut-off study day ${settings.cutoffDay} is ignored: the data carry calendar dates, so the cut-off is ${cutoffDay === undefined ? 'the latest date in the data' : `the date ${settings.cutoff ?? ''}`}.`);
  }
  if (cutoff !== undefined && table.timeKind === 'date') {
    // A cut-off typed a year or a decade too late turns every open window into a missed visit; say how far it lies
    // beyond the data so the reader can tell.
    let latest = -Infinity;
    for (let i = 0; i < table.date.length; i++) if (table.usableTiming[i] === 1 && table.date[i]! > latest) latest = table.date[i]!;
    if (Number.isFinite(latest) && Math.floor(cutoff) > Math.floor(latest)) {
      const gap = Math.floor(cutoff) - Math.floor(latest);
      notes.push(`The cut-off ${settings.cutoff ?? ''} is ${gap} day${gap === 1 ? '' : 's'} after the latest visit date in the data (${isoDate(latest)}); every visit whose window closed before it without a record counts as missed.`);
    }
  }
  const days = computeStudyDays(table, settings.schedule, place);
  // Visit dates far outside the data (a mistyped year) are warned about and do not set the default cut-off.
  const odd = implausibleDates(table, days, settings.schedule, settings.runAt, place);
  const timing = classifyVisits(table, days, settings.schedule, { place, ...(cutoff === undefined ? {} : { cutoff }), ...(odd.count > 0 ? { ignoreForCutoff: odd.flags } : {}) });
  if (cutoff === undefined && odd.count > 0 && timing.cutoff !== null) {
    const cells = odd.issues.slice(0, 3).map((i) => i.cell ?? '').join(', ');
    notes.push(
      `The default cut-off ${isoDate(timing.cutoff)} is the latest visit date in the data, leaving out ${odd.count} date${odd.count === 1 ? '' : 's'} far outside the data (${cells}${odd.count > 3 ? ', …' : ''}); records dated after the cut-off are left out of visit timing. Correct those dates, or give the cut-off.`,
    );
  }
  const issues: Issue[] = [...read.issues, ...odd.issues, ...fromScheduleIssues([...days.issues, ...timing.issues])];
  const usedForTiming = countTiming(timing.rowStatus);
  if (usedForTiming === 0) {
    // Intake found usable rows, but none survived windowing (all after the cut-off, or no reference date).
    const why = cutoff !== undefined ? `is dated on or before the data cut-off ${settings.cutoff ?? ''}` : 'has a study day (each needs a reference date or a baseline record)';
    return stop([...issues, { code: 'no-usable-rows', severity: 'error', cell: null, row: null, role: null, value: '', use: 'timing', message: `No record ${why}, so there is nothing to analyse.` }]);
  }
  const summary = summarizeTiming({ table, schedule: settings.schedule, days, timing });

  if (!(await enter('fitting'))) return CANCELLED;
  const stage = fitStage(table, days, timing, settings);
  notes.push(...stage.notes);
  const { fit, note: modelNote, means } = stage;
  const repeated = settings.model === 'repeated' ? repeatedStage(table, timing, settings) : null;
  if (modelNote !== null && table.mapping.value !== undefined) issues.push(modelNotFitted(modelNote));
  const usedForModel = fit?.nObservations ?? 0;
  const referenceArm = stage.arms[0] ?? null;
  // --model gee | logistic: that model's sheet and JSON `model` section, beside the random-intercept model's sheets.
  const other = otherModelStage(table, days, timing, settings, fit);

  if (!(await enter('writing'))) return CANCELLED;
  const excluded = excludedRows(issues);
  // A file's fingerprint comes with the settings (its bytes, hashed by the front end); cells are fingerprinted here.
  const fingerprintOf = settings.fileFingerprint === undefined ? 'cells' : 'file';
  const fingerprint = settings.fileFingerprint ?? (cells instanceof GridSource ? fingerprintCells(cells.cells) : fingerprintRows(cells));
  const model = modelOutputs({ fit, means, settings, notFitted: table.mapping.value === undefined ? null : modelNote, sensitivity: stage.sensitivity, comparison: stage.comparison });
  // The JSON `model` section is the chosen model's (repeated, gee or logistic when asked for, else the random-intercept
  // or the random intercept and slope fit); the summary sheet reads its headline numbers from it, so both agree.
  const chosenSection = repeated !== null ? repeatedModelJson(repeated, fit) : other !== null ? other.json : model.json;
  // The comparison lists every model fitted in the run: the random-intercept and slope fits of the fitting stage join
  // the visit-by-visit model's and GEE's lists (the yes/no model's likelihood is of another outcome, so it stands alone).
  const modelSection = settings.model === 'repeated' || settings.model === 'gee' ? withEveryModel(chosenSection, stage.comparison?.models ?? []) : chosenSection;
  const reportedNote = other === null ? modelNote : other.note;
  const sheets: SheetSpec[] = [
    summarySheet({ inputLabel: settings.inputLabel, rowsRead: table.nRows, runAt: settings.runAt, mode: settings.mode, summary, model: modelSection, modelNote: table.mapping.value === undefined && other === null ? null : reportedNote }),
    ...timingSheets(summary),
    ...(other?.sheets ?? []),
    ...model.sheets,
    ...(repeated?.sheets ?? []),
    // The model's technical notes (intervals, likelihood, AIC/BIC, convergence) go to the record, not the model sheet.
    recordSheet({ settings, table, excluded, fingerprint, fingerprintOf, summary, rowsTiming: usedForTiming, rowsModel: usedForModel, referenceArm, notes: [...notes, ...(fit === null ? [] : modelTechnicalNotes(fit)), ...(modelNote === null ? [] : [`The model was not fitted: ${modelNote}.`])] }),
  ];
  const json = resultsJson({
    settings,
    table,
    fingerprint,
    fingerprintOf,
    excluded,
    usedForTiming,
    usedForModel,
    visits: timingJson(summary),
    model: modelSection,
    modelNote: reportedNote,
    notes,
    issues,
    cutoff: summary.cutoff,
    cutoffRule: summary.cutoffRule,
    referenceArm,
  });
  return { ok: true, issues, excluded, sheets, json };
}

/** Rows that took part in visit timing (every row with a status). */
function countTiming(rowStatus: Uint8Array): number {
  let n = 0;
  for (let i = 0; i < rowStatus.length; i++) if (rowStatus[i] !== NO_STATUS) n++;
  return n;
}

/** `section` with `comparison` holding first the linear mixed models of `fitted` (non-finite numbers as null), then the
 * section's own entries of other kinds. Example: fitted intercept and slope, section [intercept, repeated] →
 * [intercept, slope, repeated]. */
function withEveryModel(section: Record<string, unknown> | null, fitted: readonly { kind: string; logLik: number; aic: number; bic: number; nParameters: number }[]): Record<string, unknown> | null {
  if (section === null) return null;
  const n = (x: number): number | null => (Number.isFinite(x) ? x : null);
  const first = fitted.map((m) => ({ kind: m.kind, logLik: n(m.logLik), aic: n(m.aic), bic: n(m.bic), nParameters: m.nParameters }));
  const own = Array.isArray(section.comparison) ? (section.comparison as { kind: string }[]) : [];
  return { ...section, comparison: [...first, ...own.filter((e) => !first.some((f) => f.kind === e.kind))] };
}
