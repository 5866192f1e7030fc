import type { IntakeTable } from '../intake/types';
import { textCodesOf } from '../intake/textCodes';
import { subjectGroups } from './subjectGroups';

/** Shown for subjects whose site cells are all blank. */
export const NO_SITE = '(no site)';
/** Shown for subjects whose arm cells are all blank (unblinded mode). */
export const NO_ARM = '(no arm)';

/** Each subject's site, or null when no site column is mapped. O(rows). */
export function siteGroups(table: IntakeTable): ReturnType<typeof subjectGroups> | null {
  const site = textCodesOf(table, 'site');
  return site === null ? null : subjectGroups(table.subjectIndex, table.subjectIds.length, site, NO_SITE);
}

/** Each subject's arm in unblinded mode (table.arm not null), else null: blinded mode reads no arm. O(rows). */
export function armGroups(table: IntakeTable): ReturnType<typeof subjectGroups> | null {
  const arm = textCodesOf(table, 'arm');
  return arm === null ? null : subjectGroups(table.subjectIndex, table.subjectIds.length, arm, NO_ARM);
}
