/**
 * The run's main result, read from the results JSON `model` section of the model the run reports (runAnalysis picks
 * it: the random-intercept, the random intercept and slope, the visit-by-visit, the marginal (GEE) or the yes/no
 * model), so the summary sheet, the pane's headline and the command line's summary show the chosen model's own
 * numbers, the same numbers the JSON carries, without refitting. Unblinded: each arm against the reference arm at the
 * last scheduled visit (a difference in means, or for the yes/no model an odds ratio); blinded: the model's overall
 * numbers (the intraclass correlation and the trend, or what the model has in their place). Cost O(JSON entries).
 */
import { levelPercent } from './blockParts';
import { formatCell, shownNumber } from './formats';

type Json = Record<string, unknown>;

const obj = (v: unknown): Json | null => (typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Json) : null);
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const str = (v: unknown): string | null => (typeof v === 'string' ? v : null);
const list = (v: unknown): Json[] => (Array.isArray(v) ? v.map(obj).filter((x): x is Json => x !== null) : []);

/** The model kinds of the JSON `model.kind` (README "Results JSON"); a section without `kind` is the random-intercept model. */
export type MainModelKind = 'intercept' | 'slope' | 'repeated' | 'gee' | 'logistic';

/** Each model's name in a sentence ("… in the random-intercept model"). */
export const MODEL_NAMES: Readonly<Record<MainModelKind, string>> = {
  intercept: 'the random-intercept model',
  slope: 'the random intercept and slope model',
  repeated: 'the visit-by-visit model',
  gee: 'the marginal model (GEE, robust standard errors)',
  logistic: 'the yes/no model',
};

/** One arm against the reference arm at one visit. */
export interface ArmResult {
  readonly arm: string;
  readonly reference: string;
  readonly visit: string;
  readonly estimate: number;
  readonly lower: number | null;
  readonly upper: number | null;
  readonly p: number | null;
}

/** One overall number (blinded). */
export interface OverallResult {
  /** The table's words for it, e.g. "Intraclass correlation (share of the variation between participants)". */
  readonly measure: string;
  readonly estimate: number;
  readonly lower: number | null;
  readonly upper: number | null;
}

export interface MainResult {
  readonly kind: MainModelKind;
  /** "from the random intercept and slope model": which model the numbers come from. */
  readonly source: string;
  readonly level: number | null;
  /** 'difference': a difference in means; 'oddsRatio': the odds of a yes answer, one arm over the reference arm. */
  readonly scale: 'difference' | 'oddsRatio';
  /** How "yes" was defined (the yes/no model), else null. */
  readonly outcome: string | null;
  /** Unblinded: each arm at the last scheduled visit (empty when blinded or with one arm). */
  readonly arms: readonly ArmResult[];
  /** Blinded (or one arm): the model's overall numbers. */
  readonly overall: readonly OverallResult[];
  /** Why there are no numbers (a fit that did not converge or was not made), else null. */
  readonly problem: string | null;
}

const kindOf = (model: Json): MainModelKind => {
  const k = str(model.kind);
  return k === 'slope' || k === 'repeated' || k === 'gee' || k === 'logistic' ? k : 'intercept';
};

/** The entries of the latest day (the last scheduled visit; the visit-by-visit model marks it `last`). */
function lastVisit(effects: readonly Json[]): Json[] {
  if (effects.some((e) => e.last === true)) return effects.filter((e) => e.last === true);
  const days = effects.map((e) => num(e.day)).filter((d): d is number => d !== null);
  if (days.length === 0) return effects.length === 0 ? [] : [effects[effects.length - 1]!];
  const lastDay = Math.max(...days);
  return effects.filter((e) => num(e.day) === lastDay);
}

/**
 * The main result of a JSON `model` section, or null when there is none (`model` null). Example, the invented demo
 * unblinded with the yes/no model: { kind: 'logistic', scale: 'oddsRatio', arms: [{ arm: 'Active', reference:
 * 'Placebo', visit: 'Week 48', estimate: 0.26, … }], … }.
 */
export function mainResult(model: Json | null): MainResult | null {
  if (model === null) return null;
  const kind = kindOf(model);
  const level = num(model.level);
  const base = { kind, source: `from ${MODEL_NAMES[kind]}`, level, scale: kind === 'logistic' ? ('oddsRatio' as const) : ('difference' as const), outcome: str(model.outcome) };
  const none = (problem: string): MainResult => ({ ...base, arms: [], overall: [], problem });
  if (model.fitted === false) return none(`${capital(MODEL_NAMES[kind])} was not fitted: ${(str(model.note) ?? 'see its sheet').replace(/\.+$/, '')}.`);
  if (model.converged === false || model.status === 'failed') {
    return none(`${capital(MODEL_NAMES[kind])} did not converge: ${(str(model.message) ?? 'see its sheet').replace(/\.+$/, '')}.`);
  }
  const armNames = Array.isArray(model.arms) ? model.arms.filter((a): a is string => typeof a === 'string') : [];
  const reference = armNames[0] ?? 'the reference arm';
  const odds = kind === 'logistic';
  const pick = (e: Json, field: 'estimate' | 'lower' | 'upper'): number | null =>
    num(e[odds ? ({ estimate: 'oddsRatio', lower: 'oddsRatioLower', upper: 'oddsRatioUpper' } as const)[field] : field]);
  let armRows: ArmResult[] = lastVisit(list(model.treatmentEffects)).flatMap((e) => {
    const estimate = pick(e, 'estimate');
    const arm = str(e.arm);
    if (estimate === null || arm === null) return [];
    const day = num(e.day);
    return [{ arm, reference, visit: str(e.label) ?? (day === null ? '' : `study day ${day}`), estimate, lower: pick(e, 'lower'), upper: pick(e, 'upper'), p: num(e.p) }];
  });
  const fixed = list(model.fixedEffects);
  if (armRows.length === 0 && odds) {
    // No odds ratio at the visits (no schedule contrast): the arm term itself, the odds ratio at study day 1.
    armRows = fixed.filter((e) => e.kind === 'arm').flatMap((e) => {
      const estimate = pick(e, 'estimate');
      const arm = str(e.arm);
      return estimate === null || arm === null ? [] : [{ arm, reference, visit: 'study day 1', estimate, lower: pick(e, 'lower'), upper: pick(e, 'upper'), p: num(e.p) }];
    });
  }
  if (armRows.length > 0) return { ...base, arms: armRows, overall: [], problem: null };
  return { ...base, arms: [], overall: overallOf(kind, model, fixed), problem: null };
}

