/**
 * The sheet of the repeated-measures model with an unstructured covariance ("Visit-by-visit model"): the caution
 * line, a plain paragraph of what the model does and its headline, then the differences from the reference arm at each
 * visit (unblinded), the model-based means, the fixed effects, the estimated covariance and correlation across visits,
 * the missingness patterns, and the records left out of this model (unscheduled and repeat). In blinded mode nothing
 * by arm appears. When the model could not be fitted, the paragraph says why.
 */
import type { Mode } from '../intake/types';
import type { ContrastResult } from '../model/types';
import type { RepeatedFit } from '../model/repeated';
import { cell, col, heading, levelPercent, para } from './blockParts';
import { cautionLine } from './cautions';
import { DF_DESCRIPTIONS } from './dfNotes';
import { LEFT_OUT_LISTED, type LeftOutRecord } from './repeatedJson';
import type { Block, SheetCell, SheetSpec, TableColumn } from './types';

export const REPEATED_SHEET_NAME = 'Visit-by-visit model';

export interface RepeatedSheetContext {
  readonly mode: Mode;
  readonly note: string | null;
  readonly notes: readonly string[];
  readonly leftOut: readonly LeftOutRecord[];
}

const num = (x: number): string => (Number.isFinite(x) ? (Math.round(x * 100) / 100).toString() : '–');
const pPhrase = (p: number): string => (p < 0.0001 ? 'p < 0.0001' : `p = ${p.toFixed(4)}`);

function inferenceColumns(level: number): TableColumn[] {
  const pct = levelPercent(level);
  return [
    col('Estimate', 'decimal4'),
    col('Standard error', 'decimal4'),
    col('Degrees of freedom', 'decimal1'),
    col('t', 'decimal2'),
    col('p-value', 'pvalue'),
    col(`Lower ${pct} limit`, 'decimal4'),
    col(`Upper ${pct} limit`, 'decimal4'),
  ];
}
const inferenceCells = (r: ContrastResult): SheetCell[] => [cell(r.estimate), cell(r.se), cell(r.df), cell(r.t), cell(r.p), cell(r.lower), cell(r.upper)];

/** The opening paragraph (see the file comment). */
export function repeatedParagraph(fit: RepeatedFit | null, ctx: RepeatedSheetContext): string {
  const extra = ctx.leftOut.filter((r) => r.status === 'extra').length;
  const repeat = ctx.leftOut.length - extra;
  const what =
    'This model treats each scheduled visit as a time point of its own. It estimates the mean value at every visit' +
    (ctx.mode === 'unblinded' ? ' in each arm' : '') +
    ' from the record matched to that visit, and lets the values of one participant at different visits be related in any way: each visit has its own variance and each pair of visits its own covariance. ' +
    'A participant with missing visits still counts through the visits they have; this is right when whether a visit is missing depends only on what was already seen (missing at random). ' +
    `Unscheduled records (${extra}) and repeat records (${repeat}) are left out of this model and listed at the end of this sheet.`;
  if (fit === null) return `${what} The model was not fitted: ${ctx.note ?? 'no reason given'}.`;
  let text = `${what} It used ${fit.nObservations} values of ${fit.nSubjects} participants at ${fit.visits.length} visits.`;
  if (ctx.mode === 'unblinded') {
    for (const t of fit.treatmentEffects.filter((e) => e.last)) {
      text += ` At ${t.visit}, the last scheduled visit, the mean value of ${t.arm} differed from ${fit.arms[0] ?? 'the reference arm'} by ${num(t.estimate)} (${levelPercent(fit.level)} confidence interval ${num(t.lower)} to ${num(t.upper)}; ${pPhrase(t.p)}).`;
    }
  }
  if (fit.status === 'boundary') text += ` ${fit.message}`;
  return text;
}

