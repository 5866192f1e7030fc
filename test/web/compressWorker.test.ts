/**
 * The report's compressor worker, driven in process: the engine worker's side (workerCompressor) and the worker's side
 * (createCompressHost) joined by a stand-in that delivers each message later as a structured clone, handing over
 * transferred buffers as a real worker does (HTML Standard, "structured clone" and "transfer"). Checks that a workbook
 * written through it is byte for byte the one written on one thread, that at most WINDOW pieces wait at once, and that
 * a worker that stops fails the part being written while a new one takes the next.
 */
import { describe, expect, it } from 'vitest';
import { platformCompressor } from '../../src/files/zipWriter';
import { writeWorkbook } from '../../src/files/writeWorkbook';
import type { SheetSpec } from '../../src/core/report/types';
import { createCompressHost } from '../../src/web/compressHost';
import type { FromCompressor, ToCompressor } from '../../src/web/compressMessages';
import { WINDOW, workerCompressor, type CompressorWorkerLike } from '../../src/web/workerCompressor';

class InProcessCompressor implements CompressorWorkerLike {
  private readonly onMessage: ((event: { data: FromCompressor }) => void)[] = [];
  private readonly onError: ((event: { message?: string }) => void)[] = [];
  terminated = false;
  /** Pieces posted and not yet answered 'taken', at most, over the worker's life. */
  mostWaiting = 0;
  private waiting = 0;
  constructor(private readonly host = createCompressHost((message, transfer) => {
    const copy = structuredClone(message, { transfer });
    if (copy.kind === 'taken') this.waiting -= 1;
    setTimeout(() => !this.terminated && this.onMessage.forEach((l) => l({ data: copy })), 0);
  })) {}

  postMessage(message: ToCompressor, transfer: Transferable[]): void {
    const copy = structuredClone(message, { transfer });
    if (copy.kind === 'bytes') {
      this.waiting += 1;
      this.mostWaiting = Math.max(this.mostWaiting, this.waiting);
    }
    // Later and slower than the sender: the compressor falls behind, so the window is what holds the sender back.
    setTimeout(() => !this.terminated && this.host.handle(copy), 2);
  }

  addEventListener(type: 'message' | 'error', listener: (event: never) => void): void {
    if (type === 'message') this.onMessage.push(listener as (event: { data: FromCompressor }) => void);
    else this.onError.push(listener as (event: { message?: string }) => void);
  }

  terminate(): void {
    this.terminated = true;
  }

  crash(message: string): void {
    for (const l of this.onError) l({ message });
  }
}

/** An invented listing of `n` rows (kidney-function trial, invented sites), long enough for several 1 MB pieces. */
function listing(n: number): SheetSpec {
  const rows = Array.from({ length: n }, (_, i) => [`KFT-${String(i).padStart(6, '0')}`, `Site ${String((i % 12) + 1).padStart(2, '0')}`, 45_000 + (i % 400), 60 + (i % 37) / 10, i % 5 === 0 ? 'Late – “early”' : '']);
  return {
    name: 'Listing',
    title: 'Invented listing',
    blocks: [
      {
        kind: 'table',
        id: 'Listing',
        caption: 'Invented rows',
        columns: [
          { header: 'Participant', format: 'text' },
          { header: 'Site', format: 'text' },
          { header: 'Visit date', format: 'date' },
          { header: 'eGFR', format: 'significant' },
          { header: 'Note', format: 'text' },
        ],
        rows,
      },
    ],
  };
}

describe('the compressor worker', () => {
  it('gives a workbook byte for byte the same as one compressed on the calling thread, with at most WINDOW pieces waiting', async () => {
    const sheets = [listing(60_000), { name: 'Notes', title: 'Notes', blocks: [{ kind: 'paragraph' as const, text: 'Invented data.' }] }];
    const stamp = { runAt: '2026-12-02', fingerprint: '0123456789abcdef' };
    const here = await writeWorkbook(sheets, stamp, { compressor: platformCompressor });
    const workers: InProcessCompressor[] = [];
    const there = await writeWorkbook(sheets, stamp, {
      compressor: workerCompressor(() => {
        const w = new InProcessCompressor();
        workers.push(w);
        return w;
      }),
    });
    expect(Buffer.from(there).equals(Buffer.from(here))).toBe(true);
    expect(workers).toHaveLength(1); // one worker for every part
    expect(workers[0]!.mostWaiting).toBeGreaterThan(1); // the XML was made while earlier pieces were compressed
    expect(workers[0]!.mostWaiting).toBeLessThanOrEqual(WINDOW);
  }, 60_000);

  it('a worker that stops fails the part being written with a message; the next part starts a new worker', async () => {
    const workers: InProcessCompressor[] = [];
    const compressor = workerCompressor(() => {
      const w = new InProcessCompressor();
      workers.push(w);
      return w;
    });
    const part = compressor();
    await part.write(new TextEncoder().encode('<row/>'));
    workers[0]!.crash('out of memory');
    await expect(part.end()).rejects.toThrow("The report's compressor stopped: out of memory.");
    const next = compressor();
    await next.write(new TextEncoder().encode('<row/>'));
    const done = await next.end();
    expect(done.size).toBe(6);
    expect(workers).toHaveLength(2);
    expect(workers[0]!.terminated).toBe(true);
  });

  it('compresses on the calling thread, to the same bytes, when no worker can be started', async () => {
    const compressor = workerCompressor(() => {
      throw new Error('workers are not allowed here');
    });
    const data = new TextEncoder().encode('<row r="1"/>'.repeat(1000));
    const part = compressor();
    await part.write(data.slice());
    const there = await part.end();
    const here = platformCompressor();
    await here.write(data.slice());
    const expected = await here.end();
    expect(Buffer.concat(there.chunks).equals(Buffer.concat(expected.chunks))).toBe(true);
    expect(there.crc).toBe(expected.crc);
  });
});
