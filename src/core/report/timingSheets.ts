import { STATUS_WORDS } from '../schedule/types';
import { col, para } from './blockParts';
import { cautionLine } from './cautions';
import { DUE_WORDS, type LastRecord } from './timingTypes';
import { isoDate } from '../schedule/dates';
import { ON_TIME_RATE_NOTE, cutoffPhrase, timingSummaryText } from './timingWords';

/** The sentences live in timingWords.ts; re-exported here for callers that import them with the sheets. */
export { ON_TIME_RATE_NOTE, cutoffPhrase, timingSummaryText };
import type { TimingSummary, VisitSummaryRow } from './timingTypes';
import type { Block, ChartSpec, NumberFormat, SheetCell, SheetSpec } from './types';

/** Sheet names of the visit-timing reports (front ends make them unique in the workbook). */
export const TIMING_SHEET_NAMES = { timing: 'Visit timing', deviations: 'Visit deviations', due: 'Visits due' } as const;

function visitTable(id: string, caption: string, rows: readonly VisitSummaryRow[], withArm: boolean): Block {
  const columns = [
    ...(withArm ? [col('Arm', 'text', 14)] : []),
    col('Visit', 'text', 14),
    col('Target day', 'integer'),
    col('Expected', 'integer'),
    col('On time', 'integer'),
    col('Early', 'integer'),
    col('Late', 'integer'),
    col('Missed', 'integer'),
    col('Not yet due', 'integer'),
    col('Not expected (left)', 'integer'),
    col('Visits due', 'integer'),
    col('On-time rate', 'percent1'),
    col('Median deviation (days)', 'decimal1'),
    col('Smallest deviation (days)', 'integer'),
    col('Largest deviation (days)', 'integer'),
  ];
  const body = rows.map((r): SheetCell[] => [
    ...(withArm ? [r.arm ?? ''] : []),
    r.visit,
    r.targetDay,
    r.expected,
    r.onTime,
    r.early,
    r.late,
    r.missed,
    r.notYetDue,
    r.afterExit,
    r.due,
    r.onTimeRate,
    r.medianDeviation,
    r.minDeviation,
    r.maxDeviation,
  ]);
  return { kind: 'table', id, caption, columns, rows: body };
}

/** Scheduled visits by status and visit, one bar per status, drawn from the columns of the "ByVisit" table. */
export function statusChart(rows: readonly VisitSummaryRow[]): ChartSpec {
  const x = rows.map((r) => r.visit);
  const counts: [string, (r: VisitSummaryRow) => number][] = [
    ['On time', (r) => r.onTime],
    ['Early', (r) => r.early],
    ['Late', (r) => r.late],
    ['Missed', (r) => r.missed],
    ['Not yet due', (r) => r.notYetDue],
    ['Not expected (left)', (r) => r.afterExit],
  ];
  return {
    kind: 'bar',
    id: 'StatusByVisit',
    title: 'Scheduled visits by status and visit',
    xLabel: 'Visit',
    yLabel: 'Scheduled visits',
    series: counts.map(([name, count]) => ({ name, x, y: rows.map(count) })),
    sourceTable: 'ByVisit',
  };
}

/**
 * The visit-timing report as three sheets: "Visit timing" (a one-line caution linked to the summary sheet, the table by visit, a plain summary — and by arm
 * and visit in unblinded mode, i.e. when summary.byArm is not null, with the unblinded caution — and by site, with a
 * chart of deviations by visit and of on-time rate by site), "Visit deviations" (the listing) and "Visits due"
 * (upcoming and overdue visits), each listing right after the one-line caution and its notes below it. Dates use the 'date' format for dated data and show study days otherwise.
 * Cost O(listed lines).
 */
