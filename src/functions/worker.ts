/**
 * Web Worker entry: long work (CV, BESTK, big fits) runs here with the same implementations.
 * Cancellation is done by the main thread terminating this worker (see worker-client.ts), which
 * stops even a long synchronous computation at once.
 */
import { handleRequest, type WorkerRequest, type WorkerResponse } from './worker-protocol.js';

interface WorkerScope {
  onmessage: ((e: MessageEvent<WorkerRequest>) => void) | null;
  postMessage(message: WorkerResponse): void;
}

const scope = self as unknown as WorkerScope;
scope.onmessage = (e) => handleRequest(e.data, (r) => scope.postMessage(r));
