import type { Mode } from '../intake/types';
import { para } from './blockParts';
import type { Block } from './types';

/** The cautions of SPEC §2, shown on every output sheet, in one place so every front end shows the same words. */
export const CAUTIONS: readonly string[] = [
  'This is an interim look, not a final analysis. Looking at the data repeatedly inflates the chance of a false-positive finding.',
  'Longipane is not a validated system for regulatory submissions.',
  "Results must be read by a qualified statistician under the trial's charter and local regulations. The protocol and the statistical analysis plan take precedence over anything shown here.",
];

/** Shown when unblinded mode is chosen (SPEC §2). */
export const UNBLINDED_CAUTION =
  'Unblinded mode shows results by treatment arm. It is meant only for an unblinded statistician or the statistician of a data monitoring committee; anyone who must stay blinded should not open these sheets.';

export const INVENTED_DATA_NOTE = 'The demo data are invented for illustration; they describe no real trial, site or person.';

/**
 * The caution paragraphs that open every output sheet: the three cautions, and in unblinded mode the unblinded caution
 * too (every sheet of an unblinded run, since the workbook as a whole comes from an unblinded look).
 * @example cautionBlocks('blinded').length // 3
 */
export function cautionBlocks(mode: Mode): Block[] {
  const texts = mode === 'unblinded' ? [...CAUTIONS, UNBLINDED_CAUTION] : CAUTIONS;
  return texts.map((text) => para(text, 'caution'));
}
