import { textCodesOf } from '../intake/textCodes';
import { windowOffsets, windowStudyDays } from '../schedule/studyDay';
import { STATUS_CODE, STATUS_ORDER } from '../schedule/types';
import type { DeviationRow, LastRecord, TimingInput } from './timingTypes';

const { early: EARLY, late: LATE, missed: MISSED, extra: EXTRA, repeat: REPEAT } = STATUS_CODE;

/**
 * The deviation listing for follow-up (SPEC §4 c): every early, late and missed (subject, visit), and every extra and
 * repeat record, with the visit's target date, window dates, the actual date and the days off. Dated data give day
 * numbers (target and bounds from the subject's reference date, see windowDates); study-day data give study days (the
 * study days of the window's calendar bounds, see windowStudyDays). Days off are calendar days. Sorted by site, then subject (order of first appearance),
 * then study day (ties in the order found). `siteOf` names each subject's site ("" when no site column). Cost O(rows + slots + sites log sites) plus a small insertion sort per subject, for k
 * listed lines.
 * Example: a Week 12 record on study day 95 (target 85, window 78–92) → daysOff 10, status "late".
 */
export function listDeviations(input: TimingInput, siteOf: (subject: number) => string, lastOf: (subject: number) => LastRecord): DeviationRow[] {
  return deviationRows(input, deviationOrder(input, siteOf), siteOf, lastOf);
}

/**
 * The deviation listing as numbers, in its order: per line a slot s·V + v (an early, late or missed visit) as itself,
 * or a record i (extra or repeat) as −(i + 1). Rows are made from it by deviationRows when the listing is written.
 * O(rows + slots + sites log sites) plus a small insertion sort per subject.
 */
export function deviationOrder(input: TimingInput, siteOf: (subject: number) => string): Int32Array {
  const { table, days, timing, schedule } = input;
  const V = timing.nVisits;
  const S = timing.nSubjects;

  // The listed lines as numbers only: a slot s·V + v (an early, late or missed visit) as itself, a record i (extra or
  // repeat) as −(i + 1). Lines are bucketed by subject in the order they are found (slots first, then records).
  const slotListed = (k: number): boolean => {
    const code = timing.slotStatus[k]!;
    return code === EARLY || code === LATE || code === MISSED;
  };
  const rowListed = (i: number): boolean => {
    const code = timing.rowStatus[i]!;
    return code === EXTRA || code === REPEAT;
  };
  const start = new Int32Array(S + 1);
  for (let s = 0; s < S; s++) {
    if (timing.subjectInTiming[s] !== 1) continue;
    for (let v = 0; v < V; v++) if (slotListed(s * V + v)) start[s + 1]!++;
  }
  for (let i = 0; i < table.nRows; i++) if (rowListed(i)) start[table.subjectIndex[i]! + 1]!++;
  for (let s = 0; s < S; s++) start[s + 1]! += start[s]!;
  const total = start[S]!;
  const ref = new Int32Array(total);
  const day = new Float64Array(total);
  const fill = start.slice(0, S);
  for (let s = 0; s < S; s++) {
    if (timing.subjectInTiming[s] !== 1) continue;
    for (let v = 0; v < V; v++) {
      if (!slotListed(s * V + v)) continue;
      const j = fill[s]!++;
      ref[j] = s * V + v;
      day[j] = schedule[v]!.targetDay;
    }
  }
  for (let i = 0; i < table.nRows; i++) {
    if (!rowListed(i)) continue;
    const j = fill[table.subjectIndex[i]!]!++;
    ref[j] = -(i + 1);
    day[j] = days.studyDays[i]!;
  }
  // Within a subject by day, found order kept on ties (a stable insertion sort: a subject has a handful of lines).
  for (let s = 0; s < S; s++) {
    for (let j = start[s]! + 1; j < start[s + 1]!; j++) {
      const r = ref[j]!;
      const d = day[j]!;
      let k = j - 1;
      while (k >= start[s]! && day[k]! > d) {
        ref[k + 1] = ref[k]!;
        day[k + 1] = day[k]!;
        k--;
      }
      ref[k + 1] = r;
      day[k + 1] = d;
    }
  }
  // Subjects by site (rank among the site names), then by index: a counting sort, stable in the subject index.
  const site = siteRanks(S, siteOf);
  let nSites = 0;
  for (let s = 0; s < S; s++) if (site[s]! + 1 > nSites) nSites = site[s]! + 1;
  const bySite = new Int32Array(nSites + 1);
  for (let s = 0; s < S; s++) bySite[site[s]! + 1]!++;
  for (let g = 0; g < nSites; g++) bySite[g + 1]! += bySite[g]!;
  const subjectOrder = new Int32Array(S);
  for (let s = 0; s < S; s++) subjectOrder[bySite[site[s]!]!++] = s;

  const lines = new Int32Array(total);
  let out = 0;
  for (let k = 0; k < S; k++) {
    const s = subjectOrder[k]!;
    for (let j = start[s]!; j < start[s + 1]!; j++) lines[out++] = ref[j]!;
  }
  return lines;
}

