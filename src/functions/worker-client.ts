/**
 * Main-thread side of the worker: queues calls, forwards progress, and cancels.
 *
 * Two lanes, each with its own worker: `'cv'` (cross-validation, cancelable) and `'fit'` (fits over
 * many rows). A lane runs one call at a time so the client always knows which call is running.
 * Cancelling a queued call drops it; cancelling the running call terminates that lane's worker
 * (the only way to stop a synchronous computation in a worker) and starts a fresh one for the
 * next call — its cache is lost, the other lane's is kept.
 */
import { RatchetError } from '../core/index.js';
import { MappedCellError } from '../adapter/errors.js';
import type { CellArg, CellResult } from './types.js';
import type { WorkerRequest, WorkerResponse } from './worker-protocol.js';
import { handleRequest } from './worker-protocol.js';

/** The part of the Worker API the client uses (lets tests run the protocol in process). */
export interface WorkerLike {
  postMessage(message: WorkerRequest): void;
  terminate(): void;
  onmessage: ((e: { data: WorkerResponse }) => void) | null;
  onerror: ((e: unknown) => void) | null;
}

/** Creates a worker for a lane. */
export type WorkerFactory = (lane: Lane) => WorkerLike;

/** Work lanes. */
export type Lane = 'cv' | 'fit';

interface Job {
  readonly id: number;
  readonly name: string;
  readonly args: CellArg[];
  /** Addresses of reference arguments (InvokeContext.addresses), passed on to the worker. */
  readonly addresses: (string | null | undefined)[] | undefined;
  readonly onProgress: ((fraction: number) => void) | undefined;
  readonly resolve: (r: CellResult) => void;
  readonly reject: (e: unknown) => void;
  readonly cleanup: () => void;
}

interface LaneState {
  worker: WorkerLike | undefined;
  running: Job | undefined;
  queue: Job[];
}

/** Counters for tests. */
export interface WorkerClientStats {
  started: number;
  terminated: number;
  completed: number;
  cancelled: number;
}

function cancelled(): RatchetError {
  return new RatchetError('CANCELLED', 'calculation', 'was cancelled');
}

/** Runs registry functions in workers. */
export class WorkerClient {
  private readonly lanes: Record<Lane, LaneState> = {
    cv: { worker: undefined, running: undefined, queue: [] },
    fit: { worker: undefined, running: undefined, queue: [] },
  };
  private nextId = 1;
  readonly stats: WorkerClientStats = { started: 0, terminated: 0, completed: 0, cancelled: 0 };

  /**
   * @param factory creates a lane's worker.
   * @param fallback used instead once a worker fails (e.g. its script cannot load under the host's
   *   content policy): the failed call is run again there, and later calls of that lane go there too.
   */
  constructor(
    private readonly factory: WorkerFactory,
    private readonly fallback?: WorkerFactory,
  ) {}

  private failed: Record<Lane, boolean> = { cv: false, fit: false };

  /**
   * Runs `name` on `args` in the lane's worker. Resolves with the result; rejects with a
   * MappedCellError (the worker's mapped error) or a CANCELLED RatchetError.
   */
  run(
    lane: Lane,
    name: string,
    args: CellArg[],
    options: { signal?: AbortSignal | undefined; onProgress?: ((f: number) => void) | undefined; addresses?: readonly (string | null | undefined)[] | undefined } = {},
  ): Promise<CellResult> {
    const { signal, onProgress, addresses } = options;
    if (signal?.aborted) {
      this.stats.cancelled++;
      return Promise.reject(cancelled());
    }
    return new Promise<CellResult>((resolve, reject) => {
      const id = this.nextId++;
      const onAbort = (): void => this.cancel(lane, id);
      signal?.addEventListener('abort', onAbort, { once: true });
      const cleanup = (): void => signal?.removeEventListener('abort', onAbort);
      this.lanes[lane].queue.push({ id, name, args, addresses: addresses?.slice(), onProgress, resolve, reject, cleanup });
      this.pump(lane);
    });
  }

  /** Number of calls waiting or running in a lane. */
  pending(lane: Lane): number {
    const s = this.lanes[lane];
    return s.queue.length + (s.running ? 1 : 0);
  }

