/**
 * The summary sheet, first in every workbook: the cautions in full (the only sheet that carries them whole; every other
 * sheet links here), one plain paragraph, what was analysed, the numbers a trial team asks first and two small charts.
 * Everything comes from results the run already computed (the timing summary and the results JSON `model` section of
 * the model the run reports, read by mainResult.ts); nothing is refitted.
 */
import type { Mode } from '../intake/types';
import { cell, col, heading, levelPercent, para } from './blockParts';
import { cautionBlocks, SUMMARY_SHEET_NAME } from './cautions';
import { formatCell } from './formats';
import { mainResult, mainSentences, type MainResult } from './mainResult';
import { readableRunTime } from './runTime';
import { statusChart } from './timingSheets';
import type { TimingSummary, VisitSummaryRow } from './timingTypes';
import { cutoffPhrase } from './timingWords';
import type { Block, SheetSpec } from './types';

export { SUMMARY_SHEET_NAME };

export interface SummaryInput {
  /** The file or range the data came from, as the analysis record names it. */
  readonly inputLabel: string;
  readonly rowsRead: number;
  /** ISO 8601 timestamp of the run with its UTC offset (settings.runAt), shown readable (runTime.ts). */
  readonly runAt: string;
  readonly mode: Mode;
  readonly summary: TimingSummary;
  /** The results JSON `model` section of the model the run reports (settings.model); null when no model was fitted. */
  readonly model: Record<string, unknown> | null;
  /** Why the model was not fitted (when one was asked for), else null. */
  readonly modelNote: string | null;
}

/** The headline visit-timing numbers: every count over scheduled visits; "not expected (left)" visits are not due. */
export interface TimingHeadline {
  readonly due: number;
  readonly onTime: number;
  /** On time ÷ due; null when no visit is due. */
  readonly onTimeRate: number | null;
  readonly missed: number;
  /** Participants with at least one early, late or missed scheduled visit. */
  readonly participantsWithDeviation: number;
}

/**
 * The headline numbers from the per-visit rows (due = expected − not yet due, where expected leaves out visits after
 * a participant left) and the deviation listing (distinct participants with an early, late or missed visit;
 * unscheduled and repeat records are not deviations of a scheduled visit). Cost O(visits + listed lines).
 * Example: rows with due 10 and 6, on time 8 and 3 → { due: 16, onTime: 11, onTimeRate: 0.6875, … }.
 */
export function timingHeadline(summary: Pick<TimingSummary, 'byVisit' | 'deviations'>): TimingHeadline {
  let due = 0;
  let onTime = 0;
  let missed = 0;
  for (const r of summary.byVisit) {
    due += r.due;
    onTime += r.onTime;
    missed += r.missed;
  }
  const who = new Set<string>();
  for (const d of summary.deviations) if (d.status === 'early' || d.status === 'late' || d.status === 'missed') who.add(d.subject);
  return { due, onTime, onTimeRate: due > 0 ? onTime / due : null, missed, participantsWithDeviation: who.size };
}

const plural = (n: number, one: string, many: string): string => `${n} ${n === 1 ? one : many}`;
const percentWords = (x: number | null): string => (x === null ? 'no on-time rate (no visit is due yet)' : formatCell(x, 'percent1'));

/** The opening paragraph: the timing numbers in one sentence, then the model's headline in another. */
function plainParagraph(input: SummaryInput, h: TimingHeadline): string {
  const { summary } = input;
  let text =
    `${cutoffPhrase(summary)}, ${plural(summary.subjects, 'participant', 'participants')} had ${plural(h.due, 'scheduled visit', 'scheduled visits')} due; ` +
    `${h.onTime} ${h.onTime === 1 ? 'was' : 'were'} on time (${percentWords(h.onTimeRate)}) and ${h.missed} missed. ` +
    `${plural(h.participantsWithDeviation, 'participant has', 'participants have')} at least one early, late or missed visit. `;
  const main = mainResult(input.model);
  if (main === null) {
    text += input.modelNote === null ? 'No model was fitted (no value column was chosen).' : `The model was not fitted: ${input.modelNote.replace(/\.+$/, '')}.`;
    return text;
  }
  text += mainSentences(main, false).join(' ');
  return text.trimEnd();
}

function analysedTable(input: SummaryInput): Block {
  const rows: string[][] = [
    ['File', input.inputLabel],
    ['Rows read', String(input.rowsRead)],
    ['Participants', String(input.summary.subjects)],
    ['Cut-off', cutoffPhrase(input.summary)],
    ['Mode', input.mode === 'unblinded' ? 'Unblinded (results by treatment arm)' : 'Blinded (no results by treatment arm)'],
    ['Run at', readableRunTime(input.runAt)],
  ];
  return { kind: 'table', id: 'WhatWasAnalysed', caption: 'What was analysed', columns: [col('Item', 'text', 16), col('Detail', 'text', 50)], rows };
}

