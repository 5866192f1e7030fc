/**
 * Types of the intake layer: cells as a spreadsheet hands them over in, typed columns and issues out.
 * The intake decides blanks, text, error values and dates once; later layers receive clean typed arrays.
 */

/** One cell as a host hands it over: a number, text, a boolean, or blank (null, undefined or ""). Error values
 * (#N/A, #VALUE!, ...) arrive as their text. */
export type CellValue = number | string | boolean | null | undefined;

/** The roles a column can play (SPEC §3). */
export type Role =
  | 'subject'
  | 'date'
  | 'studyDay'
  | 'reference'
  | 'visit'
  | 'value'
  | 'arm'
  | 'site'
  | 'exit'
  | 'exitStatus'
  | 'exitReason'
  /** A yes/no answer (0 or 1) for the yes/no model; optional. */
  | 'responder'
  | 'covariate';

/** Which column (0-based index within the range) plays which role. `covariates` may be empty. */
export interface ColumnMapping {
  readonly subject?: number;
  readonly date?: number;
  readonly studyDay?: number;
  readonly reference?: number;
  readonly visit?: number;
  readonly value?: number;
  readonly arm?: number;
  readonly site?: number;
  /** The date the participant left the study (ADaM EOSDT), its end-of-study status (EOSSTT) and reason (DCSREAS). */
  readonly exit?: number;
  readonly exitStatus?: number;
  readonly exitReason?: number;
  /** A 0/1 yes/no column for the yes/no model (any other cell reads as missing there). */
  readonly responder?: number;
  readonly covariates: readonly number[];
}

/** Blinded mode reads no arm column; unblinded mode does (SPEC §2). */
export type Mode = 'blinded' | 'unblinded';

/** The spreadsheet date system: serial 0 is 1899-12-30 (1900 system, as used in practice) or 1904-01-01. ECMA-376 Part 1, §18.17.4. */
export type DateSystem = 1900 | 1904;

/** How dates written with the day and month as numbers (03/04/2025) are read: day/month/year or month/day/year. */
export type DateOrder = 'dmy' | 'mdy';

/** How a date column with numeric day and month (03/04/2025) was read, for the run's notes. */
export interface DateReading {
  readonly role: Role;
  /** The column's header (or "column C" when it has none). */
  readonly column: string;
  readonly order: DateOrder;
  /** 'setting': the order was given; 'data': some values can be read only this way (`evidence` holds up to three). */
  readonly source: 'setting' | 'data';
  readonly evidence: readonly string[];
}

export interface IntakeOptions {
  /** Sheet name used in cell addresses, e.g. "Visits" gives "Visits!C17". */
  readonly sheet: string;
  /** Address of the top-left cell of the range (the header row's first cell), e.g. "A1" or "B3". */
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly mode: Mode;
  /** The user's confirmed mapping; when absent the detected one is used. */
  readonly mapping?: ColumnMapping;
  /** How text in numeric roles (value, study day, numeric covariates) is treated: 'reject' (default, for spreadsheet
   * cells, where a number typed as text is a problem) or 'accept' (for CSV input, where every cell is text): then text
   * that is a plain decimal number (optional sign, digits, optional fraction, optional exponent) is taken. */
  readonly numericText?: 'reject' | 'accept';
  /** How to read dates whose day and month are numbers (03/04/2025), for every date column. When absent each column
   * decides from values that can be read only one way (a first part over 12 means day first); a column where every
   * such value could be read both ways stops the run and asks for this setting. */
  readonly dateOrder?: DateOrder;
}

/** The uses a row can serve (SPEC §3): visit timing, and the model. */
export type Use = 'timing' | 'model';

export type Severity = 'error' | 'warning';