  private worker(lane: Lane): WorkerLike {
    const s = this.lanes[lane];
    if (s.worker) return s.worker;
    let w: WorkerLike;
    try {
      w = this.failed[lane] && this.fallback ? this.fallback(lane) : this.factory(lane);
    } catch (e) {
      if (!this.fallback || this.failed[lane]) throw e;
      this.failed[lane] = true;
      w = this.fallback(lane);
    }
    this.stats.started++;
    w.onmessage = (e) => this.receive(lane, e.data);
    w.onerror = (e) => {
      const job = s.running;
      this.restart(lane);
      if (job && this.fallback && !this.failed[lane]) {
        // Retry the call on the fallback; the lane stays there.
        this.failed[lane] = true;
        s.queue.unshift(job);
      } else if (job) {
        job.cleanup();
        job.reject(new Error(`worker failed: ${String((e as { message?: unknown })?.message ?? e)}`));
      }
      this.pump(lane);
    };
    s.worker = w;
    return w;
  }

  private restart(lane: Lane): void {
    const s = this.lanes[lane];
    if (s.worker) {
      s.worker.onmessage = null;
      s.worker.onerror = null;
      s.worker.terminate();
      this.stats.terminated++;
    }
    s.worker = undefined;
    s.running = undefined;
  }

  private pump(lane: Lane): void {
    const s = this.lanes[lane];
    if (s.running || s.queue.length === 0) return;
    const job = s.queue.shift()!;
    s.running = job;
    let w: WorkerLike;
    try {
      w = this.worker(lane);
    } catch (e) {
      s.running = undefined;
      job.cleanup();
      job.reject(e);
      this.pump(lane);
      return;
    }
    w.postMessage({ type: 'invoke', id: job.id, name: job.name, args: job.args, addresses: job.addresses, progress: job.onProgress !== undefined });
  }

  private receive(lane: Lane, msg: WorkerResponse): void {
    const s = this.lanes[lane];
    const job = s.running;
    if (!job || job.id !== msg.id) return;
    if (msg.type === 'progress') {
      job.onProgress?.(msg.fraction);
      return;
    }
    s.running = undefined;
    job.cleanup();
    this.stats.completed++;
    if (msg.ok) job.resolve(msg.result);
    else job.reject(new MappedCellError(msg.error));
    this.pump(lane);
  }

  private cancel(lane: Lane, id: number): void {
    const s = this.lanes[lane];
    const queued = s.queue.findIndex((j) => j.id === id);
    if (queued >= 0) {
      const [job] = s.queue.splice(queued, 1);
      job!.cleanup();
      this.stats.cancelled++;
      job!.reject(cancelled());
      return;
    }
    if (s.running?.id === id) {
      const job = s.running;
      this.restart(lane);
      job.cleanup();
      this.stats.cancelled++;
      job.reject(cancelled());
      this.pump(lane);
    }
  }

  /** Terminates both workers and rejects everything pending. */
  dispose(): void {
    for (const lane of ['cv', 'fit'] as Lane[]) {
      const s = this.lanes[lane];
      const jobs = [...(s.running ? [s.running] : []), ...s.queue];
      s.queue = [];
      this.restart(lane);
      for (const j of jobs) {
        j.cleanup();
        j.reject(cancelled());
      }
    }
  }
}

/**
 * A worker that runs the protocol in this thread on a later task (for hosts without Web Workers,
 * and for tests). `terminate` drops a call that has not started yet.
 */
export function inProcessWorker(): WorkerLike {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const queue: WorkerRequest[] = [];
  const w: WorkerLike = {
    onmessage: null,
    onerror: null,
    postMessage(message) {
      queue.push(message);
      timer ??= setTimeout(function drain() {
        timer = undefined;
        const next = queue.shift();
        if (next) handleRequest(next, (r) => w.onmessage?.({ data: structuredClone(r) }));
        if (queue.length > 0) timer = setTimeout(drain, 0);
      }, 0);
    },
    terminate() {
      if (timer !== undefined) clearTimeout(timer);
      timer = undefined;
      queue.length = 0;
    },
  };
  return w;
}
