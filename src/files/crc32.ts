/** CRC-32 with the polynomial of ISO 3309 / ITU-T V.42 (reflected 0xEDB88320), as the zip format stores it. */

/** Eight tables for "slicing by 8" (eight bytes per step; the table method of Kounavis & Berry 2005): TABLES[0] is
 * the classic byte table, TABLES[k][n] the CRC of byte n followed by k zero bytes. */
const TABLES = ((): Uint32Array[] => {
  const t = Array.from({ length: 8 }, () => new Uint32Array(256));
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[0]![n] = c >>> 0;
  }
  for (let n = 0; n < 256; n++) {
    let c = t[0]![n]!;
    for (let k = 1; k < 8; k++) {
      c = t[0]![c & 0xff]! ^ (c >>> 8);
      t[k]![n] = c >>> 0;
    }
  }
  return t;
})();
const [T0, T1, T2, T3, T4, T5, T6, T7] = TABLES as [Uint32Array, Uint32Array, Uint32Array, Uint32Array, Uint32Array, Uint32Array, Uint32Array, Uint32Array];

/**
 * Continues a CRC-32 over more bytes: start with crc32Update(0, first), then feed the result back in. Cost O(bytes).
 * Example: crc32Update(0, new TextEncoder().encode('123456789')) → 0xCBF43926 (the standard check value)
 */
export function crc32Update(crc: number, bytes: Uint8Array): number {
  let c = ~crc >>> 0;
  let i = 0;
  const n = bytes.length;
  for (; i + 8 <= n; i += 8) {
    const a = (c ^ (bytes[i]! | (bytes[i + 1]! << 8) | (bytes[i + 2]! << 16) | (bytes[i + 3]! << 24))) >>> 0;
    c =
      T7[a & 0xff]! ^
      T6[(a >>> 8) & 0xff]! ^
      T5[(a >>> 16) & 0xff]! ^
      T4[a >>> 24]! ^
      T3[bytes[i + 4]!]! ^
      T2[bytes[i + 5]!]! ^
      T1[bytes[i + 6]!]! ^
      T0[bytes[i + 7]!]!;
  }
  for (; i < n; i++) c = T0[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return ~c >>> 0;
}
