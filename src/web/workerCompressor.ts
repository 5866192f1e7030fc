/**
 * The engine worker's side of the compressor worker: a zipWriter.ts Compressor whose parts are deflated on another
 * thread (compress.worker.ts). The bytes of a part are transferred as they are made; at most WINDOW pieces are on
 * their way at once, so memory stays flat when the XML is made faster than it is compressed. If the worker stops,
 * the part being written fails with a message, and the next part starts a new worker; if none can be started at all,
 * parts are compressed on the calling thread (the same bytes).
 */
import { platformCompressor, type Compressor, type CompressedPart, type PartCompressor } from '../files/zipWriter';
import type { FromCompressor, ToCompressor } from './compressMessages';

/** What is needed of a Worker (a real one in the browser; an in-process stand-in in tests). */
export interface CompressorWorkerLike {
  postMessage(message: ToCompressor, transfer: Transferable[]): void;
  addEventListener(type: 'message', listener: (event: { readonly data: FromCompressor }) => void): void;
  addEventListener(type: 'error', listener: (event: { readonly message?: string }) => void): void;
  terminate(): void;
}

/** Pieces (of up to 1 MB each, zipWriter.ts) sent and not yet taken into the compressor, at most. */
export const WINDOW = 4;

interface OpenPart {
  taken: number;
  sent: number;
  /** Waiting for a piece to be taken (so another may be sent). */
  wake: (() => void) | null;
  readonly done: Promise<CompressedPart>;
  readonly resolve: (part: CompressedPart) => void;
  readonly reject: (error: Error) => void;
  error: Error | null;
}

export function workerCompressor(start: () => CompressorWorkerLike): Compressor {
  let worker: CompressorWorkerLike | null = null;
  let nextPart = 1;
  const open = new Map<number, OpenPart>();

  const fail = (reason: string): void => {
    worker?.terminate();
    worker = null;
    for (const p of open.values()) {
      p.error = new Error(reason);
      p.reject(p.error);
      p.wake?.();
    }
    open.clear();
  };

  const ensure = (): CompressorWorkerLike => {
    if (worker !== null) return worker;
    const w = start();
    w.addEventListener('message', ({ data }) => {
      const p = open.get(data.part);
      if (p === undefined) return;
      if (data.kind === 'taken') {
        p.taken += 1;
        const wake = p.wake;
        p.wake = null;
        wake?.();
      } else if (data.kind === 'closed') {
        open.delete(data.part);
        p.resolve({ chunks: data.chunks, crc: data.crc, size: data.size });
      } else {
        open.delete(data.part);
        p.error = new Error(data.message);
        p.reject(p.error);
        p.wake?.();
      }
    });
    w.addEventListener('error', (event) => fail(`The report's compressor stopped${event.message ? `: ${event.message}` : ''}.`));
    worker = w;
    return w;
  };

  /** Set when no worker could be started here (say a policy forbids it): parts are then compressed on this thread. */
  let unavailable = false;

  return (): PartCompressor => {
    if (!unavailable && worker === null) {
      try {
        ensure();
      } catch {
        unavailable = true;
      }
    }
    if (unavailable) return platformCompressor();
    const part = nextPart++;
    let resolve!: (c: CompressedPart) => void;
    let reject!: (e: Error) => void;
    const done = new Promise<CompressedPart>((ok, no) => {
      resolve = ok;
      reject = no;
    });
    done.catch(() => undefined); // reported through write() or end()
    const state: OpenPart = { taken: 0, sent: 0, wake: null, done, resolve, reject, error: null };
    open.set(part, state);
    ensure().postMessage({ kind: 'open', part }, []);
    return {
      write: async (bytes) => {
        while (state.error === null && state.sent - state.taken >= WINDOW) await new Promise<void>((ok) => (state.wake = ok));
        if (state.error !== null) throw state.error;
        state.sent += 1;
        // The buffer behind the piece is handed over whole (a compressor may take it: zipWriter.ts PartCompressor).
        ensure().postMessage({ kind: 'bytes', part, bytes }, [bytes.buffer]);
      },
      end: async () => {
        if (state.error !== null) throw state.error;
        ensure().postMessage({ kind: 'close', part }, []);
        return done;
      },
    };
  };
}

/** The browser's compressor worker, built by webpack as a script of its own beside the page. */
export function startCompressorWorker(): CompressorWorkerLike {
  return new Worker(new URL('./compress.worker.ts', import.meta.url)) as unknown as CompressorWorkerLike;
}
