/**
 * Builds IntakeTable objects for schedule and report tests (a small stand-in for the intake layer's readTable).
 * Data rows start at worksheet row 2 (the header is row 1); columns: subject, time, visit, reference, arm, site.
 */
import type { IntakeTable } from '../../../src/core/intake/types';

export interface RowSpec {
  readonly subject: string;
  /** A day number (dated data) or a study day (study-day data); NaN for an unusable time. */
  readonly time: number;
  readonly visit?: string;
  readonly reference?: number;
  readonly arm?: string;
  readonly site?: string;
  /** The participant's exit date (a day number) on this row, when given. */
  readonly exit?: number;
}

export function makeTable(
  rows: readonly RowSpec[],
  opts: { readonly timeKind?: 'date' | 'studyDay'; readonly labels?: boolean; readonly reference?: boolean; readonly arm?: boolean; readonly site?: boolean } = {},
): IntakeTable {
  const timeKind = opts.timeKind ?? 'date';
  const subjectIds: string[] = [];
  const pos = new Map<string, number>();
  const subjectIndex = new Int32Array(rows.length);
  rows.forEach((r, i) => {
    if (r.subject === '') {
      subjectIndex[i] = -1;
      return;
    }
    if (!pos.has(r.subject)) {
      pos.set(r.subject, subjectIds.length);
      subjectIds.push(r.subject);
    }
    subjectIndex[i] = pos.get(r.subject)!;
  });
  const times = Float64Array.from(rows, (r) => r.time);
  const nanColumn = new Float64Array(rows.length).fill(NaN);
  const arms = opts.arm === true ? [...new Set(rows.map((r) => r.arm ?? '').filter((a) => a !== ''))] : [];
  return {
    nRows: rows.length,
    headers: ['Subject', timeKind === 'date' ? 'Visit date' : 'Study day', 'Visit', 'Reference date', 'Arm', 'Site'],
    mapping: {
      subject: 0,
      ...(timeKind === 'date' ? { date: 1 } : { studyDay: 1 }),
      ...(opts.labels === true ? { visit: 2 } : {}),
      ...(opts.reference === true ? { reference: 3 } : {}),
      ...(opts.arm === true ? { arm: 4 } : {}),
      ...(opts.site === true ? { site: 5 } : {}),
      covariates: [],
    },
    mode: opts.arm === true ? 'unblinded' : 'blinded',
    sheetRows: Int32Array.from(rows, (_, i) => i + 2),
    subject: rows.map((r) => r.subject),
    subjectIndex,
    subjectIds,
    timeKind,
    date: timeKind === 'date' ? times : nanColumn,
    studyDay: timeKind === 'studyDay' ? times : nanColumn.slice(),
    reference: opts.reference === true ? Float64Array.from(rows, (r) => r.reference ?? NaN) : nanColumn.slice(),
    visit: opts.labels === true ? rows.map((r) => r.visit ?? '') : null,
    value: new Float64Array(rows.length).fill(1),
    arm: opts.arm === true ? rows.map((r) => r.arm ?? '') : null,
    arms,
    site: opts.site === true ? rows.map((r) => r.site ?? '') : null,
    covariates: [],
    usableTiming: Uint8Array.from(rows, (r) => (r.subject !== '' && Number.isFinite(r.time) ? 1 : 0)),
    usableModel: Uint8Array.from(rows, (r) => (r.subject !== '' && Number.isFinite(r.time) ? 1 : 0)),
    subjectExit: Float64Array.from(subjectIds, (id) => Math.max(...rows.filter((r) => r.subject === id).map((r) => r.exit ?? -Infinity))).map((d) => (Number.isFinite(d) ? d : NaN)),
    subjectExitStatus: null,
    subjectExitReason: null,
  };
}
