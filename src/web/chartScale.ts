/** Axis arithmetic for the page's charts: round tick values and linear maps from data to pixels. */

/**
 * Round tick values covering [min, max], about `count` of them, each step 1, 2 or 5 times a power of ten
 * ("nice numbers", Heckbert, Graphics Gems 1990, pp. 61–63). Cost O(count).
 * Example: niceTicks(0, 97, 5) gives [0, 20, 40, 60, 80, 100].
 * A zero-width range is widened by one unit either side; non-finite bounds give [].
 */
export function niceTicks(min: number, max: number, count = 5): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return [];
  let lo = Math.min(min, max);
  let hi = Math.max(min, max);
  if (lo === hi) {
    lo -= 1;
    hi += 1;
  }
  const step = niceStep((hi - lo) / Math.max(1, count));
  const first = Math.floor(lo / step) * step;
  const last = Math.ceil(hi / step) * step;
  const out: number[] = [];
  const n = Math.round((last - first) / step);
  for (let i = 0; i <= n; i++) out.push(roundTo(first + i * step, step));
  return out;
}

/** The smallest step of the form {1, 2, 5} × 10^k not below `rough` (Heckbert 1990). */
export function niceStep(rough: number): number {
  const power = 10 ** Math.floor(Math.log10(rough));
  const fraction = rough / power;
  const nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  return nice * power;
}

/** Removes floating-point dust from a multiple of `step` (0.30000000000000004 becomes 0.3). */
function roundTo(value: number, step: number): number {
  const decimals = Math.max(0, -Math.floor(Math.log10(step)) + 1);
  return Number(value.toFixed(Math.min(decimals, 12)));
}

/** A linear map from [d0, d1] to [r0, r1]; a zero-width domain maps everything to the middle of the range. */
export function linearScale(d0: number, d1: number, r0: number, r1: number): (v: number) => number {
  if (d0 === d1) return () => (r0 + r1) / 2;
  const k = (r1 - r0) / (d1 - d0);
  return (v) => r0 + (v - d0) * k;
}

/** The finite extent of some lists of numbers (nulls and NaN skipped); null when there is none. */
export function extent(...lists: readonly (readonly (number | null)[] | undefined)[]): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const list of lists) {
    if (!list) continue;
    for (const v of list) {
      if (v === null || !Number.isFinite(v)) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return lo <= hi ? [lo, hi] : null;
}

/** A tick label: integers plainly, others with up to 3 significant decimals and no trailing zeros. */
export function tickLabel(value: number): string {
  if (Number.isInteger(value)) return value.toLocaleString('en-US');
  return String(Number(value.toPrecision(6)));
}
