/**
 * The naive fit beside the mixed model, for the model sheet and the JSON: a table of each term's least-squares
 * estimate and SE beside the model's SE, with one plain sentence per kind of term (between-participant terms such as
 * the arm, within-participant terms such as time) saying which way ignoring the correlation moved the SE, and why.
 */
import type { ModelFit, NaiveEffect } from '../model/types';
import { cell, col, para } from './blockParts';
import { num } from './modelText';
import type { Block } from './types';

const jsonNum = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** JSON `model.naive`: null when there is no naive fit. Example: { residualVariance, df, fixedEffects: [{ term, estimate, se, seRatio }] }. */
export function naiveJson(fit: ModelFit): Record<string, unknown> | null {
  const nv = fit.naive;
  if (nv === null) return null;
  return {
    residualVariance: jsonNum(nv.residualVariance),
    df: nv.df,
    fixedEffects: nv.fixedEffects.map((f) => ({ term: f.term, estimate: jsonNum(f.estimate), se: jsonNum(f.se), seRatio: jsonNum(f.seRatio) })),
  };
}

/** "0.41" or "0.41 to 0.58": the range of the ratios of a group of terms. */
function ratioRange(effects: readonly NaiveEffect[]): string {
  const r = effects.map((f) => f.seRatio).filter(Number.isFinite);
  if (r.length === 0) return 'n/a';
  const lo = Math.min(...r);
  const hi = Math.max(...r);
  return num(lo) === num(hi) ? num(lo) : `${num(lo)} to ${num(hi)}`;
}

const direction = (effects: readonly NaiveEffect[]): 'small' | 'large' | 'mixed' =>
  effects.every((f) => f.seRatio < 1) ? 'small' : effects.every((f) => f.seRatio > 1) ? 'large' : 'mixed';

const names = (effects: readonly NaiveEffect[]): string => effects.map((f) => (f.kind === 'intercept' ? 'the overall level' : f.term)).join(', ');

/**
 * The plain sentences under the table, one per kind of term present.
 * Example (high ICC): "For terms that compare participants with one another (the overall level, Arm B vs A), the naive
 * standard error is 0.41 to 0.52 times the model's: too small, because ...".
 */
export function naiveSentences(fit: ModelFit): string[] {
  const nv = fit.naive;
  if (nv === null) return [];
  const out: string[] = [];
  // The intercept is named only when it is the only between-participant term (blinded fits without covariates).
  const betweenAll = nv.fixedEffects.filter((f) => f.between);
  const between = betweenAll.some((f) => f.kind !== 'intercept') ? betweenAll.filter((f) => f.kind !== 'intercept') : betweenAll;
  const within = nv.fixedEffects.filter((f) => !f.between);
  const icc = num(fit.variance.icc);
  if (between.length > 0) {
    const d = direction(between);
    const why =
      d === 'small'
        ? 'too small, because the naive fit counts every value of a participant as new information, although the values share that participant’s own level'
        : d === 'large'
          ? `not too small here, because the participants differ little from one another (intraclass correlation ${icc})`
          : `smaller for some terms and larger for others (intraclass correlation ${icc})`;
    out.push(`For terms that compare participants with one another (${names(between)}), the naive standard error is ${ratioRange(between)} times the model’s: ${why}.`);
  }
  if (within.length > 0) {
    const d = direction(within);
    const why =
      d === 'large'
        ? 'too large, because the naive fit leaves the differences between participants in its error, while the model sets them aside by comparing each participant with their own earlier values'
        : d === 'small'
          ? `not too large here, because the participants differ little from one another (intraclass correlation ${icc})`
          : `larger for some terms and smaller for others (intraclass correlation ${icc})`;
    out.push(`For terms that compare values of the same participant over time (${names(within)}), the naive standard error is ${ratioRange(within)} times the model’s: ${why}.`);
  }
  out.push('The model’s standard errors are the ones to use; the naive fit is shown only to make the difference visible.');
  return out;
}

/** The table and its sentences; nothing when there is no naive fit. */
export function naiveBlocks(fit: ModelFit): Block[] {
  const nv = fit.naive;
  if (nv === null) return [];
  return [
    {
      kind: 'table',
      id: 'NaiveFit',
      caption: 'The same terms by ordinary least squares, treating every value as independent (naive fit)',
      columns: [col('Term', 'text', 28), col('Naive estimate', 'significant'), col('Naive standard error', 'significant'), col('Model standard error', 'significant'), col('Ratio (naive ÷ model)', 'decimal2')],
      rows: nv.fixedEffects.map((f, j) => [f.term, cell(f.estimate), cell(f.se), cell(fit.fixedEffects[j]?.se ?? NaN), cell(f.seRatio)]),
    },
    ...naiveSentences(fit).map((s) => para(s)),
  ];
}
