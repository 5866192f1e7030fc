/** Grouping cell rectangles into write requests that stay well under the host's payload and cell limits. */
import type { CellPatch } from './layout';

/** Bytes one row of a patch adds to a request: its values' and formats' JSON text (UTF-8 estimate, 3 bytes per
 * non-ASCII character at most). O(cells of the row). */
function rowBytes(values: readonly unknown[], formats: readonly string[]): number {
  const text = JSON.stringify(values) + JSON.stringify(formats);
  let bytes = text.length;
  for (let i = 0; i < text.length; i++) if (text.charCodeAt(i) > 0x7f) bytes += 2;
  return bytes + 64; // per-row overhead of the request's own structure, generous (common practice: round up)
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
export function planWrites(patches: readonly CellPatch[], targetBytes: number, maxCells: number): CellPatch[][] {
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
    let start = 0;
    for (let i = 0; i < p.values.length; i++) {
      const b = rowBytes(p.values[i] ?? [], p.formats[i] ?? []);
      if (i > start && (bytes + b > targetBytes || cells + width > maxCells)) {
        current.push(slice(p, start, i));
        flush();
        start = i;
      } else if (i === start && current.length > 0 && (bytes + b > targetBytes || cells + width > maxCells)) {
        flush();
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