/** The rows of the deviation listing for the lines of deviationOrder (subject, site, dates, status, latest record). O(lines). */
export function deviationRows(
  input: TimingInput,
  lines: Int32Array,
  siteOf: (subject: number) => string,
  lastOf: (subject: number) => LastRecord,
): DeviationRow[] {
  const { table, schedule, days, timing } = input;
  const V = timing.nVisits;
  const dated = table.timeKind === 'date';
  // Each visit's window once: calendar offsets (dated data add the subject's reference date) or study days.
  const wins = schedule.map((vis) => (dated ? windowOffsets(vis) : windowStudyDays(vis)));
  const opens = Float64Array.from(wins, (w) => w.opens);
  const targets = Float64Array.from(wins, (w) => w.target);
  const closes = Float64Array.from(wins, (w) => w.closes);
  const actual = dated ? table.date : days.studyDays;
  // An extra record's own visit label, read from the codes (no per-row strings).
  const visits = textCodesOf(table, 'visit');
  const visitText = (i: number): string => (visits === null ? '' : visits.texts[visits.codes[i]!]!);
  const rows: DeviationRow[] = new Array<DeviationRow>(lines.length);
  for (let out = 0; out < lines.length; out++) {
    const r0 = lines[out]!;
    const s = r0 >= 0 ? Math.floor(r0 / V) : table.subjectIndex[-r0 - 1]!;
    const subject = table.subjectIds[s]!;
    const siteName = siteOf(s);
    const last = lastOf(s);
    const base = dated ? days.referenceDay[s]! : 0;
    if (r0 >= 0) {
      const v = r0 - s * V;
      const r = timing.slotRow[r0]!;
      rows[out] = {
        subject,
        site: siteName,
        visit: schedule[v]!.label,
        targetDate: base + targets[v]!,
        windowOpens: base + opens[v]!,
        windowCloses: base + closes[v]!,
        actualDate: r >= 0 ? actual[r]! : null,
        daysOff: r >= 0 ? timing.rowDeviation[r]! : null,
        status: STATUS_ORDER[timing.slotStatus[r0]!]!,
        sheetRow: r >= 0 ? table.sheetRows[r]! : null,
        lastRecord: last,
      };
    } else {
      const i = -r0 - 1;
      const v = timing.rowVisit[i]!;
      rows[out] = {
        subject,
        site: siteName,
        visit: v >= 0 ? schedule[v]!.label : visitText(i),
        targetDate: v >= 0 ? base + targets[v]! : null,
        windowOpens: v >= 0 ? base + opens[v]! : null,
        windowCloses: v >= 0 ? base + closes[v]! : null,
        actualDate: actual[i]!,
        daysOff: v >= 0 ? timing.rowDeviation[i]! : null,
        status: STATUS_ORDER[timing.rowStatus[i]!]!,
        sheetRow: table.sheetRows[i]!,
        lastRecord: last,
      };
    }
  }
  return rows;
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
