import { siteGroups, armGroups } from './groups';
import { deviationOrder, deviationRows } from './deviationList';
import { lazyProperty } from '../intake/lazyProperty';
import { summarizeBySite } from './siteSummary';
import type { TimingInput, TimingSummary } from './timingTypes';
import { summarizeByVisit } from './visitSummary';
import { dueOrder, dueRows } from './visitsDue';
import { exitOrder, exitRows, lastRecordOf, silenceThreshold } from './participants';

/**
 * All visit-timing reports as plain data (SPEC §4 a–d): counts, by visit, by arm and visit (unblinded mode only,
 * i.e. when table.arm is not null), by site (when a site column is mapped), the deviation listing and the visits due.
 * Cost O(rows + subjects · visits) plus the sorts of distinct days; the listings' rows are made when first read.
 */
export function summarizeTiming(input: TimingInput): TimingSummary {
  const { table, timing } = input;
  const sites = siteGroups(table);
  const arms = armGroups(table);
  const siteOf = (s: number): string => (sites === null ? '' : sites.names[sites.group[s]!]!);
  const silenceDays = silenceThreshold(input);
  const lastOf = lastRecordOf(input, silenceDays);
  let subjects = 0;
  for (let s = 0; s < timing.nSubjects; s++) subjects += timing.subjectInTiming[s]!;
  // The three listings are computed here as numbers in their order; their rows (one object per line) are made when
  // the listing is first read, i.e. when a sheet or the JSON is written.
  const deviationLines = deviationOrder(input, siteOf);
  const due = dueOrder(input);
  const left = exitOrder(input);
  const summary = {
    dated: table.timeKind === 'date',
    cutoff: timing.cutoff,
    cutoffRule: timing.cutoffRule,
    subjects,
    counts: timing.counts,
    byVisit: summarizeByVisit(input),
    byArm: arms === null ? null : summarizeByVisit(input, arms),
    bySite: sites === null ? null : summarizeBySite(input, sites),
    deviations: null,
    upcoming: null,
    exits: null,
    exitKnown: table.mapping.exit !== undefined && table.timeKind === 'date',
    silenceDays,
  };
  lazyProperty(summary, 'deviations', () => deviationRows(input, deviationLines, siteOf, lastOf));
  lazyProperty(summary, 'upcoming', () => dueRows(input, due, siteOf, lastOf));
  lazyProperty(summary, 'exits', () => exitRows(input, left, siteOf));
  return summary as unknown as TimingSummary;
}
