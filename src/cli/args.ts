/** Command-line argument parsing for `longipane analyze` (no library: a dozen flags do not need one). */
import { resolve } from 'node:path';
import type { DateOrder } from '../core/intake/types';
import type { DfMethod, FitMethod, ModelKind, TimeUnit } from '../core/pipeline/types';

/** Misuse of the command line: the message says what was wrong; main prints it and exits with code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}

export interface AnalyzeArgs {
  readonly data: string;
  readonly schedule: string;
  readonly sheet?: string;
  readonly cutoff?: string;
  /** Data cut-off as a study day, for study-day data (no calendar dates). */
  readonly cutoffDay?: number;
  readonly out?: string;
  readonly json?: string;
  /** role → header text, in the order given. */
  readonly map: readonly (readonly [string, string])[];
  readonly unblinded: boolean;
  readonly referenceArm?: string;
  readonly timeUnit: TimeUnit;
  readonly df: DfMethod;
  readonly method: FitMethod;
  /** The main model (--model; default 'intercept'). */
  readonly model: ModelKind;
  readonly level: number;
  readonly covariates: readonly string[];
  readonly scheduledOnly: boolean;
  readonly perSubject: boolean;
  /** How dates with numeric day and month are read; absent: each date column decides from its values. */
  readonly dateOrder?: DateOrder;
  /** The results JSON indented for reading (default: compact, one line). */
  readonly pretty: boolean;
  /** The yes/no answer of --model logistic from the value: yes below or above a threshold. */
  readonly responder?: { readonly below?: number; readonly above?: number };
}

const VALUE_FLAGS = ['data', 'schedule', 'sheet', 'cutoff', 'cutoff-day', 'out', 'json', 'map', 'reference-arm', 'time-unit', 'df', 'method', 'model', 'level', 'covariate', 'date-order', 'responder-below', 'responder-above'] as const;
/** `--per-subject` is the older spelling of `--per-participant`, still accepted. */
const BOOLEAN_FLAGS = ['unblinded', 'scheduled-only', 'per-participant', 'per-subject', 'pretty'] as const;
type ValueFlag = (typeof VALUE_FLAGS)[number];
type BooleanFlag = (typeof BOOLEAN_FLAGS)[number];

function oneOf<T extends string>(flag: string, value: string, allowed: readonly T[]): T {
  if ((allowed as readonly string[]).includes(value)) return value as T;
  throw new UsageError(`--${flag} must be one of ${allowed.join(', ')}; got "${value}".`);
}

/** The models --model can name (every ModelKind). */
export const AVAILABLE_MODELS = ['intercept', 'slope', 'repeated', 'gee', 'logistic'] as const;

function modelKind(value: string): (typeof AVAILABLE_MODELS)[number] {
  if ((AVAILABLE_MODELS as readonly string[]).includes(value)) return value as (typeof AVAILABLE_MODELS)[number];
  throw new UsageError(`--model must be one of the available models: ${AVAILABLE_MODELS.join(', ')} (random intercept; random intercept and slope; visit by visit; GEE; yes/no answer); got "${value}".`);
}

