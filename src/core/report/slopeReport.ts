/**
 * The random intercept and slope model's own parts of the model sheet and the JSON: the between-participant
 * covariance G (variances of the intercepts and slopes, their covariance and correlation) with the within-participant
 * variance, and one plain sentence. The rest of the slope fit (fixed effects, differences by visit, trajectories) is
 * shown by the same tables as the random-intercept model (modelSheet.ts).
 */
import { isSlopeFit } from '../model/slope/kind';
import type { ModelFit, SlopeFit } from '../model/types';
import { cell, col, levelPercent, para } from './blockParts';
import { num } from './modelText';
import type { Block } from './types';

const jsonNum = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** The sheet title for a fit. Example: a slope fit -> "Random intercept and slope model". */
export function modelTitle(fit: ModelFit): string {
  return isSlopeFit(fit) ? 'Random intercept and slope model' : 'Random-intercept model';
}

/** The G table and its sentence for a slope fit; nothing for the random-intercept model. */
export function slopeBlocks(fit: ModelFit, unit: string): Block[] {
  if (!isSlopeFit(fit)) return [];
  const g = fit.randomEffects;
  const v = fit.variance;
  const pct = levelPercent(fit.level);
  return [
    {
      kind: 'table',
      id: 'LevelAndRate',
      caption: `How participants differ in level and in rate of change (time in ${unit}s)`,
      columns: [col('Component', 'text', 40), col('Estimate', 'decimal4'), col('Standard deviation', 'decimal4'), col(`Lower ${pct} limit`, 'decimal4'), col(`Upper ${pct} limit`, 'decimal4')],
      rows: [
        ['Variance of the participants\' levels at study day 1', cell(g.intercept), cell(Math.sqrt(g.intercept)), cell(g.interceptLower), cell(g.interceptUpper)],
        [`Variance of the participants' rates of change (per ${unit}, squared)`, cell(g.slope), cell(Math.sqrt(g.slope)), cell(g.slopeLower), cell(g.slopeUpper)],
        ['Covariance of level and rate of change', cell(g.covariance), null, null, null],
        ['Correlation of level and rate of change', cell(g.correlation), null, null, null],
        ['Within-participant variance', cell(v.residual), cell(Math.sqrt(v.residual)), cell(v.residualLower), cell(v.residualUpper)],
      ],
    },
    para(slopeSentence(fit, unit)),
  ];
}

/** Example: "Participants' rates of change spread with a standard deviation of 0.98 per month around their arm's mean rate; …". */
export function slopeSentence(fit: SlopeFit, unit: string): string {
  const g = fit.randomEffects;
  let text = `Participants' rates of change spread with a standard deviation of ${num(Math.sqrt(g.slope))} per ${unit} around the mean rate of their ${fit.arms.length > 1 ? 'arm' : 'group'}`;
  if (Number.isFinite(g.correlation)) {
    const dir = g.correlation > 0 ? 'those who start higher tend to rise faster (or fall more slowly)' : 'those who start higher tend to fall faster (or rise more slowly)';
    text += `; the correlation of level and rate of change is ${num(g.correlation)}${Math.abs(g.correlation) >= 0.1 ? `: ${dir}` : ''}`;
  }
  text += '.';
  if (fit.covarianceShape !== 'full') text += ' The covariance matrix is at its boundary (see the fit verdict), so the model has one random effect fewer than it allows; read the variances as approximate.';
  return text;
}

/** The JSON additions under `model.variance` for a slope fit: `slope`, `correlation` and the rest of G. */
export function slopeVarianceJson(fit: ModelFit): Record<string, unknown> {
  if (!isSlopeFit(fit)) return {};
  const g = fit.randomEffects;
  return {
    slope: jsonNum(g.slope),
    correlation: jsonNum(g.correlation),
    covariance: jsonNum(g.covariance),
    slopeLower: jsonNum(g.slopeLower),
    slopeUpper: jsonNum(g.slopeUpper),
    covarianceShape: fit.covarianceShape,
  };
}
