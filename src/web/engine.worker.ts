/**
 * The page's engine worker: runs the analysis and writes the report off the page's thread, so the page keeps
 * drawing and answering while they work (see engineHost.ts for what it does, engineMessages.ts for the messages).
 * Started by workerEngine.ts (startEngineWorker, from this file's URL relative to the module); webpack builds it as
 * a script of its own beside the page, addressed relative to the page, so any path prefix works.
 */
import type { FromEngine, ToEngine } from './engineMessages';
import { createEngineHost } from './engineHost';
import { startCompressorWorker, workerCompressor } from './workerCompressor';

/** The few members of the worker's global scope used here (the project type-checks with the DOM library). */
interface WorkerScope {
  postMessage(message: FromEngine, transfer: Transferable[]): void;
  onmessage: ((event: MessageEvent<ToEngine>) => void) | null;
}

const scope = self as unknown as WorkerScope;
// The report's parts are deflated in a worker of this worker's own where the browser allows one (all current ones do).
const compressor = typeof Worker === 'function' ? workerCompressor(startCompressorWorker) : undefined;
const host = createEngineHost((message, transfer) => scope.postMessage(message, transfer), compressor !== undefined ? { compressor } : {});
scope.onmessage = (event) => host.handle(event.data);
