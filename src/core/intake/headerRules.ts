/**
 * What one header can mean: scored role candidates from the open CDISC SDTM/ADaM variable names (CDISC SDTM
 * Implementation Guide and ADaM Implementation Guide) and from plain header words. Scores only rank candidates
 * against each other: an exact CDISC name beats a plain word, the stronger CDISC name beats the weaker one
 * (USUBJID over SUBJID, visit labels over visit numbers).
 */
import type { Role } from './types';

export type MappableRole = Exclude<Role, 'covariate'>;

export interface Candidate {
  readonly role: MappableRole;
  readonly score: number;
  readonly reason: string;
}

/** How a header was recognised when it has no role of its own. */
export interface HeaderNote {
  readonly kind: 'change' | 'baseline-value' | 'baseline-flag';
  readonly text: string;
}

/** Lower-case letters and digits only: "Visit_Date " and "visit date" both give "visitdate". */
export function compactHeader(header: string): string {
  return header.toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** Lower-case words, split at spaces, punctuation and lower-to-upper case changes: "VisitDate" gives ["visit", "date"]. */
export function headerWords(header: string): string[] {
  return header
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .toLowerCase()
    .split(/[^a-z0-9]+/)
    .filter((w) => w !== '');
}

const CDISC: Readonly<Record<string, Candidate>> = {
  usubjid: { role: 'subject', score: 100, reason: 'USUBJID is the CDISC unique subject identifier' },
  subjid: { role: 'subject', score: 90, reason: 'SUBJID is the CDISC subject identifier within the study' },
  siteid: { role: 'site', score: 100, reason: 'SITEID is the CDISC study site identifier' },
  trt01p: { role: 'arm', score: 100, reason: 'TRT01P is the CDISC planned treatment for period 01' },
  trt01a: { role: 'arm', score: 96, reason: 'TRT01A is the CDISC actual treatment for period 01' },
  trtp: { role: 'arm', score: 94, reason: 'TRTP is the CDISC planned treatment of the record' },
  trta: { role: 'arm', score: 93, reason: 'TRTA is the CDISC actual treatment of the record' },
  arm: { role: 'arm', score: 92, reason: 'ARM is the CDISC description of the planned arm' },
  avisit: { role: 'visit', score: 100, reason: 'AVISIT is the CDISC analysis visit (its name)' },
  visit: { role: 'visit', score: 96, reason: 'VISIT is the CDISC visit name' },
  avisitn: { role: 'visit', score: 80, reason: 'AVISITN is the CDISC analysis visit number (no visit-name column was found)' },
  visitnum: { role: 'visit', score: 78, reason: 'VISITNUM is the CDISC visit number (no visit-name column was found)' },
  adt: { role: 'date', score: 100, reason: 'ADT is the CDISC analysis date' },
  ady: { role: 'studyDay', score: 100, reason: 'ADY is the CDISC analysis relative day' },
  randdt: { role: 'reference', score: 100, reason: 'RANDDT is the CDISC date of randomization' },
  trtsdt: { role: 'reference', score: 96, reason: 'TRTSDT is the CDISC date of first exposure to treatment' },
  rfstdtc: { role: 'reference', score: 92, reason: 'RFSTDTC is the CDISC subject reference start date' },
  aval: { role: 'value', score: 100, reason: 'AVAL is the CDISC analysis value' },
  eosdt: { role: 'exit', score: 100, reason: 'EOSDT is the CDISC ADaM end of study date' },
  eosstt: { role: 'exitStatus', score: 100, reason: 'EOSSTT is the CDISC ADaM end of study status' },
  dcsreas: { role: 'exitReason', score: 100, reason: 'DCSREAS is the CDISC ADaM reason for discontinuation from study' },
};

/** CDISC names recognised but never mapped to a role. */
const NOTED: Readonly<Record<string, HeaderNote>> = {
  chg: { kind: 'change', text: 'CHG is the CDISC change from baseline; it is never used as the value' },
  base: { kind: 'baseline-value', text: 'BASE is the CDISC baseline value; it can be chosen as a covariate, but is not added' },
  ablfl: { kind: 'baseline-flag', text: 'ABLFL is the CDISC baseline record flag; it is not read' },
};

/** Domain-prefixed CDISC names: xxDTC (date of collection), xxDY (study day), xxSTRESN (numeric standard result). */
function prefixed(c: string, header: string): Candidate | null {
  if (/^[a-z]{2}dtc$/.test(c)) return { role: 'date', score: 90, reason: `${header} is a CDISC --DTC date of collection` };
  if (/^[a-z]{2}dy$/.test(c)) return { role: 'studyDay', score: 90, reason: `${header} is a CDISC --DY study day` };
  if (/^[a-z]{2}stresn$/.test(c)) return { role: 'value', score: 90, reason: `${header} is a CDISC --STRESN numeric result in standard units` };
  return null;
}

const has = (words: readonly string[], ...any: string[]): string | undefined => words.find((w) => any.includes(w));

/** Plain words: the first matching rule gives the candidate; its reason quotes the word that decided it. */
function plain(words: readonly string[], header: string): Candidate | null {
  const q = `"${header}"`;
  const date = has(words, 'date', 'datetime', 'dt');
  const isRand = words.some((w) => w.startsWith('random') || w === 'rand');
  const dosing = has(words, 'dose', 'dosing', 'treatment', 'exposure') !== undefined;
  const isFirstDose = dosing && has(words, 'first', 'start') !== undefined;
  const leaving = dosing ? undefined : has(words, 'exit', 'withdrawal', 'withdrawn', 'discontinuation', 'discontinued', 'dropout', 'termination', 'eos') ??
    (has(words, 'end') !== undefined && has(words, 'study') !== undefined ? 'end of study' : undefined);
  if (leaving !== undefined && date === undefined && has(words, 'reason') !== undefined) {
    return { role: 'exitReason', score: 75, reason: `${q} names the reason for leaving the study` };
  }
  if (leaving !== undefined && date === undefined && has(words, 'status') !== undefined) {
    return { role: 'exitStatus', score: 75, reason: `${q} names the end-of-study status` };
  }
  if (date !== undefined) {
    if (has(words, 'birth', 'dob', 'death', 'consent') !== undefined) return null;
    if (leaving !== undefined) return { role: 'exit', score: 80, reason: `${q} names the date the participant left the study ("${leaving}")` };
    if (isRand) return { role: 'reference', score: 80, reason: `${q} names the randomisation date` };
    if (isFirstDose) return { role: 'reference', score: 78, reason: `${q} names the first-dose date` };
    if (has(words, 'reference', 'ref') !== undefined) return { role: 'reference', score: 76, reason: `${q} names a reference date` };
    const visitish = has(words, 'visit', 'assessment', 'collection', 'sample', 'measurement', 'exam') !== undefined;
    return { role: 'date', score: visitish ? 75 : 70, reason: `${q} contains the word "${date}"` };
  }
  if (has(words, 'day') !== undefined) {
    return { role: 'studyDay', score: has(words, 'study') !== undefined ? 80 : 70, reason: `${q} contains the word "day"` };
  }
  // "Days since randomisation" counts days but may have a day 0, unlike a study day: the user maps it.
  if (has(words, 'days') !== undefined) return null;
  const armWord = has(words, 'arm', 'treatment', 'group', 'trt', 'cohort');
  if (isRand && armWord === undefined) return { role: 'reference', score: 60, reason: `${q} names the randomisation (read as its date)` };
  const subject = has(words, 'subject', 'patient', 'participant', 'usubjid', 'subjid');
  if (subject !== undefined) return { role: 'subject', score: 75, reason: `${q} contains the word "${subject}"` };
  if (words.length === 1 && has(words, 'id', 'ptid', 'pid') !== undefined) {
    return { role: 'subject', score: 60, reason: `${q} is an identifier column` };
  }
  const site = has(words, 'site', 'centre', 'center', 'siteid');
  if (site !== undefined) return { role: 'site', score: 75, reason: `${q} contains the word "${site}"` };
  if (armWord !== undefined) return { role: 'arm', score: 75, reason: `${q} contains the word "${armWord}"` };
  const visit = has(words, 'visit', 'timepoint');
  if (visit !== undefined) {
    const numbered = has(words, 'number', 'num', 'no', 'nr', 'n') !== undefined;
    return numbered
      ? { role: 'visit', score: 55, reason: `${q} is a visit number (no visit-name column was found)` }
      : { role: 'visit', score: 75, reason: `${q} contains the word "${visit}"` };
  }
  if (has(words, 'baseline', 'base', 'change', 'chg', 'flag', 'unit', 'units', 'normal', 'range', 'limit') !== undefined) return null;
  const value = has(words, 'value', 'result', 'outcome', 'measurement', 'response', 'score');
  if (value !== undefined) return { role: 'value', score: 70, reason: `${q} contains the word "${value}"` };
  return null;
}

/**
 * The role candidate of one header (or null), and a note when it is a recognised column that is never mapped.
 * @example headerCandidate("USUBJID").candidate // { role: 'subject', score: 100, reason: 'USUBJID is ...' }
 * @example headerCandidate("Visit date").candidate?.role // "date"
 */
export function headerCandidate(header: string): { candidate: Candidate | null; note: HeaderNote | null } {
  const c = compactHeader(header);
  const noted = NOTED[c];
  if (noted !== undefined) return { candidate: null, note: noted };
  const cdisc = CDISC[c] ?? prefixed(c, header.trim());
  if (cdisc !== null) return { candidate: cdisc, note: null };
  const words = headerWords(header);
  const candidate = plain(words, header.trim());
  const baseline = candidate === null && has(words, 'baseline') !== undefined && has(words, 'date', 'flag', 'day') === undefined;
  return {
    candidate,
    note: baseline ? { kind: 'baseline-value', text: `"${header.trim()}" looks like a baseline value; it can be chosen as a covariate, but is not added` } : null,
  };
}
