/**
 * The messages between the engine worker and its compressor worker (compress.worker.ts): the report's parts are
 * deflated there, on a thread of their own, while the engine worker goes on making the next bytes of the sheet.
 * Bytes and compressed pieces are transferred, never copied.
 */

/** Engine worker → compressor. Parts are opened, fed and closed one at a time, in order. */
export type ToCompressor =
  | { readonly kind: 'open'; readonly part: number }
  | { readonly kind: 'bytes'; readonly part: number; readonly bytes: Uint8Array<ArrayBuffer> }
  | { readonly kind: 'close'; readonly part: number };

/** Compressor → engine worker. */
export type FromCompressor =
  /** One 'bytes' message taken into the compressor (so the sender may send more). */
  | { readonly kind: 'taken'; readonly part: number }
  /** The part's raw deflate data with the CRC-32 and length of its bytes (zipWriter.ts CompressedPart). */
  | { readonly kind: 'closed'; readonly part: number; readonly chunks: readonly Uint8Array[]; readonly crc: number; readonly size: number }
  | { readonly kind: 'failed'; readonly part: number; readonly message: string };
