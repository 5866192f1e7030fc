/**
 * The yes/no model's sheet and JSON: a plain paragraph first (what is modelled and what an odds ratio means), the
 * effects on the logit scale with odds ratios, the between-participant variance on the logit scale, and the
 * population-averaged probability of "yes" at each visit (by arm when unblinded).
 */
import type { Mode } from '../intake/types';
import type { LogisticFit } from '../model/logistic';
import { cell, col, heading, levelPercent, para } from './blockParts';
import { cautionLine } from './cautions';
import { num } from './modelText';
import type { Block, SheetSpec } from './types';

export const LOGISTIC_SHEET_NAME = 'Yes-no model';

/** A change of the log-likelihood above this with twice the nodes is worth a caution (common practice: well below 0.1). */
const QUADRATURE_TOLERANCE = 0.01;

const jsonNum = (x: number | null): number | null => (x !== null && Number.isFinite(x) ? x : null);

/** JSON `model` for --model logistic: kind 'logistic', outcome (how yes was defined), fixedEffects with odds ratios, variance.subject, nodes, probabilities. */
export function logisticJson(fit: LogisticFit, outcome: string): Record<string, unknown> {
  return {
    kind: 'logistic',
    status: fit.status,
    message: fit.message,
    outcome,
    nSubjects: fit.nSubjects,
    nObservations: fit.nObservations,
    nYes: fit.nYes,
    nodes: fit.nodes,
    quadratureCheck: { nodes: fit.quadratureCheck.nodes, logLikChange: jsonNum(fit.quadratureCheck.logLikChange) },
    iterations: fit.iterations,
    level: fit.level,
    timeUnit: fit.timeUnit,
    arms: [...fit.arms],
    logLik: jsonNum(fit.logLik),
    aic: jsonNum(fit.aic),
    bic: jsonNum(fit.bic),
    nParameters: fit.nParameters,
    variance: { subject: jsonNum(fit.variance.subject), subjectSe: jsonNum(fit.variance.subjectSe) },
    fixedEffects: fit.fixedEffects.map((e) => ({
      term: e.term,
      kind: e.kind,
      arm: e.arm,
      estimate: jsonNum(e.estimate),
      se: jsonNum(e.se),
      z: jsonNum(e.z),
      lower: jsonNum(e.lower),
      upper: jsonNum(e.upper),
      p: jsonNum(e.p),
      oddsRatio: jsonNum(e.oddsRatio),
      oddsRatioLower: jsonNum(e.oddsRatioLower),
      oddsRatioUpper: jsonNum(e.oddsRatioUpper),
    })),
    treatmentEffects: fit.treatmentEffects.map((c) => ({ arm: c.arm, label: c.label, day: c.day, time: c.time, estimate: jsonNum(c.estimate), se: jsonNum(c.se), z: jsonNum(c.z), lower: jsonNum(c.lower), upper: jsonNum(c.upper), p: jsonNum(c.p), oddsRatio: jsonNum(c.oddsRatio), oddsRatioLower: jsonNum(c.oddsRatioLower), oddsRatioUpper: jsonNum(c.oddsRatioUpper) })),
    probabilities: fit.marginalProbabilities.map((m) => ({ visit: m.label, targetDay: m.day, arm: m.arm, probability: jsonNum(m.probability) })),
  };
}

/** The one sheet of the yes/no model; `outcome` says in words how "yes" was defined. */
export function logisticSheet(fit: LogisticFit, mode: Mode, outcome: string): SheetSpec {
  const lv = levelPercent(fit.level);
  const armed = fit.arms.length > 0;
  const blocks: Block[] = [
    cautionLine(mode),
    para(
      `This model describes the chance of a yes answer (${outcome}) over time${armed ? ' in each arm' : ''}, allowing each participant their own tendency to answer yes. An odds ratio above 1 means higher odds of yes. ${fit.nYes} of ${fit.nObservations} values are yes, from ${fit.nSubjects} participants; the likelihood is computed with ${fit.nodes} quadrature point${fit.nodes === 1 ? '' : 's'} per participant.`,
    ),
    ...(Math.abs(fit.quadratureCheck.logLikChange) > QUADRATURE_TOLERANCE
      ? [para(`With ${fit.quadratureCheck.nodes} quadrature points instead of ${fit.nodes}, the log-likelihood at these estimates changes by ${num(fit.quadratureCheck.logLikChange)}: the estimates still depend on the number of points (participants who answer the same throughout while participants differ a lot). Read them as approximate.`, 'caution')]
      : []),
    ...(fit.status === 'failed' ? [para(`The estimates are not reliable: ${fit.message}`, 'caution')] : fit.status === 'boundary' ? [para(fit.message, 'caution')] : []),
    heading('Effects'),
    {
      kind: 'table',
      id: 'YesNoEffects',
      caption: `Log odds and odds ratios with ${lv} Wald intervals`,
      columns: [col('Term', 'text', 28), col('Log odds', 'decimal3'), col('SE', 'decimal4'), col('Odds ratio', 'decimal3'), col(`Lower ${lv}`, 'decimal3'), col(`Upper ${lv}`, 'decimal3'), col('p', 'pvalue')],
      rows: fit.fixedEffects.map((e) => [e.term, cell(e.estimate), cell(e.se), cell(e.oddsRatio), cell(e.oddsRatioLower), cell(e.oddsRatioUpper), cell(e.p)]),
    },
    para(`Between-participant variance on the log-odds scale: ${num(fit.variance.subject)}${fit.variance.subjectSe === null ? '' : ` (SE ${num(fit.variance.subjectSe)})`}.`),
    heading('Chance of yes at each visit'),
    {
      kind: 'table',
      id: 'YesNoByVisit',
      caption: 'Averaged over participants (population-averaged), covariates at their mean',
      columns: [col('Visit name', 'text', 16), col('Target day', 'integer'), ...(armed ? [col('Arm', 'text', 14)] : []), col('Chance of yes', 'percent1')],
      rows: fit.marginalProbabilities.map((m) => [m.label, m.day, ...(armed ? [m.arm] : []), cell(m.probability)]),
    },
  ];
  return { name: LOGISTIC_SHEET_NAME, title: 'Random-intercept model for a yes/no outcome', blocks };
}
