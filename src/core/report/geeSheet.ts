/**
 * The GEE's sheet and JSON: a plain paragraph first (what the marginal model says and how its standard errors are
 * made), the effects with the three standard errors, and the working correlation; a caution when an arm has fewer
 * than 40 participants (the robust SE is then too small; Mancl & DeRouen 2001).
 */
import type { Mode } from '../intake/types';
import type { GeeFit } from '../model/gee';
import { SMALL_SAMPLE_PARTICIPANTS } from '../model/gee';
import { cell, col, heading, levelPercent, para } from './blockParts';
import { cautionLine } from './cautions';
import { num } from './modelText';
import type { Block, SheetSpec } from './types';

export const GEE_SHEET_NAME = 'Marginal model';

const jsonNum = (x: number | null): number | null => (x !== null && Number.isFinite(x) ? x : null);

/** The caution sentence, or null when every arm has at least 40 participants. */
export function geeSmallSampleCaution(fit: GeeFit): string | null {
  if (fit.minParticipantsPerArm >= SMALL_SAMPLE_PARTICIPANTS) return null;
  return `Fewer than ${SMALL_SAMPLE_PARTICIPANTS} participants ${fit.arms.length > 0 ? 'in an arm' : 'in all'} (${fit.minParticipantsPerArm}): the robust standard errors tend to be too small with so few participants; read the small-sample column (Mancl & DeRouen 2001) instead.`;
}

/** JSON `model` for --model gee. Example keys: kind 'gee', workingCorrelation { structure, correlation }, fixedEffects [{ term, estimate, se, seModel, seSmallSample, … }]. */
export function geeJson(fit: GeeFit): Record<string, unknown> {
  return {
    kind: 'gee',
    status: fit.status,
    message: fit.message,
    nSubjects: fit.nSubjects,
    nObservations: fit.nObservations,
    iterations: fit.iterations,
    level: fit.level,
    timeUnit: fit.timeUnit,
    arms: [...fit.arms],
    workingCorrelation: { structure: fit.workingCorrelation.structure, correlation: jsonNum(fit.workingCorrelation.correlation) },
    scale: jsonNum(fit.scale),
    minParticipantsPerArm: fit.minParticipantsPerArm,
    smallSampleCaution: geeSmallSampleCaution(fit),
    fixedEffects: fit.fixedEffects.map((e) => ({
      term: e.term,
      kind: e.kind,
      arm: e.arm,
      estimate: jsonNum(e.estimate),
      se: jsonNum(e.se),
      seModel: jsonNum(e.seModel),
      seSmallSample: jsonNum(e.seSmallSample),
      z: jsonNum(e.z),
      lower: jsonNum(e.lower),
      upper: jsonNum(e.upper),
      p: jsonNum(e.p),
    })),
    treatmentEffects: fit.treatmentEffects.map((c) => ({ arm: c.arm, label: c.label, day: c.day, time: c.time, estimate: jsonNum(c.estimate), se: jsonNum(c.se), z: jsonNum(c.z), lower: jsonNum(c.lower), upper: jsonNum(c.upper), p: jsonNum(c.p) })),
  };
}

/** The one sheet of the GEE. */
export function geeSheet(fit: GeeFit, mode: Mode): SheetSpec {
  const lv = levelPercent(fit.level);
  const caution = geeSmallSampleCaution(fit);
  const blocks: Block[] = [
    cautionLine(mode),
    para(
      `This model describes the average value over time${fit.arms.length > 0 ? ' in each arm' : ''}, without modelling each participant's own level. Values of the same participant are allowed to be alike: one common correlation between any two of a participant's values (estimated here as ${num(fit.workingCorrelation.correlation)}) shapes the estimates, and the robust standard errors stay right even if that pattern is wrong. ${fit.nSubjects} participants, ${fit.nObservations} values.`,
    ),
    ...(caution === null ? [] : [para(caution, 'caution')]),
    ...(fit.status === 'converged' ? [] : [para(`The estimates may not be reliable: ${fit.message}`, 'caution')]),
    heading('Effects'),
    {
      kind: 'table',
      id: 'GeeEffects',
      caption: `Estimates with ${lv} confidence intervals from the robust standard error (normal distribution)`,
      columns: [col('Term', 'text', 28), col('Estimate', 'decimal3'), col('Robust SE', 'decimal4'), col('Model-based SE', 'decimal4'), col('Small-sample SE', 'decimal4'), col(`Lower ${lv}`, 'decimal3'), col(`Upper ${lv}`, 'decimal3'), col('p', 'pvalue')],
      rows: fit.fixedEffects.map((e) => [e.term, cell(e.estimate), cell(e.se), cell(e.seModel), e.seSmallSample === null ? null : cell(e.seSmallSample), cell(e.lower), cell(e.upper), cell(e.p)]),
    },
    para(`Robust SE: the sandwich estimator (Liang & Zeger 1986). Model-based SE: right only if the common correlation describes the data. Small-sample SE: the bias-corrected sandwich (Mancl & DeRouen 2001)${fit.fixedEffects.some((e) => e.seSmallSample === null) ? '; not available here, because one participant alone determines a term' : ''}.`),
    heading('Working correlation'),
    {
      kind: 'table',
      id: 'GeeCorrelation',
      caption: 'Moment estimates from the residuals',
      columns: [col('Quantity', 'text', 40), col('Value', 'decimal4')],
      rows: [
        ['Correlation between two values of a participant', cell(fit.workingCorrelation.correlation)],
        ['Variance of a value', cell(fit.scale)],
        ['Alternations of estimates and correlation', fit.iterations],
      ],
    },
  ];
  return { name: GEE_SHEET_NAME, title: 'Marginal model (GEE, exchangeable working correlation)', blocks };
}
