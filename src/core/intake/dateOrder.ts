/**
 * The per-column decision between day/month/year and month/day/year for dates whose day and month are numbers.
 * One cheap pass over the column's text, before any date is parsed.
 */
import { numericDateParts } from './dateText';
import { toCellSource, type CellInput } from './cellSource';
import type { DateOrder } from './types';

/** How many example values a decision keeps for its message. */
const EXAMPLES = 3;

export type DateOrderDecision =
  /** The order numeric dates of this column are read in, and why: given by the user, or the only reading of some
   * values (`evidence` holds up to three of them). No numeric date at all gives order null, source 'none'. */
  | { readonly kind: 'decided'; readonly order: DateOrder | null; readonly source: 'setting' | 'data' | 'none'; readonly evidence: readonly string[] }
  /** Every numeric date reads both ways (03/04/2025): the user must say. */
  | { readonly kind: 'ambiguous'; readonly examples: readonly string[] }
  /** Some values read only day first (13/01/2025), others only month first (01/13/2025). */
  | { readonly kind: 'mixed'; readonly dayFirst: readonly string[]; readonly monthFirst: readonly string[] };

/** Keeps up to EXAMPLES distinct example values; returns 1 (one more value counted). */
function keep(list: string[], t: string): 1 {
  if (list.length < EXAMPLES && !list.includes(t)) list.push(t);
  return 1;
}

/**
 * Decides how column `col` of `cells` (row 0 is the header) reads dates like 03/04/2025. A given `forced` order
 * always wins (source 'setting' when the column has numeric dates, else 'none'; values it cannot read are reported
 * row by row later). Otherwise a value whose first part is over 12 (and second at most 12) can only be day first, one whose
 * second part is over 12 only month first; values with both parts at most 12 and different read both ways, and equal
 * parts (05/05/2025) read the same either way. Two-digit years are not evidence (they are never read). Never throws;
 * O(rows), allocating only for the few values with a numeric-date shape.
 * @example decideDateOrder([["ADT"], ["13/01/2025"], ["03/04/2025"]], 0, undefined) // { kind: 'decided', order: 'dmy', source: 'data', evidence: ["13/01/2025"] }
 * @example decideDateOrder([["ADT"], ["03/04/2025"]], 0, undefined) // { kind: 'ambiguous', examples: ["03/04/2025"] }
 */
export function decideDateOrder(cells: CellInput, col: number, forced: DateOrder | undefined): DateOrderDecision {
  const source = toCellSource(cells);
  const dayFirst: string[] = [];
  const monthFirst: string[] = [];
  const both: string[] = [];
  let nDay = 0;
  let nMonth = 0;
  let nBoth = 0;
  let nSame = 0;
  for (let r = 1; r < source.rowCount; r++) {
    const cell = source.cell(r, col);
    if (typeof cell !== 'string') continue;
    const c0 = cell.charCodeAt(0);
    // Cheap shape filter before trimming: a numeric date starts with a digit (or a space before one).
    if (!((c0 >= 48 && c0 <= 57) || c0 === 32 || c0 === 9)) continue;
    const t = cell.trim();
    const p = numericDateParts(t);
    if (p === null || p.yearDigits !== 4) continue;
    const { first: a, second: b } = p;
    if (a < 1 || b < 1 || (a > 12 && b > 12)) continue; // no reading: reported as impossible later
    if (a > 12) nDay += keep(dayFirst, t);
    else if (b > 12) nMonth += keep(monthFirst, t);
    else if (a !== b) nBoth += keep(both, t);
    else nSame++;
  }
  if (forced !== undefined) {
    const any = nDay + nMonth + nBoth + nSame > 0;
    return { kind: 'decided', order: forced, source: any ? 'setting' : 'none', evidence: forced === 'dmy' ? dayFirst : monthFirst };
  }
  if (nDay > 0 && nMonth > 0) return { kind: 'mixed', dayFirst, monthFirst };
  if (nDay > 0) return { kind: 'decided', order: 'dmy', source: 'data', evidence: dayFirst };
  if (nMonth > 0) return { kind: 'decided', order: 'mdy', source: 'data', evidence: monthFirst };
  if (nBoth > 0) return { kind: 'ambiguous', examples: both };
  // Only values like 05/05/2025 read the same in both orders; day first is as good as month first for them.
  return { kind: 'decided', order: nSame > 0 ? 'dmy' : null, source: 'none', evidence: [] };
}
