import type { Mode } from '../intake/types';
import { para } from './blockParts';
import type { Block, ParagraphBlock } from './types';

/** The summary sheet's wanted name: it carries the cautions in full from cell A1, and every other sheet links there. */
export const SUMMARY_SHEET_NAME = 'Summary';

/** The cautions of SPEC §2, shown in full on the summary sheet (a one-line caution links there from every other sheet), in one place so every front end shows the same words. */
export const CAUTIONS: readonly string[] = [
  'This is an interim look, not a final analysis. Looking at the data repeatedly inflates the chance of a false-positive finding.',
  'Longipane is not a validated system for regulatory submissions.',
  "Results must be read by a qualified statistician under the trial's charter and local regulations. The protocol and the statistical analysis plan take precedence over anything shown here.",
];

/** Shown when unblinded mode is chosen (SPEC §2). */
export const UNBLINDED_CAUTION =
  'Unblinded mode shows results by treatment arm. It is meant only for an unblinded statistician or the statistician of a data monitoring committee; anyone who must stay blinded should not open these sheets.';

export const INVENTED_DATA_NOTE = 'The demo data are invented for illustration; they describe no real trial, site or person.';

/** The one-line caution of every sheet but the summary sheet (SPEC §2 in short; the full text is on the summary sheet). */
export const CAUTION_LINE =
  'Caution: an interim look, not a final analysis; not validated for regulatory submissions; for a qualified statistician to read. The full cautions are on the summary sheet.';

/** Added to the one-line caution in unblinded mode. */
export const UNBLINDED_LINE = 'Unblinded: results by treatment arm, for unblinded readers only.';

/**
 * The one-line caution that opens every sheet but the summary sheet, linked to the summary sheet's cell A1 where the
 * cautions stand in full; in unblinded mode it also says the results are by arm.
 * @example cautionLine('blinded').link // { sheet: 'Summary', cell: 'A1' }
 */
export function cautionLine(mode: Mode): ParagraphBlock {
  const text = mode === 'unblinded' ? `${CAUTION_LINE} ${UNBLINDED_LINE}` : CAUTION_LINE;
  return { kind: 'paragraph', text, style: 'caution', link: { sheet: SUMMARY_SHEET_NAME, cell: 'A1' } };
}

/**
 * The caution paragraphs that open the summary sheet: the three cautions, and in unblinded mode the unblinded caution
 * too (every sheet of an unblinded run, since the workbook as a whole comes from an unblinded look).
 * @example cautionBlocks('blinded').length // 3
 */
export function cautionBlocks(mode: Mode): Block[] {
  const texts = mode === 'unblinded' ? [...CAUTIONS, UNBLINDED_CAUTION] : CAUTIONS;
  return texts.map((text) => para(text, 'caution'));
}
