/**
 * Invented listings for the whole-run benchmark (bench/whole-run.ts): the demo trial's generator (scripts/make-demo-data.ts,
 * seeded through scripts/random.ts) at any size, with three arms (the generator's "Active" participants split by
 * participant number into "Active low" and "Active high"), twelve invented sites, and the demo's irregularities
 * (missed, repeat, unscheduled and early or late visits, participants who leave). About 4.35 rows per participant, so
 * 1,000,000 rows hold about 230,000 participants. Written as CSV text with ISO 8601 dates, as the demo file is.
 */
import { closeSync, openSync, writeSync } from 'node:fs';
import { dayNumber, DEMO_HEADER, DEMO_OPTIONS, generateTrial, isoDate, SCHEDULE } from '../scripts/make-demo-data';

/** Rows per participant of the generator at the demo's rates (measured: 1,000,000 rows from 229,9xx participants). */
const ROWS_PER_PARTICIPANT = 4.35;

/** The schedule CSV of the demo trial. */
export function benchScheduleCsv(): string {
  return ['visit,target_day,days_before,days_after', ...SCHEDULE.map((v) => `${v.visit},${v.targetDay},${v.before},${v.after}`)].join('\n') + '\n';
}

/**
 * Writes an invented listing of exactly `rows` data rows (plus the header) to `path`, in pieces, and returns the
 * number of participants. Enrolment spans two years and the cut-off falls in the last year, so many visits are
 * not yet due and some are missed, as in a running trial.
 */
export function writeBenchCsv(path: string, rows: number): number {
  const fd = openSync(path, 'w');
  let lines: string[] = [`${DEMO_HEADER.join(',')}\n`];
  let written = 0;
  let participants = 0;
  let last = '';
  generateTrial(
    {
      ...DEMO_OPTIONS,
      patients: Math.ceil(rows / ROWS_PER_PARTICIPANT) + 1000,
      seed: 20261202,
      firstRandomised: dayNumber('2024-01-08'),
      enrolmentDays: 730,
      cutoff: dayNumber('2026-06-30'),
    },
    (r) => {
      if (written >= rows) return;
      written++;
      if (r.subject !== last) {
        last = r.subject;
        participants++;
      }
      const n = Number(r.subject.slice(-6));
      const arm = r.arm === 'Placebo' ? 'Placebo' : n % 2 === 0 ? 'Active high' : 'Active low';
      lines.push(
        `${r.subject},${r.site},${arm},${r.visit},${isoDate(r.date)},${isoDate(r.rand)},${r.value.toFixed(1)},${r.exit === null ? '' : isoDate(r.exit)},${r.status},${r.reason}\n`,
      );
      if (lines.length >= 20_000) {
        writeSync(fd, lines.join(''));
        lines = [];
      }
    },
  );
  writeSync(fd, lines.join(''));
  closeSync(fd);
  return participants;
}
