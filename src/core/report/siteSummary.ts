import { STATUS_CODE } from '../schedule/types';
import type { SiteSummaryRow, TimingInput } from './timingTypes';

const { onTime: ON_TIME, early: EARLY, late: LATE, missed: MISSED, notYetDue: NOT_YET_DUE, afterExit: AFTER_EXIT } = STATUS_CODE;

/**
 * The summary by site (SPEC §4 b): subjects in timing and how many of them left the study, visits not expected
 * because the participant had left, visits due (all but not yet due and not expected), on time, out of window
 * (early + late), missed, and each as a rate of visits due; sorted worst first by the combined rate (out of window +
 * missed) / due, then by the combined count, then by site name. Null rates when nothing is due (sorted last).
 * Cost O(subjects · visits + sites · log sites).
 * Example: site 01 with 4 due, 1 late and 1 missed → outOfWindowRate 0.25, missedRate 0.25, combinedRate 0.5.
 */
export function summarizeBySite(input: TimingInput, sites: { readonly names: readonly string[]; readonly group: Int32Array }): SiteSummaryRow[] {
  const { timing } = input;
  const V = timing.nVisits;
  const G = sites.names.length;
  const subjects = new Float64Array(G);
  const due = new Float64Array(G);
  const onTime = new Float64Array(G);
  const out = new Float64Array(G);
  const missed = new Float64Array(G);
  const afterExit = new Float64Array(G);
  const left = new Float64Array(G);
  for (let s = 0; s < timing.nSubjects; s++) {
    if (timing.subjectInTiming[s] !== 1) continue;
    const g = sites.group[s]!;
    subjects[g]!++;
    if (Number.isFinite(timing.exitOffset[s]!)) left[g]!++;
    for (let v = 0; v < V; v++) {
      const code = timing.slotStatus[s * V + v]!;
      if (code === AFTER_EXIT) {
        afterExit[g]!++;
        continue;
      }
      if (code !== NOT_YET_DUE) due[g]!++;
      if (code === ON_TIME) onTime[g]!++;
      else if (code === EARLY || code === LATE) out[g]!++;
      else if (code === MISSED) missed[g]!++;
    }
  }
  const rate = (k: number, g: number): number | null => (due[g]! > 0 ? k / due[g]! : null);
  const rows: SiteSummaryRow[] = [];
  for (let g = 0; g < G; g++) {
    if (subjects[g] === 0) continue;
    rows.push({
      site: sites.names[g]!,
      subjects: subjects[g]!,
      due: due[g]!,
      onTime: onTime[g]!,
      outOfWindow: out[g]!,
      missed: missed[g]!,
      afterExit: afterExit[g]!,
      left: left[g]!,
      onTimeRate: rate(onTime[g]!, g),
      outOfWindowRate: rate(out[g]!, g),
      missedRate: rate(missed[g]!, g),
      combinedRate: rate(out[g]! + missed[g]!, g),
    });
  }
  return rows.sort(
    (a, b) =>
      (b.combinedRate ?? -1) - (a.combinedRate ?? -1) ||
      b.outOfWindow + b.missed - (a.outOfWindow + a.missed) ||
      (a.site < b.site ? -1 : a.site > b.site ? 1 : 0),
  );
}
