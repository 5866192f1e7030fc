/** The few plain lines the results step leads with: what was read, what was left out, and the model's own summary. */
import type { AnalysisOutput } from '../core/pipeline/types';
import { CAUTIONS, INVENTED_DATA_NOTE } from '../core/report/cautions';
import type { SheetSpec } from '../core/report/types';

type Done = Extract<AnalysisOutput, { ok: true }>;

const count = (n: number, one: string, many: string): string => `${n.toLocaleString('en-US')} ${n === 1 ? one : many}`;

/**
 * Lines for the results step. Counts come from the output's exclusion list; the summary is the first plain paragraph
 * of the model sheet (the report puts its plain-language summary there, SPEC §5), else of any sheet.
 * Example: 10 rows read, one left out of the model gives "10 rows read." and "1 row left out of the model; …".
 */
export function headlineOf(output: Done, rowsRead: number): string[] {
  const lines = [`${count(rowsRead, 'row', 'rows')} read.`];
  const timing = new Set(output.excluded.filter((e) => e.use === 'timing').map((e) => e.row)).size;
  const model = new Set(output.excluded.filter((e) => e.use === 'model').map((e) => e.row)).size;
  if (timing + model === 0) lines.push('No row was left out.');
  else lines.push(`${count(timing, 'row', 'rows')} left out of visit timing; ${count(model, 'row', 'rows')} left out of the model (see the problems below).`);
  const summary = modelSummary(output.sheets);
  if (summary !== null) lines.push(summary);
  return lines;
}

const STANDING = new Set<string>([...CAUTIONS, INVENTED_DATA_NOTE]);

function firstPlainParagraph(sheet: SheetSpec): string | null {
  for (const block of sheet.blocks) {
    if (block.kind === 'paragraph' && (block.style ?? 'normal') === 'normal' && !STANDING.has(block.text) && block.text.trim() !== '') {
      return block.text;
    }
  }
  return null;
}

function modelSummary(sheets: readonly SheetSpec[]): string | null {
  const modelFirst = [...sheets].sort((a, b) => Number(/model/i.test(b.name)) - Number(/model/i.test(a.name)));
  for (const sheet of modelFirst) {
    const text = firstPlainParagraph(sheet);
    if (text !== null) return text;
  }
  return null;
}