export function timingSheets(summary: TimingSummary): SheetSpec[] {
  const unblinded = summary.byArm !== null;
  const caution = cautionLine(unblinded ? 'unblinded' : 'blinded');

  // The one-line caution, then the first table at once (row 4); the plain summary and the rate's definition follow it.
  const timing: Block[] = [caution, visitTable('ByVisit', 'Scheduled visits by visit', summary.byVisit, false), para(timingSummaryText(summary)), para(ON_TIME_RATE_NOTE)];
  timing.push({
    kind: 'chart',
    chart: {
      kind: 'line',
      id: 'DeviationByVisit',
      title: 'Deviation from target day by visit (median, with smallest and largest)',
      xLabel: 'Visit',
      yLabel: 'Days from target (negative = early)',
      series: [
        {
          name: 'Median deviation',
          x: summary.byVisit.map((r) => r.visit),
          y: summary.byVisit.map((r) => r.medianDeviation),
          lower: summary.byVisit.map((r) => r.minDeviation),
          upper: summary.byVisit.map((r) => r.maxDeviation),
          style: 'points',
        },
      ],
      sourceTable: 'ByVisit',
    },
  });
  timing.push({ kind: 'chart', chart: statusChart(summary.byVisit) });
  if (summary.byArm !== null) {
    timing.push(para('By arm and visit', 'heading'), visitTable('ByArmVisit', 'Scheduled visits by arm and visit', summary.byArm, true));
  }
  timing.push(para('By site', 'heading'));
  if (summary.bySite === null) {
    timing.push(para('No site column was mapped, so there is no summary by site.'));
  } else {
    timing.push(
      para('Sites are listed worst first: by the share of visits due that were out of window or missed, then by their number.'),
      {
        kind: 'table',
        id: 'BySite',
        caption: 'Scheduled visits by site',
        columns: [
          col('Site', 'text', 14),
          col('Participants', 'integer'),
          col('Visits due', 'integer'),
          col('On time', 'integer'),
          col('Out of window', 'integer'),
          col('Missed', 'integer'),
          col('Not expected (left)', 'integer'),
          col('Participants who left', 'integer'),
          col('On-time rate', 'percent1'),
          col('Out-of-window rate', 'percent1'),
          col('Missed rate', 'percent1'),
          col('Out of window or missed', 'percent1'),
        ],
        rows: summary.bySite.map((r) => [r.site, r.subjects, r.due, r.onTime, r.outOfWindow, r.missed, r.afterExit, r.left, r.onTimeRate, r.outOfWindowRate, r.missedRate, r.combinedRate]),
      },
      {
        kind: 'chart',
        chart: {
          kind: 'bar',
          id: 'OnTimeRateBySite',
          title: 'On-time rate by site',
          xLabel: 'Site',
          yLabel: 'On-time rate',
          series: [{ name: 'On-time rate', x: summary.bySite.map((r) => r.site), y: summary.bySite.map((r) => r.onTimeRate) }],
          sourceTable: 'BySite',
        },
      },
    );
  }

  timing.push(...exitBlocks(summary));

  const dateFormat: NumberFormat = summary.dated ? 'date' : 'integer';
  const when = summary.dated ? 'date' : 'study day';
  // The glossary's "target day" for study-day data; dated data show the target's calendar date.
  const target = summary.dated ? 'target date' : 'target day';
  const targetHeader = summary.dated ? 'Target date' : 'Target day';
  const withSite = summary.bySite !== null;
  const deviations: Block[] = [
    caution,
    para(
      `${cutoffPhrase(summary)}: every early, late or missed scheduled visit, and every unscheduled or repeat record, for follow-up. ` +
        `Days from target = calendar days from the ${target} to the actual ${when} (negative = early; no day is skipped at the reference date). ` +
        (summary.dated ? 'Target and window dates count from each participant’s reference date (day 1).' : 'The data carry study days, so study days are shown instead of dates.'),
    ),
    {
      kind: 'table',
      id: 'Deviations',
      caption: 'Visits needing follow-up',
      columns: [
        col('Participant', 'text', 12),
        ...(withSite ? [col('Site', 'text', 12)] : []),
        col('Visit', 'text', 14),
        col(targetHeader, dateFormat, 12),
        col('Window opens', dateFormat, 12),
        col('Window closes', dateFormat, 12),
        col(`Actual ${when}`, dateFormat, 12),
        col('Days from target', 'integer'),
        col('Status', 'text', 10),
        col('Data row', 'integer'),
        ...lastRecordColumns(dateFormat, when),
      ],
      rows: summary.deviations.map((d) => [
        d.subject,
        ...(withSite ? [d.site] : []),
        d.visit,
        d.targetDate,
        d.windowOpens,
        d.windowCloses,
        d.actualDate,
        d.daysOff,
        STATUS_WORDS[d.status],
        d.sheetRow,
        ...lastRecordCells(d.lastRecord, summary.dated),
      ]),
    },
  ];

  const due: Block[] = [
    caution,
    para(
      `${cutoffPhrase(summary)}: each participant still in follow-up (no record yet of the final scheduled visit) with their next scheduled visit that has no record. ` +
        'Days until target is negative when the target has passed. "Overdue": the window closed before the cut-off; "Window open now": the cut-off falls inside the window; "Coming up": the window opens later.',
    ),
    {
      kind: 'table',
      id: 'VisitsDue',
      caption: 'Next visit of each participant in follow-up',
      columns: [
        col('Participant', 'text', 12),
        ...(withSite ? [col('Site', 'text', 12)] : []),
        col('Next visit', 'text', 14),
        col('Window opens', dateFormat, 12),
        col(targetHeader, dateFormat, 12),
        col('Window closes', dateFormat, 12),
        col('Days until target', 'integer'),
        col('Status', 'text', 16),
        ...lastRecordColumns(dateFormat, when),
      ],
      rows: summary.upcoming.map((u) => [
        u.subject,
        ...(withSite ? [u.site] : []),
        u.visit,
        u.windowOpens,
        u.targetDate,
        u.windowCloses,
        u.daysUntilTarget,
        DUE_WORDS[u.status],
        ...lastRecordCells(u.lastRecord, summary.dated),
      ]),
    },
  ];

  const silenceNote =
    summary.silenceDays === null
      ? ''
      : ` "No record since …" marks a participant with no record for more than ${summary.silenceDays} days (two scheduled intervals) and no exit date: check whether they left the study; their visits are still counted as the schedule says.`;
  const lastPara = para(`Last record: the participant's latest record; days since it are counted to the cut-off.${silenceNote}`);
  deviations.splice(2, 0, lastPara);
  due.splice(2, 0, lastPara);
  // The listing comes first (row 4), its explanations after it.
  const tableFirst = (blocks: Block[]): Block[] => [blocks[0]!, ...blocks.filter((b) => b.kind === 'table'), ...blocks.slice(1).filter((b) => b.kind !== 'table')];

  return [
    { name: TIMING_SHEET_NAMES.timing, title: 'Visit timing against the schedule', blocks: timing },
    { name: TIMING_SHEET_NAMES.deviations, title: 'Visit deviations for follow-up', blocks: tableFirst(deviations) },
    { name: TIMING_SHEET_NAMES.due, title: 'Upcoming and overdue visits', blocks: tableFirst(due) },
  ];
}

