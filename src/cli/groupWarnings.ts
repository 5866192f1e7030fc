/** A problem to print: the issue shape the pipeline returns, or a note from a file reader. */
export interface Printable {
  readonly code: string;
  /** The column's role, when the problem concerns one (warnings group by code and role). */
  readonly role?: string | null;
  readonly cell: string | null;
  readonly message: string;
}

/** Warnings of one kind: the first one in full, how many there are, and the first few cells. */
export interface WarningGroup {
  readonly first: Printable;
  count: number;
  readonly cells: string[];
  /** True when the first message already speaks for all `count` rows (the blank-row summary): no "… more" line. */
  readonly summary?: boolean;
}

/** Cells named per group after the first message. */
export const CELLS_NAMED = 4;

/**
 * Groups warnings by their code and role, in the order each kind first appears, counting them and keeping the first few cells
 * of each. A cell already seen for a code is counted once (a row left out of both uses has two warnings that say the
 * same thing). One pass with a hash set: O(warnings), whatever their number.
 * Example: groupWarnings([{code:'a',cell:'S!B2',…},{code:'a',cell:'S!B3',…}]) → [{first: …B2, count: 2, cells: ['S!B3']}]
 */
export function groupWarnings(items: Iterable<Printable>): WarningGroup[] {
  const groups = new Map<string, WarningGroup>();
  const seen = new Set<string>();
  for (const w of items) {
    if (w.cell !== null) {
      const key = `${w.code}\u0000${w.cell}`;
      if (seen.has(key)) continue;
      seen.add(key);
    }
    const kind = `${w.code}\u0000${w.role ?? ''}`;
    const g = groups.get(kind);
    if (g === undefined) groups.set(kind, { first: w, count: 1, cells: [] });
    else {
      g.count++;
      if (w.cell !== null && g.cells.length < CELLS_NAMED) g.cells.push(w.cell);
    }
  }
  return [...groups.values()];
}

/** An issue as one line, led by its cell address (intake's row-level messages already start with it). */
export const where = (i: { cell: string | null; message: string }): string =>
  i.cell === null || i.message.startsWith(i.cell) ? i.message : `${i.cell}: ${i.message}`;

/** The printed lines of the groups: the first warning of each kind, then "and N more like it: cells, …". */
export function groupLines(groups: readonly WarningGroup[]): string[] {
  const lines: string[] = [];
  for (const g of groups) {
    lines.push(`  ${where(g.first)}`);
    if (g.count > 1 && g.summary !== true) {
      const more = g.count - 1;
      const named = g.cells.join(', ');
      lines.push(`    … and ${more.toLocaleString('en-US')} more like it${named === '' ? '' : `: ${named}${more > g.cells.length ? ', …' : ''}`}.`);
    }
  }
  return lines;
}

/** The rows left out of one use: how many, and those rows grouped by kind (each row once). */
export interface LeftOutRows {
  readonly rows: number;
  readonly groups: WarningGroup[];
}

/** A warning that leaves a row out of a use (the same test the pipeline's list of left-out rows applies). */
type RowIssue = Printable & {
  readonly severity?: string;
  readonly row?: number | null;
  readonly use?: string | null;
  /** A summary issue standing for many rows (blank rows), left out of both uses. */
  readonly rowSpans?: readonly (readonly [number, number])[];
};

const leavesRowOut = (i: RowIssue): boolean =>
  i.severity === 'warning' && typeof i.row === 'number' && (i.use === 'timing' || i.use === 'model' || i.rowSpans !== undefined);

/** Rows a summary issue stands for (the sum of its spans). */
const spanRows = (spans: readonly (readonly [number, number])[]): number => spans.reduce((n, [a, b]) => n + b - a + 1, 0);

/**
 * The rows left out of `use`, each row once (under the first warning that names it for that use), grouped by kind as
 * groupWarnings groups them, so the group counts add up to `rows`. One pass with a hash set: O(issues).
 * Example: a row with a blank participant and a bad date, both for 'timing' → rows 1, one group (the first warning).
 */
export function leftOutOf(
  issues: Iterable<RowIssue & { readonly severity: string; readonly row: number | null; readonly use: string | null }>,
  use: 'timing' | 'model',
): LeftOutRows {
  const groups = new Map<string, WarningGroup>();
  const rows = new Set<number>();
  // Blank rows come as one summary issue whose spans name them; no other issue names a blank row, so they add apart.
  let spanned = 0;
  for (const i of issues) {
    if (i.rowSpans !== undefined && leavesRowOut(i)) {
      const n = spanRows(i.rowSpans);
      spanned += n;
      groups.set(`${i.code}\u0000spans`, { first: i, count: n, cells: [], summary: true });
      continue;
    }
    if (!leavesRowOut(i) || i.use !== use || rows.has(i.row!)) continue;
    rows.add(i.row!);
    const kind = `${i.code}\u0000${i.role ?? ''}`;
    const g = groups.get(kind);
    if (g === undefined) groups.set(kind, { first: i, count: 1, cells: [] });
    else {
      g.count++;
      if (i.cell !== null && g.cells.length < CELLS_NAMED) g.cells.push(i.cell);
    }
  }
  return { rows: rows.size + spanned, groups: [...groups.values()] };
}

/** Warnings that leave no row out of a use (the row is kept, or the warning is about the whole range). */
export function otherWarnings<T extends RowIssue>(
  items: readonly T[],
): T[] {
  return items.filter((i) => !leavesRowOut(i));
}
