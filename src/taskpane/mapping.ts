/** Small immutable edits of a column mapping, as the pane's dropdowns and check boxes make them. */
import type { ColumnMapping } from '../core/intake/types';
import type { SingleRole } from './roles';

type Writable = { -readonly [K in keyof ColumnMapping]: ColumnMapping[K] };

/**
 * Returns a new mapping with `role` set to column `column`, or removed when `column` is null.
 * A column given to a role is taken away from the covariates. The input is never changed.
 * Example: setRole({ covariates: [2] }, 'value', 2) gives { value: 2, covariates: [] }.
 */
export function setRole(mapping: ColumnMapping, role: SingleRole, column: number | null): ColumnMapping {
  const next: Writable = { ...mapping, covariates: mapping.covariates.filter((c) => c !== column) };
  if (column === null) delete next[role];
  else next[role] = column;
  return next;
}

/** Returns a new mapping with `column` added to or removed from the covariates (kept in column order). */
export function toggleCovariate(mapping: ColumnMapping, column: number, on: boolean): ColumnMapping {
  const rest = mapping.covariates.filter((c) => c !== column);
  return { ...mapping, covariates: on ? [...rest, column].sort((a, b) => a - b) : rest };
}

/** Returns the mapping without the arm column: blinded mode reads no arm (SPEC §2). */
export function withoutArm(mapping: ColumnMapping): ColumnMapping {
  return setRole(mapping, 'arm', null);
}

/** The role a column currently plays, or null. */
export function roleOfColumn(mapping: ColumnMapping, column: number): SingleRole | 'covariate' | null {
  for (const [key, value] of Object.entries(mapping)) {
    if (key !== 'covariates' && value === column) return key as SingleRole;
  }
  return mapping.covariates.includes(column) ? 'covariate' : null;
}

/** True when every mapped column lies inside a range of `width` columns. */
export function fitsWidth(mapping: ColumnMapping, width: number): boolean {
  const inside = (c: number): boolean => Number.isInteger(c) && c >= 0 && c < width;
  return Object.entries(mapping).every(([key, value]) =>
    key === 'covariates' ? (value as readonly number[]).every(inside) : inside(value as number),
  );
}

/**
 * Fills the roles `primary` leaves empty from `secondary` (e.g. the mapping remembered from the last run), when the
 * remembered column fits the range and is not already used. Example: fillGaps({ subject: 0, covariates: [] },
 * { subject: 1, site: 3, covariates: [] }, 5) gives { subject: 0, site: 3, covariates: [] }.
 */
export function fillGaps(primary: ColumnMapping, secondary: ColumnMapping | undefined, width: number): ColumnMapping {
  if (secondary === undefined || !fitsWidth(secondary, width)) return primary;
  let next = primary;
  for (const [key, value] of Object.entries(secondary)) {
    if (key === 'covariates') continue;
    const role = key as SingleRole;
    if (next[role] === undefined && roleOfColumn(next, value as number) === null)
      next = setRole(next, role, value as number);
  }
  return next;
}
