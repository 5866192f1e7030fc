/**
 * The compressor worker's logic (compress.worker.ts is its global scope; tests drive this in process): each part's
 * bytes go through the platform's compressor (zipWriter.ts platformCompressor) as they arrive, each 'bytes' message
 * is answered 'taken' once the compressor has it, and a closed part is sent back with its compressed pieces
 * transferred.
 */
import { platformCompressor, type Compressor, type PartCompressor } from '../files/zipWriter';
import type { FromCompressor, ToCompressor } from './compressMessages';
import type { Post } from './engineMessages';

const messageOf = (e: unknown): string => (e instanceof Error ? e.message : String(e));

/** Each distinct buffer once (a transfer list must not name a buffer twice). */
function buffersOf(chunks: readonly Uint8Array[]): ArrayBuffer[] {
  return [...new Set(chunks.map((c) => c.buffer as ArrayBuffer))];
}

export function createCompressHost(post: Post<FromCompressor>, compressor: Compressor = platformCompressor): { readonly handle: (message: ToCompressor) => void } {
  const parts = new Map<number, PartCompressor>();
  /** Each part's work in order: a message is handled after the ones before it, however long they take. */
  const queue = new Map<number, Promise<void>>();
  const failed = new Set<number>();
  const then = (part: number, work: () => Promise<void>): void => {
    const next = (queue.get(part) ?? Promise.resolve()).then(async () => {
      if (failed.has(part)) return;
      try {
        await work();
      } catch (e) {
        failed.add(part);
        parts.delete(part);
        post({ kind: 'failed', part, message: messageOf(e) }, []);
      }
    });
    queue.set(part, next);
  };
  return {
    handle(message) {
      const { part } = message;
      switch (message.kind) {
        case 'open':
          failed.delete(part);
          queue.delete(part);
          then(part, async () => {
            parts.set(part, compressor());
          });
          break;
        case 'bytes':
          then(part, async () => {
            const p = parts.get(part);
            if (p === undefined) throw new Error(`No part ${part} is open.`);
            await p.write(message.bytes);
            post({ kind: 'taken', part }, []);
          });
          break;
        case 'close':
          then(part, async () => {
            const p = parts.get(part);
            if (p === undefined) throw new Error(`No part ${part} is open.`);
            parts.delete(part);
            const done = await p.end();
            post({ kind: 'closed', part, chunks: done.chunks, crc: done.crc, size: done.size }, buffersOf(done.chunks));
            queue.delete(part);
          });
          break;
      }
    },
  };
}
