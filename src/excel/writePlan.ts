/**
 * Grouping cell rectangles into write requests that stay well under the host's payload and cell limits, and how
 * number formats travel: per cell (`Range.numberFormat`, a code for every cell), or per column (`Range.style`, one
 * named style per format code for a whole column of a patch, when every row of that column has the same code; the
 * columns that do not still go per cell). Both are ExcelApi 1.7. The column way sends each code once per column
 * instead of once per cell.
 */
import type { CellPatch } from './layout';

/** How number formats are written: a code per cell, or a named style per column where the column allows it. */
export type FormatMode = 'cells' | 'columns';

/** UTF-8 bytes of JSON text (3 bytes per non-ASCII character at most, an upper estimate). O(length). */
function textBytes(text: string): number {
  let bytes = text.length;
  for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) > 0x7f) bytes += 2;
  return bytes;
}

/** Per-row overhead of a request's own structure, generous (common practice: round up). */
const ROW_OVERHEAD = 64;

/** Bytes one row of a patch adds to a request: its values' JSON text, and its formats' when they go per cell
 * (`formats` null: per column). O(cells of the row). */
function rowBytes(values: readonly unknown[], formats: readonly string[] | null): number {
  return textBytes(JSON.stringify(values)) + (formats === null ? 0 : textBytes(JSON.stringify(formats))) + ROW_OVERHEAD;
}

/** For each column of a patch, its one format code when every row has it, else null. O(cells). */
export function uniformFormats(p: CellPatch): (string | null)[] {
  const width = p.values[0]?.length ?? 0;
  return Array.from({ length: width }, (_, c) => {
    const first = p.formats[0]?.[c];
    if (first === undefined) return null;
    for (const row of p.formats) if (row[c] !== first) return null;
    return first;
  });
}

/** The name of the workbook style that carries format code `code` (and nothing else). */
export const styleNameFor = (code: string): string => `Longipane format ${code}`;

/** Bytes a patch's formats add once per request in column mode: a style name per uniform column, plus overhead. */
function columnStyleBytes(uniform: readonly (string | null)[]): number {
  let bytes = 0;
  for (const code of uniform) if (code !== null) bytes += textBytes(JSON.stringify(styleNameFor(code))) + ROW_OVERHEAD;
  return bytes;
}

/** The formats of a row that still go per cell in column mode (the non-uniform columns), or null when none do. */
function cellFormatsLeft(formats: readonly string[], uniform: readonly (string | null)[]): string[] | null {
  const left = formats.filter((_, c) => uniform[c] === null);
  return left.length === 0 ? null : left;
}

/** Splits a patch into two by rows (the first half rounded up). */
export function halvePatch(p: CellPatch): [CellPatch, CellPatch] {
  const k = Math.ceil(p.values.length / 2);
  return [
    { ...p, values: p.values.slice(0, k), formats: p.formats.slice(0, k) },
    { ...p, row: p.row + k, values: p.values.slice(k), formats: p.formats.slice(k) },
  ];
}

/**
 * Packs patches, in order, into requests of at most `targetBytes` (estimated) and `maxCells` cells; a patch too big
 * for one request is cut by rows. Every request holds at least one row. Cost O(cells).
 * Example: one 100,000-row × 10-column patch of short numbers at 1,500,000 bytes → about 8 requests.
 */
export function planWrites(patches: readonly CellPatch[], targetBytes: number, maxCells: number, mode: FormatMode = 'cells'): CellPatch[][] {
  const requests: CellPatch[][] = [];
  let current: CellPatch[] = [];
  let bytes = 0;
  let cells = 0;
  const flush = (): void => {
    if (current.length > 0) requests.push(current);
    current = [];
    bytes = 0;
    cells = 0;
  };
  for (const p of patches) {
    const width = p.values[0]?.length ?? 0;
    const uniform = mode === 'columns' ? uniformFormats(p) : null;
    const rowFormats = (i: number): readonly string[] | null =>
      uniform === null ? (p.formats[i] ?? []) : cellFormatsLeft(p.formats[i] ?? [], uniform);
    const styles = uniform === null ? 0 : columnStyleBytes(uniform); // sent once per request holding the patch
    let start = 0;
    bytes += styles;
    for (let i = 0; i < p.values.length; i++) {
      const b = rowBytes(p.values[i] ?? [], rowFormats(i));
      if (i > start && (bytes + b > targetBytes || cells + width > maxCells)) {
        current.push(slice(p, start, i));
        flush();
        start = i;
        bytes += styles;
      } else if (i === start && current.length > 0 && (bytes + b > targetBytes || cells + width > maxCells)) {
        flush();
        bytes += styles;
      }
      bytes += b;
      cells += width;
    }
    if (start < p.values.length) current.push(slice(p, start, p.values.length));
  }
  flush();
  return requests;
}

function slice(p: CellPatch, from: number, to: number): CellPatch {
  return { ...p, row: p.row + from, values: p.values.slice(from, to), formats: p.formats.slice(from, to) };
}

/** What a plan sends: its requests and their payload, the JSON text of the values, format codes and style names
 * (without the planning's per-row allowance for the request's own structure). */
export interface PlanSize {
  readonly requests: number;
  readonly bytes: number;
}

/** The requests and payload bytes of writing `patches` in `mode` at the given budgets. Pure. O(cells). */
export function planSize(patches: readonly CellPatch[], targetBytes: number, maxCells: number, mode: FormatMode): PlanSize {
  const groups = planWrites(patches, targetBytes, maxCells, mode);
  let bytes = 0;
  for (const group of groups) {
    for (const p of group) {
      const uniform = mode === 'columns' ? uniformFormats(p) : null;
      if (uniform !== null) bytes += columnStyleBytes(uniform) - ROW_OVERHEAD * uniform.filter((u) => u !== null).length;
      p.values.forEach((row, i) => {
        const formats = p.formats[i] ?? [];
        bytes += rowBytes(row, uniform === null ? formats : cellFormatsLeft(formats, uniform)) - ROW_OVERHEAD;
      });
    }
  }
  return { requests: groups.length, bytes };
}
