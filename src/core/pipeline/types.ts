/** Settings and output of one analysis run, shared by the command line, the browser page and the add-in. */
import type { ColumnMapping, DateOrder, DateSystem, Issue, Mode } from '../intake/types';
import type { ScheduleVisit } from '../schedule/types';
import type { DfMethod, FitMethod, ModelKind, TimeUnit } from '../model/types';
import type { SheetSpec } from '../report/types';

/** The model's own choices, handed on under the same names for the front ends. */
export type { DfMethod, FitMethod, ModelKind, TimeUnit };

/** Days per time unit (SPEC §3): a month is 30.4375 days (365.25 / 12, common practice). */
export const DAYS_PER_UNIT: Readonly<Record<TimeUnit, number>> = { month: 30.4375, week: 7, day: 1 };

export interface AnalysisSettings {
  readonly sheet: string;
  readonly topLeft: string;
  readonly dateSystem: DateSystem;
  readonly mode: Mode;
  /** The confirmed mapping; when absent the detected one is used. */
  readonly mapping?: ColumnMapping;
  readonly schedule: readonly ScheduleVisit[];
  /** Data cut-off as ISO date (YYYY-MM-DD); defaults to the latest date in the data. */
  readonly cutoff?: string;
  /** Data cut-off as a study day (non-zero integer), for study-day data; defaults to each subject's own last record.
   * Ignored, with a note, for dated data (a study day falls on a different date for each subject). */
  readonly cutoffDay?: number;
  /** Unblinded mode: the reference arm; defaults to the first arm in order of appearance. */
  readonly referenceArm?: string;
  readonly timeUnit: TimeUnit;
  readonly dfMethod: DfMethod;
  readonly method: FitMethod;
  /** Which model is the main fit (default 'intercept'). 'slope': the random intercept and slope model; both the
   * intercept and the slope model are fitted for the model comparison. 'repeated' adds the visit-by-visit model with
   * an unstructured covariance (repeatedStage.ts): its sheet follows the random-intercept sheets and the JSON `model`
   * is its section. */
  readonly model?: ModelKind;
  /** Confidence level, e.g. 0.95. */
  readonly level: number;
  /** Restrict the model to records matched to scheduled visits (default false: all valid rows). */
  readonly scheduledOnly: boolean;
  /** Add a per-subject sheet with random intercepts and residual summaries. */
  readonly perSubject: boolean;
  /** Free text describing the input, e.g. "visits.csv" or "Data!A1:G2401"; goes into the analysis record. */
  readonly inputLabel: string;
  /** Notes about reading the input file (encoding repairs, stray fields), first among the run's notes. */
  readonly fileNotes?: readonly string[];
  /** ISO 8601 timestamp of the run with the local UTC offset, e.g. "2026-12-02T14:05:09+01:00" (isoWithOffset in
   * report/runTime.ts; a "Z" timestamp is read as UTC); passed in so the core stays pure and testable. Its date is
   * the run's local day (implausible dates, the printed footer). */
  readonly runAt: string;
  /** How intake treats numbers written as text: 'reject' (default, spreadsheet cells) or 'accept' (CSV input, where
   * every cell is text). Passed on to readTable as IntakeOptions.numericText. */
  readonly numericText?: 'accept' | 'reject';
  /** How dates written with day and month as numbers (03/04/2025) are read in every date column; when absent each
   * column decides from its values, and a column where every such value reads both ways stops the run. */
  readonly dateOrder?: DateOrder;
  /** SHA-256 (hex) of the input file's bytes, when the front end read a file (the command line: fileFingerprint in
   * src/files). When absent, the run fingerprints the cell values (fingerprintCells, canonical form LP-FP1), as the
   * add-in does for a worksheet range. The JSON's input.fingerprintOf says which ('file' or 'cells'). */
  readonly fileFingerprint?: string;
  /** The yes/no outcome of the 'logistic' model from the value: yes when value < below, or when value > above. */
  readonly responder?: { readonly below?: number; readonly above?: number };
  /** The tool's version, for the analysis record and the JSON (the front end knows it; core has no package.json). */
  readonly toolVersion?: string;
}

/** Rows left out of one use for one reason: worksheet row `row`, or rows `row` to `lastRow` when the entry spans
 * several consecutive rows (then `cell` is an A1 range such as "Visits!C5:C9"). */
export interface ExcludedRow {
  readonly row: number;
  readonly lastRow?: number;
  readonly cell: string | null;
  readonly use: 'timing' | 'model';
  readonly reason: string;
}

export type AnalysisOutput =
  | {
      readonly ok: true;
      readonly issues: readonly Issue[];
      readonly excluded: readonly ExcludedRow[];
      readonly sheets: readonly SheetSpec[];
      /** The machine-readable results (schema in the README). */
      readonly json: Record<string, unknown>;
    }
  | {
      readonly ok: false;
      readonly issues: readonly Issue[];
      /** A run stopped by its data: the JSON that says why (`ok: false`, `input`, `issues`; schema in the README).
       * Absent when the run was cancelled. */
      readonly json?: Record<string, unknown>;
      readonly cancelled?: true;
    };

/** The stages a run reports as it goes (the pane shows them as progress). */
export type Stage = 'reading' | 'windowing' | 'fitting' | 'writing';

export interface RunHooks {
  readonly onStage?: (stage: Stage) => void;
  /** Checked between stages; when aborted the run returns { ok: false, cancelled: true }. */
  readonly signal?: { readonly aborted: boolean };
  /** Lets the front end yield to its event loop between stages (core has no timers). */
  readonly yieldControl?: () => Promise<void>;
}
