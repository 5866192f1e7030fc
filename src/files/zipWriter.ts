/**
 * A small zip writer for .xlsx packages (PKWARE APPNOTE 6.3: local headers 4.3.7, central directory 4.3.12, end record
 * 4.3.16; deflate, RFC 1951). Each part's text is handed in piece by piece, encoded as UTF-8 and compressed as it
 * comes (by default with the platform's own CompressionStream, Node ≥ 20 and current browsers; the page hands in a
 * compressor on a thread of its own), so a long sheet exists only as compressed chunks, never as one string. A part's local header is written once its CRC-32 and sizes
 * are known (no data descriptors), which every reader accepts. No zip64: a part or archive past 4 GiB stops with a
 * plain error (a worksheet within Excel's limits of 1,048,576 rows is far below that for our reports).
 */
import { FileFormatError } from './errors';

/** Bytes gathered before they are handed to the compressor: large enough that the per-piece cost vanishes, small
 * enough that memory stays flat. */
const BYTE_CHUNK = 1024 * 1024;
/** Fixed date and time of every part (1980-01-01 00:00, the zip format's earliest), so the same report gives the same
 * bytes; the run date is printed in the footer instead. */
const DOS_TIME = 0;
const DOS_DATE = (0 << 9) | (1 << 5) | 1;
const UTF8_NAMES = 1 << 11;
const LIMIT = 0xffffffff;

interface Entry {
  readonly name: Uint8Array;
  readonly crc: number;
  readonly size: number;
  readonly compressedSize: number;
  readonly offset: number;
}

/** Where one part's text goes: call write() with pieces of any size, then end() once. */
export interface PartWriter {
  write(text: string): Promise<void>;
  /** UTF-8 bytes made elsewhere (byteRows.ts), after the text written before; the writer takes the buffer over. */
  writeBytes(bytes: Uint8Array<ArrayBuffer>): Promise<void>;
  end(): Promise<void>;
}

/** One part compressed: its raw deflate data (RFC 1951) in pieces, and the CRC-32 and length of the bytes that went in. */
export interface CompressedPart {
  readonly chunks: readonly Uint8Array[];
  readonly crc: number;
  readonly size: number;
}

/** Compresses one part's bytes as they come. write() may keep, or take over, the whole buffer behind the view it is
 * given: the caller does not use that buffer again. */
export interface PartCompressor {
  write(bytes: Uint8Array<ArrayBuffer>): Promise<void>;
  end(): Promise<CompressedPart>;
}

/** Makes a compressor for each part (the default: platformCompressor, on the calling thread). */
export type Compressor = () => PartCompressor;

const encoder = new TextEncoder();

function u16(n: number): number[] {
  return [n & 0xff, (n >>> 8) & 0xff];
}
function u32(n: number): number[] {
  return [n & 0xff, (n >>> 8) & 0xff, (n >>> 16) & 0xff, (n >>> 24) & 0xff];
}

/** Gzip's fixed header fields and flags (RFC 1952 §2.3). */
const GZIP_HEADER = 10;
const FHCRC = 2;
const FEXTRA = 4;
const FNAME = 8;
const FCOMMENT = 16;
const GZIP_TRAILER = 8;

/**
 * Raw deflate data, CRC-32 and length out of one gzip member (RFC 1952): the header (10 bytes, plus the optional
 * fields its flags announce) and the 8-byte trailer (CRC-32, then the length mod 2^32, little-endian) are taken off;
 * what lies between is the deflate data a 'deflate-raw' stream of the same compressor gives. Throws on anything that
 * is not one gzip member of deflate data.
 * Example: the gzip of "hello" → { chunks: [deflate of "hello"], crc: 0x3610A686, size: 5 }
 */