/** True when text is a real calendar date written YYYY-MM-DD (ISO 8601 calendar date, extended format). */
export function isIsoDate(text: string): boolean {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const t = new Date(Date.UTC(y, mo - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === mo - 1 && t.getUTCDate() === d;
}

/** Output files must be new names: never an input (the source is never modified) and not each other; --out must be
 * an .xlsx file, since that is what is written there. */
function checkOutputs(inputs: readonly [string, string][], outputs: readonly [string, string | undefined][]): void {
  const seen = new Map<string, string>(inputs.map(([flag, path]) => [resolve(path), flag]));
  for (const [flag, path] of outputs) {
    if (path === undefined) continue;
    if (flag === 'out' && !/\.xlsx$/i.test(path)) throw new UsageError(`--out must name an .xlsx file (the report is a workbook); got "${path}".`);
    const clash = seen.get(resolve(path));
    if (clash !== undefined) throw new UsageError(`--${flag} "${path}" is the same file as --${clash}; give the output a new name.`);
    seen.set(resolve(path), flag);
  }
}

/**
 * Parses the arguments after `analyze`. Flags take their value as the next argument or after "=" (`--level=0.9`);
 * --map and --covariate may repeat.
 * Example: parseAnalyzeArgs(['--data','v.csv','--schedule','s.csv']) → { data: 'v.csv', schedule: 's.csv', mode defaults … }
 * @throws UsageError for an unknown flag, a missing value, a missing --data/--schedule or a value out of range.
 */
export function parseAnalyzeArgs(argv: readonly string[]): AnalyzeArgs {
  const values = new Map<ValueFlag, string[]>();
  const flags = new Set<BooleanFlag>();
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (!arg.startsWith('--')) throw new UsageError(`Unexpected argument "${arg}" (flags start with --).`);
    const eq = arg.indexOf('=');
    const name = eq >= 0 ? arg.slice(2, eq) : arg.slice(2);
    if ((BOOLEAN_FLAGS as readonly string[]).includes(name)) {
      if (eq >= 0) throw new UsageError(`--${name} takes no value.`);
      flags.add(name as BooleanFlag);
      continue;
    }
    if (!(VALUE_FLAGS as readonly string[]).includes(name)) throw new UsageError(`Unknown flag "--${name}".`);
    let value: string | undefined;
    if (eq >= 0) value = arg.slice(eq + 1);
    else {
      value = argv[i + 1];
      if (value === undefined || value.startsWith('--')) throw new UsageError(`--${name} needs a value.`);
      i++;
    }
    if (value.trim() === '') throw new UsageError(`--${name} needs a value; it was given an empty one.`);
    const list = values.get(name as ValueFlag) ?? [];
    if (list.length > 0 && name !== 'map' && name !== 'covariate') throw new UsageError(`--${name} is given twice.`);
    list.push(value);
    values.set(name as ValueFlag, list);
  }
  const one = (f: ValueFlag): string | undefined => values.get(f)?.[0];
  const data = one('data');
  const schedule = one('schedule');
  if (data === undefined) throw new UsageError('--data FILE is required (a .csv or .xlsx file of visits).');
  if (schedule === undefined) throw new UsageError('--schedule FILE is required (a CSV with header visit,target_day,days_before,days_after).');
  checkOutputs([['data', data], ['schedule', schedule]], [['out', one('out')], ['json', one('json')]]);
  const cutoff = one('cutoff');
  if (cutoff !== undefined && !isIsoDate(cutoff)) throw new UsageError(`--cutoff must be a real date written YYYY-MM-DD; got "${cutoff}".`);
  const cutoffDayText = one('cutoff-day');
  const cutoffDay = cutoffDayText === undefined ? undefined : Number(cutoffDayText);
  if (cutoffDay !== undefined && (!/^\s*[+-]?\d+\s*$/.test(cutoffDayText!) || cutoffDay === 0 || Math.abs(cutoffDay) > 36_500)) {
    throw new UsageError(`--cutoff-day must be a whole study day such as 365 (study days skip 0); got "${cutoffDayText}".`);
  }
  if (cutoff !== undefined && cutoffDay !== undefined) throw new UsageError('Give either --cutoff (a date, for dated data) or --cutoff-day (a study day, for study-day data), not both.');
  const levelText = one('level') ?? '0.95';
  const level = Number(levelText);
  if (!(level > 0 && level < 1)) throw new UsageError(`--level must be a number between 0 and 1, such as 0.95; got "${levelText}".`);
  const map = (values.get('map') ?? []).map((m): readonly [string, string] => {
    const at = m.indexOf('=');
    if (at <= 0 || at === m.length - 1) throw new UsageError(`--map takes role=Header, such as value=AVAL; got "${m}".`);
    return [m.slice(0, at).trim(), m.slice(at + 1).trim()];
  });
  const referenceArm = one('reference-arm');
  const unblinded = flags.has('unblinded');
  if (referenceArm !== undefined && !unblinded) throw new UsageError('--reference-arm only applies with --unblinded.');
  const optional = {
    ...(one('sheet') === undefined ? {} : { sheet: one('sheet')! }),
    ...(cutoff === undefined ? {} : { cutoff }),
    ...(cutoffDay === undefined ? {} : { cutoffDay }),
    ...(one('out') === undefined ? {} : { out: one('out')! }),
    ...(one('json') === undefined ? {} : { json: one('json')! }),
    ...(referenceArm === undefined ? {} : { referenceArm }),
    ...(one('date-order') === undefined ? {} : { dateOrder: oneOf('date-order', one('date-order')!, ['dmy', 'mdy'] as const) }),
  };
  const method = oneOf('method', one('method') ?? 'reml', ['reml', 'ml'] as const);
  const model = modelKind(one('model') ?? 'intercept');
  const threshold = (flag: 'responder-below' | 'responder-above'): number | undefined => {
    const text = one(flag);
    if (text === undefined) return undefined;
    const x = Number(text);
    if (!Number.isFinite(x)) throw new UsageError(`--${flag} must be a number, such as 45; got "${text}".`);
    return x;
  };
  const below = threshold('responder-below');
  const above = threshold('responder-above');
  if (below !== undefined && above !== undefined) throw new UsageError('Give either --responder-below or --responder-above, not both.');
  if ((below !== undefined || above !== undefined) && model !== 'logistic') throw new UsageError('--responder-below and --responder-above only apply with --model logistic.');
  const chosen = {
    ...(below !== undefined ? { responder: { below } } : above !== undefined ? { responder: { above } } : {}),
  };
  return {
    data,
    schedule,
    ...optional,
    ...chosen,
    map,
    unblinded,
    timeUnit: oneOf('time-unit', one('time-unit') ?? 'month', ['month', 'week', 'day'] as const),
    // The default df follows the method: Kenward–Roger is defined for REML, so a maximum-likelihood fit defaults to
    // Satterthwaite (Kenward–Roger after ML is allowed, with a note in the report).
    df: oneOf('df', one('df') ?? (method === 'ml' ? 'satterthwaite' : 'kenward-roger'), ['kenward-roger', 'satterthwaite', 'residual', 'containment'] as const),
    method,
    model,
    level,
    covariates: values.get('covariate') ?? [],
    scheduledOnly: flags.has('scheduled-only'),
    perSubject: flags.has('per-participant') || flags.has('per-subject'),
    pretty: flags.has('pretty'),
  };
}

export const HELP_TEXT = `longipane — visit-window checks and a random-intercept mixed model for repeated-measures trial data

Usage:
  longipane analyze --data FILE --schedule FILE [options]
  longipane help

Input:
  --data FILE             visits, one row per assessment: a .csv file or an .xlsx workbook
  --sheet NAME            which worksheet of an .xlsx file (default: the first)
  --schedule FILE         CSV with header visit,target_day,days_before,days_after (visit name, target
                          day, days allowed before, days allowed after)
  --map role=Header       confirm a column's role (repeatable); roles: participant (also written
                          subject), date (visit date), studyDay, reference (reference date:
                          randomisation or first dose), visit (visit name), value, arm, site, exit
                          (exit date: the date the participant left the study), exitStatus,
                          exitReason, responder (a 0/1 yes/no column for --model logistic).
                          Columns not given are detected from headers (CDISC names such
                          as USUBJID, ADT, AVAL, EOSDT need no --map).
  --covariate Header      add a model covariate column (repeatable)
  --cutoff YYYY-MM-DD     cut-off date of the data (default: the latest date in the data)
  --cutoff-day N          cut-off as a study day, for data with study days and no dates
                          (default: each participant's own last record)
  --date-order dmy|mdy    read dates like 03/04/2025 as day/month/year (dmy) or month/day/year (mdy)
                          in every date column (default: each column decides from values that can be
                          read only one way, such as 13/04/2025; if none can, the run stops and asks)
Dates may be ISO 8601 (2025-01-12, 2025-01-12T08:30), day-month-name-year (12JAN2025, 12-Jan-2025),
day and month as numbers with /, . or - (12/01/2025), or spreadsheet date cells. Partial dates
(2025-01, JAN2025) and two-digit years are never guessed: such rows are left out and listed.

Model:
  --unblinded             read the arm column and report treatment effects (unblinded staff only)
  --reference-arm NAME    the arm others are compared with (default: the first arm seen)
  --time-unit UNIT        month (30.4375 days, default), week or day
  --df METHOD             kenward-roger (default with REML), satterthwaite (default with ML),
                          residual or containment (between/within)
  --method METHOD         reml (default) or ml
  --model KIND            intercept (random intercept, default); slope (random intercept and
                          slope: participants may also differ in their rate of change; both are
                          fitted and compared on the model sheet); repeated (adds the visit-by-visit
                          model: visit as a factor, an unstructured covariance across scheduled
                          visits, on the records matched to the schedule); gee (marginal model
                          with one common within-participant correlation and robust standard
                          errors); logistic (random-intercept model for a yes/no answer)
  --responder-below X     with --model logistic: the answer is yes when the value is below X
  --responder-above X     with --model logistic: the answer is yes when the value is above X
  --level P               confidence level (default 0.95)
  --scheduled-only        fit only records matched to scheduled visits (default: all valid rows)
  --per-participant       add a sheet of each participant's random intercept and mean residual

Output:
  --out FILE.xlsx         write the report workbook
  --json FILE.json        write the machine-readable results (also when the data stop the run:
                          then "ok" is false and "issues" says why); compact, on one line
  --pretty                indent the JSON results for reading (larger file)
Files are written under a temporary name and renamed when complete; an existing file is only replaced by a
finished one. Exit codes: 0 done, 1 the data could not be analysed, 2 wrong command line or unreadable file.
`;