function timingTable(h: TimingHeadline): Block {
  return {
    kind: 'table',
    id: 'TimingAtAGlance',
    caption: 'Visit timing at a glance (visits not expected because the participant left are not due)',
    columns: [col('Visits due', 'integer'), col('On time', 'integer'), col('On-time rate', 'percent1'), col('Missed', 'integer'), col('Participants with any early, late or missed visit', 'integer', 22)],
    rows: [[h.due, h.onTime, h.onTimeRate, h.missed, h.participantsWithDeviation]],
  };
}

/**
 * Unblinded: each arm against the reference arm at the last scheduled visit (a difference, or for the yes/no model an
 * odds ratio); blinded: the model's overall numbers; the caption names the model they come from.
 */
function modelTable(main: MainResult): Block | null {
  if (main.problem !== null) return null;
  const pct = main.level === null ? '' : `, with ${levelPercent(main.level)} confidence intervals`;
  if (main.arms.length > 0) {
    const odds = main.scale === 'oddsRatio';
    const what = odds ? `Odds ratio of a yes answer${main.outcome === null ? '' : ` (${main.outcome})`}` : 'Treatment difference';
    const atStart = main.arms.every((a) => a.visit === 'study day 1');
    return {
      kind: 'table',
      id: 'DifferenceAtLastVisit',
      caption: `${what} ${atStart ? 'at the start' : 'at the last scheduled visit'}, ${main.source}${pct}`,
      columns: [col('Arm', 'text', 14), col('Compared with', 'text', 14), col('Visit', 'text', 12), col(odds ? 'Odds ratio' : 'Difference', 'significant'), col('Lower limit', 'significant'), col('Upper limit', 'significant'), col('p', 'pvalue')],
      rows: main.arms.map((a) => [a.arm, a.reference, a.visit, cell(a.estimate), a.lower === null ? null : cell(a.lower), a.upper === null ? null : cell(a.upper), a.p === null ? null : cell(a.p)]),
    };
  }
  if (main.overall.length === 0) return null;
  return {
    kind: 'table',
    id: 'ModelAtAGlance',
    caption: `The model at a glance, all participants together, ${main.source}${pct}`,
    columns: [col('Measure', 'text', 36), col('Estimate', 'significant'), col('Lower limit', 'significant'), col('Upper limit', 'significant')],
    rows: main.overall.map((o) => [o.measure, cell(o.estimate), o.lower === null ? null : cell(o.lower), o.upper === null ? null : cell(o.upper)]),
  };
}

/** On-time rate by scheduled visit, as a small chart with its own table (pooled over arms in either mode). */
function onTimeChart(rows: readonly VisitSummaryRow[]): Block {
  return {
    kind: 'chart',
    chart: {
      kind: 'bar',
      id: 'SummaryOnTime',
      title: 'On-time rate by visit',
      xLabel: 'Visit',
      yLabel: 'On time ÷ visits due',
      series: [{ name: 'On-time rate', x: rows.map((r) => r.visit), y: rows.map((r) => r.onTimeRate) }],
    },
  };
}

/**
 * The summary sheet: the cautions in full at A1 onwards (mode's own set), one plain paragraph, the table of what was
 * analysed, the visit-timing numbers, the reported model's headline numbers (unblinded: the treatment difference, or
 * odds ratio, at the last scheduled visit with its interval and p; blinded: the ICC and the overall trend or what the
 * model has in their place, nothing by arm; mainResult.ts) and two small charts
 * (on-time rate by visit and visits by status and visit, pooled over arms). Cost O(visits + listed lines).
 */
export function summarySheet(input: SummaryInput): SheetSpec {
  const h = timingHeadline(input.summary);
  const main = mainResult(input.model);
  const model = main === null ? null : modelTable(main);
  const blocks: Block[] = [
    ...cautionBlocks(input.mode),
    para(plainParagraph(input, h)),
    analysedTable(input),
    timingTable(h),
    ...(model === null ? [] : [model]),
  ];
  if (input.summary.byVisit.length > 0) {
    // The status chart of the timing sheet, under its own id and drawn from its own small table on this sheet.
    const { sourceTable: _elsewhere, ...status } = statusChart(input.summary.byVisit);
    blocks.push(heading('Charts'), onTimeChart(input.summary.byVisit), { kind: 'chart', chart: { ...status, id: 'SummaryStatus' } });
  }
  return { name: SUMMARY_SHEET_NAME, title: 'Summary of this interim look', blocks };
}
