/**
 * Checks a column mapping against the range before any row is read: every mapped column exists, no column plays two
 * roles, and the columns each mode needs are there (SPEC §3). Problems are added to the issue list.
 */
import { columnLetters, MAX_COLUMN_INDEX } from './cellAddress';
import type { IssueList } from './issueList';
import { roleWords } from './messages';
import type { ColumnMapping, Mode, Role } from './types';

/** The single-column roles in a fixed order (the order issues are reported in). */
export const SINGLE_ROLES = ['subject', 'date', 'studyDay', 'reference', 'visit', 'value', 'arm', 'site', 'exit', 'exitStatus', 'exitReason', 'responder'] as const;
export type SingleRole = (typeof SINGLE_ROLES)[number];

/** The mapping that is actually read: in blinded mode the arm column is dropped, whatever was mapped (SPEC §2). */
export function effectiveMapping(mapping: ColumnMapping, mode: Mode): ColumnMapping {
  if (mode === 'unblinded' || mapping.arm === undefined) return mapping;
  const { arm: _arm, ...rest } = mapping;
  return rest;
}

/**
 * Adds the mapping's problems to `issues`: 'column-outside-range', 'duplicate-role' (errors at the header cell),
 * 'no-subject-column', 'no-time-column', 'no-arm-column' (errors) and 'no-value-column' (a warning: the visit-timing
 * checks run without a value; every row is left out of the model). `mapping` is the effective mapping. O(columns).
 */
export function checkMapping(mapping: ColumnMapping, headers: readonly string[], mode: Mode, issues: IssueList): void {
  const width = headers.length;
  const rolesByColumn = new Map<number, Role[]>();
  const note = (col: number | undefined, role: Role): void => {
    if (col === undefined) return;
    if (!Number.isInteger(col) || col < 0 || col >= width) {
      const label = Number.isInteger(col) && col >= 0 && col <= MAX_COLUMN_INDEX ? columnLetters(col) : String(col);
      issues.range('column-outside-range', 'error', role, label, null);
      return;
    }
    const list = rolesByColumn.get(col);
    if (list === undefined) rolesByColumn.set(col, [role]);
    else list.push(role);
  };
  for (const role of SINGLE_ROLES) note(mapping[role], role);
  for (const col of mapping.covariates) note(col, 'covariate');

  const columns = [...rolesByColumn.keys()].sort((a, b) => a - b);
  for (const col of columns) {
    const roles = rolesByColumn.get(col)!;
    if (roles.length < 2) continue;
    const name = headers[col] !== '' ? headers[col]! : columnLetters(col);
    issues.header('duplicate-role', 'error', col, roles[0]!, name, roles.map(roleWords).join(', '));
  }

  if (mapping.subject === undefined) issues.range('no-subject-column', 'error', 'subject', '', null);
  if (mapping.date === undefined && mapping.studyDay === undefined) issues.range('no-time-column', 'error', 'date', '', null);
  if (mode === 'unblinded' && mapping.arm === undefined) issues.range('no-arm-column', 'error', 'arm', '', null);
  if (mapping.value === undefined) issues.range('no-value-column', 'warning', 'value', '', 'model');
}
