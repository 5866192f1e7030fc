/**
 * Print settings of a report sheet: fit to one page wide (any number of pages tall), landscape when the widest table
 * would not fit a portrait page at a readable size, the header row of a sheet's only table repeated on every page, and
 * a footer with the sheet name, the page number, the run date and the first 12 characters of the input fingerprint.
 * Footer codes (&A sheet name, &P page, &N pages, &L &C &R sections, && a literal ampersand) are those of the
 * headerFooter element, ECMA-376 Part 1 §18.3.1.36. Pure.
 */

/** The run a printed page comes from; both parts are optional so a workbook can be written without a run. */
export interface PrintStamp {
  /** ISO date or timestamp of the run; the first 10 characters (YYYY-MM-DD) are printed. */
  readonly runAt?: string;
  /** The input fingerprint (SHA-256 in hex); the first 12 characters are printed. */
  readonly fingerprint?: string;
}

/** Table widths (sum of column widths in characters) above which a sheet prints landscape. A portrait A4 or Letter
 * page holds about 90 characters of the default font between default margins (from memory: ~7.3 in at ~12
 * characters per inch); up to 1.3 times that still prints at a readable size once fitted to the width. */
export const LANDSCAPE_FROM = 118;

/** The characters of a fingerprint that are printed. */
export const FOOTER_FINGERPRINT_LENGTH = 12;

/** Text made safe inside a footer: "&" starts a code there, so a literal one is doubled. */
function footerText(s: string): string {
  return s.replace(/&/g, '&&');
}

/**
 * The footer: sheet name on the left, "Page n of m" in the centre, run date and input fingerprint on the right.
 * Example: footer({ runAt: '2026-12-02T09:30:00Z', fingerprint: 'ab12…' }) →
 * "&L&A&CPage &P of &N&RRun 2026-12-02, input ab12cd34ef56".
 */
export function footer(stamp: PrintStamp): string {
  const right: string[] = [];
  if (stamp.runAt !== undefined && stamp.runAt !== '') right.push(`Run ${stamp.runAt.slice(0, 10)}`);
  if (stamp.fingerprint !== undefined && stamp.fingerprint !== '') right.push(`input ${stamp.fingerprint.slice(0, FOOTER_FINGERPRINT_LENGTH)}`);
  return `&L&A&CPage &P of &N${right.length > 0 ? `&R${footerText(right.join(', '))}` : ''}`;
}

/**
 * The stamp of a run from its results JSON (settings.runAt and input.fingerprint; schema in the README), leaving out
 * what is missing. Example: printStampOf({ settings: { runAt: '2026-12-02T09:30:00Z' }, input: { fingerprint: 'ab' } })
 * → { runAt: '2026-12-02T09:30:00Z', fingerprint: 'ab' }.
 */
export function printStampOf(json: Record<string, unknown>): PrintStamp {
  const settings = json.settings as { runAt?: unknown } | undefined;
  const input = json.input as { fingerprint?: unknown } | undefined;
  return {
    ...(typeof settings?.runAt === 'string' ? { runAt: settings.runAt } : {}),
    ...(typeof input?.fingerprint === 'string' ? { fingerprint: input.fingerprint } : {}),
  };
}

/** Printable area in points (1/72 inch) of the smaller of A4 (595 × 842) and Letter (612 × 792) in each direction,
 * less the margins writeWorkbook sets (0.5 in left and right, 0.6 in top, 0.7 in bottom). */
export const PRINTABLE = {
  portrait: { width: 595 - 72, height: 792 - 94 },
  landscape: { width: 792 - 72, height: 595 - 94 },
} as const;

/** Width in points of a column `chars` characters wide in the default 11-point font: about 7 pixels a character
 * plus 5 pixels of padding, at 0.75 points a pixel (from memory: the column width rule of ECMA-376 Part 1
 * §18.3.1.13). */
export function columnPoints(chars: number): number {
  return (chars * 7 + 5) * 0.75;
}

/**
 * The rows after which a page break keeps each block (a chart, or a table with its caption) whole on one printed
 * page: walking down the sheet at the scale "one page wide" gives, a block that would run past the foot of the current
 * page starts the next one (a block taller than a page is left where it is, and splits between rows only).
 * `rowHeight(r)` gives row r's height in points (1-based rows); `blocks` are first rows and row counts, in order.
 * Cost O(rows).
 * Example: 15-point rows, a page of 300 points at scale 1, a chart of 10 rows at row 15 → [14] (rows 15–24 would end
 * at 360 points).
 */
export function keepWholeBreaks(
  rowHeight: (row: number) => number,
  blocks: readonly { readonly row: number; readonly rows: number }[],
  pageHeight: number,
  scale: number,
): number[] {
  // 5% to spare: readers round the fitted scale and measure column widths slightly differently.
  const page = (0.95 * pageHeight) / scale;
  const breaks: number[] = [];
  let top = 0; // sheet points from row 1 to the top of the current page
  let y = 0; // sheet points from row 1 to the top of row r
  let r = 1;
  for (const c of blocks) {
    for (; r < c.row; r++) {
      y += rowHeight(r);
      if (y - top > page) top = y - rowHeight(r);
    }
    let height = 0;
    for (let k = 0; k < c.rows; k++) height += rowHeight(c.row + k);
    if (y - top + height > page && height <= page && c.row > 1) {
      breaks.push(c.row - 1);
      top = y;
    }
  }
  return breaks;
}
