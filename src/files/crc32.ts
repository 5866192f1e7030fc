/** CRC-32 with the polynomial of ISO 3309 / ITU-T V.42 (reflected 0xEDB88320), as the zip format stores it. */
const TABLE = ((): Uint32Array => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/**
 * Continues a CRC-32 over more bytes: start with crc32Update(0, first), then feed the result back in. Cost O(bytes).
 * Example: crc32Update(0, new TextEncoder().encode('123456789')) → 0xCBF43926 (the standard check value)
 */
export function crc32Update(crc: number, bytes: Uint8Array): number {
  let c = ~crc >>> 0;
  for (let i = 0; i < bytes.length; i++) c = TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return ~c >>> 0;
}