/** Every problem intake can report. Errors block a run; warnings exclude a row from a use and say so. */
export type IssueCode =
  | 'no-rows' // the range has a header but no data rows
  | 'no-subject-column'
  | 'no-time-column' // neither a date nor a study-day column
  | 'no-value-column'
  | 'no-arm-column' // unblinded mode without an arm column
  | 'arm-column-blinded' // blinded mode, but a column naming the arm is mapped to another role (SPEC §2)
  | 'duplicate-role' // one column mapped to two roles (a mapping outside the range is 'column-outside-range')
  | 'subject-in-two-arms'
  | 'too-few-subjects-per-arm'
  | 'no-usable-rows'
  | 'blank-subject'
  | 'blank-time'
  | 'bad-date'
  | 'bad-study-day'
  | 'bad-reference-date'
  | 'blank-value'
  | 'text-in-numeric'
  | 'error-value'
  | 'blank-arm'
  | 'bad-covariate'
  | 'blank-row' // every cell of the data row is blank: one summary issue for all of them (rowSpans), left out of both uses
  | 'duplicate-header' // two columns share one header text: neither is chosen for a role without the user saying which
  | 'long-text' // a cell longer than a spreadsheet cell holds (32,767 characters); kept whole up to LONG_TEXT_CAP
  | 'implausible-date' // a visit date far from the rest of the data (after the run's day, long after the schedule's end, long before the reference date); kept, but ignored for the default cut-off
  | 'empty-header' // the header row has no text at all
  | 'column-outside-range' // a mapping points at a column the range does not have
  | 'partial-date' // a partial date (ISO 8601 reduced precision "2025-03", "2025"; "JAN2025"; "UNK-JAN-2025"): never guessed
  | 'date-order-unknown' // a date column whose numeric dates all read both as day/month/year and month/day/year
  | 'date-order-mixed' // a date column with values only day first and others only month first
  | 'unreadable-date-column' // a date column with values, none of which is a date or a partial date
  | 'not-finite' // a number that is not finite (NaN or infinite) in a numeric role
  | 'unknown-reference-arm' // unblinded mode: the chosen reference arm is not among the data's arms
  | 'too-few-arms' // unblinded mode with fewer than two arms among usable rows
  | 'reference-date-differs' // a row's reference date differs from the one first given for its subject
  | 'bad-exit-date' // an exit date that cannot be read (the row is kept; the participant's exit comes from other rows)
  | 'exit-date-differs' // a participant's rows give two different exit dates (the latest is used)
  // Raised by later layers and passed on in the run's one issue list (src/core/pipeline):
  | 'no-reference-date' // schedule: a dated row whose subject has no reference date
  | 'no-baseline-record' // schedule: a dated row whose subject has no record of the first scheduled visit
  | 'after-cutoff' // schedule: a record dated after the data cut-off
  | 'after-exit' // schedule: a record dated after the participant's exit date (kept)
  | 'model-not-fitted'; // pipeline: the model could not be fitted (the visit-timing results still stand)

export interface Issue {
  readonly code: IssueCode;
  readonly severity: Severity;
  /** e.g. "Visits!C17"; null for issues about the whole range. */
  readonly cell: string | null;
  /** 1-based worksheet row number of the data row concerned, or null. */
  readonly row: number | null;
  readonly role: Role | null;
  /** The offending value as text ("" for blank). */
  readonly value: string;
  /** Which use the row is left out of; null when the issue blocks the run or concerns no single use. */
  readonly use: Use | null;
  /** A plain sentence, rendered from the code in one place (messages.ts). */
  readonly message: string;
  /** For a summary issue standing for many rows (blank rows): the worksheet rows it covers, as inclusive [first, last]
   * spans in row order. `row` and `cell` then name the first of them. */
  readonly rowSpans?: readonly (readonly [number, number])[];
}

/** A covariate column after intake: numeric (NaN where missing) or categorical (levels as text, "" where missing). */
export type CovariateColumn =
  | { readonly name: string; readonly kind: 'numeric'; readonly values: Float64Array }
  | { readonly name: string; readonly kind: 'categorical'; readonly values: readonly string[]; readonly levels: readonly string[] };

