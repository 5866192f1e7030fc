import { crc32Update } from './crc32';
import { FileFormatError } from './errors';

/** One file inside a zip archive, as its central directory describes it. */
export interface ZipEntry {
  readonly name: string;
  readonly method: number;
  readonly crc: number;
  readonly compressedSize: number;
  readonly size: number;
  readonly localOffset: number;
  readonly encrypted: boolean;
}

/** Signatures of the zip format's records (PKWARE APPNOTE, sections 4.3.7, 4.3.12, 4.3.16). */
const LOCAL_SIG = 0x04034b50;
const CENTRAL_SIG = 0x02014b50;
const END_SIG = 0x06054b50;
/** The end record is 22 bytes plus a comment of at most 65,535 bytes. */
const END_MIN = 22;
const END_SEARCH = END_MIN + 0xffff;
/** Compressed bytes handed to the inflater at a time: small enough that memory stays flat, large enough to be quick. */
const FEED_CHUNK = 64 * 1024;

/** The error for a broken archive: one plain message, whatever the broken part. */
export function damaged(why: string): FileFormatError {
  return new FileFormatError(`The file is damaged: ${why}. Open it in Excel and save it again, or export the sheet as CSV.`);
}

/** A part whose inflated size passes its cap: the message names the part and the cap. */
export class PartTooLargeError extends FileFormatError {}

/**
 * Lists the entries of a zip archive from its central directory (PKWARE APPNOTE 4.3.16 end record, 4.3.12 central
 * headers). Reads only the directory, never the data. Cost O(entries).
 * @throws FileFormatError ("The file is damaged: …") when the directory is missing, cut short or points outside the file.
 */
export function zipEntries(bytes: Uint8Array): Map<string, ZipEntry> {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let end = -1;
  for (let i = bytes.length - END_MIN; i >= Math.max(0, bytes.length - END_SEARCH); i--) {
    if (view.getUint32(i, true) === END_SIG) {
      end = i;
      break;
    }
  }
  if (end < 0) throw damaged('its zip directory is missing (the file may be cut short)');
  const count = view.getUint16(end + 10, true);
  const dirSize = view.getUint32(end + 12, true);
  const dirOffset = view.getUint32(end + 16, true);
  if (count === 0xffff || dirOffset === 0xffffffff) throw damaged('it uses the zip64 extension, which no .xlsx workbook within Excel\'s limits needs');
  if (dirOffset + dirSize > end) throw damaged('its zip directory points outside the file');
  const names = new TextDecoder('utf-8');
  const entries = new Map<string, ZipEntry>();
  let p = dirOffset;
  for (let k = 0; k < count; k++) {
    if (p + 46 > end || view.getUint32(p, true) !== CENTRAL_SIG) throw damaged('its zip directory is broken');
    const flags = view.getUint16(p + 8, true);
    const nameLen = view.getUint16(p + 28, true);
    const extraLen = view.getUint16(p + 30, true);
    const commentLen = view.getUint16(p + 32, true);
    if (p + 46 + nameLen > end) throw damaged('its zip directory is broken');
    const name = names.decode(bytes.subarray(p + 46, p + 46 + nameLen));
    entries.set(name, {
      name,
      method: view.getUint16(p + 10, true),
      crc: view.getUint32(p + 16, true),
      compressedSize: view.getUint32(p + 20, true),
      size: view.getUint32(p + 24, true),
      localOffset: view.getUint32(p + 42, true),
      encrypted: (flags & 1) !== 0,
    });
    p += 46 + nameLen + extraLen + commentLen;
  }
  return entries;
}

/** The compressed bytes of an entry, found through its local header (APPNOTE 4.3.7). */
function entryData(bytes: Uint8Array, e: ZipEntry): Uint8Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const p = e.localOffset;
  if (p + 30 > bytes.length || view.getUint32(p, true) !== LOCAL_SIG) throw damaged(`the part ${e.name} is missing from the archive`);
  const start = p + 30 + view.getUint16(p + 26, true) + view.getUint16(p + 28, true);
  if (start + e.compressedSize > bytes.length) throw damaged(`the part ${e.name} is cut short`);
  return bytes.subarray(start, start + e.compressedSize);
}

/** Decompresses raw deflate (RFC 1951) chunk by chunk with the platform's own DecompressionStream (Node ≥ 20.12 and
 * current browsers). Compressed bytes are fed 64 KiB at a time and the output is pulled as it comes, so a consumer that
 * stops early (a cap) stops the work. */
async function* inflateRaw(data: Uint8Array): AsyncGenerator<Uint8Array> {
  const stream = new DecompressionStream('deflate-raw');
  const writer = stream.writable.getWriter();
  const reader = stream.readable.getReader();
  const feed = (async (): Promise<void> => {
    for (let o = 0; o < data.length; o += FEED_CHUNK) await writer.write(data.slice(o, o + FEED_CHUNK));
    await writer.close();
  })();
  // A failure of the feed also errors the readable side, where it is reported; this only keeps it from going unhandled.
  feed.catch(() => undefined);
  let finished = false;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      yield value;
    }
    finished = true;
  } finally {
    if (!finished) await reader.cancel().catch(() => undefined);
  }
}

/** Running totals shared by all the parts read from one archive, for the cap on their sum. */
export interface InflateBudget {
  used: number;
  readonly total: number;
}

/**
 * Inflates one part of the archive and hands its bytes on chunk by chunk, checking as it goes: the part's own cap
 * and the archive's total budget (stops at the cap, not after), the declared size, and the CRC-32 at the end.
 * Cost O(inflated bytes), memory O(one chunk).
 * @throws PartTooLargeError at the cap; FileFormatError ("The file is damaged: …") for a broken part.
 */
export async function inflatePart(
  bytes: Uint8Array,
  e: ZipEntry,
  cap: number,
  budget: InflateBudget,
  onChunk: (chunk: Uint8Array) => void,
  what: string,
): Promise<void> {
  if (e.encrypted) throw new FileFormatError('The workbook is encrypted; save an unprotected copy and read that.');
  const limit = Math.min(cap, budget.total - budget.used);
  const tooLarge = (): PartTooLargeError =>
    new PartTooLargeError(
      `The ${what} (${e.name}) inflates to more than ${mib(limit)} MiB, past the most this reader takes (see the README, "Limits"). The file is not read; if it is a real workbook, export the sheet as CSV.`,
    );
  if (e.size > limit) throw tooLarge();
  const data = entryData(bytes, e);
  let crc = 0;
  let size = 0;
  const take = (chunk: Uint8Array): void => {
    size += chunk.length;
    if (size > limit) throw tooLarge();
    crc = crc32Update(crc, chunk);
    onChunk(chunk);
  };
  if (e.method === 0) {
    for (let o = 0; o < data.length; o += FEED_CHUNK) take(data.subarray(o, o + FEED_CHUNK));
  } else if (e.method === 8) {
    try {
      for await (const chunk of inflateRaw(data)) take(chunk);
    } catch (err) {
      if (err instanceof FileFormatError) throw err;
      throw damaged(`the part ${e.name} cannot be decompressed`);
    }
  } else {
    throw damaged(`the part ${e.name} uses a compression method (${e.method}) that .xlsx files do not use`);
  }
  budget.used += size;
  if (size !== e.size) throw damaged(`the part ${e.name} has ${size} bytes where the zip directory says ${e.size}`);
  if (crc !== e.crc) throw damaged(`the part ${e.name} fails its CRC-32 check`);
}

/** Bytes as whole mebibytes, for messages. */
export function mib(n: number): string {
  return (n / 1024 / 1024).toLocaleString('en-US', { maximumFractionDigits: 0 });
}
