/**
 * Blinding guard (SPEC §2: in blinded mode no arm column is read). A column whose header names a treatment arm — the
 * CDISC arm variables or a plain header the detection reads as an arm — may not enter a blinded run under any role,
 * e.g. as a covariate or as the site, since that would show results by arm all the same.
 */
import { compactHeader, headerCandidate } from './headerRules';
import type { IssueList } from './issueList';
import { SINGLE_ROLES } from './checkMapping';
import type { ColumnMapping, Role } from './types';

/** CDISC SDTM/ADaM arm and treatment variables beyond those the detection proposes (codes, numeric codes, actual arm). */
const ARM_LIKE = /^(act)?arm(cd|n)?$|^trt\d\d[pa]n?$|^trt[pa]n?$|^trtseq[pa]n?$/;

/**
 * True when a header names a treatment arm.
 * @example isArmHeader('TRT01P') // true
 * @example isArmHeader('Treatment group') // true
 * @example isArmHeader('SITEID') // false
 */
export function isArmHeader(header: string): boolean {
  if (ARM_LIKE.test(compactHeader(header))) return true;
  return headerCandidate(header).candidate?.role === 'arm';
}

/**
 * In blinded mode, adds a blocking 'arm-column-blinded' error at the header cell of every mapped column whose header
 * names an arm (the arm role itself is already dropped by effectiveMapping). O(columns).
 */
export function checkBlindedColumns(mapping: ColumnMapping, headers: readonly string[], issues: IssueList): void {
  const uses: [number, Role][] = [];
  for (const role of SINGLE_ROLES) {
    const col = mapping[role];
    if (col !== undefined && role !== 'arm') uses.push([col, role]);
  }
  for (const col of mapping.covariates) uses.push([col, 'covariate']);
  for (const [col, role] of uses) {
    const header = headers[col];
    if (header !== undefined && isArmHeader(header)) issues.header('arm-column-blinded', 'error', col, role, header);
  }
}
