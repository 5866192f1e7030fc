import { columnIndex, columnLetters } from '../core/intake';
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
  responder: 'responder',
};

const key = (s: string): string => s.replace(/[\s_-]+/g, '').toLowerCase();

/**
 * The column index of a header, matched exactly after trimming, else ignoring case; or, when no header reads so,
 * `column D` (a column's letter as the spreadsheet shows it, counted from the sheet's column A). A header that two
 * columns share is a usage error naming both letters, since picking one would be a silent guess.
 */
function headerIndex(headers: readonly string[], wanted: string, flag: string, firstColumn: number): number {
  const letter = (c: number): string => columnLetters(firstColumn + c);
  const all = (same: (h: string) => boolean): number[] => headers.flatMap((h, c) => (same(h) ? [c] : []));
  const exact = all((h) => h.trim() === wanted.trim());
  const found = exact.length > 0 ? exact : all((h) => h.trim().toLowerCase() === wanted.trim().toLowerCase());
  if (found.length > 1) {
    throw new UsageError(
      `${flag}: ${found.length} columns are headed "${wanted}" (${found.map(letter).join(', ')}); say which one with its letter, e.g. ${flag.replace(/=.*$/, '')}="column ${letter(found[found.length - 1]!)}".`,
    );
  }
  if (found.length === 1) return found[0]!;
  const m = /^column\s+([A-Za-z]{1,3})$/i.exec(wanted.trim());
  if (m !== null) {
    const col = columnIndex(m[1]!) - firstColumn;
    if (col >= 0 && col < headers.length) return col;
    throw new UsageError(`${flag}: the data have no column ${m[1]!.toUpperCase()} (they span ${letter(0)} to ${letter(Math.max(0, headers.length - 1))}).`);
  }
  throw new UsageError(`${flag}: the data have no column headed "${wanted}". Headers: ${headers.map((h) => `"${h}"`).join(', ')}.`);
}

/**
 * The mapping to analyse with: the detected one, with each --map role=Header and --covariate Header laid over it.
 * A role mapped to "none" is removed (e.g. --map reference=none to use each participant's baseline date instead).
 * A role given twice (--map value=A --map value=B, or studyDay and day) and a covariate given twice are usage errors:
 * the last would otherwise win silently. `firstColumn` is the 0-based sheet column of the data's first column (for
 * `column D`).
 */
export function buildMapping(
  detected: ColumnMapping,
  headers: readonly string[],
  map: readonly (readonly [string, string])[],
  covariates: readonly string[],
  firstColumn = 0,
): ColumnMapping {
  const m: Partial<Record<SingleRole, number>> = {};
  for (const role of Object.values(ROLE_WORDS)) {
    const c = detected[role];
    if (c !== undefined) m[role] = c;
  }
  const given = new Map<SingleRole, string>();
  for (const [word, header] of map) {
    const role = ROLE_WORDS[key(word)];
    if (role === undefined) {
      throw new UsageError(`--map ${word}=${header}: unknown role "${word}"; roles are participant, date, studyDay, reference, visit, value, arm, site, exit, exitStatus, exitReason.`);
    }
    const before = given.get(role);
    if (before !== undefined) {
      throw new UsageError(`--map gives the role ${role} twice (${before} and ${word}=${header}); give each role once.`);
    }
    given.set(role, `${word}=${header}`);
    if (header.toLowerCase() === 'none') delete m[role];
    else m[role] = headerIndex(headers, header, `--map ${word}=${header}`, firstColumn);
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
  const cov = covariates.length > 0 ? covariates.map((h) => headerIndex(headers, h, `--covariate ${h}`, firstColumn)) : [...detected.covariates];
  const twice = cov.find((c, k) => cov.indexOf(c) !== k);
  if (twice !== undefined) throw new UsageError(`--covariate names column ${columnLetters(firstColumn + twice)} ("${headers[twice] ?? ''}") twice; give each covariate once.`);
  return { ...m, covariates: cov };
}
