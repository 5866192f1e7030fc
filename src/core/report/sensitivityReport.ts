/**
 * What the visit deviations cost: one small table comparing the main fit (actual visit days) with the refit at each
 * visit's target day and the refit on on-time visits only — the treatment difference at the last scheduled visit
 * (unblinded) or the change per time unit (blinded), and the ICC — with a plain sentence saying how much the visit
 * timing moves the estimate. Nothing by arm in blinded mode.
 */
import type { Mode } from '../intake/types';
import type { ContrastResult, ModelFit } from '../model/types';
import { cell, col, levelPercent, para } from './blockParts';
import { lastVisitEffects, num } from './modelText';
import type { Block, SheetCell } from './types';

/** One refit: the analysis key (as in the JSON), and the fit or the reason there is none. */
export interface SensitivityRun {
  readonly analysis: 'nominal-time' | 'on-time-only';
  readonly fit: ModelFit | null;
  readonly note: string | null;
}

const ANALYSIS_WORDS = {
  main: 'Main: actual visit days',
  'nominal-time': 'Target days instead of actual days',
  'on-time-only': 'On-time visits only',
} as const;

const jsonNum = (x: number): number | null => (Number.isFinite(x) ? x : null);
const inf = (r: ContrastResult): Record<string, number | null> => ({ estimate: jsonNum(r.estimate), se: jsonNum(r.se), df: jsonNum(r.df), p: jsonNum(r.p), lower: jsonNum(r.lower), upper: jsonNum(r.upper) });
const armed = (fit: ModelFit, mode: Mode): boolean => mode === 'unblinded' && fit.arms.length > 1;
const slopeOf = (fit: ModelFit): ContrastResult | undefined => fit.fixedEffects.find((f) => f.kind === 'time');

/**
 * JSON `model.sensitivity`: per refit { analysis, fitted, note, nSubjects, nObservations, treatmentEffects (at the last
 * scheduled visit; unblinded), slopeDifferences (unblinded), slope (blinded), variance { subject, residual, icc,
 * iccLower, iccUpper } }; the numbers are null when the refit could not be made.
 */
export function sensitivityJson(runs: readonly SensitivityRun[], mode: Mode): Record<string, unknown>[] {
  return runs.map(({ analysis, fit, note }) => {
    if (fit === null) return { analysis, fitted: false, note, nSubjects: null, nObservations: null, treatmentEffects: [], slopeDifferences: [], slope: null, variance: null };
    const withArms = armed(fit, mode);
    const slope = slopeOf(fit);
    const v = fit.variance;
    return {
      analysis,
      fitted: true,
      note,
      nSubjects: fit.nSubjects,
      nObservations: fit.nObservations,
      treatmentEffects: withArms ? lastVisitEffects(fit).map((t) => ({ arm: t.arm, label: t.label, day: t.day, ...inf(t) })) : [],
      slopeDifferences: withArms ? fit.slopeDifferences.map((s) => ({ arm: s.arm, ...inf(s) })) : [],
      slope: !withArms && slope !== undefined ? inf(slope) : null,
      variance: { subject: jsonNum(v.subject), residual: jsonNum(v.residual), icc: jsonNum(v.icc), iccLower: jsonNum(v.iccLower), iccUpper: jsonNum(v.iccUpper) },
    };
  });
}

/** The quantity compared, per arm (unblinded) or pooled (blinded): the arm key (null pooled) and the result. */
function compared(fit: ModelFit, mode: Mode): { arm: string | null; r: ContrastResult }[] {
  if (armed(fit, mode)) return lastVisitEffects(fit).map((t) => ({ arm: t.arm, r: t }));
  const s = slopeOf(fit);
  return s === undefined ? [] : [{ arm: null, r: s }];
}

/**
 * The plain sentences: per arm (or pooled), how far each refit moves the estimate from the main fit; a refit that
 * could not be made says why. Example (blinded): "The visit timing changes the estimate of the change per month by
 * 0.012 when each visit is placed at its target day (from −1.21 to −1.20) and by −0.034 when only on-time visits are
 * kept (to −1.24)."
 */
export function sensitivitySentences(main: ModelFit, runs: readonly SensitivityRun[], mode: Mode, unit: string): string[] {
  const out: string[] = [];
  const how = { 'nominal-time': 'when each visit is placed at its target day', 'on-time-only': 'when only on-time visits are kept' } as const;
  for (const m of compared(main, mode)) {
    const what = m.arm === null ? `the change per ${unit}` : `the difference between ${m.arm} and ${main.arms[0]!} at ${lastVisitEffects(main)[0]?.label ?? 'the last visit'}`;
    const parts: string[] = [];
    for (const run of runs) {
      if (run.fit === null) continue;
      const other = compared(run.fit, mode).find((o) => o.arm === m.arm);
      if (other === undefined) continue;
      parts.push(`by ${num(other.r.estimate - m.r.estimate)} ${how[run.analysis]} (from ${num(m.r.estimate)} to ${num(other.r.estimate)})`);
    }
    if (parts.length > 0) out.push(`The visit timing changes the estimate of ${what} ${parts.join(' and ')}.`);
  }
  for (const run of runs) {
    if (run.fit === null) out.push(`The refit ${how[run.analysis]} could not be made: ${(run.note ?? 'no reason given').trim().replace(/\.+$/, '')}.`);
  }
  out.push('A large change means the conclusion depends on when the visits actually took place; the main analysis, which uses the actual visit days, is the one to report.');
  return out;
}

/** The table and sentences; nothing when there are no refits. */
export function sensitivityBlocks(main: ModelFit, runs: readonly SensitivityRun[], mode: Mode, unit: string): Block[] {
  if (runs.length === 0) return [];
  const pct = levelPercent(main.level);
  const withArms = armed(main, mode);
  const label = withArms ? `Difference at ${lastVisitEffects(main)[0]?.label ?? 'the last visit'}` : `Change per ${unit}`;
  const rows: SheetCell[][] = [];
  const all: { name: string; fit: ModelFit | null; note: string | null }[] = [
    { name: ANALYSIS_WORDS.main, fit: main, note: null },
    ...runs.map((r) => ({ name: ANALYSIS_WORDS[r.analysis], fit: r.fit, note: r.note })),
  ];
  for (const a of all) {
    const armCell = (arm: string | null): SheetCell[] => (withArms ? [arm] : []);
    if (a.fit === null) {
      rows.push([a.name, ...armCell(null), null, null, null, null, null, null, `Not fitted: ${a.note ?? ''}`]);
      continue;
    }
    const fit = a.fit;
    for (const m of compared(fit, mode)) {
      rows.push([a.name, ...armCell(m.arm), fit.nSubjects, fit.nObservations, cell(m.r.estimate), cell(m.r.lower), cell(m.r.upper), cell(fit.variance.icc), null]);
    }
  }
  return [
    {
      kind: 'table',
      id: 'VisitTimingEffect',
      caption: 'What the visit timing changes: the main fit beside two refits',
      columns: [
        col('Analysis', 'text', 34),
        ...(withArms ? [col('Arm', 'text', 16)] : []),
        col('Participants', 'integer'),
        col('Measurements', 'integer'),
        col(label, 'significant'),
        col(`Lower ${pct} limit`, 'significant'),
        col(`Upper ${pct} limit`, 'significant'),
        col('Intraclass correlation', 'significant'),
        col('Note', 'text', 40),
      ],
      rows,
    },
    ...sensitivitySentences(main, runs, mode, unit).map((s) => para(s)),
  ];
}
