/**
 * A small zip writer for .xlsx packages (PKWARE APPNOTE 6.3: local headers 4.3.7, central directory 4.3.12, end record
 * 4.3.16; deflate, RFC 1951). Each part's text is handed in piece by piece, encoded as UTF-8 and compressed as it
 * comes with the platform's own CompressionStream('deflate-raw') (Node ≥ 20 and current browsers), so a long sheet
 * exists only as compressed chunks, never as one string. A part's local header is written once its CRC-32 and sizes
 * are known (no data descriptors), which every reader accepts. No zip64: a part or archive past 4 GiB stops with a
 * plain error (a worksheet within Excel's limits of 1,048,576 rows is far below that for our reports).
 */
import { crc32Update } from './crc32';
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
  end(): Promise<void>;
}

const encoder = new TextEncoder();

function u16(n: number): number[] {
  return [n & 0xff, (n >>> 8) & 0xff];
}
function u32(n: number): number[] {
  return [n & 0xff, (n >>> 8) & 0xff, (n >>> 16) & 0xff, (n >>> 24) & 0xff];
}

/**
 * Builds a zip archive part by part. Parts are compressed one at a time in the order they are opened (open the next
 * only after the previous one's end()). finish() returns the whole archive. Cost O(bytes); memory O(compressed size).
 * Example: const z = new ZipWriter(); const p = z.part('a.txt'); await p.write('hi'); await p.end(); z.finish()
 */
export class ZipWriter {
  private readonly chunks: Uint8Array[] = [];
  private readonly entries: Entry[] = [];
  private offset = 0;
  private open = false;

  private push(bytes: Uint8Array): void {
    this.chunks.push(bytes);
    this.offset += bytes.length;
  }

  /** A part to write, compressed with deflate. */
  part(name: string): PartWriter {
    if (this.open) throw new Error('ZipWriter: a part is still open; end it before opening the next.');
    this.open = true;
    const stream = new CompressionStream('deflate-raw');
    const writer = stream.writable.getWriter();
    const reader = stream.readable.getReader();
    const compressed: Uint8Array[] = [];
    let compressedSize = 0;
    // The compressed side is read while the text is written, so the stream never stalls on a full queue.
    const drain = (async (): Promise<void> => {
      for (;;) {
        const { done, value } = await reader.read();
        if (done) return;
        compressed.push(value);
        compressedSize += value.length;
      }
    })();
    let crc = 0;
    let size = 0;
    // Text is encoded straight into a byte buffer (no intermediate strings or arrays); a full buffer goes to the
    // compressor and a fresh one is started, since the compressor may still read the one it was given.
    let bytes = new Uint8Array(BYTE_CHUNK);
    let used = 0;
    let inFlight: Promise<void> = Promise.resolve();
    const flush = async (): Promise<void> => {
      if (used === 0) return;
      const piece = bytes.subarray(0, used);
      bytes = new Uint8Array(BYTE_CHUNK);
      used = 0;
      await send(piece);
    };
    const send = async (piece: Uint8Array<ArrayBuffer>): Promise<void> => {
      crc = crc32Update(crc, piece);
      size += piece.length;
      // At most one piece in the compressor while the next is made (deflate runs on Node's thread pool and off the
      // page's main work in browsers), so memory stays at two pieces.
      await inFlight;
      inFlight = writer.write(piece);
    };
    return {
      write: async (text: string): Promise<void> => {
        // UTF-8 takes at most 3 bytes per UTF-16 code unit.
        if (used + text.length * 3 > BYTE_CHUNK) await flush();
        if (text.length * 3 > BYTE_CHUNK) await send(encoder.encode(text));
        else used += encoder.encodeInto(text, bytes.subarray(used)).written;
      },
      end: async (): Promise<void> => {
        await flush();
        await inFlight;
        await writer.close();
        await drain;
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
        compressed.length = 0;
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
