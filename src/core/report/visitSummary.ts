import { SLOT_STATUSES, STATUS_CODE } from '../schedule/types';
import type { TimingInput, VisitSummaryRow } from './timingTypes';
import { medianMinMax } from './numberOrder';

// Local copies of the shared constants, read in the loops below.
const SLOTS = SLOT_STATUSES;
const CODE = { ...STATUS_CODE };

/**
 * The summary by scheduled visit (SPEC §4 a), one row per visit in order of target day, or per (group, visit) when
 * subjects are grouped (by arm). Counts come from the (subject, visit) statuses of subjects in timing; visits not
 * expected because the participant had left (afterExit) are counted apart and are not expected; visits due =
 * expected − not yet due; on-time rate = on time / due; median, min and max deviation over the visits' own records
 * (on time, early, late), in calendar days (the classification's own deviations). Cost O(subjects · visits + records) (medians by selection).
 * Example: 2 subjects, Week 12 on time (deviation −2) and late (+9) → expected 2, due 2, on-time rate 0.5, median 3.5.
 */
export function summarizeByVisit(
  input: TimingInput,
  groups?: { readonly names: readonly string[]; readonly group: Int32Array },
): VisitSummaryRow[] {
  const { schedule, timing } = input;
  const V = timing.nVisits;
  const G = groups?.names.length ?? 1;
  const counts = new Float64Array(G * V * SLOTS);
  // The per-slot arrays as locals, and one group (0) when not grouped: the loops below run over every slot.
  const S = timing.nSubjects;
  const inTiming = timing.subjectInTiming;
  const slotStatus = timing.slotStatus;
  const slotRow = timing.slotRow;
  const rowDeviation = timing.rowDeviation;
  const group = groups?.group ?? new Int32Array(S);
  // The deviations of each (group, visit) in one typed array: counted first, then placed, then each part selected.
  const starts = new Int32Array(G * V + 1);
  for (let s = 0; s < S; s++) {
    if (inTiming[s] !== 1) continue;
    const gv = group[s]! * V;
    for (let v = 0; v < V; v++) {
      const k = s * V + v;
      counts[(gv + v) * SLOTS + slotStatus[k]!]!++;
      if (slotRow[k]! >= 0) starts[gv + v + 1]!++;
    }
  }
  for (let k = 0; k < G * V; k++) starts[k + 1]! += starts[k]!;
  const all = new Float64Array(starts[G * V]!);
  const fill = starts.slice(0, G * V);
  for (let s = 0; s < S; s++) {
    if (inTiming[s] !== 1) continue;
    const gv = group[s]! * V;
    for (let v = 0; v < V; v++) {
      const r = slotRow[s * V + v]!;
      if (r >= 0) all[fill[gv + v]!++] = rowDeviation[r]!;
    }
  }
  const order = Array.from({ length: V }, (_, v) => v).sort((a, b) => schedule[a]!.targetDay - schedule[b]!.targetDay || a - b);
  const rows: VisitSummaryRow[] = [];
  for (let g = 0; g < G; g++) {
    for (const v of order) {
      const c = (code: number): number => counts[(g * V + v) * SLOTS + code]!;
      const onTime = c(CODE.onTime);
      const early = c(CODE.early);
      const late = c(CODE.late);
      const missed = c(CODE.missed);
      const notYetDue = c(CODE.notYetDue);
      const afterExit = c(CODE.afterExit);
      const expected = onTime + early + late + missed + notYetDue;
      const due = expected - notYetDue;
      const d = medianMinMax(all.subarray(starts[g * V + v]!, starts[g * V + v + 1]!));
      rows.push({
        visit: schedule[v]!.label,
        targetDay: schedule[v]!.targetDay,
        ...(groups ? { arm: groups.names[g]! } : {}),
        expected,
        onTime,
        early,
        late,
        missed,
        notYetDue,
        afterExit,
        due,
        onTimeRate: due > 0 ? onTime / due : null,
        medianDeviation: d === null ? null : d.median,
        minDeviation: d === null ? null : d.min,
        maxDeviation: d === null ? null : d.max,
      });
    }
  }
  return rows;
}
