/**
 * The model's sheets (SPEC §5, §6): "Model results" opens with the one-line caution linked to the summary sheet and a plain-language paragraph, then
 * tables of fixed effects, treatment differences by visit, slope differences, variance components and ICC, how well
 * the model fits with the convergence verdict, predicted trajectories beside observed means (with a chart spec); and,
 * on request, "Per participant" with each participant's random intercept. In blinded mode no text outside the caution speaks
 * of arms: captions, column headers and the per-participant explanation use pooled wording and the arm column is left out.
 */
import type { Mode } from '../intake/types';
import type { ContrastResult, ModelFit } from '../model/types';
import { cautionLine } from './cautions';
import { fitVerdict, modelSummaryText, statusWords } from './modelText';
import { cell, col, levelPercent, para } from './blockParts';
import { DF_DESCRIPTIONS } from './dfNotes';
import { modelExtraBlocks } from './modelExtras';
import type { SensitivityRun } from './sensitivityReport';
import type { Block, ChartSeries, SheetCell, SheetSpec, TableColumn } from './types';
import type { ModelComparison } from '../model/slope/compare';
import { comparisonBlocks } from './comparisonReport';
import { modelTitle, slopeBlocks } from './slopeReport';

export interface ObservedVisitMean {
  readonly label: string;
  readonly day: number;
  readonly arm: string | null;
  readonly mean: number;
  readonly n: number;
}

export interface ModelSheetContext {
  readonly observed: readonly ObservedVisitMean[];
  readonly mode: Mode;
  readonly perSubject: boolean;
  /** Subject ids by model subject index (the fit's subjects already carry their ids; kept for front ends). */
  readonly subjectIds: readonly string[];
  /** The sensitivity refits (nominal time, on-time only); none when absent. */
  readonly sensitivity?: readonly SensitivityRun[];
  /** The model comparison (every model fitted, the slope test); none when absent. */
  readonly comparison?: ModelComparison | null;
}

/** Thrown when the report is asked for something the fit cannot support, e.g. a blinded report of a fit with arms. */
export class ModelReportError extends Error {
  readonly code = 'model-report' as const;
  constructor(message: string) {
    super(`Model report: ${message}`);
    this.name = 'ModelReportError';
  }
}

/** Sheet names of the model output (front ends make them unique in the workbook). */
export const MODEL_SHEET_NAMES = { results: 'Model results', perParticipant: 'Per participant' } as const;

const UNIT = { month: 'month', week: 'week', day: 'day' } as const;

function inferenceColumns(level: number): TableColumn[] {
  const pct = levelPercent(level);
  return [
    col('Estimate', 'significant'),
    col('Standard error', 'significant'),
    col('Degrees of freedom', 'decimal1'),
    col('t', 'decimal2'),
    col('p-value', 'pvalue'),
    col(`Lower ${pct} limit`, 'significant'),
    col(`Upper ${pct} limit`, 'significant'),
  ];
}
const inferenceCells = (r: ContrastResult): SheetCell[] => [cell(r.estimate), cell(r.se), cell(r.df), cell(r.t), cell(r.p), cell(r.lower), cell(r.upper)];

/**
 * Builds the model sheets; a blinded context with a fit that has arms throws ModelReportError (never leak arms).
 * Example: a blinded fit with perSubject false -> one sheet "Model results" whose first block
 * is the one-line caution, followed by the summary paragraph and the tables.
 */