export function fromGzip(chunks: readonly Uint8Array[], size: number): CompressedPart {
  let total = 0;
  for (const c of chunks) total += c.length;
  // A byte by its position in the whole member (the header may in principle be split across chunks).
  const at = (k: number): number => {
    for (const c of chunks) {
      if (k < c.length) return c[k]!;
      k -= c.length;
    }
    return -1;
  };
  if (total < GZIP_HEADER + GZIP_TRAILER || at(0) !== 0x1f || at(1) !== 0x8b || at(2) !== 8) throw new Error('The compressor did not give gzip data.');
  const flags = at(3);
  let start = GZIP_HEADER;
  if (flags & FEXTRA) start += 2 + (at(start) | (at(start + 1) << 8));
  for (const flag of [FNAME, FCOMMENT]) {
    if (!(flags & flag)) continue;
    while (start < total && at(start) !== 0) start += 1;
    start += 1;
  }
  if (flags & FHCRC) start += 2;
  const stop = total - GZIP_TRAILER;
  if (start > stop) throw new Error('The compressor gave a gzip header longer than its data.');
  const crc = (at(stop) | (at(stop + 1) << 8) | (at(stop + 2) << 16) | (at(stop + 3) << 24)) >>> 0;
  const isize = (at(stop + 4) | (at(stop + 5) << 8) | (at(stop + 6) << 16) | (at(stop + 7) << 24)) >>> 0;
  if (isize !== size % 0x100000000) throw new Error('The compressor\'s gzip trailer does not match the bytes given.');
  const out: Uint8Array[] = [];
  let pos = 0;
  for (const c of chunks) {
    const from = Math.max(start, pos);
    const to = Math.min(stop, pos + c.length);
    if (to > from) out.push(from === pos && to === pos + c.length ? c : c.subarray(from - pos, to - pos));
    pos += c.length;
  }
  return { chunks: out, crc, size };
}

/**
 * The platform's compressor (CompressionStream, Node ≥ 20 and current browsers) on the calling thread. It compresses
 * to gzip and takes the deflate data, the CRC-32 and the length out of the gzip member (fromGzip), so the CRC-32 is
 * computed by the platform's zlib as it compresses rather than by a second pass in JavaScript; the deflate data are
 * those of CompressionStream('deflate-raw') (the same compressor with the same settings, only the framing differs).
 */
export const platformCompressor: Compressor = () => {
  const stream = new CompressionStream('gzip');
  const writer = stream.writable.getWriter();
  const reader = stream.readable.getReader();
  const compressed: Uint8Array[] = [];
  let size = 0;
  // The compressed side is read while the bytes are written, so the stream never stalls on a full queue.
  const drain = (async (): Promise<void> => {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      compressed.push(value);
    }
  })();
  // At most one piece in the compressor while the next is made, so memory stays at two pieces.
  let inFlight: Promise<void> = Promise.resolve();
  return {
    write: async (bytes) => {
      size += bytes.length;
      await inFlight;
      inFlight = writer.write(bytes);
    },
    end: async () => {
      await inFlight;
      await writer.close();
      await drain;
      return fromGzip(compressed, size);
    },
  };
};

/**
 * Builds a zip archive part by part. Parts are compressed one at a time in the order they are opened (open the next
 * only after the previous one's end()), by `compressor` (default: platformCompressor). finish() returns the whole
 * archive. Cost O(bytes); memory O(compressed size).
 * Example: const z = new ZipWriter(); const p = z.part('a.txt'); await p.write('hi'); await p.end(); z.finish()
 */
export class ZipWriter {
  private readonly chunks: Uint8Array[] = [];
  private readonly entries: Entry[] = [];
  private offset = 0;
  private open = false;

  constructor(private readonly compressor: Compressor = platformCompressor) {}

  private push(bytes: Uint8Array): void {
    this.chunks.push(bytes);
    this.offset += bytes.length;
  }

