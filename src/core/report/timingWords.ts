/** The plain sentences of the visit-timing sheets: the cut-off, the summary of counts and the on-time rate note. */
import { isoDate } from '../schedule/dates';
import { formatCell } from './formats';
import type { TimingSummary } from './timingTypes';

export const ON_TIME_RATE_NOTE =
  'On-time rate = visits on time ÷ visits due. A visit is due unless its window is still open or yet to open at the cut-off ("not yet due"); missed visits count as due. Deviation = calendar days from the target date to the visit (negative = early), over the records that are the visits’ own (on time, early, late).';

const pct = (x: number | null): string => (x === null ? 'n/a' : formatCell(x, 'percent1'));
const plural = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;

/** How the cut-off reads in a sentence, e.g. "As of 2024-06-30 (the latest visit date in the data)". */
export function cutoffPhrase(summary: Pick<TimingSummary, 'cutoff' | 'cutoffRule' | 'dated'>): string {
  const { cutoff, cutoffRule, dated } = summary;
  if (cutoff === null) return dated ? 'With no usable dates in the data' : "As of each participant's last record (the data carry study days, not dates)";
  if (!dated) return `As of study day ${cutoff} (the given cut-off)`;
  return cutoffRule === 'given' ? `As of the cut-off ${isoDate(cutoff)}` : `As of ${isoDate(cutoff)} (the latest visit date in the data)`;
}

/** The one-paragraph plain summary of the counts and the cut-off heading the timing sheet. */
export function timingSummaryText(summary: TimingSummary): string {
  const c = summary.counts;
  const due = c.onTime + c.early + c.late + c.missed;
  return (
    `${cutoffPhrase(summary)}, ${plural(summary.subjects, 'participant', 'participants')} had ${plural(due, 'scheduled visit', 'scheduled visits')} due: ` +
    `${c.onTime} on time (${pct(due > 0 ? c.onTime / due : null)}), ${c.early} early, ${c.late} late and ${c.missed} missed; ` +
    `${plural(c.notYetDue, 'visit is', 'visits are')} not yet due. ` +
    (summary.exits.length > 0
      ? `${plural(summary.exits.length, 'participant', 'participants')} left the study; ${plural(c.afterExit, 'scheduled visit', 'scheduled visits')} after they left ${c.afterExit === 1 ? 'is' : 'are'} not expected. `
      : '') +
    `Besides the scheduled visits there ${c.extra === 1 ? 'was' : 'were'} ${plural(c.extra, 'unscheduled record', 'unscheduled records')} (matching no scheduled visit) and ${plural(c.repeat, 'repeat record', 'repeat records')} (a second record of a visit already matched).`
  );
}
