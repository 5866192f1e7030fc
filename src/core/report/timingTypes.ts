/** Plain-data visit-timing reports (SPEC §4 a–d), computed once and rendered as sheets and as JSON. */
import type { IntakeTable } from '../intake/types';
import type { CutoffRule, ScheduleVisit, StatusCounts, StudyDays, VisitStatus, VisitTiming } from '../schedule/types';

/** Everything the timing reports read. */
export interface TimingInput {
  readonly table: IntakeTable;
  readonly schedule: readonly ScheduleVisit[];
  readonly days: StudyDays;
  readonly timing: VisitTiming;
}

/**
 * One scheduled visit (optionally within one arm). Visits due = expected − not yet due. On-time rate = on time / visits
 * due (null when none is due). Deviations (days, record − target) are summarised over the visit's records that are on
 * time, early or late; null when there are none.
 */
export interface VisitSummaryRow {
  readonly visit: string;
  readonly targetDay: number;
  /** Present in the by-arm table only. */
  readonly arm?: string;
  readonly expected: number;
  readonly onTime: number;
  readonly early: number;
  readonly late: number;
  readonly missed: number;
  readonly notYetDue: number;
  /** Not expected: the participant had left the study by the window's last day (not part of `expected`). */
  readonly afterExit: number;
  readonly due: number;
  readonly onTimeRate: number | null;
  readonly medianDeviation: number | null;
  readonly minDeviation: number | null;
  readonly maxDeviation: number | null;
}

/** One site: rates are over the site's visits due; combined = out of window + missed. */
export interface SiteSummaryRow {
  readonly site: string;
  readonly subjects: number;
  readonly due: number;
  readonly onTime: number;
  readonly outOfWindow: number;
  readonly missed: number;
  /** Scheduled visits not expected because the participant had left (not part of `due`). */
  readonly afterExit: number;
  /** Participants of the site who left the study (with an exit date). */
  readonly left: number;
  readonly onTimeRate: number | null;
  readonly outOfWindowRate: number | null;
  readonly missedRate: number | null;
  readonly combinedRate: number | null;
}

/**
 * One line of the deviation listing: an early, late or missed visit, or an extra or repeat record. Dates are day
 * numbers (0 = 1899-12-30) for dated data and study days for study-day data; null where they do not apply (an extra
 * record has no target, a missed visit no actual date).
 */
export interface DeviationRow {
  readonly subject: string;
  readonly site: string;
  readonly visit: string;
  readonly targetDate: number | null;
  readonly windowOpens: number | null;
  readonly windowCloses: number | null;
  readonly actualDate: number | null;
  /** Record − target in days (negative = early); null for missed visits and extra records. */
  readonly daysOff: number | null;
  readonly status: VisitStatus;
  /** Worksheet row of the record, null for a missed visit. */
  readonly sheetRow: number | null;
  /** The participant's latest record (day number or study day) and the calendar days from it to the cut-off. */
  readonly lastRecord: LastRecord;
}

/** A participant's latest record as of the cut-off: when it was, how long ago, and whether that is a long silence. */
export interface LastRecord {
  /** Day number (dated data) or study day; null when unknown. */
  readonly date: number | null;
  /** Calendar days from the latest record to the cut-off; null when there is no cut-off. */
  readonly daysSince: number | null;
  /** True when the participant has no record for longer than two scheduled intervals (and no exit date). */
  readonly silent: boolean;
}

/** A participant who left the study (has an exit date), for the list of participants who left. */
export interface ExitRow {
  readonly subject: string;
  readonly site: string;
  /** Exit date as a day number. */
  readonly exitDate: number;
  /** Study day of the exit (CDISC rule, from the participant's reference date). */
  readonly exitStudyDay: number | null;
  /** The last scheduled visit with a record before leaving ("" when none). */
  readonly lastVisit: string;
  readonly status: string;
  readonly reason: string;
}

export type DueStatus = 'overdue' | 'windowOpen' | 'comingUp';

/** Plain words for DueStatus on sheets. */
export const DUE_WORDS: Readonly<Record<DueStatus, string>> = {
  overdue: 'Overdue',
  windowOpen: 'Window open now',
  comingUp: 'Coming up',
};

/** A subject still in follow-up and their next scheduled visit without a record, as of the cut-off. */
export interface DueRow {
  readonly subject: string;
  readonly site: string;
  readonly visit: string;
  readonly windowOpens: number;
  readonly targetDate: number;
  readonly windowCloses: number;
  /** Calendar days from the cut-off to the target (negative = the target has passed). */
  readonly daysUntilTarget: number;
  readonly status: DueStatus;
  readonly lastRecord: LastRecord;
}

export interface TimingSummary {
  /** True when dates (day numbers) are shown; false for study-day data. */
  readonly dated: boolean;
  /** Day number (dated data), study day (study-day data with a given cut-off), or null (each subject's last record). */
  readonly cutoff: number | null;
  readonly cutoffRule: CutoffRule;
  /** Subjects taking part in visit timing. */
  readonly subjects: number;
  readonly counts: StatusCounts;
  readonly byVisit: readonly VisitSummaryRow[];
  /** By arm and visit in unblinded mode; null in blinded mode. */
  readonly byArm: readonly VisitSummaryRow[] | null;
  /** Null when no site column is mapped. */
  readonly bySite: readonly SiteSummaryRow[] | null;
  readonly deviations: readonly DeviationRow[];
  readonly upcoming: readonly DueRow[];
  /** Participants who left the study, in order of exit date; empty without an exit column. */
  readonly exits: readonly ExitRow[];
  /** Whether an exit-date column was mapped (and the data carry dates, so it could be used). */
  readonly exitKnown: boolean;
  /** How many days without a record mark a participant as silent (two scheduled intervals); null with one visit. */
  readonly silenceDays: number | null;
}
