/**
 * The one place where issue sentences are written. Every issue's message is rendered here from its code, role, value,
 * cell and use, plus an optional short context (a column name, a participant id, a count) for the few codes that need it.
 */
import type { IssueCode, Role, Use } from './types';

/** What a message is rendered from. */
export interface MessageInput {
  readonly code: IssueCode;
  readonly role: Role | null;
  /** The offending value as text ("" for blank). */
  readonly value: string;
  readonly cell: string | null;
  readonly use: Use | null;
  /** Extra words some codes need: the column name of a covariate, the participant of an arm conflict, a count. */
  readonly context?: string;
  /** A second value some sentences compare with, e.g. the reference date first given for the participant. */
  readonly other?: string;
}

const ROLE_WORDS: Readonly<Record<Role, string>> = {
  subject: 'participant',
  date: 'visit date',
  studyDay: 'study day',
  reference: 'reference date',
  visit: 'visit name',
  value: 'value',
  arm: 'arm',
  site: 'site',
  exit: 'exit date',
  exitStatus: 'end-of-study status',
  exitReason: 'reason for leaving',
  responder: 'yes/no answer',
  covariate: 'covariate',
};

/** Plain words for a role, e.g. "visit date" for 'date'. */
export function roleWords(role: Role): string {
  return ROLE_WORDS[role];
}

function useWords(use: Use | null): string {
  if (use === 'timing') return 'left out of the visit-timing checks';
  if (use === 'model') return 'left out of the model';
  return 'kept';
}

/** The date forms intake reads, as one sentence (shown when a whole date column cannot be read). */
export const ACCEPTED_FORMS =
  'Accepted forms: ISO 8601 dates and date-times (2025-01-12, 2025-01-12T08:30, 2025-01-12 08:30:00), day-month-name-year (12JAN2025, 12-Jan-2025, 12 jan 2025), day/month/year or month/day/year with "/", "." or "-" (12/01/2025, decided per column or by the date order setting), and spreadsheet date cells.';

/** Why a date text is not a date, from the context intake gives a 'bad-date' or 'bad-reference-date' issue. */
function dateReason(context: string | undefined): string {
  switch (context) {
    case 'impossible':
      return 'no such day exists (dates run from 1900-01-01 to 9999-12-31)';
    case 'two-digit-year':
      return 'the year has two digits, and the century is never guessed; write the year with four digits';
    case 'order-dmy':
    case 'order-mdy':
      return `it cannot be read as ${context === 'order-dmy' ? 'day/month/year' : 'month/day/year'}, the order this column's dates are read in`;
    case 'serial':
      return 'it is not a date serial between 1900-01-01 and 9999-12-31 in this date system';
    default:
      return 'dates are read as ISO 8601 (2025-03-04), day-month-name-year (04MAR2025) or day and month as numbers (04/03/2025), each a real day from 1900-01-01 to 9999-12-31';
  }
}

/** Why a visit date is far outside the data (context of an 'implausible-date' issue; other: the bound as a date). */
function implausibleReason(context: string | undefined, bound: string | undefined): string {
  switch (context) {
    case 'after-run':
      return `after the day of this run (${bound ?? 'today'})`;
    case 'after-schedule':
      return `after ${bound ?? 'the end of the schedule'}, more than ${PLAUSIBLE_SLACK_DAYS} days after the last scheduled window of the latest reference date`;
    default:
      return `more than ${PLAUSIBLE_SLACK_DAYS} days before the earliest window of the schedule, counted from this row's reference date ${bound ?? ''}`.trimEnd();
  }
}

/** How far, in days, a visit date may lie beyond what the schedule allows before it is called implausible. */
export const PLAUSIBLE_SLACK_DAYS = 180;

/** Values longer than this are shown shortened in sentences (the issue's `value` keeps them whole). */
const SHOWN_VALUE = 200;

function quoted(value: string): string {
  if (value.length <= SHOWN_VALUE) return `"${value}"`;
  return `"${value.slice(0, SHOWN_VALUE)}…" (${value.length.toLocaleString('en-US')} characters)`;
}

/**
 * The plain sentence for an issue. Row-level sentences start with the cell address.
 * @example renderMessage({ code: 'blank-value', role: 'value', value: '', cell: 'Visits!F7', use: 'model' })
 * // "Visits!F7: the value is blank, so the row is left out of the model."
 */
