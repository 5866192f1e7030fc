/** Types of the visit schedule and of the visit-timing result (SPEC §4). */

/** One scheduled visit: label, target study day, and the days allowed before and after it (bounds included). */
export interface ScheduleVisit {
  readonly label: string;
  readonly targetDay: number;
  readonly before: number;
  readonly after: number;
}

/** Status words; JSON uses these keys, sheets show the plain words of STATUS_WORDS. */
export type VisitStatus = 'onTime' | 'early' | 'late' | 'missed' | 'notYetDue' | 'afterExit' | 'extra' | 'repeat';

export const STATUS_WORDS: Readonly<Record<VisitStatus, string>> = {
  onTime: 'On time',
  early: 'Early',
  late: 'Late',
  missed: 'Missed',
  notYetDue: 'Not yet due',
  afterExit: 'Not expected (left)',
  extra: 'Unscheduled',
  repeat: 'Repeat',
};

export type StatusCounts = Readonly<Record<VisitStatus, number>>;

/** Status codes in per-row and per-visit typed arrays: the index into STATUS_ORDER; NO_STATUS where none applies. */
export const STATUS_ORDER: readonly VisitStatus[] = ['onTime', 'early', 'late', 'missed', 'notYetDue', 'afterExit', 'extra', 'repeat'];
export const STATUS_CODE: Readonly<Record<VisitStatus, number>> = {
  onTime: 0,
  early: 1,
  late: 2,
  missed: 3,
  notYetDue: 4,
  afterExit: 5,
  extra: 6,
  repeat: 7,
};
/** Number of statuses a (subject, scheduled visit) slot can have: the codes 0 .. SLOT_STATUSES − 1. */
export const SLOT_STATUSES = 6;
/** Code for a row left out of visit timing, or a (subject, visit) slot of a subject with no usable record. */
export const NO_STATUS = 255;

/** Problems found by the schedule layer; like intake issues, each carries a cell address when one applies. */
export type ScheduleIssueCode =
  | 'schedule-empty' // no header or no visit rows
  | 'schedule-missing-column' // a needed heading was not found
  | 'schedule-blank-label'
  | 'schedule-duplicate-label'
  | 'schedule-bad-target-day'
  | 'schedule-zero-target-day'
  | 'schedule-bad-allowance'
  | 'schedule-duplicate-target-day' // two visits with the same target day (error)
  | 'schedule-overlap' // two windows share days (warning)
  | 'no-reference-date' // a dated row whose subject has no reference date
  | 'no-baseline-record' // a dated row whose subject has no record of the first scheduled visit
  | 'after-cutoff' // a record dated after the data cut-off
  | 'after-exit'; // a record dated after the participant's exit date (kept)

export interface ScheduleIssue {
  readonly code: ScheduleIssueCode;
  readonly severity: 'error' | 'warning';
  /** e.g. "Schedule!B4" or "Visits!D17"; null when no single cell applies. */
  readonly cell: string | null;
  /** 1-based worksheet row, or null. */
  readonly row: number | null;
  /** The offending value as text ("" for blank). */
  readonly value: string;
  /** 'timing' when the issue leaves a data row out of visit timing; null for schedule-table issues. */
  readonly use: 'timing' | null;
  readonly message: string;
}

/** Outcome of reading a schedule table: ok is false when any error-level issue was found. */
export interface ParseScheduleResult {
  readonly ok: boolean;
  /** The valid visits, sorted by target day (empty when the table could not be read at all). */
  readonly schedule: readonly ScheduleVisit[];
  readonly issues: readonly ScheduleIssue[];
}

/** Calendar offsets and study days per row, and the day number used as each subject's reference date (day 1). */
export interface StudyDays {
  /** Study day per data row (CDISC, no day 0; for display); NaN when the row cannot serve visit timing. */
  readonly studyDays: Float64Array;
  /** Calendar days from the subject's reference date per data row (0 on the reference date, −1 the day before): what
   * windows, deviations and model time are computed on. NaN when the row cannot serve visit timing. */
  readonly offsets: Float64Array;
  /** Per subject (index into table.subjectIds): the reference date as a day number; NaN when unknown or when the
   * data carry study days only. */
  readonly referenceDay: Float64Array;
  readonly issues: readonly ScheduleIssue[];
}

/** How the cut-off was set: given by the user, the latest date in the data, or (study-day data without a given
 * cut-off) each subject's own last record. */
export type CutoffRule = 'given' | 'latestDate' | 'eachSubjectsLastRecord';

/** Output of classifyVisits: per-row and per-(subject, visit) results in typed arrays. */
export interface VisitTiming {
  readonly nVisits: number;
  readonly nSubjects: number;
  /** Per row: status code (STATUS_CODE), NO_STATUS for rows left out of timing. */
  readonly rowStatus: Uint8Array;
  /** Per row: index of the scheduled visit the row is matched to, or -1 (extra or left out). */
  readonly rowVisit: Int32Array;
  /** Per row: calendar days from the matched visit's target (offset − target offset; on time, early, late, repeat),
   * else NaN. Negative = early. */
  readonly rowDeviation: Float64Array;
  /** Per slot s = subject * nVisits + visit: status code (on time, early, late, missed, not yet due), NO_STATUS for
   * subjects with no usable record. */
  readonly slotStatus: Uint8Array;
  /** Per slot: the row index of the visit's record, or -1. */
  readonly slotRow: Int32Array;
  /** Per subject: the exit date as a calendar offset from the reference date (NaN when none, or study-day data). */
  readonly exitOffset: Float64Array;
  /** Per subject: 1 when the subject takes part in visit timing (has at least one usable record). */
  readonly subjectInTiming: Uint8Array;
  /** Per subject: the cut-off as a calendar offset from that subject's reference date (NaN for subjects not in
   * timing). */
  readonly cutoffOffset: Float64Array;
  /** The cut-off as a day number (dated data) or a study day (study-day data with a given cut-off); null when each
   * subject's own last record serves. */
  readonly cutoff: number | null;
  readonly cutoffRule: CutoffRule;
  readonly counts: StatusCounts;
  readonly issues: readonly ScheduleIssue[];
}
