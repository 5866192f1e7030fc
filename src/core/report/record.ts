import type { ColumnMapping, Mode } from '../intake/types';
import type { ScheduleVisit } from '../schedule/types';
import { cautionLine } from './cautions';
import { col, heading } from './blockParts';
import type { Block, SheetSpec } from './types';
import { rowsLeftOut } from './rowsLeftOut';
import { readableRunTime } from './runTime';

/** One row left out of one use, as the analysis record lists it. */
export interface RecordExclusion {
  /** 1-based worksheet row (the first, when the entry spans rows `row` to `lastRow`). */
  readonly row: number;
  readonly lastRow?: number;
  /** e.g. "Visits!C17"; null when no single cell applies. */
  readonly cell: string | null;
  readonly use: 'timing' | 'model';
  readonly reason: string;
}

/** Everything the analysis record shows (SPEC §6); plain data so every front end passes the same. */
export interface AnalysisRecordInput {
  /** e.g. "Visits!A1:G2401" or "egfr-visits.csv". */
  readonly inputLabel: string;
  /** SHA-256 of the input values (fingerprintCells), or of the input file's bytes when fingerprintOf is 'file'. */
  readonly fingerprint: string;
  /** What the fingerprint hashes; 'cells' when absent. */
  readonly fingerprintOf?: 'file' | 'cells';
  readonly rowsRead: number;
  readonly rowsTiming: number;
  readonly rowsModel: number;
  readonly excluded: readonly RecordExclusion[];
  readonly mapping: readonly MappingLine[];
  readonly schedule: readonly ScheduleVisit[];
  /** Settings as name and plain value, in the order to show, e.g. {name: "Time unit", value: "month"}. */
  readonly settings: readonly { readonly name: string; readonly value: string }[];
  /** The cut-off in words, e.g. "2024-06-30 (the latest visit date in the data)". */
  readonly cutoff: string;
  readonly mode: Mode;
  readonly version: string;
  /** ISO 8601 timestamp of the run with its UTC offset; shown as "2026-12-02 14:05 (UTC+01:00)" (runTime.ts). */
  readonly runAt: string;
  /** Further plain notes about the run (e.g. a cut-off that could not be applied). */
  readonly notes?: readonly string[];
}

/** One mapped column: role in words, the column's heading and its position within the range (1-based). */
export interface MappingLine {
  readonly role: string;
  readonly header: string;
  readonly column: number;
}

const ROLE_WORDS: readonly [Exclude<keyof ColumnMapping, 'covariates'>, string][] = [
  ['subject', 'Participant'],
  ['date', 'Visit date'],
  ['studyDay', 'Study day'],
  ['reference', 'Reference date'],
  ['visit', 'Visit name'],
  ['value', 'Value'],
  ['arm', 'Arm'],
  ['site', 'Site'],
];

/**
 * The mapping as lines for the record: each mapped role with its column heading, then the covariates, in that order.
 * Example: mappingLines({subject: 0, value: 2, covariates: [3]}, ["ID", "Day", "eGFR", "Base"]) →
 * [{role: "Subject", header: "ID", column: 1}, {role: "Value", header: "eGFR", column: 3},
 *  {role: "Covariate", header: "Base", column: 4}].
 */
export function mappingLines(mapping: ColumnMapping, headers: readonly string[]): MappingLine[] {
  const lines: MappingLine[] = [];
  for (const [key, word] of ROLE_WORDS) {
    const c = mapping[key];
    if (c !== undefined) lines.push({ role: word, header: headers[c] ?? '', column: c + 1 });
  }
  for (const c of mapping.covariates) lines.push({ role: 'Covariate', header: headers[c] ?? '', column: c + 1 });
  return lines;
}

const USE_WORDS: Readonly<Record<RecordExclusion['use'], string>> = { timing: 'Visit timing', model: 'Model' };

