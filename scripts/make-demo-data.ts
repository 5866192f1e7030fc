/**
 * Writes the demo data: an INVENTED kidney-function trial (eGFR every 12 weeks to week 48 at twelve invented sites).
 * Nothing here describes a real trial, site or person. Run with `npm run demo:data`; the output is committed.
 *
 * The generator is seeded (mulberry32, a small public-domain 32-bit generator), so the files are the same on every
 * run (scripts/random.ts). The generator of rows is exported so that the benchmark can make large data sets of the same shape.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { mulberry32 } from './random';


/** A standard normal draw by the Box–Muller transform (Box & Muller, 1958). */
function normal(rand: () => number): number {
  const u = Math.max(rand(), 1e-12);
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
}

/** Invented sites, numbered rather than named so that no name can be mistaken for a real place or hospital. */
export const SITES = Array.from({ length: 12 }, (_, k) => `Site ${String(k + 1).padStart(2, '0')}`);

export const SCHEDULE = [
  { visit: 'Baseline', targetDay: 1, before: 3, after: 3 },
  { visit: 'Week 12', targetDay: 85, before: 7, after: 7 },
  { visit: 'Week 24', targetDay: 169, before: 7, after: 7 },
  { visit: 'Week 36', targetDay: 253, before: 7, after: 7 },
  { visit: 'Week 48', targetDay: 337, before: 7, after: 7 },
] as const;

export const HEADER = ['USUBJID', 'SITEID', 'TRT01P', 'AVISIT', 'ADT', 'RANDDT', 'AVAL'] as const;
/** The demo listing's header: the visit columns, then the participant's end of study (CDISC ADaM EOSDT, EOSSTT,
 * DCSREAS), repeated on every row of the participant as in a merged listing. */
export const DEMO_HEADER = [...HEADER, 'EOSDT', 'EOSSTT', 'DCSREAS'] as const;
/** Reasons for leaving early, from the CDISC controlled terminology for reasons of non-completion (NCOMPLT). */
const LEAVING_REASONS = ['WITHDRAWAL BY SUBJECT', 'LOST TO FOLLOW-UP', 'ADVERSE EVENT', 'PHYSICIAN DECISION'] as const;

/** One generated visit row; dates as day numbers (0 = 1899-12-30, the 1900-system serial). */
export interface DemoRow {
  subject: string;
  site: string;
  arm: 'Placebo' | 'Active';
  visit: string;
  date: number;
  rand: number;
  value: number;
  /** End of study as known at the cut-off: the exit date (day number) or null, status and reason ("" when none). */
  exit: number | null;
  status: 'COMPLETED' | 'DISCONTINUED' | 'ONGOING';
  reason: string;
}

export interface TrialOptions {
  readonly patients: number;
  readonly seed: number;
  /** First randomisation date (day number) and the enrolment span in days. */
  readonly firstRandomised: number;
  readonly enrolmentDays: number;
  /** No record after this day number (the data cut-off); visits after it are simply not in the data yet. */
  readonly cutoff: number;
  /** Rates of the irregularities. */
  readonly missRate: number;
  readonly dropoutRate: number;
  readonly extraRate: number;
  readonly repeatRate: number;
}

const DAY_MS = 86_400_000;
/** Day number (0 = 1899-12-30) of an ISO date; 25569 is the serial of 1970-01-01 (ECMA-376 Part 1, §18.17.4.1). */
export function dayNumber(iso: string): number {
  return Date.parse(`${iso}T00:00:00Z`) / DAY_MS + 25569;
}
export function isoDate(day: number): string {
  return new Date((day - 25569) * DAY_MS).toISOString().slice(0, 10);
}

/** Generates the trial: per patient a baseline eGFR (mean 55, SD 12 mL/min/1.73m²), a yearly decline of 3.0 on
 * Placebo and 1.0 on Active, within-patient noise SD 4; visits scattered around their target days. */
export function generateTrial(o: TrialOptions, onRow: (r: DemoRow) => void): void {
  const rand = mulberry32(o.seed);
  const perSite = Math.ceil(o.patients / SITES.length);
  for (let p = 0; p < o.patients; p++) {
    const siteIndex = p % SITES.length;
    const site = SITES[siteIndex]!;
    const subject = `KFT-${String(siteIndex + 1).padStart(2, '0')}-${String(Math.floor(p / SITES.length) + 1).padStart(perSite > 999 ? 6 : 3, '0')}`;
    const arm = rand() < 0.5 ? 'Placebo' : 'Active';
    const randomised = o.firstRandomised + Math.floor(rand() * o.enrolmentDays);
    const level = 55 + 12 * normal(rand);
    const slopePerYear = arm === 'Placebo' ? -3.0 : -1.0;
    // The visit after which the patient drops out (5 = completes).
    const dropAfter = rand() < o.dropoutRate ? 1 + Math.floor(rand() * 4) : 5;
    const rows: DemoRow[] = [];
    const emit = (visit: string, studyDay: number): void => {
      const date = studyDay > 0 ? randomised + studyDay - 1 : randomised + studyDay; // CDISC: no day 0
      if (date > o.cutoff) return;
      const value = level + (slopePerYear * (studyDay - 1)) / 365.25 + 4 * normal(rand);
      rows.push({ subject, site, arm, visit, date, rand: randomised, value: Math.round(value * 10) / 10, exit: null, status: 'ONGOING', reason: '' });
    };
    SCHEDULE.forEach((v, k) => {
      if (k >= dropAfter) return;
      if (k > 0 && rand() < o.missRate) return;
      let offset = k === 0 ? (rand() < 0.9 ? 0 : -1 - Math.floor(rand() * 5)) : Math.round(3 * normal(rand));
      if (k > 0 && rand() < 0.08) offset = (rand() < 0.5 ? -1 : 1) * (8 + Math.floor(rand() * 14));
      const day = v.targetDay + offset;
      const studyDay = day <= 0 ? day - 1 : day; // no day 0 (CDISC study-day convention)
      emit(v.visit, studyDay);
      if (k > 0 && rand() < o.repeatRate) emit(v.visit, studyDay + 2 + Math.floor(rand() * 6));
    });
    if (rand() < o.extraRate) emit('Unscheduled', 20 + Math.floor(rand() * 300));
    // End of study, from the patient number alone so that the random stream (and every value above) is unchanged:
    // a patient who drops out leaves 14 to 53 days after the last visit attended; one who completes leaves on the
    // final visit's target date (or on the final record, if later). Known only when on or before the cut-off.
    const lastTarget = SCHEDULE[dropAfter - 1]!.targetDay - 1;
    const leaves = dropAfter < 5 ? randomised + lastTarget + 14 + (p % 40) : Math.max(randomised + lastTarget, ...rows.map((r) => r.date));
    const known = leaves <= o.cutoff;
    for (const r of rows) {
      r.exit = known ? leaves : null;
      r.status = !known ? 'ONGOING' : dropAfter < 5 ? 'DISCONTINUED' : 'COMPLETED';
      r.reason = known && dropAfter < 5 ? LEAVING_REASONS[p % LEAVING_REASONS.length]! : '';
      onRow(r);
    }
  }
}

