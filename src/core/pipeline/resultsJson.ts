import type { ColumnMapping, Issue, IntakeTable } from '../intake/types';
import type { VisitsJson } from '../report/timingJson';
import { CAUTIONS, UNBLINDED_CAUTION } from '../report/cautions';
import { isoDate } from '../schedule/dates';
import type { CutoffRule } from '../schedule/types';
import type { AnalysisSettings, ExcludedRow } from './types';
import { compactIssues, type CompactIssue } from './compactIssues';
import { capJsonText } from '../intake/longText';
import { DAYS_PER_UNIT } from './types';

export interface ResultsJsonInput {
  readonly settings: AnalysisSettings;
  readonly table: IntakeTable;
  readonly fingerprint: string;
  /** 'file': SHA-256 of the input file's bytes; 'cells': of the cell values' canonical form (fingerprintCells). */
  readonly fingerprintOf: 'file' | 'cells';
  readonly excluded: readonly ExcludedRow[];
  readonly usedForTiming: number;
  readonly usedForModel: number;
  readonly visits: VisitsJson;
  readonly model: Record<string, unknown> | null;
  readonly modelNote: string | null;
  readonly notes: readonly string[];
  readonly issues: readonly Issue[];
  readonly cutoff: number | null;
  readonly cutoffRule: CutoffRule;
  /** The reference arm actually used (unblinded mode), else null. */
  readonly referenceArm: string | null;
}

/** The mapping as role → header text (what a reader of the JSON recognises), covariates as a list of headers. */
export function mappingByHeader(mapping: ColumnMapping, headers: readonly string[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const roles = ['subject', 'date', 'studyDay', 'reference', 'visit', 'value', 'arm', 'site'] as const;
  for (const r of roles) {
    const c = mapping[r];
    if (c !== undefined) out[r] = headers[c] ?? `column ${c + 1}`;
  }
  out.covariates = mapping.covariates.map((c) => headers[c] ?? `column ${c + 1}`);
  return out;
}

/**
 * The machine-readable results (schema: README.md, "Results JSON"). Plain JSON values only: no NaN, no
 * typed arrays. In blinded mode nothing here is by arm (the visit and model parts come from blinded inputs, and the
 * settings carry no reference arm). Text longer than JSON_TEXT_CAP (1,048,576 characters) is cut with a marker
 * (capJsonText). O(excluded rows + issues).
 */
export function resultsJson(r: ResultsJsonInput): Record<string, unknown> {
  return capJsonText(resultsJsonWhole(r));
}

function resultsJsonWhole(r: ResultsJsonInput): Record<string, unknown> {
  const s = r.settings;
  const unblinded = s.mode === 'unblinded';
  return {
    ok: true,
    tool: { name: 'longipane', version: s.toolVersion ?? 'unknown' },
    cautions: s.mode === 'unblinded' ? [...CAUTIONS, UNBLINDED_CAUTION] : [...CAUTIONS],
    input: {
      label: s.inputLabel,
      sheet: s.sheet,
      topLeft: s.topLeft,
      rows: r.table.nRows,
      subjects: r.table.subjectIds.length,
      fingerprint: r.fingerprint,
      fingerprintOf: r.fingerprintOf,
      excluded: r.excluded.map((e) => ({ row: e.row, ...(e.lastRow === undefined ? {} : { lastRow: e.lastRow }), cell: e.cell, use: e.use, reason: e.reason })),
      usedForTiming: r.usedForTiming,
      usedForModel: r.usedForModel,
    },
    settings: {
      mode: s.mode,
      mapping: mappingByHeader(r.table.mapping, r.table.headers),
      schedule: s.schedule.map((v) => ({ label: v.label, targetDay: v.targetDay, before: v.before, after: v.after })),
      cutoff: r.cutoff === null ? null : r.table.timeKind === 'date' ? isoDate(r.cutoff) : r.cutoff,
      cutoffRule: r.cutoffRule,
      referenceArm: unblinded ? r.referenceArm : null,
      timeUnit: s.timeUnit,
      daysPerUnit: DAYS_PER_UNIT[s.timeUnit],
      dfMethod: s.dfMethod,
      method: s.method,
      ...(s.model === undefined ? {} : { model: s.model }),
      level: s.level,
      dateOrder: s.dateOrder ?? null,
      scheduledOnly: s.scheduledOnly,
      perSubject: s.perSubject,
      runAt: s.runAt,
    },
    visits: r.visits,
    model: r.model,
    modelNote: r.modelNote,
    notes: [...r.notes],
    issues: compactIssues(r.issues).map(issueJson),
  };
}

/** One issue as plain JSON: `lastRow` when it stands for consecutive rows (compactIssues), `rowSpans` for a summary. */
export function issueJson(i: CompactIssue): Record<string, unknown> {
  return {
    code: i.code,
    severity: i.severity,
    cell: i.cell,
    row: i.row,
    ...(i.lastRow === undefined ? {} : { lastRow: i.lastRow }),
    ...(i.rowSpans === undefined ? {} : { rowSpans: i.rowSpans.map(([a, b]) => [a, b]) }),
    role: i.role,
    value: i.value,
    use: i.use,
    message: i.message,
  };
}