const capital = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);

function overallOf(kind: MainModelKind, model: Json, fixed: readonly Json[]): OverallResult[] {
  const unit = str(model.timeUnit) ?? 'time unit';
  const out: OverallResult[] = [];
  const add = (measure: string, e: Json | null | undefined, fields: readonly [string, string, string] = ['estimate', 'lower', 'upper']): void => {
    const estimate = e === null || e === undefined ? null : num(e[fields[0]]);
    if (estimate === null) return;
    out.push({ measure, estimate, lower: num(e![fields[1]]), upper: num(e![fields[2]]) });
  };
  const time = fixed.find((e) => e.kind === 'time');
  if (kind === 'intercept' || kind === 'slope') {
    const at = kind === 'slope' ? ' at study day 1' : '';
    add(`Intraclass correlation${at} (share of the variation between participants)`, obj(model.variance), ['icc', 'iccLower', 'iccUpper']);
    add(`Overall change in the value per ${unit}`, time);
  } else if (kind === 'repeated') {
    const visits = Array.isArray(model.visits) ? model.visits.filter((v): v is string => typeof v === 'string') : [];
    const last = visits[visits.length - 1];
    if (last !== undefined) add(`Mean value at ${last}, the last scheduled visit`, list(model.means).find((m) => m.label === last && (m.arm ?? null) === null));
  } else if (kind === 'gee') {
    add(`Overall change in the value per ${unit}`, time);
    const rho = num(obj(model.workingCorrelation)?.correlation);
    if (rho !== null) out.push({ measure: 'Correlation between two values of a participant', estimate: rho, lower: null, upper: null });
  } else {
    add(`Odds ratio of a yes answer per ${unit}`, time, ['oddsRatio', 'oddsRatioLower', 'oddsRatioUpper']);
  }
  return out;
}

const pWords = (p: number | null): string => (p === null ? '' : p < 0.0001 ? 'p < 0.0001' : `p = ${formatCell(p, 'pvalue')}`);

/**
 * The main result in sentences. `short`: the pane's form ("95% CI"), else the sheets' ("95% confidence interval").
 * Example (short): "At Week 48, Active differed from Placebo by 4.051 (95% CI 0.7623 to 7.330; p = 0.0159) in the
 * random-intercept model."
 */
export function mainSentences(r: MainResult, short: boolean): string[] {
  if (r.problem !== null) return [r.problem];
  const pct = r.level === null ? '' : `${levelPercent(r.level)} `;
  const ci = (lo: number | null, hi: number | null): string => (lo === null || hi === null ? '' : `${pct}${short ? 'CI' : 'confidence interval'} ${shownNumber(lo)} to ${shownNumber(hi)}`);
  const inside = (...parts: string[]): string => {
    const kept = parts.filter((s) => s !== '');
    return kept.length === 0 ? '' : ` (${kept.join('; ')})`;
  };
  const model = MODEL_NAMES[r.kind];
  const lines: string[] = [];
  for (const a of r.arms) {
    const last = a.visit === 'study day 1' ? 'at the start' : short ? '' : ', the last scheduled visit';
    if (r.scale === 'oddsRatio') {
      const yes = r.outcome === null ? 'a yes answer' : `a yes answer (${r.outcome})`;
      lines.push(`At ${a.visit}${last === 'at the start' ? ' (the start)' : last}, the odds of ${yes} in ${a.arm} were ${shownNumber(a.estimate)} times those in ${a.reference}${inside(ci(a.lower, a.upper), pWords(a.p))} in ${model}.`);
    } else {
      lines.push(`At ${a.visit}${last}, ${short ? '' : 'the mean value of '}${a.arm} differed from ${a.reference} by ${shownNumber(a.estimate)}${inside(ci(a.lower, a.upper), pWords(a.p))} in ${model}.`);
    }
  }
  r.overall.forEach((o, i) => {
    // "Intraclass correlation is 0.9045 (95% CI …) in the random-intercept model: the share …"; the model named once.
    const what = o.measure.replace(/ \(share of the variation between participants\)$/, '');
    const why = what === o.measure ? '' : ': the share of the variation that lies between participants';
    lines.push(`${what}${what.includes(',') ? ',' : ''} is ${shownNumber(o.estimate)}${inside(ci(o.lower, o.upper))}${i === 0 ? ` in ${model}` : ''}${why}.`);
  });
  if (lines.length === 0) lines.push(`${capital(model)} gives no headline number here; see its sheet.`);
  return lines;
}