/**
 * The analysis-record sheet (SPEC §6): what was read (input label and SHA-256 fingerprint of its values), row counts,
 * the mode, cut-off, program version and run time, the column mapping, the schedule, the settings, and every row left
 * out of a use with the reason — all of them, however many. Text is written as text. Cost O(exclusions).
 * Example: analysisRecordSheet({inputLabel: "visits.csv", rowsRead: 10, …}).name → "Analysis record".
 */
export function analysisRecordSheet(input: AnalysisRecordInput): SheetSpec {
  const rowsOut = rowsLeftOut(input.excluded);
  const rowsOutOf = (use: RecordExclusion['use']): number => rowsLeftOut(input.excluded.filter((e) => e.use === use));
  const blocks: Block[] = [
    cautionLine(input.mode),
    {
      kind: 'table',
      id: 'RunFacts',
      caption: 'What was analysed, when and how',
      columns: [col('Item', 'text', 28), col('Value', 'text', 70)],
      rows: [
        ['Input', input.inputLabel],
        [input.fingerprintOf === 'file' ? 'Fingerprint of the input file (SHA-256)' : 'Fingerprint of the input values (SHA-256)', input.fingerprint],
        ['Mode', input.mode === 'unblinded' ? 'Unblinded (results by arm)' : 'Blinded (pooled, no arm read)'],
        ['Data cut-off', input.cutoff],
        ['Program version', input.version],
        ['Run at', readableRunTime(input.runAt)],
      ],
    },
    {
      kind: 'table',
      id: 'RowCounts',
      caption: 'Rows',
      columns: [col('Rows', 'text', 40), col('Count', 'integer')],
      rows: [
        ['Data rows read', input.rowsRead],
        ['Used for visit timing', input.rowsTiming],
        ['Used for the model', input.rowsModel],
        ['Left out of visit timing', rowsOutOf('timing')],
        ['Left out of the model', rowsOutOf('model')],
        ['Left out of at least one use', rowsOut],
      ],
    },
    heading('Column mapping'),
    {
      kind: 'table',
      id: 'Mapping',
      caption: 'Which column plays which role',
      columns: [col('Role', 'text', 16), col('Column heading', 'text', 24), col('Column number in the range', 'integer')],
      rows: input.mapping.map((m) => [m.role, m.header, m.column]),
    },
    heading('Visit schedule'),
    {
      kind: 'table',
      id: 'Schedule',
      caption: 'The schedule used',
      columns: [col('Visit', 'text', 14), col('Target day', 'integer'), col('Days allowed before', 'integer'), col('Days allowed after', 'integer')],
      rows: input.schedule.map((v) => [v.label, v.targetDay, v.before, v.after]),
    },
    heading('Settings'),
    {
      kind: 'table',
      id: 'Settings',
      caption: 'Settings of this run',
      columns: [col('Setting', 'text', 28), col('Value', 'text', 40)],
      rows: input.settings.map((s) => [s.name, s.value]),
    },
  ];
  if (input.notes !== undefined && input.notes.length > 0) {
    blocks.push(heading('Notes'), ...input.notes.map((text): Block => ({ kind: 'paragraph', text })));
  }
  blocks.push(
    heading('Rows left out'),
    {
      kind: 'paragraph',
      text:
        input.excluded.length === 0
          ? 'No row was left out of any use.'
          : `${input.excluded.length} ${input.excluded.length === 1 ? 'exclusion' : 'exclusions'} on ${rowsOut} ${rowsOut === 1 ? 'row' : 'rows'}. A row left out of one use still serves the others.`,
    },
    {
      kind: 'table',
      id: 'LeftOut',
      caption: 'Every row left out of a use, with the reason',
      columns: [col('Data row', 'integer'), col('To data row', 'integer'), col('Cell', 'text', 14), col('Left out of', 'text', 14), col('Reason', 'text', 80)],
      rows: input.excluded.map((e) => [e.row, e.lastRow ?? e.row, e.cell ?? '', USE_WORDS[e.use], e.reason]),
    },
  );
  return { name: 'Analysis record', title: 'Analysis record', blocks };
}