export function modelSheets(fit: ModelFit, context: ModelSheetContext): SheetSpec[] {
  if (context.mode === 'blinded' && fit.arms.length > 0) {
    throw new ModelReportError('a blinded report cannot show a fit that contains arm terms; fit the blinded data without arms.');
  }
  const unit = UNIT[fit.timeUnit];
  const unblinded = context.mode === 'unblinded' && fit.arms.length > 1;
  const blocks: Block[] = [cautionLine(context.mode), para(modelSummaryText(fit, context.mode))];

  blocks.push({
    kind: 'table',
    id: 'FixedEffects',
    caption: unblinded ? `Fixed effects (time in ${unit}s; arm terms compare each arm with ${fit.arms[0]!})` : `Fixed effects (time in ${unit}s)`,
    columns: [col('Term', 'text', 28), ...inferenceColumns(fit.level)],
    rows: fit.fixedEffects.map((f) => [f.term, ...inferenceCells(f)]),
  });

  if (unblinded) {
    blocks.push({
      kind: 'table',
      id: 'DifferenceByVisit',
      caption: `Difference in mean from ${fit.arms[0]!} at each scheduled visit (model-based, at the visit's target day)`,
      columns: [col('Arm', 'text', 16), col('Visit', 'text', 14), col('Study day', 'integer'), col(`Time (${unit}s)`, 'significant'), ...inferenceColumns(fit.level)],
      rows: fit.treatmentEffects.map((t) => [t.arm, t.label, t.day, cell(t.time), ...inferenceCells(t)]),
    });
    blocks.push({
      kind: 'table',
      id: 'SlopeDifference',
      caption: `Difference in change per ${unit} from ${fit.arms[0]!}`,
      columns: [col('Arm', 'text', 16), ...inferenceColumns(fit.level)],
      rows: fit.slopeDifferences.map((s) => [s.arm, ...inferenceCells(s)]),
    });
    if (fit.jointTest !== null) {
      const j = fit.jointTest;
      blocks.push({
        kind: 'table',
        id: 'SlopeJointTest',
        caption: 'Joint test that all arms change at the same rate',
        columns: [col('Numerator df', 'integer'), col('Denominator df', 'decimal1'), col('F', 'significant'), col('p-value', 'pvalue')],
        rows: [[j.numDf, cell(j.denDf), cell(j.F), cell(j.p)]],
      });
    }
  }

  const v = fit.variance;
  const pct = levelPercent(fit.level);
  blocks.push({
    kind: 'table',
    id: 'VarianceICC',
    caption: 'Variation between and within participants',
    columns: [col('Component', 'text', 30), col('Estimate', 'significant'), col('Standard deviation', 'significant'), col(`Lower ${pct} limit`, 'significant'), col(`Upper ${pct} limit`, 'significant')],
    rows: [
      ['Between-participant variance', cell(v.subject), cell(Math.sqrt(v.subject)), cell(v.subjectLower), cell(v.subjectUpper)],
      ['Within-participant variance', cell(v.residual), cell(Math.sqrt(v.residual)), cell(v.residualLower), cell(v.residualUpper)],
      ['Intraclass correlation', cell(v.icc), null, cell(v.iccLower), cell(v.iccUpper)],
    ],
  });
  blocks.push(...slopeBlocks(fit, unit));

  blocks.push({
    kind: 'table',
    id: 'ModelFit',
    caption: 'How well the model fits, and whether the fit converged',
    columns: [col('Item', 'text', 24), col('Value', 'significant'), col('Note', 'text', 60)],
    rows: [
      ['Estimation', null, fit.method === 'reml' ? 'Restricted maximum likelihood (REML)' : 'Maximum likelihood'],
      ['Degrees of freedom', null, DF_DESCRIPTIONS[fit.dfMethod]],
      ['Log-likelihood', cell(fit.logLik), 'higher means a closer fit'],
      ['AIC', cell(fit.aic), 'for comparing fits of the same data: lower is better'],
      ['BIC', cell(fit.bic), 'for comparing fits of the same data: lower is better'],
      ['Verdict', null, statusWords(fit)],
    ],
  });
  blocks.push({
    kind: 'table',
    id: 'FitCounts',
    caption: 'Data used and work done',
    columns: [col('Item', 'text', 24), col('Count', 'integer')],
    rows: [
      ['Participants', fit.nSubjects],
      ['Measurements', fit.nObservations],
      ['Fixed effects', fit.fixedEffects.length],
    ],
  });

  blocks.push(...modelExtraBlocks(fit, context.sensitivity ?? [], context.mode, unit));
  blocks.push(...comparisonBlocks(context.comparison));
  blocks.push(...trajectoryBlocks(fit, context, unit, pct));

  const sheets: SheetSpec[] = [{ name: MODEL_SHEET_NAMES.results, title: modelTitle(fit), blocks }];
  if (context.perSubject) sheets.push(perParticipantSheet(fit, context.mode, unblinded));
  return sheets;
}

/**
 * The model sheet of a run in which no model was fitted: the one-line caution, then the reason in plain words, so a reader
 * who looks for the model finds why there is none (the visit-timing sheets stand).
 * Example: modelNotFittedSheet('all 24 values are equal (5)', 'blinded').blocks[1] -> paragraph "No model was fitted:
 * all 24 values are equal (5). ..."
 */
export function modelNotFittedSheet(reason: string, mode: Mode): SheetSpec {
  const why = reason.trim().replace(/\.+$/, '');
  return {
    name: MODEL_SHEET_NAMES.results,
    title: 'Random-intercept model',
    blocks: [
      cautionLine(mode),
      para(`No model was fitted: ${why}. No estimates, intervals or p-values are shown, because any would be wrong. The visit-timing sheets are not affected.`),
    ],
  };
}

/** A trajectory's study day as the table shows it (one decimal); the chart uses the same numbers, so a front end that
 * charts from cells finds them in the table. */
/** Study days are shown as whole days (the model's time column keeps the exact time). */
const shownDay = (d: number): number => Math.round(d);

