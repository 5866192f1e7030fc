/**
 * Columns that share one header text. A role is never given to one of them silently: detection leaves the role
 * unmapped (with a note for the pane), and intake warns at both header cells until the mapping picks one.
 */
import { columnLetters, formatAddress, type CellRef } from './cellAddress';
import { headerCandidate } from './headerRules';
import type { IssueList } from './issueList';
import type { ColumnMapping } from './types';

/** The header key two columns must share to be duplicates: the text trimmed, case ignored. */
const headerKey = (h: string): string => h.trim().toLowerCase();

/**
 * Groups of column indices (two or more, in column order) whose non-blank headers are the same text, ignoring case and
 * surrounding spaces. O(columns).
 * @example duplicateHeaderGroups(["USUBJID", "ADY", "usubjid "]) // [[0, 2]]
 */
export function duplicateHeaderGroups(headers: readonly string[]): number[][] {
  const byKey = new Map<string, number[]>();
  headers.forEach((h, col) => {
    if (h.trim() === '') return;
    const k = headerKey(h);
    const list = byKey.get(k);
    if (list === undefined) byKey.set(k, [col]);
    else list.push(col);
  });
  return [...byKey.values()].filter((g) => g.length > 1);
}

/** Every column index the mapping uses (single roles and covariates). */
function mappedColumns(mapping: ColumnMapping): Set<number> {
  const used = new Set<number>(mapping.covariates);
  for (const [k, v] of Object.entries(mapping)) if (k !== 'covariates' && typeof v === 'number') used.add(v);
  return used;
}

/**
 * Adds a 'duplicate-header' warning at the header cell of each later column of a group (naming the first column's
 * cell too) when the mapping uses none of the group's columns: the user has not said which one plays the role.
 * A mapping that uses a column of the group is the user's choice and gets no warning. O(columns).
 */
export function checkDuplicateHeaders(headers: readonly string[], mapping: ColumnMapping, sheet: string, top: CellRef, issues: IssueList): void {
  const used = mappedColumns(mapping);
  for (const group of duplicateHeaderGroups(headers)) {
    if (group.some((c) => used.has(c))) continue;
    const first = group[0]!;
    const role = headerCandidate(headers[first]!).candidate?.role ?? null;
    const firstCell = formatAddress(sheet, top.row, top.col + first);
    for (const col of group.slice(1)) {
      issues.header('duplicate-header', 'warning', col, role, headers[col]!.trim(), columnLetters(top.col + col), firstCell);
    }
  }
}
