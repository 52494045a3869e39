/**
 * Messages between the add-in's main thread and its Web Worker, and the worker-side handler.
 * The worker runs the very same registry implementations (and keeps its own result cache); errors
 * are mapped with the one mapping before they cross the boundary.
 */
import type { CellArg, CellResult } from './types.js';
import { functionByName } from './registry.js';
import { mapError, type MappedError } from '../adapter/errors.js';

/** Main thread → worker: run one function. */
export interface WorkerRequest {
  readonly type: 'invoke';
  readonly id: number;
  readonly name: string;
  readonly args: CellArg[];
  /** Addresses of reference arguments (InvokeContext.addresses); absent: every argument given directly. */
  readonly addresses?: (string | null | undefined)[] | undefined;
  /** Send progress messages (fraction done) while it runs. */
  readonly progress?: boolean;
}

/** Worker → main thread. */
export type WorkerResponse =
  | { readonly type: 'result'; readonly id: number; readonly ok: true; readonly result: CellResult }
  | { readonly type: 'result'; readonly id: number; readonly ok: false; readonly error: MappedError }
  | { readonly type: 'progress'; readonly id: number; readonly fraction: number };

/**
 * Handles one request synchronously and posts the result (and progress, when asked). Never
 * throws: every failure is posted as a mapped error.
 */
export function handleRequest(req: WorkerRequest, post: (r: WorkerResponse) => void): void {
  try {
    const f = functionByName(req.name);
    if (!f) throw new Error(`unknown function ${req.name}`);
    const onProgress = req.progress ? (fraction: number) => post({ type: 'progress', id: req.id, fraction }) : undefined;
    const result = f.invoke(req.args, { onProgress, addresses: req.addresses });
    post({ type: 'result', id: req.id, ok: true, result });
  } catch (e) {
    post({ type: 'result', id: req.id, ok: false, error: mapError(e) });
  }
}
