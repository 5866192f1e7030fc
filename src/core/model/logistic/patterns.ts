/**
 * Participants with the same design rows and the same answers, in the same order, have the same likelihood
 * contribution and the same adaptive nodes, so the likelihood needs each such pattern once, weighted by how many
 * participants share it. The key is exact: every design value's bits and every answer (no rounding), so grouping
 * changes only the order of summation. With a few arms and a fixed visit schedule patterns are few; with actual visit
 * days most participants are their own pattern and this costs one pass. Cost O(N p) to build the keys.
 */
import type { Grouped } from './objective';

export interface Patterns extends Grouped {
  /** Participants sharing each pattern (group g of the returned start/order). */
  readonly count: Float64Array;
}

/** Groups the participants of `g` (order/start by participant) into patterns; the first member's rows represent each. */
export function groupPatterns(g: Grouped): Patterns {
  const { p, x, y, order, start } = g;
  const nG = start.length - 1;
  const index = new Map<string, number>();
  const firstOf: number[] = [];
  const counts: number[] = [];
  const bits = new Uint32Array(x.buffer, x.byteOffset, x.length * 2);
  for (let i = 0; i < nG; i++) {
    const lo = start[i]!;
    const hi = start[i + 1]!;
    if (hi === lo) continue;
    let key = '';
    for (let t = lo; t < hi; t++) {
      const r = order[t]!;
      key += y[r] === 1 ? 'y' : 'n';
      for (let j = 0; j < p; j++) key += `${bits[2 * (r * p + j)]!.toString(36)}.${bits[2 * (r * p + j) + 1]!.toString(36)},`;
    }
    const at = index.get(key);
    if (at === undefined) {
      index.set(key, firstOf.length);
      firstOf.push(i);
      counts.push(1);
    } else counts[at] = counts[at]! + 1;
  }
  const nP = firstOf.length;
  const newStart = new Int32Array(nP + 1);
  for (let k = 0; k < nP; k++) newStart[k + 1] = newStart[k]! + (start[firstOf[k]! + 1]! - start[firstOf[k]!]!);
  const newOrder = new Int32Array(newStart[nP]!);
  for (let k = 0; k < nP; k++) newOrder.set(order.subarray(start[firstOf[k]!]!, start[firstOf[k]! + 1]!), newStart[k]!);
  return { p, x, y, order: newOrder, start: newStart, count: Float64Array.from(counts) };
}
