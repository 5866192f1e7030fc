/**
 * The yes/no outcome of the yes/no model: from a mapped 0/1 column (role 'responder'), or from the value with a
 * threshold (settings.responder: yes when value < below, or when value > above; a value equal to the threshold is no).
 * Returns a copy of the intake table whose `value` holds 1 (yes) and 0 (no) and whose `usableModel` marks the rows
 * that have an answer, so the model's usual row selection applies unchanged. Cost O(rows).
 */
import type { IntakeTable } from '../intake/types';
import type { AnalysisSettings } from './types';

export type YesNo =
  | { readonly ok: true; readonly table: IntakeTable; readonly words: string; readonly withoutAnswer: number }
  | { readonly ok: false; readonly problem: string };

/**
 * Example: values [55, 62, 48] with responder { below: 60 } -> value [1, 0, 1], words "value below 60".
 */
export function yesNoTable(table: IntakeTable, settings: AnalysisSettings): YesNo {
  const r = settings.responder ?? {};
  const hasBelow = r.below !== undefined;
  const hasAbove = r.above !== undefined;
  if (hasBelow && hasAbove) return { ok: false, problem: 'give either a "below" or an "above" threshold for the yes/no answer, not both' };
  const n = table.nRows;
  const value = new Float64Array(n).fill(NaN);
  const usable = new Uint8Array(n);
  let withoutAnswer = 0;
  if (table.responder !== undefined && !hasBelow && !hasAbove) {
    const col = table.responder;
    // With a value column, usableModel also vouches for the arm and covariates; without one, the timing row and the arm.
    const base = table.mapping.value === undefined ? table.usableTiming : table.usableModel;
    for (let i = 0; i < n; i++) {
      if (base[i] !== 1 || (table.arm !== null && table.arm[i] === '')) continue;
      const v = col[i]!;
      if (v === 0 || v === 1) {
        value[i] = v;
        usable[i] = 1;
      } else withoutAnswer++;
    }
    return { ok: true, table: { ...table, value, usableModel: usable }, words: 'the yes/no column, 1 = yes', withoutAnswer };
  }
  if (!hasBelow && !hasAbove) return { ok: false, problem: 'the yes/no model needs a yes/no answer: a threshold on the value ("below" or "above") or a 0/1 column mapped as the responder' };
  const cut = (hasBelow ? r.below : r.above)!;
  if (!Number.isFinite(cut)) return { ok: false, problem: 'the threshold for the yes/no answer must be a finite number' };
  for (let i = 0; i < n; i++) {
    if (table.usableModel[i] !== 1) continue;
    const v = table.value[i]!;
    value[i] = (hasBelow ? v < cut : v > cut) ? 1 : 0;
    usable[i] = 1;
  }
  return { ok: true, table: { ...table, value, usableModel: usable }, words: `value ${hasBelow ? 'below' : 'above'} ${cut}`, withoutAnswer };
}
