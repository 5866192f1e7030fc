/**
 * The model sheet's further blocks, after the fit tables: the note on the degrees-of-freedom method when it has a known
 * weakness (dfNotes.ts), the naive fit beside the model (naiveReport.ts) and what the visit timing changes
 * (sensitivityReport.ts). Kept apart from modelSheet.ts so each can change on its own.
 */
import type { Mode } from '../intake/types';
import type { ModelFit } from '../model/types';
import { para } from './blockParts';
import { dfMethodNote } from './dfNotes';
import { naiveBlocks } from './naiveReport';
import { sensitivityBlocks, type SensitivityRun } from './sensitivityReport';
import type { Block } from './types';

/** Example: a REML fit with Kenward–Roger df and no refits -> the naive-fit table and its sentences. */
export function modelExtraBlocks(fit: ModelFit, sensitivity: readonly SensitivityRun[], mode: Mode, unit: string): Block[] {
  const note = dfMethodNote(fit.method, fit.dfMethod);
  return [...(note === null ? [] : [para(`About the degrees of freedom: ${note}`)]), ...naiveBlocks(fit), ...sensitivityBlocks(fit, sensitivity, mode, unit)];
}
