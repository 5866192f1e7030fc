/**
 * What blinded mode keeps out of the pane (SPEC §2: in blinded mode no arm column is read). Every column whose header
 * names a treatment arm — the mapped arm column and any other, such as an actual-arm column beside the planned one —
 * is hidden from the preview and offered for no role; a mapping that still gives one a role is refused with a message.
 */
import { isArmHeader } from '../core/intake';
import type { ColumnMapping } from '../core/intake/types';
import { ROLES } from './roles';

/**
 * The 0-based indices of the columns whose header names an arm. O(columns).
 * @example armLikeColumns(['USUBJID', 'TRT01P', 'TRT01A', 'AVAL']) // [1, 2]
 */
export function armLikeColumns(headers: readonly string[]): number[] {
  return headers.flatMap((h, i) => (isArmHeader(h) ? [i] : []));
}

/**
 * The columns whose values the blinded pane does not show: every arm-like column, and the mapped arm column even when
 * its header does not name an arm. Sorted, no repeats.
 * @example hiddenWhileBlinded(['USUBJID', 'Group', 'TRT01A'], { arm: 1, covariates: [] }) // [1, 2]
 */
export function hiddenWhileBlinded(headers: readonly string[], mapping: ColumnMapping | null): number[] {
  const hidden = new Set(armLikeColumns(headers));
  if (mapping?.arm !== undefined) hidden.add(mapping.arm);
  return [...hidden].sort((a, b) => a - b);
}

/**
 * One sentence for each arm-like column that a blinded run would read under a role other than the arm (the intake
 * refuses these with 'arm-column-blinded'); empty when there is none.
 * @example blindedConflicts({ subject: 0, covariates: [2] }, ['USUBJID', 'AVAL', 'TRT01A'])
 *   // ['"TRT01A" names a treatment arm, so it cannot be a covariate while blinded.']
 */
export function blindedConflicts(mapping: ColumnMapping, headers: readonly string[]): string[] {
  const armLike = new Set(armLikeColumns(headers));
  const out: string[] = [];
  for (const { role, label } of ROLES) {
    const col = mapping[role];
    if (role === 'arm' || col === undefined || !armLike.has(col)) continue;
    out.push(`"${headers[col] ?? ''}" names a treatment arm, so it cannot be the ${label.toLowerCase()} column while blinded.`);
  }
  for (const col of mapping.covariates) {
    if (armLike.has(col)) out.push(`"${headers[col] ?? ''}" names a treatment arm, so it cannot be a covariate while blinded.`);
  }
  return out;
}
