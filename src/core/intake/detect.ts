/**
 * Proposes a column mapping from header text, for the user to confirm (SPEC §3).
 */
import { headerCandidate, type Candidate, type MappableRole } from './headerRules';
import { roleWords } from './messages';
import type { ColumnMapping, DetectedMapping, Mode } from './types';
import { duplicateHeaderGroups } from './duplicateHeaders';

interface Scored extends Candidate {
  readonly col: number;
}

/**
 * Proposes which column plays which role, from plain header words (subject, patient, visit, date, day, result, arm,
 * treatment, site, randomisation date, ...) and the open CDISC SDTM/ADaM names (USUBJID, AVISIT, ADT, AVAL, ...).
 * Matching ignores case, spaces and underscores. Each role takes the column with the strongest candidate and each
 * column plays one role at most: USUBJID wins over SUBJID, AVISIT over AVISITN. CHG and BASE are never the value;
 * BASE and other baseline-value columns are listed in `covariateSuggestions` but never added as covariates. In
 * blinded mode no arm is proposed (SPEC §2). Every chosen role gets a reason; columns that were recognised but not
 * used get a note. Columns that share one header text (ignoring case) get no role and a note: the user chooses.
 * O(columns · log columns).
 * @example detectMapping(["USUBJID", "ADT", "AVAL"], "blinded").mapping
 * // { subject: 0, date: 1, value: 2, covariates: [] }
 */
export function detectMapping(headers: readonly string[], mode: Mode): DetectedMapping {
  const label = (col: number): string => `Column "${(headers[col] ?? '').trim()}"`;
  const scored: Scored[] = [];
  const notes: string[] = [];
  const covariateSuggestions: number[] = [];
  // Columns sharing one header are never given a role here: the user says which (the pane asks; --map on the command line).
  const shared = new Set<number>();
  for (const group of duplicateHeaderGroups(headers)) {
    for (const c of group) shared.add(c);
    const cols = group.map((c) => `column ${c + 1}`).join(', ');
    notes.push(`${label(group[0]!)} appears ${group.length} times (${cols}); none of them is given a role until you choose which one to use.`);
  }
  headers.forEach((header, col) => {
    if (header.trim() === '' || shared.has(col)) return;
    const { candidate, note } = headerCandidate(header);
    if (note !== null) {
      notes.push(`${label(col)}: ${note.text}.`);
      if (note.kind === 'baseline-value') covariateSuggestions.push(col);
    }
    if (candidate === null) return;
    if (candidate.role === 'arm' && mode === 'blinded') {
      notes.push(`${label(col)} looks like the arm; blinded mode reads no arm column.`);
      return;
    }
    scored.push({ ...candidate, col });
  });
  scored.sort((a, b) => b.score - a.score || a.col - b.col);

  const chosen = new Map<MappableRole, Scored>();
  const usedColumns = new Set<number>();
  for (const s of scored) {
    const winner = chosen.get(s.role);
    if (winner !== undefined) {
      notes.push(
        `${label(s.col)} could be the ${roleWords(s.role)}, but column "${(headers[winner.col] ?? '').trim()}" is the stronger match.`,
      );
      continue;
    }
    if (usedColumns.has(s.col)) continue;
    chosen.set(s.role, s);
    usedColumns.add(s.col);
  }

  const mapping: { -readonly [K in MappableRole]?: number } = {};
  const reasons: { -readonly [K in MappableRole]?: string } = {};
  const order: readonly MappableRole[] = ['subject', 'date', 'studyDay', 'reference', 'visit', 'value', 'arm', 'site', 'exit', 'exitStatus', 'exitReason'];
  for (const role of order) {
    const s = chosen.get(role);
    if (s === undefined) continue;
    mapping[role] = s.col;
    reasons[role] = `${label(s.col)}: ${s.reason}.`;
  }
  const result: ColumnMapping = { ...mapping, covariates: [] };
  return { mapping: result, reasons, covariateSuggestions, notes };
}
