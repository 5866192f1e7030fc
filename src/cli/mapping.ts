import type { ColumnMapping, Role } from '../core/intake/types';
import { UsageError } from './args';

type SingleRole = Exclude<Role, 'covariate'>;

/** Role words accepted by --map, compared ignoring case, spaces, hyphens and underscores. */
const ROLE_WORDS: Readonly<Record<string, SingleRole>> = {
  participant: 'subject',
  subject: 'subject',
  date: 'date',
  visitdate: 'date',
  studyday: 'studyDay',
  day: 'studyDay',
  reference: 'reference',
  referencedate: 'reference',
  visit: 'visit',
  visitname: 'visit',
  value: 'value',
  arm: 'arm',
  site: 'site',
  exit: 'exit',
  exitdate: 'exit',
  exitstatus: 'exitStatus',
  exitreason: 'exitReason',
};

const key = (s: string): string => s.replace(/[\s_-]+/g, '').toLowerCase();

/** The column index of a header, matched exactly after trimming, else ignoring case. */
function headerIndex(headers: readonly string[], wanted: string, flag: string): number {
  const exact = headers.findIndex((h) => h.trim() === wanted.trim());
  if (exact >= 0) return exact;
  const loose = headers.findIndex((h) => h.trim().toLowerCase() === wanted.trim().toLowerCase());
  if (loose >= 0) return loose;
  throw new UsageError(`${flag}: the data have no column headed "${wanted}". Headers: ${headers.map((h) => `"${h}"`).join(', ')}.`);
}

/**
 * The mapping to analyse with: the detected one, with each --map role=Header and --covariate Header laid over it.
 * A role mapped to "none" is removed (e.g. --map reference=none to use each participant's baseline date instead).
 */
export function buildMapping(
  detected: ColumnMapping,
  headers: readonly string[],
  map: readonly (readonly [string, string])[],
  covariates: readonly string[],
): ColumnMapping {
  const m: Partial<Record<SingleRole, number>> = {};
  for (const role of Object.values(ROLE_WORDS)) {
    const c = detected[role];
    if (c !== undefined) m[role] = c;
  }
  for (const [word, header] of map) {
    const role = ROLE_WORDS[key(word)];
    if (role === undefined) {
      throw new UsageError(`--map ${word}=${header}: unknown role "${word}"; roles are participant, date, studyDay, reference, visit, value, arm, site, exit, exitStatus, exitReason.`);
    }
    if (header.toLowerCase() === 'none') delete m[role];
    else m[role] = headerIndex(headers, header, `--map ${word}=${header}`);
  }
  // A column given a role explicitly leaves any other role it was detected for.
  for (const [word] of map) {
    const role = ROLE_WORDS[key(word)]!;
    const col = m[role];
    if (col === undefined) continue;
    for (const other of Object.keys(m) as SingleRole[]) {
      if (other !== role && m[other] === col && !map.some(([w]) => ROLE_WORDS[key(w)] === other)) delete m[other];
    }
  }
  const cov = covariates.length > 0 ? covariates.map((h) => headerIndex(headers, h, `--covariate ${h}`)) : [...detected.covariates];
  return { ...m, covariates: cov };
}