  /** A part to write, compressed with deflate. */
  part(name: string): PartWriter {
    if (this.open) throw new Error('ZipWriter: a part is still open; end it before opening the next.');
    this.open = true;
    const compressor = this.compressor();
    // Text is encoded straight into a byte buffer (no intermediate strings or arrays); a full buffer goes to the
    // compressor and a fresh one is started, since the compressor may still read the one it was given.
    let bytes = new Uint8Array(BYTE_CHUNK);
    let used = 0;
    const flush = async (): Promise<void> => {
      if (used === 0) return;
      const piece = bytes.subarray(0, used);
      bytes = new Uint8Array(BYTE_CHUNK);
      used = 0;
      await compressor.write(piece);
    };
    return {
      write: async (text: string): Promise<void> => {
        // UTF-8 takes at most 3 bytes per UTF-16 code unit.
        if (used + text.length * 3 > BYTE_CHUNK) await flush();
        if (text.length * 3 > BYTE_CHUNK) await compressor.write(encoder.encode(text));
        else used += encoder.encodeInto(text, bytes.subarray(used)).written;
      },
      writeBytes: async (piece: Uint8Array<ArrayBuffer>): Promise<void> => {
        await flush();
        if (piece.length > 0) await compressor.write(piece);
      },
      end: async (): Promise<void> => {
        await flush();
        const { chunks: compressed, crc, size } = await compressor.end();
        let compressedSize = 0;
        for (const c of compressed) compressedSize += c.length;
        if (size > LIMIT || compressedSize > LIMIT || this.offset > LIMIT) {
          throw new FileFormatError(`The report part ${name} is larger than 4 GiB, more than an .xlsx file without the zip64 extension holds.`);
        }
        const nameBytes = encoder.encode(name);
        const entry: Entry = { name: nameBytes, crc, size, compressedSize, offset: this.offset };
        this.entries.push(entry);
        this.push(
          Uint8Array.from([
            ...u32(0x04034b50),
            ...u16(20),
            ...u16(UTF8_NAMES),
            ...u16(8),
            ...u16(DOS_TIME),
            ...u16(DOS_DATE),
            ...u32(crc),
            ...u32(compressedSize),
            ...u32(size),
            ...u16(nameBytes.length),
            ...u16(0),
          ]),
        );
        this.push(nameBytes);
        for (const c of compressed) this.push(c);
        this.open = false;
      },
    };
  }

  /** A whole part at once (small parts: workbook, styles, relationships). */
  async text(name: string, text: string): Promise<void> {
    const p = this.part(name);
    await p.write(text);
    await p.end();
  }

  /** The archive: every part, then the central directory and its end record. */
  finish(): Uint8Array {
    if (this.open) throw new Error('ZipWriter: a part is still open.');
    const dirStart = this.offset;
    for (const e of this.entries) {
      this.push(
        Uint8Array.from([
          ...u32(0x02014b50),
          ...u16(20),
          ...u16(20),
          ...u16(UTF8_NAMES),
          ...u16(8),
          ...u16(DOS_TIME),
          ...u16(DOS_DATE),
          ...u32(e.crc),
          ...u32(e.compressedSize),
          ...u32(e.size),
          ...u16(e.name.length),
          ...u16(0),
          ...u16(0),
          ...u16(0),
          ...u16(0),
          ...u32(0),
          ...u32(e.offset),
        ]),
      );
      this.push(e.name);
    }
    const dirSize = this.offset - dirStart;
    if (this.entries.length > 0xffff || this.offset > LIMIT) throw new FileFormatError('The report is larger than 4 GiB, more than an .xlsx file without the zip64 extension holds.');
    this.push(Uint8Array.from([...u32(0x06054b50), ...u16(0), ...u16(0), ...u16(this.entries.length), ...u16(this.entries.length), ...u32(dirSize), ...u32(dirStart), ...u16(0)]));
    const out = new Uint8Array(this.offset);
    let p = 0;
    for (const c of this.chunks) {
      out.set(c, p);
      p += c.length;
    }
    this.chunks.length = 0;
    return out;
  }
}