/** The last-record columns of the follow-up lists. */
function lastRecordColumns(format: NumberFormat, when: string): ReturnType<typeof col>[] {
  return [col(`Last record (${when})`, format, 12), col('Days since last record', 'integer'), col('Follow-up note', 'text', 22)];
}

function lastRecordCells(l: LastRecord, dated: boolean): SheetCell[] {
  const since = l.date === null ? '' : dated ? isoDate(l.date) : `study day ${l.date}`;
  return [l.date, l.daysSince, l.silent ? `No record since ${since}` : ''];
}

/** The "Participants who left" part of the timing sheet: how many left and when, or why it cannot be shown. */
function exitBlocks(summary: TimingSummary): Block[] {
  const blocks: Block[] = [para('Participants who left the study', 'heading')];
  if (!summary.exitKnown) {
    blocks.push(
      para(
        'No exit-date column was mapped (or the data carry study days, not dates), so every scheduled visit without a record counts as missed once its window has closed. Map the date each participant left the study (for example EOSDT) so that visits after it are not counted as missed.',
      ),
    );
    return blocks;
  }
  if (summary.exits.length === 0) {
    blocks.push(para('No participant has an exit date in the data.'));
    return blocks;
  }
  const withSite = summary.bySite !== null;
  blocks.push(
    para(
      `${summary.exits.length} participant${summary.exits.length === 1 ? '' : 's'} left the study. A scheduled visit whose window had not closed by the exit date is "not expected (left)": it is not missed, not a deviation and not due. A visit whose window closed before the exit date and has no record is still missed.`,
    ),
    {
      kind: 'table',
      id: 'Exits',
      caption: 'Participants who left the study',
      columns: [
        col('Participant', 'text', 12),
        ...(withSite ? [col('Site', 'text', 12)] : []),
        col('Exit date', 'date', 12),
        col('Study day of exit', 'integer'),
        col('Last visit attended', 'text', 14),
        col('End-of-study status', 'text', 14),
        col('Reason for leaving', 'text', 20),
      ],
      rows: summary.exits.map((e) => [e.subject, ...(withSite ? [e.site] : []), e.exitDate, e.exitStudyDay, e.lastVisit, e.status, e.reason]),
    },
  );
  return blocks;
}
