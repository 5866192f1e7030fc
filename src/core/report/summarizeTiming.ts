import { siteGroups, armGroups } from './groups';
import { listDeviations } from './deviationList';
import { summarizeBySite } from './siteSummary';
import type { TimingInput, TimingSummary } from './timingTypes';
import { summarizeByVisit } from './visitSummary';
import { listVisitsDue } from './visitsDue';
import { lastRecordOf, listExits, silenceThreshold } from './participants';

/**
 * All visit-timing reports as plain data (SPEC §4 a–d): counts, by visit, by arm and visit (unblinded mode only,
 * i.e. when table.arm is not null), by site (when a site column is mapped), the deviation listing and the visits due.
 * Cost O(rows + subjects · visits + k log k) for the sorted lists.
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
  return {
    dated: table.timeKind === 'date',
    cutoff: timing.cutoff,
    cutoffRule: timing.cutoffRule,
    subjects,
    counts: timing.counts,
    byVisit: summarizeByVisit(input),
    byArm: arms === null ? null : summarizeByVisit(input, arms),
    bySite: sites === null ? null : summarizeBySite(input, sites),
    deviations: listDeviations(input, siteOf, lastOf),
    upcoming: listVisitsDue(input, siteOf, lastOf),
    exits: listExits(input, siteOf),
    exitKnown: table.mapping.exit !== undefined && table.timeKind === 'date',
    silenceDays,
  };
}