function matrixTable(id: string, caption: string, visits: readonly string[], m: readonly (readonly number[])[], format: 'decimal4' | 'decimal3'): Block {
  return {
    kind: 'table',
    id,
    caption,
    columns: [col('Visit', 'text'), ...visits.map((v) => col(v, format))],
    rows: visits.map((v, j) => [v, ...m[j]!.map(cell)]),
  };
}

/** The sheet (see the file comment). */
export function repeatedSheet(fit: RepeatedFit | null, ctx: RepeatedSheetContext): SheetSpec {
  const blocks: Block[] = [cautionLine(ctx.mode), para(repeatedParagraph(fit, ctx))];
  const unblinded = ctx.mode === 'unblinded';
  if (fit !== null) {
    const level = fit.level;
    if (unblinded && fit.treatmentEffects.length > 0) {
      blocks.push({
        kind: 'table',
        id: 'VisitDifferences',
        caption: `Difference from ${fit.arms[0] ?? 'the reference arm'} at each visit`,
        columns: [col('Arm', 'text'), col('Visit', 'text'), col('Target day', 'integer'), col('Last visit', 'text'), ...inferenceColumns(level)],
        rows: fit.treatmentEffects.map((t) => [t.arm, t.visit, t.day, t.last ? 'Yes' : 'No', ...inferenceCells(t)]),
      });
    }
    const byArm = unblinded ? [...fit.means].sort((a, b) => fit.arms.indexOf(a.arm ?? '') - fit.arms.indexOf(b.arm ?? '')) : fit.means;
    blocks.push({
      kind: 'table',
      id: 'VisitMeans',
      caption: fit.fixedEffects.some((f) => f.kind === 'baseline') ? 'Model-based mean at each visit (at the average baseline covariate)' : 'Model-based mean at each visit',
      columns: [...(unblinded ? [col('Arm', 'text')] : []), col('Visit', 'text'), col('Participants with a value', 'integer'), ...inferenceColumns(level)],
      rows: byArm.map((m) => [...(unblinded ? [m.arm ?? ''] : []), m.visit, m.n, ...inferenceCells(m)]),
    });
    blocks.push({
      kind: 'table',
      id: 'VisitModelTerms',
      caption: `Fixed effects (degrees of freedom: ${DF_DESCRIPTIONS[fit.dfMethod]})`,
      columns: [col('Term', 'text'), ...inferenceColumns(level)],
      rows: fit.fixedEffects.map((f) => [f.term, ...inferenceCells(f)]),
    });
    blocks.push(matrixTable('VisitCovariance', 'Estimated covariance of the values across visits', fit.visits, fit.covariance, 'decimal4'));
    blocks.push(matrixTable('VisitCorrelation', 'Estimated correlation of the values across visits', fit.visits, fit.correlation, 'decimal3'));
    blocks.push({
      kind: 'table',
      id: 'VisitPatterns',
      caption: 'Which visits participants have a value at',
      columns: [col('Visits with a value', 'text'), col('Participants', 'integer')],
      rows: fit.patterns.map((p) => [p.visits.join(', '), p.n]),
    });
  }
  if (ctx.notes.length > 0) blocks.push(heading('Notes'), ...ctx.notes.map((t) => para(t)));
  if (ctx.leftOut.length > 0) {
    const listed = ctx.leftOut.slice(0, LEFT_OUT_LISTED);
    blocks.push({
      kind: 'table',
      id: 'VisitRecordsLeftOut',
      caption: listed.length < ctx.leftOut.length ? `Records left out of this model (first ${listed.length} of ${ctx.leftOut.length})` : 'Records left out of this model',
      columns: [col('Row', 'integer'), col('Participant', 'text'), col('Why', 'text')],
      rows: listed.map((r) => [r.row, r.participant, r.status === 'extra' ? 'Unscheduled' : 'Repeat']),
    });
  }
  return { name: REPEATED_SHEET_NAME, title: 'Visit-by-visit model (unstructured covariance)', blocks };
}
