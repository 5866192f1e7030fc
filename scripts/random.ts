/**
 * mulberry32, a small public-domain 32-bit seeded generator (attributed to Tommy Ettinger, 2017, from memory; common
 * practice for reproducible test and demo data, not for cryptography): returns a function giving uniform numbers in
 * [0, 1) from a 32-bit seed.
 * The one copy used by the demo data, the benchmarks and the model tests. Cost O(1) per draw.
 *
 * Example: const u = mulberry32(1); u() → a number in [0, 1), the same on every run and platform.
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
