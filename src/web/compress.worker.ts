/**
 * The report's compressor worker, started by the engine worker (engine.worker.ts) so that deflating a long sheet runs
 * beside the making of its XML rather than after it. Its logic is compressHost.ts; its messages compressMessages.ts.
 */
import type { FromCompressor, ToCompressor } from './compressMessages';
import { createCompressHost } from './compressHost';

interface WorkerScope {
  postMessage(message: FromCompressor, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<ToCompressor>) => void) | null;
}

const scope = self as unknown as WorkerScope;
const host = createCompressHost((message, transfer) => scope.postMessage(message, transfer));
scope.onmessage = (event) => host.handle(event.data);