function trajectoryBlocks(fit: ModelFit, context: ModelSheetContext, unit: string, pct: string): Block[] {
  if (fit.trajectories.length === 0) return [];
  const label = (arm: string | null): string => (arm === null ? 'All participants' : arm);
  // The arm column appears only in unblinded mode; blinded tables hold the pooled rows without it.
  const withArm = context.mode === 'unblinded';
  const armCol: TableColumn[] = withArm ? [col('Arm', 'text', 16)] : [];
  const armCell = (arm: string | null): SheetCell[] => (withArm ? [label(arm)] : []);
  const rows: SheetCell[][] = [];
  for (const tr of fit.trajectories) {
    tr.day.forEach((d, g) => rows.push([...armCell(tr.arm), shownDay(d), cell(tr.time[g]!), cell(tr.mean[g]!), cell(tr.lower[g]!), cell(tr.upper[g]!)]));
  }
  // Grouped by arm (in order of first appearance), visits in order within each arm, so each arm's observed means
  // stand in consecutive rows and a chart can read them from the table's cells.
  const shown = context.observed.filter((o) => (context.mode === 'unblinded' ? true : o.arm === null));
  const armOrder = [...new Set(shown.map((o) => o.arm))];
  const observed = armOrder.flatMap((a) => shown.filter((o) => o.arm === a));
  const series: ChartSeries[] = [];
  for (const tr of fit.trajectories) {
    series.push({ name: `${label(tr.arm)}: model`, x: tr.day.map(shownDay), y: tr.mean.map(cell) as (number | null)[], lower: tr.lower.map(cell) as (number | null)[], upper: tr.upper.map(cell) as (number | null)[], style: 'line' });
  }
  const groups = armOrder;
  for (const g of groups) {
    const pts = observed.filter((o) => o.arm === g);
    series.push({ name: `${label(g)}: observed mean`, x: pts.map((o) => o.day), y: pts.map((o) => cell(o.mean) as number | null), style: 'points' });
  }
  return [
    {
      kind: 'table',
      id: 'Trajectories',
      caption: `Predicted mean over time with ${pct} pointwise intervals (covariates at their averages)`,
      columns: [...armCol, col('Study day', 'integer'), col(`Time (${unit}s)`, 'significant'), col('Predicted mean', 'significant'), col(`Lower ${pct} limit`, 'significant'), col(`Upper ${pct} limit`, 'significant')],
      rows,
    },
    {
      kind: 'table',
      id: 'ObservedMeans',
      caption: 'Observed mean at each scheduled visit',
      columns: [...armCol, col('Visit', 'text', 14), col('Study day', 'integer'), col('Observed mean', 'significant'), col('Participants', 'integer')],
      rows: observed.map((o) => [...armCell(o.arm), o.label, o.day, cell(o.mean), o.n]),
    },
    {
      kind: 'chart',
      chart: { kind: 'scatter', id: 'TrajectoryChart', title: 'Predicted and observed means over time', xLabel: 'Study day', yLabel: 'Mean value', series, sourceTable: 'Trajectories' },
    },
  ];
}

function perParticipantSheet(fit: ModelFit, mode: Mode, unblinded: boolean): SheetSpec {
  const reference = unblinded ? 'the average for their arm and visit times' : 'the average of all participants at their visit times';
  return {
    name: MODEL_SHEET_NAMES.perParticipant,
    title: 'Per-participant random intercepts',
    blocks: [
      cautionLine(mode),
      {
        kind: 'table',
        id: 'ParticipantIntercepts',
        caption: 'Random intercept and mean residual per participant',
        columns: [col('Participant', 'text', 16), col('Measurements', 'integer'), col('Random intercept', 'significant'), col('Mean residual', 'significant')],
        rows: fit.subjects.map((s) => [s.id, s.n, cell(s.blup), cell(s.meanResidual)]),
      },
      para(
        `Each participant's random intercept is the model's best prediction of how far that participant's level lies above (positive) or below (negative) ${reference}, shrunk toward zero when the participant has few measurements. ${fit.subjects.length} participants.`,
      ),
    ],
  };
}

/**
 * The model's technical notes, in plain sentences, for the analysis record (the model sheet keeps the tables a reader
 * needs): how the intervals were computed, what the log-likelihood includes, how AIC and BIC are defined, how many
 * likelihood evaluations the fit took and the convergence detail.
 * Example: modelTechnicalNotes(fit)[0] → "How the intervals were computed: Profile-likelihood intervals from the restricted (REML) likelihood …"
 */
export function modelTechnicalNotes(fit: ModelFit): string[] {
  const k = fit.nParameters;
  return [
    `How the intervals were computed: ${fit.variance.intervalMethod}`,
    `The log-likelihood is the ${fit.method === 'reml' ? 'restricted log-likelihood' : 'log-likelihood'} with its constants included.`,
    `AIC = −2 × log-likelihood + 2k and BIC = −2 × log-likelihood + k × log(N), with k = ${k} (the fixed effects and the ${k - fit.fixedEffects.length === 2 ? '2 variances' : `${k - fit.fixedEffects.length} covariance parameters`}) and N = ${fit.bicN} (${fit.method === 'reml' ? 'measurements minus fixed effects' : 'measurements'}).`,
    `The fit took ${fit.iterations} likelihood evaluations. Convergence: ${fitVerdict(fit)}`,
  ];
}