/**
 * Typed columns, one entry per data row (index i is worksheet row sheetRows[i]).
 * Dates are whole day numbers counted so that 1899-12-30 is 0 (the 1900-system serial for dates from 1900-03-01 on;
 * 1904-system serials are shifted by 1462 on the way in). Missing or unusable numbers are NaN.
 */
export interface IntakeTable {
  readonly nRows: number;
  readonly headers: readonly string[];
  readonly mapping: ColumnMapping;
  readonly mode: Mode;
  /** 1-based worksheet row of each data row. */
  readonly sheetRows: Int32Array;
  /** Subject id per row, trimmed, case kept; "" if blank. */
  readonly subject: readonly string[];
  /** Index into subjectIds per row, -1 if blank. */
  readonly subjectIndex: Int32Array;
  /** Distinct non-blank subject ids in order of first appearance. */
  readonly subjectIds: readonly string[];
  /** 'date' when a date column is mapped (study day is derived later), else 'studyDay'. */
  readonly timeKind: 'date' | 'studyDay';
  /** Visit date as a day number (see above); all NaN when timeKind is 'studyDay'. */
  readonly date: Float64Array;
  /** Given study day (integer, never 0); all NaN when timeKind is 'date'. */
  readonly studyDay: Float64Array;
  /** Reference (randomisation or first-dose) date as a day number, NaN when absent. */
  readonly reference: Float64Array;
  /** Visit label per row, trimmed; null when no visit column is mapped. */
  readonly visit: readonly string[] | null;
  readonly value: Float64Array;
  /** Arm per row (unblinded mode only), "" if blank; null in blinded mode or when not mapped. */
  readonly arm: readonly string[] | null;
  /** Distinct arms in order of first appearance (empty in blinded mode). */
  readonly arms: readonly string[];
  readonly site: readonly string[] | null;
  readonly covariates: readonly CovariateColumn[];
  /** Per subject (index into subjectIds): the exit date as a day number (the latest one given), NaN when none. */
  readonly subjectExit: Float64Array;
  /** Per subject: end-of-study status and reason as given (first non-blank), "" when none; null when not mapped. */
  readonly subjectExitStatus: readonly string[] | null;
  readonly subjectExitReason: readonly string[] | null;
  /** How each date column with numeric day and month was read (absent or empty when none has such dates). */
  readonly dateReadings?: readonly DateReading[];
  /** 1 where the row can serve visit timing (subject and a valid date or study day). */
  readonly usableTiming: Uint8Array;
  /** 1 where the row can also serve the model (numeric value, arm in unblinded mode, covariates present). */
  readonly usableModel: Uint8Array;
  /** The mapped yes/no column: 0, 1, or NaN for anything else; absent when none is mapped. */
  readonly responder?: Float64Array;
  /** The visit, site and arm columns as codes (`texts[codes[i]]` equals visit[i], site[i], arm[i]; each text once),
   * so later layers can group and match by number; absent for a table not made by readTable. */
  readonly visitCodes?: TextCodes;
  readonly siteCodes?: TextCodes;
  readonly armCodes?: TextCodes;
}

/** A text column as codes: row i's text is texts[codes[i]]; every text appears once in `texts`. */
export interface TextCodes {
  readonly codes: Int32Array;
  readonly texts: readonly string[];
}

export type IntakeResult =
  | { readonly ok: true; readonly table: IntakeTable; readonly issues: readonly Issue[] }
  | { readonly ok: false; readonly issues: readonly Issue[] };

/** A proposed mapping from header text, with the reason each role was chosen (shown to the user for confirmation). */
export interface DetectedMapping {
  readonly mapping: ColumnMapping;
  readonly reasons: Readonly<Partial<Record<Exclude<Role, 'covariate'>, string>>>;
  /** Columns that could serve as covariates (e.g. a baseline value, BASE); proposed only, never added to the mapping. */
  readonly covariateSuggestions?: readonly number[];
  /** Plain sentences about recognised columns that were not mapped (e.g. CHG is a change score, never the value). */
  readonly notes?: readonly string[];
}