export function renderMessage(m: MessageInput): string {
  const at = m.cell === null ? '' : `${m.cell}: `;
  const role = m.role === null ? 'cell' : m.role === 'covariate' && m.context !== undefined ? `covariate ${quoted(m.context)}` : ROLE_WORDS[m.role];
  const left = useWords(m.use);
  switch (m.code) {
    case 'empty-header':
      return 'The header row is empty: the first row of the range must name the columns.';
    case 'no-rows':
      return 'The range has a header row but no data rows.';
    case 'no-subject-column':
      return 'No column is mapped to the participant; every row needs a participant.';
    case 'no-time-column':
      return 'No column is mapped to a visit date or a study day; visit timing and the model need one of them.';
    case 'no-value-column':
      return 'No column is mapped to the value: the visit-timing checks can run, but every row is left out of the model.';
    case 'no-arm-column':
      return 'Unblinded mode needs a column mapped to the arm.';
    case 'arm-column-blinded':
      return `Column ${quoted(m.value)} names the treatment arm, so a blinded run cannot read it (here as the ${role}); unmap it, or use unblinded mode if you are allowed to see results by arm.`;
    case 'duplicate-role':
      return `Column ${quoted(m.value)} is mapped to more than one role (${m.context ?? ''}); a column can play one role only.`;
    case 'column-outside-range':
      return `The ${role} is mapped to column ${m.value}, which is outside the range.`;
    case 'subject-in-two-arms':
      return `${at}participant ${quoted(m.context ?? '')} is in arm ${quoted(m.value)} here but in ${m.other === undefined ? 'another arm' : `arm ${quoted(m.other)}`} elsewhere; a participant must stay in one arm.`;
    case 'too-few-subjects-per-arm':
      return `Arm ${quoted(m.value)} has ${m.context ?? 'fewer than two'} participant(s) with usable rows; unblinded mode needs at least two participants in every arm.`;
    case 'unknown-reference-arm':
      return `The reference arm ${quoted(m.value)} is not among the arms in the data (${m.context ?? ''}); choose one of them, since the reference arm decides the sign of every treatment difference.`;
    case 'too-few-arms':
      return `Unblinded mode needs at least two arms; the usable rows have ${m.context ?? 'fewer'}.`;
    case 'no-usable-rows':
      return m.use === 'model'
        ? 'No row has everything the model needs (a numeric value, and an arm and covariates where mapped), so the model cannot run.'
        : 'No data row has both a participant and a valid visit date or study day, so there is nothing to analyse.';
    case 'blank-row':
      // The run's one summary (context: how many rows, other: which) or, in the excluded-row list, one span's reason.
      return m.context === undefined
        ? `${at}the whole row is blank, so it is ${m.use === null ? 'left out of the visit-timing checks and the model' : left}.`
        : `${at}${m.context === '1' ? 'one blank row is' : `${Number(m.context).toLocaleString('en-US')} blank rows are`} skipped (worksheet row${m.context === '1' ? '' : 's'} ${m.other ?? ''}); a blank row is left out of the visit-timing checks and the model.`;
    case 'duplicate-header':
      return `${at}columns ${m.other ?? ''} and ${m.cell ?? ''} are both headed ${quoted(m.value)}, so neither is used${m.role === null ? '' : ` as the ${role}`} until you say which: choose the column in the pane's column roles, or on the command line give --map ${m.role === 'subject' ? 'participant' : (m.role ?? 'role')}="column ${m.context ?? 'letter'}" (a column's letter, as the spreadsheet shows it).`;
    case 'long-text':
      return `${at}${m.role === null ? 'this header' : `the ${role}`} holds ${m.context ?? 'more than 32,767'} characters, more than a spreadsheet cell can hold (32,767): the report workbook shows it cut, and the results JSON keeps it whole up to ${m.other ?? 'its cap'} characters. The row is kept.`;
    case 'implausible-date':
      return `${at}the ${role} ${m.value} lies ${implausibleReason(m.context, m.other)}; the record is kept, but it is not used to set the default cut-off. Check the year.`;
    case 'blank-subject':
      return `${at}the participant is blank, so the row is ${left}.`;
    case 'blank-time':
      return `${at}the ${role} is blank, so the row is ${left}.`;
    case 'bad-date':
      return m.context === 'serial'
        ? `${at}${m.value} is not a date serial between 1900-01-01 and 9999-12-31 in this workbook's date system (in the 1900 system, serial 60 stands for 1900-02-29, a day that never existed), so the row is ${left}.`
        : `${at}${quoted(m.value)} is not a valid ${role}: ${dateReason(m.context)}, so the row is ${left}.`;
    case 'partial-date':
      return m.use === null
        ? `${at}${quoted(m.value)} is a partial date (a day or month is missing) and is never guessed, so this row's ${role} is treated as missing; the row is kept.`
        : `${at}${quoted(m.value)} is a partial date (a day or month is missing): the visit cannot be timed, and the missing part is never guessed. The row is ${left}.`;
    case 'bad-reference-date':
      return `${at}${quoted(m.value)} is not a valid date (${dateReason(m.context)}), so this row's reference date is treated as missing; the row is kept.`;
    case 'date-order-unknown':
      return `Column ${quoted(m.value)} (${role}) writes the day and month as numbers, and every such value reads both as day/month/year and as month/day/year (e.g. ${m.context ?? ''}). Say which order the column uses: --date-order dmy or --date-order mdy on the command line, or "Order of day and month" in the pane's settings.`;
    case 'date-order-mixed':
      return `Column ${quoted(m.value)} (${role}) has dates that can only be day/month/year (e.g. ${m.context ?? ''}) and others that can only be month/day/year (e.g. ${m.other ?? ''}). Correct the column, or choose the order (--date-order dmy or mdy, or "Order of day and month" in the pane's settings); values the chosen order cannot read are then left out with their cell address.`;
    case 'unreadable-date-column':
      return `Column ${quoted(m.value)} (${role}) has no value that can be read as a date (e.g. ${m.context ?? ''}). ${ACCEPTED_FORMS}${m.other === 'two-digit-year' ? ' Two-digit years are not read, since the century would be a guess: write the year with four digits.' : ''}`;
    case 'bad-study-day':
      return /^[+-]?0+(\.0*)?$/.test(m.value)
        ? `${at}study day 0 does not exist: by the CDISC convention the reference date is day 1 and the day before it is day -1. The row is ${left}.`
        : `${at}${quoted(m.value)} is not a study day: a study day is a whole number other than 0. The row is ${left}.`;
    case 'blank-value':
      return `${at}the ${role} is blank, so the row is ${left}.`;
    case 'text-in-numeric':
      return `${at}${quoted(m.value)} is not a number, and the ${role} must be a number, so the row is ${left}.`;
    case 'not-finite':
      return `${at}${quoted(m.value)} is not a finite number, so the row is ${left}.`;
    case 'error-value':
      return m.use === null
        ? `${at}the spreadsheet error value ${m.value} in the ${role} column is treated as blank; the row is kept.`
        : `${at}the ${role} holds the spreadsheet error value ${m.value}, so the row is ${left}.`;
    case 'reference-date-differs':
      return `${at}the reference date ${m.value} differs from ${m.other ?? 'the one'} given earlier for participant ${quoted(m.context ?? '')}; a participant has one reference date. The row is kept with its own reference date.`;
    case 'bad-exit-date':
      return `${at}${quoted(m.value)} is not a valid date, so it is not used as this participant's exit date; the row is kept.`;
    case 'exit-date-differs':
      return `${at}the exit date ${m.value} differs from ${m.other ?? 'another one'} given for participant ${quoted(m.context ?? '')}; a participant leaves once, so the latest date is used. The row is kept.`;
    case 'after-exit':
      return `${at}the record is dated after the participant's exit date${m.other === undefined ? '' : ` ${m.other}`} (data after the exit date); it is kept.`;
    case 'blank-arm':
      return `${at}the arm is blank, so the row is ${left}.`;
    case 'no-reference-date':
      return `${at}participant ${quoted(m.value)} has no reference date on any row, so the row is ${left}.`;
    case 'no-baseline-record':
      return `${at}participant ${quoted(m.value)} has no dated record of the first scheduled visit to count study days from, so the row is ${left}.`;
    case 'after-cutoff':
      return `${at}the record is dated after the data cut-off, so it is ${left}.`;
    case 'model-not-fitted':
      return `The model could not be fitted${m.context === undefined ? '' : `: ${m.context.replace(/\.+$/, '')}`}. The visit-timing results stand.`;
    case 'bad-covariate':
      return `${at}covariate ${quoted(m.context ?? '')} is treated as categorical because this cell holds the text ${quoted(m.value)}; make every cell a number to use it as a numeric covariate.`;
  }
}
