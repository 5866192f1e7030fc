/**
 * Orders and order statistics on numbers without a comparator over objects: the timing lists and summaries at a
 * million rows sort hundreds of thousands of entries by a few thousand distinct keys.
 */

/**
 * The members ordered by key (ascending), members with equal keys in the order given: a counting sort over the ranks
 * of the distinct keys. Keys are numbers other than NaN. O(m + d log d) for m members and d distinct keys.
 * @example orderByKey(Float64Array.of(5, 2, 5, 1), Int32Array.of(0, 1, 2, 3)) // Int32Array [3, 1, 0, 2]
 */
export function orderByKey(key: Float64Array, members: Int32Array): Int32Array {
  const m = members.length;
  const rank = new Map<number, number>();
  for (let j = 0; j < m; j++) rank.set(key[j]!, 0);
  const distinct = Float64Array.from(rank.keys()).sort();
  distinct.forEach((k, r) => rank.set(k, r));
  const start = new Int32Array(distinct.length + 1);
  const ranks = new Int32Array(m);
  for (let j = 0; j < m; j++) {
    const r = rank.get(key[j]!)!;
    ranks[j] = r;
    start[r + 1]!++;
  }
  for (let r = 0; r < distinct.length; r++) start[r + 1]! += start[r]!;
  const out = new Int32Array(m);
  for (let j = 0; j < m; j++) out[start[ranks[j]!]!++] = members[j]!;
  return out;
}

/**
 * The median, minimum and maximum of `x` (not changed), or null when it is empty; the median of an even count is the
 * mean of the two middle values. By selection (Hoare's FIND, 1961) on a copy: O(n) expected, exact.
 * @example medianMinMax(Float64Array.of(9, -2, 3, 4)) // { median: 3.5, min: -2, max: 9 }
 */
export function medianMinMax(x: Float64Array): { readonly median: number; readonly min: number; readonly max: number } | null {
  const n = x.length;
  if (n === 0) return null;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = x[i]!;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  const a = Float64Array.from(x);
  const hi = n >> 1;
  const upper = select(a, hi);
  if (n % 2 === 1) return { median: upper, min, max };
  // The lower middle value is the largest of the elements placed before position hi.
  let lower = -Infinity;
  for (let i = 0; i < hi; i++) if (a[i]! > lower) lower = a[i]!;
  return { median: (lower + upper) / 2, min, max };
}

/** Rearranges `a` so that a[k] is the value a sorted copy has at k, smaller-or-equal values before it. O(n) expected. */
function select(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  while (hi > lo) {
    // Median of three as the pivot, then a three-way partition (many equal values are common: whole days).
    const mid = (lo + hi) >> 1;
    const p = median3(a[lo]!, a[mid]!, a[hi]!);
    let lt = lo;
    let gt = hi;
    let i = lo;
    while (i <= gt) {
      const v = a[i]!;
      if (v < p) {
        a[i] = a[lt]!;
        a[lt++] = v;
        i++;
      } else if (v > p) {
        a[i] = a[gt]!;
        a[gt--] = v;
      } else i++;
    }
    if (k < lt) hi = lt - 1;
    else if (k > gt) lo = gt + 1;
    else return p;
  }
  return a[k]!;
}

function median3(x: number, y: number, z: number): number {
  return x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
}
