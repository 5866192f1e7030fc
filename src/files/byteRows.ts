/**
 * Sheet rows written straight as UTF-8 bytes, for the long tables of a report: the markup is ASCII we make ourselves,
 * so it is written a character code at a time into a byte buffer, and cell text is copied the same way when it is
 * ASCII (else encoded with TextEncoder.encodeInto). No string is built per cell or per row, so a 200,000-row listing
 * makes no garbage and needs no second pass to encode. The bytes are exactly those of the same markup written as text
 * and encoded as UTF-8. Full buffers go to the part (PartWriter.writeBytes), which takes them over.
 */
import type { PartWriter } from './zipWriter';

/** Bytes gathered before they are handed on (as zipWriter.ts gathers text). */
const CHUNK = 1024 * 1024;
/** Hand the buffer on between rows once this much of it is used. */
const HAND_ON_AT = CHUNK - 64 * 1024;

const encoder = new TextEncoder();

/** A fragment of ASCII markup as bytes, made once and written with ByteRows.raw. */
export function asciiBytes(s: string): Uint8Array {
  return Uint8Array.from(s, (ch) => ch.charCodeAt(0));
}

export class ByteRows {
  private bytes = new Uint8Array(CHUNK);
  private used = 0;

  constructor(private readonly out: PartWriter) {}

  /** Room for `n` more bytes (a row longer than the buffer's rest grows it; rare: long text). */
  room(n: number): void {
    if (this.used + n <= this.bytes.length) return;
    const grown = new Uint8Array(Math.max(2 * this.bytes.length, this.used + n));
    grown.set(this.bytes.subarray(0, this.used));
    this.bytes = grown;
  }

  /** Markup we make ourselves (ASCII only; the caller made room: its length). */
  ascii(s: string): void {
    const b = this.bytes;
    let u = this.used;
    for (let i = 0; i < s.length; i++) b[u++] = s.charCodeAt(i);
    this.used = u;
  }

  /** Bytes made once (ascii() of a fixed fragment, by asciiBytes), copied (room: their length). */
  raw(fragment: Uint8Array): void {
    const b = this.bytes;
    let u = this.used;
    for (let i = 0; i < fragment.length; i++) b[u++] = fragment[i]!;
    this.used = u;
  }

  /** A whole number 0 ≤ n < 2^31 in decimal digits (room: 10 bytes). */
  digits(n: number): void {
    const b = this.bytes;
    if (n < 10) {
      b[this.used++] = 48 + n;
      return;
    }
    let k = n;
    let len = 0;
    while (k > 0) {
      len += 1;
      k = Math.floor(k / 10);
    }
    let u = this.used + len;
    this.used = u;
    k = n;
    while (k > 0) {
      const q = Math.floor(k / 10);
      b[--u] = 48 + (k - q * 10);
      k = q;
    }
  }

  /** Any text as UTF-8 (room: 3 bytes per UTF-16 code unit, made here). */
  text(s: string): void {
    this.room(s.length * 3);
    const b = this.bytes;
    let u = this.used;
    for (let i = 0; i < s.length; i++) {
      const c = s.charCodeAt(i);
      if (c >= 0x80) {
        this.used = u + encoder.encodeInto(s.slice(i), b.subarray(u)).written;
        return;
      }
      b[u++] = c;
    }
    this.used = u;
  }

  /** Between rows: hands the bytes on once the buffer is nearly full. */
  async rowDone(): Promise<void> {
    if (this.used >= HAND_ON_AT) await this.handOn();
  }

  /** Hands on whatever is gathered (at the end of a table). */
  async end(): Promise<void> {
    if (this.used > 0) await this.handOn();
  }

  private async handOn(): Promise<void> {
    const piece = this.bytes.subarray(0, this.used);
    this.bytes = new Uint8Array(CHUNK);
    this.used = 0;
    await this.out.writeBytes(piece);
  }
}
