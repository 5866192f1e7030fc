/**
 * Participants with the same design rows and the same answers, in the same order, have the same likelihood
 * contribution and the same adaptive nodes, so the likelihood needs each such pattern once, weighted by how many
 * participants share it. Participants are hashed (FNV-1a) on their answers and the bits of every design value, then
 * compared exactly within a hash (no rounding), so grouping changes only the order of summation. With a few arms and a
 * fixed visit schedule patterns are few; with actual visit days most participants are their own pattern (bench data:
 * 180,234 patterns among 200,000 participants) and this costs one pass. Cost O(N p).
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
  const bits = new Uint32Array(x.buffer, x.byteOffset, x.length * 2);
  // Hash of each participant's rows (answers and the bits of every design value), then exact comparison within a hash.
  const byHash = new Map<number, number[]>();
  const firstOf: number[] = [];
  const counts: number[] = [];
  const same = (a: number, b: number): boolean => {
    const la = start[a]!;
    const lb = start[b]!;
    const n = start[a + 1]! - la;
    if (start[b + 1]! - lb !== n) return false;
    for (let t = 0; t < n; t++) {
      const ra = order[la + t]!;
      const rb = order[lb + t]!;
      if (y[ra] !== y[rb]) return false;
      for (let j = 0; j < 2 * p; j++) if (bits[2 * ra * p + j] !== bits[2 * rb * p + j]) return false;
    }
    return true;
  };
  for (let i = 0; i < nG; i++) {
    const lo = start[i]!;
    const hi = start[i + 1]!;
    if (hi === lo) continue;
    let h = 0x811c9dc5 ^ (hi - lo);
    for (let t = lo; t < hi; t++) {
      const r = order[t]!;
      h = Math.imul(h ^ (y[r] === 1 ? 1 : 2), 0x01000193);
      for (let j = 0; j < 2 * p; j++) h = Math.imul(h ^ bits[2 * r * p + j]!, 0x01000193);
    }
    const list = byHash.get(h);
    let at = -1;
    if (list !== undefined) for (const k of list) if (same(firstOf[k]!, i)) at = k;
    if (at >= 0) counts[at] = counts[at]! + 1;
    else {
      if (list === undefined) byHash.set(h, [firstOf.length]);
      else list.push(firstOf.length);
      firstOf.push(i);
      counts.push(1);
    }
  }
  const nP = firstOf.length;
  const newStart = new Int32Array(nP + 1);
  for (let k = 0; k < nP; k++) newStart[k + 1] = newStart[k]! + (start[firstOf[k]! + 1]! - start[firstOf[k]!]!);
  const newOrder = new Int32Array(newStart[nP]!);
  for (let k = 0; k < nP; k++) newOrder.set(order.subarray(start[firstOf[k]!]!, start[firstOf[k]! + 1]!), newStart[k]!);
  return { p, x, y, order: newOrder, start: newStart, count: Float64Array.from(counts) };
}
