import type { Issue, Role } from '../intake/types';
import { renderMessage } from '../intake/messages';
import type { ScheduleIssue } from '../schedule/types';

const ROLE_OF: Readonly<Partial<Record<ScheduleIssue['code'], Role>>> = {
  'no-reference-date': 'reference',
  'no-baseline-record': 'date',
  'after-cutoff': 'date',
  'after-exit': 'date',
};

/**
 * The schedule layer's row issues as run issues. A row left out of visit timing has no study day, so it is left out
 * of the model as well: each becomes two issues, one per use, as intake reports its own timing exclusions.
 * A row issue with use null (a record after the participant's exit date) is passed on once, as a warning that leaves
 * the row in. Schedule-table issues have no data role and are not passed on here.
 */
export function fromScheduleIssues(issues: readonly ScheduleIssue[]): Issue[] {
  const out: Issue[] = [];
  for (const i of issues) {
    const role = ROLE_OF[i.code];
    if (role === undefined) continue;
    const code = i.code as Issue['code'];
    if (i.use === null) {
      // A kept row with a warning (data after the exit date): one issue, excluding the row from nothing.
      out.push({ code, severity: i.severity, cell: i.cell, row: i.row, role, value: i.value, use: null, message: i.message });
      continue;
    }
    for (const use of ['timing', 'model'] as const) {
      out.push({ code, severity: i.severity, cell: i.cell, row: i.row, role, value: i.value, use, message: use === 'timing' ? i.message : renderMessage({ code, role, value: i.value, cell: i.cell, use }) });
    }
  }
  return out;
}

/** The run-level issue saying the model was not fitted and why (the visit-timing results still stand). */
export function modelNotFitted(reason: string): Issue {
  return {
    code: 'model-not-fitted',
    severity: 'warning',
    cell: null,
    row: null,
    role: null,
    value: '',
    use: null,
    message: renderMessage({ code: 'model-not-fitted', role: null, value: '', cell: null, use: null, context: reason }),
  };
}

/**
 * Unblinded mode with a chosen reference arm that is not among the data's arms: a blocking error (a silent fallback
 * to another arm would flip the sign of every treatment difference). Null when there is nothing to say.
 * @example unknownReferenceArm(['Placebo', 'Active'], { mode: 'unblinded', referenceArm: 'Plaecbo' })?.code // 'unknown-reference-arm'
 */
export function unknownReferenceArm(arms: readonly string[], settings: { readonly mode: string; readonly referenceArm?: string }): Issue | null {
  if (settings.mode !== 'unblinded' || settings.referenceArm === undefined || arms.includes(settings.referenceArm)) return null;
  const value = settings.referenceArm;
  const context = arms.map((a) => `"${a}"`).join(', ');
  return {
    code: 'unknown-reference-arm',
    severity: 'error',
    cell: null,
    row: null,
    role: 'arm',
    value,
    use: 'model',
    message: renderMessage({ code: 'unknown-reference-arm', role: 'arm', value, cell: null, use: 'model', context }),
  };
}