export const DEMO_OPTIONS: TrialOptions = {
  patients: 240,
  seed: 20250106,
  firstRandomised: dayNumber('2025-01-06'),
  enrolmentDays: 270,
  cutoff: dayNumber('2026-03-31'),
  missRate: 0.05,
  dropoutRate: 0.1,
  extraRate: 0.06,
  repeatRate: 0.03,
};

function csvField(s: string): string {
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The demo CSV text, with four deliberately bad cells so the demo shows how they are reported. */
export function demoCsv(): string {
  const rows: string[][] = [];
  generateTrial(DEMO_OPTIONS, (r) =>
    rows.push([r.subject, r.site, r.arm, r.visit, isoDate(r.date), isoDate(r.rand), r.value.toFixed(1), r.exit === null ? '' : isoDate(r.exit), r.status, r.reason]),
  );
  rows.sort((a, b) => (a[0]! < b[0]! ? -1 : a[0]! > b[0]! ? 1 : a[4]! < b[4]! ? -1 : a[4]! > b[4]! ? 1 : 0));
  // Deliberate bad cells (data row i is worksheet row i + 2).
  rows[40]![6] = 'pending'; // text in the value column
  rows[155]![0] = ''; // a blank subject
  rows[302]![4] = '2025-02-30'; // an impossible date
  rows[517]![6] = '#N/A'; // an error value pasted from a spreadsheet
  return [DEMO_HEADER.join(','), ...rows.map((r) => r.map(csvField).join(','))].join('\n') + '\n';
}

export function scheduleCsv(): string {
  return ['visit,target_day,days_before,days_after', ...SCHEDULE.map((v) => `${v.visit},${v.targetDay},${v.before},${v.after}`)].join('\n') + '\n';
}

const README = `# Demo data (invented)

**These data are invented for illustration. They describe no real trial, site or person.** They are made by
\`scripts/make-demo-data.ts\` (seeded, so every run gives the same files): \`npm run demo:data\`.

The invented scenario: a kidney-function trial in 240 participants at twelve invented sites, randomised 1:1 to
"Placebo" or "Active" between January and October 2025. eGFR (mL/min/1.73m²) is measured at Baseline (day 1) and then
every 12 weeks up to Week 48 (days 85, 169, 253, 337; window ±3 days at Baseline and ±7 days after). The data stop on
2026-03-31, so later visits are not yet due. Some visits are early or late, some missed, some participants leave the
study early (their exit date is in EOSDT), and there are a few unscheduled and repeated visits.

- \`egfr-visits.csv\` — one row per assessment; columns USUBJID, SITEID, TRT01P, AVISIT, ADT (visit date), RANDDT
  (randomisation date), AVAL (eGFR), and the participant's end of study repeated on each of their rows: EOSDT (the
  date they left the study, blank while still in it), EOSSTT (COMPLETED, DISCONTINUED or ONGOING) and DCSREAS (the
  reason for leaving early, in CDISC controlled terminology). The CDISC ADaM names let Longipane detect every column
  without \`--map\`.
- \`egfr-schedule.csv\` — the visit schedule: visit, target_day, days_before, days_after.

Four cells are wrong on purpose, to show how bad input is reported with its cell address and left out of the use it
cannot serve: a value "pending" (G42), a blank subject (A157), an impossible date 2025-02-30 (E304) and a value "#N/A"
(G519).

Try it: \`npm run demo\` writes \`out/demo-report.xlsx\` and \`out/demo-results.json\` (unblinded, reference arm
Placebo).
`;

function main(): void {
  const root = join(dirname(fileURLToPath(import.meta.url)), '..');
  const dir = join(root, 'demo');
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, 'egfr-visits.csv'), demoCsv());
  writeFileSync(join(dir, 'egfr-schedule.csv'), scheduleCsv());
  writeFileSync(join(dir, 'README.md'), README);
  process.stdout.write(`Wrote ${join(dir, 'egfr-visits.csv')}, egfr-schedule.csv and README.md\n`);
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) main();
