import { windowDates, windowStudyDays } from '../schedule/studyDay';
import { NO_STATUS, STATUS_CODE, STATUS_ORDER } from '../schedule/types';
import type { DeviationRow, LastRecord, TimingInput } from './timingTypes';

const { early: EARLY, late: LATE, missed: MISSED, extra: EXTRA, repeat: REPEAT } = STATUS_CODE;

/**
 * The deviation listing for follow-up (SPEC §4 c): every early, late and missed (subject, visit), and every extra and
 * repeat record, with the visit's target date, window dates, the actual date and the days off. Dated data give day
 * numbers (target and bounds from the subject's reference date, see windowDates); study-day data give study days (the
 * study days of the window's calendar bounds, see windowStudyDays). Days off are calendar days. Sorted by site, then subject (order of first appearance),
 * then study day. `siteOf` names each subject's site ("" when no site column). Cost O(rows + slots + k log k) for k
 * listed lines.
 * Example: a Week 12 record on study day 95 (target 85, window 78–92) → daysOff 10, status "late".
 */
export function listDeviations(input: TimingInput, siteOf: (subject: number) => string, lastOf: (subject: number) => LastRecord): DeviationRow[] {
  const { table, schedule, days, timing } = input;
  const V = timing.nVisits;
  const dated = table.timeKind === 'date';
  const lines: { row: DeviationRow; s: number; day: number }[] = [];
  const site = siteRanks(timing.nSubjects, siteOf);
  const bounds = (s: number, v: number): { opens: number; target: number; closes: number } => {
    const vis = schedule[v]!;
    return dated ? windowDates(days.referenceDay[s]!, vis) : windowStudyDays(vis);
  };
  const actual = (i: number): number => (dated ? table.date[i]! : days.studyDays[i]!);

  for (let s = 0; s < timing.nSubjects; s++) {
    if (timing.subjectInTiming[s] !== 1) continue;
    for (let v = 0; v < V; v++) {
      const code = timing.slotStatus[s * V + v]!;
      if (code !== EARLY && code !== LATE && code !== MISSED) continue;
      const r = timing.slotRow[s * V + v]!;
      const b = bounds(s, v);
      lines.push({
        s,
        day: schedule[v]!.targetDay,
        row: {
          subject: table.subjectIds[s]!,
          site: siteOf(s),
          visit: schedule[v]!.label,
          targetDate: b.target,
          windowOpens: b.opens,
          windowCloses: b.closes,
          actualDate: r >= 0 ? actual(r) : null,
          daysOff: r >= 0 ? timing.rowDeviation[r]! : null,
          status: STATUS_ORDER[code]!,
          sheetRow: r >= 0 ? table.sheetRows[r]! : null,
          lastRecord: lastOf(s),
        },
      });
    }
  }
  for (let i = 0; i < table.nRows; i++) {
    const code = timing.rowStatus[i]!;
    if (code === NO_STATUS || (code !== EXTRA && code !== REPEAT)) continue;
    const s = table.subjectIndex[i]!;
    const v = timing.rowVisit[i]!;
    const b = v >= 0 ? bounds(s, v) : null;
    lines.push({
      s,
      day: days.studyDays[i]!,
      row: {
        subject: table.subjectIds[s]!,
        site: siteOf(s),
        visit: v >= 0 ? schedule[v]!.label : (table.visit?.[i] ?? ''),
        targetDate: b?.target ?? null,
        windowOpens: b?.opens ?? null,
        windowCloses: b?.closes ?? null,
        actualDate: actual(i),
        daysOff: v >= 0 ? timing.rowDeviation[i]! : null,
        status: STATUS_ORDER[code]!,
        sheetRow: table.sheetRows[i]!,
        lastRecord: lastOf(s),
      },
    });
  }
  // Sorted by numbers only: the site's rank among the site names, the subject's index, the day.
  lines.sort((a, b) => site[a.s]! - site[b.s]! || a.s - b.s || a.day - b.day);
  return lines.map((l) => l.row);
}

/** Each subject's site as its rank among the distinct site names in code-unit order (the order of < on strings), so
 * sorting by rank sorts by name. O(subjects + sites log sites). */
function siteRanks(subjects: number, siteOf: (subject: number) => string): Int32Array {
  const names = new Map<string, number>();
  const nameOf: string[] = new Array<string>(subjects);
  for (let s = 0; s < subjects; s++) {
    const n = siteOf(s);
    nameOf[s] = n;
    names.set(n, 0);
  }
  [...names.keys()].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)).forEach((n, k) => names.set(n, k));
  const rank = new Int32Array(subjects);
  for (let s = 0; s < subjects; s++) rank[s] = names.get(nameOf[s]!)!;
  return rank;
}
