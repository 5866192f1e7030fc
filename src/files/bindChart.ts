/**
 * Where a chart's numbers live on its sheet: each series' x, y and interval bounds are found as a run of cells in one
 * column of a table already written on the sheet (the chart's source table first), so the native chart reads the
 * sheet's own cells. Pure; cost O(tables · columns · rows) per series.
 */
import type { ChartSpec, SheetCell } from '../core/report/types';

/** A table as written on the sheet: header row (1-based), first column (0-based), headers and stored cell values. */
export interface WrittenTable {
  readonly id: string;
  readonly headerRow: number;
  readonly column: number;
  readonly headers: readonly string[];
  /** Body rows as stored (text cut to the cell limit, non-finite numbers blank). */
  readonly rows: readonly (readonly (string | number | null)[])[];
}

/** A run of cells in one column: rows first..last (1-based, inclusive), 0-based column. */
export interface CellRun {
  readonly first: number;
  readonly last: number;
  readonly column: number;
}

export interface BoundSeries {
  readonly name: string;
  readonly x: CellRun;
  readonly y: CellRun;
  /** Values as charted, for the chart's cached copies (what a reader shows before it recalculates). */
  readonly xValues: readonly (string | number | null)[];
  readonly yValues: readonly (number | null)[];
  /** An interval bound drawn as a dashed line. */
  readonly dashed: boolean;
  /** Markers without a joining line. */
  readonly markersOnly: boolean;
}

/** True when a stored cell shows the charted value: equal numbers or text, a number in a text column as its text,
 * and a missing or non-finite value as a blank cell. */
function sameValue(cell: string | number | null | undefined, v: SheetCell | undefined): boolean {
  const want = v === undefined || v === null || (typeof v === 'number' && !Number.isFinite(v)) ? null : v;
  const have = cell ?? null;
  if (want === null || have === null) return want === have;
  if (typeof have === 'string' && typeof want === 'number') return have === String(want);
  return have === want;
}

/** Every place (column and first body row index) where `values` stand as consecutive cells of one column. */
function runsOf(t: WrittenTable, values: readonly SheetCell[], columns?: readonly number[]): { column: number; start: number }[] {
  const found: { column: number; start: number }[] = [];
  const n = values.length;
  for (const j of columns ?? t.headers.map((_, k) => k)) {
    for (let start = 0; start + n <= t.rows.length; start++) {
      let all = true;
      for (let i = 0; i < n && all; i++) all = sameValue(t.rows[start + i]![j], values[i]);
      if (all) found.push({ column: j, start });
    }
  }
  return found;
}

function run(t: WrittenTable, column: number, start: number, n: number): CellRun {
  return { first: t.headerRow + 1 + start, last: t.headerRow + n + start, column: t.column + column };
}

/** Column order to try for a series' values: the column headed by the series' name first. */
function preferred(t: WrittenTable, name: string): number[] {
  const all = t.headers.map((_, k) => k);
  return [...all.filter((k) => t.headers[k] === name), ...all.filter((k) => t.headers[k] !== name)];
}

/**
 * The series of `chart` bound to cells of `tables` (the chart's source table tried first), or null when some series
 * is not found whole in one table, in which case the caller writes the chart's numbers as a table of their own.
 * A series' x, y, lower and upper must sit in the same rows of one table. Series without points are left out.
 * Example: a bar chart of ["A","B"] against [0.5, 1] over a table with columns Site = A, B and Rate = 0.5, 1 at
 * header row 10 → one series with x rows 11..12 in column 0 and y rows 11..12 in column 1.
 */
export function bindChart(chart: ChartSpec, tables: readonly WrittenTable[]): BoundSeries[] | null {
  const order = [...tables.filter((t) => t.id === chart.sourceTable), ...tables.filter((t) => t.id !== chart.sourceTable)];
  const markersOnly = (style: string | undefined): boolean => (style ?? (chart.kind === 'scatter' ? 'points' : 'line')) === 'points';
  const out: BoundSeries[] = [];
  for (const s of chart.series) {
    const n = s.x.length;
    if (n === 0) continue;
    const parts: [string, readonly (number | null)[], boolean][] = [[s.name, s.y, false]];
    if (s.lower !== undefined) parts.push([`${s.name} lower`, s.lower, true]);
    if (s.upper !== undefined) parts.push([`${s.name} upper`, s.upper, true]);
    let bound: BoundSeries[] | null = null;
    for (const t of order) {
      for (const x of runsOf(t, s.x)) {
        const ys = parts.map(([name, values]) => runsOf(t, values.slice(0, n), preferred(t, name)).find((r) => r.start === x.start && r.column !== x.column));
        if (ys.every((r) => r !== undefined) && parts.every(([, values]) => values.length === n)) {
          bound = parts.map(([name, values, dashed], k) => ({
            name,
            x: run(t, x.column, x.start, n),
            y: run(t, ys[k]!.column, x.start, n),
            xValues: s.x,
            yValues: values.map((v) => (v !== null && Number.isFinite(v) ? v : null)),
            dashed,
            markersOnly: !dashed && markersOnly(s.style),
          }));
          break;
        }
      }
      if (bound !== null) break;
    }
    if (bound === null) return null;
    out.push(...bound);
  }
  return out;
}
