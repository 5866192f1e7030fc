/**
 * SHA-256 (NIST FIPS 180-4, §6.2) over UTF-8 bytes, written out in plain TypeScript so the core needs no platform
 * crypto. Incremental: feed text or bytes in pieces, then take the digest. Cost O(bytes), constant memory.
 * Example: sha256Hex("abc") → "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" (FIPS 180-4 example).
 */

/** Round constants: the first 32 bits of the fractional parts of the cube roots of the first 64 primes (FIPS 180-4 §4.2.2). */
const K = new Int32Array([
  0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5, 0xd807aa98, 0x12835b01,
  0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174, 0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc,
  0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da, 0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147,
  0x06ca6351, 0x14292967, 0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
  0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070, 0x19a4c116, 0x1e376c08,
  0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3, 0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208,
  0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2,
]);

/** Initial hash value: the first 32 bits of the fractional parts of the square roots of the first 8 primes (§5.3.3). */
const H0 = [0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a, 0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19];

/** Thrown when a finished hash is used again (its digest can be taken once). */
export class HashUsageError extends Error {
  constructor() {
    super('This SHA-256 hash is finished: its digest was already taken; start a new Sha256 for another message.');
    this.name = 'HashUsageError';
  }
}

export class Sha256 {
  private readonly h = new Int32Array(H0); // Int32 lanes keep the arithmetic in small integers
  private readonly block = new Uint8Array(64);
  private readonly w = new Int32Array(64);
  private filled = 0;
  private bytes = 0; // total message length in bytes (exact up to 2^53)
  private done = false;

  /** Adds bytes to the message. Throws HashUsageError after hex(). */
  update(data: Uint8Array): this {
    if (this.done) throw new HashUsageError();
    for (let i = 0; i < data.length; i++) this.byte(data[i]!);
    return this;
  }

  /** Adds the UTF-8 encoding of a string (lone surrogates become U+FFFD, as the WHATWG encoder does). */
  updateText(text: string): this {
    if (this.done) throw new HashUsageError();
    const block = this.block;
    for (let i = 0; i < text.length; i++) {
      let c = text.charCodeAt(i);
      if (c < 0x80) {
        // ASCII fast path: straight into the block
        block[this.filled++] = c;
        this.bytes++;
        if (this.filled === 64) {
          this.compress();
          this.filled = 0;
        }
        continue;
      }
      if (c >= 0xd800 && c <= 0xdbff && i + 1 < text.length) {
        const d = text.charCodeAt(i + 1);
        if (d >= 0xdc00 && d <= 0xdfff) {
          c = 0x10000 + ((c - 0xd800) << 10) + (d - 0xdc00);
          i++;
        }
      }
      if (c >= 0xd800 && c <= 0xdfff) c = 0xfffd;
      if (c < 0x80) this.byte(c);
      else if (c < 0x800) {
        this.byte(0xc0 | (c >> 6));
        this.byte(0x80 | (c & 63));
      } else if (c < 0x10000) {
        this.byte(0xe0 | (c >> 12));
        this.byte(0x80 | ((c >> 6) & 63));
        this.byte(0x80 | (c & 63));
      } else {
        this.byte(0xf0 | (c >> 18));
        this.byte(0x80 | ((c >> 12) & 63));
        this.byte(0x80 | ((c >> 6) & 63));
        this.byte(0x80 | (c & 63));
      }
    }
    return this;
  }

  /** Pads the message (§5.1.1) and returns the 256-bit digest as 64 lower-case hex digits. Call once. */
  hex(): string {
    if (this.done) throw new HashUsageError();
    const bits = this.bytes * 8;
    this.byte(0x80);
    while (this.filled !== 56) this.byte(0);
    const hi = Math.floor(bits / 0x100000000);
    const lo = bits >>> 0;
    for (const word of [hi, lo]) for (let s = 24; s >= 0; s -= 8) this.byte((word >>> s) & 255);
    this.done = true;
    return Array.from(this.h, (x) => (x >>> 0).toString(16).padStart(8, '0')).join('');
  }

  private byte(b: number): void {
    this.block[this.filled++] = b;
    this.bytes++;
    if (this.filled === 64) {
      this.compress();
      this.filled = 0;
    }
  }

  /** One application of the compression function to the current 512-bit block (§6.2.2). */
  private compress(): void {
    const w = this.w;
    const m = this.block;
    for (let t = 0; t < 16; t++) w[t] = (m[4 * t]! << 24) | (m[4 * t + 1]! << 16) | (m[4 * t + 2]! << 8) | m[4 * t + 3]!;
    for (let t = 16; t < 64; t++) {
      const x = w[t - 15]!;
      const y = w[t - 2]!;
      const s0 = ((x >>> 7) | (x << 25)) ^ ((x >>> 18) | (x << 14)) ^ (x >>> 3);
      const s1 = ((y >>> 17) | (y << 15)) ^ ((y >>> 19) | (y << 13)) ^ (y >>> 10);
      w[t] = (w[t - 16]! + s0 + w[t - 7]! + s1) | 0;
    }
    const h = this.h;
    let a = h[0]!, b = h[1]!, c = h[2]!, d = h[3]!, e = h[4]!, f = h[5]!, g = h[6]!, k = h[7]!;
    for (let t = 0; t < 64; t++) {
      const S1 = ((e >>> 6) | (e << 26)) ^ ((e >>> 11) | (e << 21)) ^ ((e >>> 25) | (e << 7));
      const ch = (e & f) ^ (~e & g);
      const t1 = (k + S1 + ch + K[t]! + w[t]!) | 0;
      const S0 = ((a >>> 2) | (a << 30)) ^ ((a >>> 13) | (a << 19)) ^ ((a >>> 22) | (a << 10));
      const maj = (a & b) ^ (a & c) ^ (b & c);
      const t2 = (S0 + maj) | 0;
      k = g;
      g = f;
      f = e;
      e = (d + t1) | 0;
      d = c;
      c = b;
      b = a;
      a = (t1 + t2) | 0;
    }
    h[0] = (h[0]! + a) | 0;
    h[1] = (h[1]! + b) | 0;
    h[2] = (h[2]! + c) | 0;
    h[3] = (h[3]! + d) | 0;
    h[4] = (h[4]! + e) | 0;
    h[5] = (h[5]! + f) | 0;
    h[6] = (h[6]! + g) | 0;
    h[7] = (h[7]! + k) | 0;
  }
}

/** SHA-256 of a string's UTF-8 bytes as lower-case hex. Example: sha256Hex("") → "e3b0c442…b855". */
export function sha256Hex(text: string): string {
  return new Sha256().updateText(text).hex();
}
