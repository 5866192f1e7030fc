/**
 * The few plain lines the results step leads with: what was read and used, how visits kept to the schedule, and the
 * model's main number. Read from the run's results JSON (schema in the README); when a part is missing there, the
 * model sheet's own plain-language summary stands in.
 */
import type { Issue } from '../core/intake/types';
import type { AnalysisOutput } from '../core/pipeline/types';
import { CAUTIONS, INVENTED_DATA_NOTE } from '../core/report/cautions';
import { formatCell } from '../core/report/formats';
import { mainResult, mainSentences } from '../core/report/mainResult';
import { readableRunTime } from '../core/report/runTime';
import type { SheetSpec } from '../core/report/types';

type Done = Extract<AnalysisOutput, { ok: true }>;
type Json = Record<string, unknown>;

const obj = (v: unknown): Json | null =>
  typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Json) : null;
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const str = (v: unknown): string | null => (typeof v === 'string' ? v : null);
const whole = (n: number): string => n.toLocaleString('en-US');

/**
 * Lines for the results step. Example, for the invented demo run unblinded: "920 rows read from 240 participants: 918
 * used for visit timing, 916 in the model.", "820 of 975 visits due were on time (84.1%); 86 missed.", "At Week 48,
 * Active differed from Placebo by 4.051 (95% CI 0.7623 to 7.330; p = 0.0159) in the random-intercept model.", "Run at
 * 2026-12-02 14:05 (UTC+01:00)."
 */
export function headlineOf(output: Done, rowsRead: number): string[] {
  const json = output.json;
  const input = obj(json.input);
  const lines: string[] = [];
  const subjects = num(input?.subjects);
  const timing = num(input?.usedForTiming);
  const model = num(input?.usedForModel);
  let first = `${whole(rowsRead)} ${rowsRead === 1 ? 'row' : 'rows'} read${subjects === null ? '' : ` from ${whole(subjects)} ${subjects === 1 ? 'participant' : 'participants'}`}`;
  if (timing !== null && model !== null)
    first += `: ${whole(timing)} used for visit timing, ${whole(model)} in the model`;
  lines.push(`${first}.`);

  const counts = obj(obj(json.visits)?.counts);
  const onTime = num(counts?.onTime);
  const missed = num(counts?.missed);
  const due =
    onTime === null || missed === null ? null : onTime + (num(counts?.early) ?? 0) + (num(counts?.late) ?? 0) + missed;
  if (onTime !== null && missed !== null && due !== null && due > 0) {
    lines.push(
      `${whole(onTime)} of ${whole(due)} visits due were on time (${formatCell(onTime / due, 'percent1')}); ${whole(missed)} missed.`,
    );
  }

  const fit = obj(json.model);
  const modelLine = fit === null ? null : modelHeadline(fit);
  if (modelLine !== null) lines.push(modelLine);
  else {
    const note = str(json.modelNote);
    const summary = note ?? modelSummary(output.sheets);
    if (summary !== null) lines.push(summary);
  }
  const runAt = str(obj(json.settings)?.runAt);
  if (runAt !== null && runAt !== '') lines.push(`Run at ${readableRunTime(runAt)}.`);
  return lines;
}

/**
 * The chosen model's main number (mainResult.ts, the same reading as the summary sheet's): the treatment difference or
 * odds ratio at the last scheduled visit (unblinded) or the model's overall numbers (blinded), naming the model.
 */
function modelHeadline(fit: Json): string | null {
  const main = mainResult(fit);
  return main === null ? null : mainSentences(main, true).join(' ');
}

const STANDING = new Set<string>([...CAUTIONS, INVENTED_DATA_NOTE]);

function firstPlainParagraph(sheet: SheetSpec): string | null {
  for (const block of sheet.blocks) {
    if (
      block.kind === 'paragraph' &&
      (block.style ?? 'normal') === 'normal' &&
      !STANDING.has(block.text) &&
      block.text.trim() !== ''
    ) {
      return block.text;
    }
  }
  return null;
}

function modelSummary(sheets: readonly SheetSpec[]): string | null {
  const modelSheet = sheets.find((s) => /model/i.test(s.name));
  return modelSheet === undefined ? null : firstPlainParagraph(modelSheet);
}

/** The issues with those that stop the run first (each group in its own order), as the results step lists them. */
export function stoppingFirst(issues: readonly Issue[]): Issue[] {
  return [...issues.filter((i) => i.severity === 'error'), ...issues.filter((i) => i.severity !== 'error')];
}

/**
 * The status line of a run its data stopped: why, in the first stopping problem's own words.
 * Example: "The run stopped: Column "ADT" (visit date) writes the day and month as numbers, … (and 1 more problem that
 * stops it)."
 */
export function stoppedStatus(issues: readonly Issue[]): string {
  const errors = issues.filter((i) => i.severity === 'error');
  const first = errors[0];
  if (first === undefined) return 'The run stopped; no reason was given.';
  const where = first.cell !== null && !first.message.startsWith(first.cell) ? `${first.cell}: ` : '';
  const more = errors.length - 1;
  const tail = more === 0 ? '' : ` (and ${more} more problem${more === 1 ? '' : 's'} that stop${more === 1 ? 's' : ''} it)`;
  return `The run stopped: ${where}${first.message.replace(/\.$/, '')}${tail}.`;
}
