/**
 * The Excel entry (src/functions/functions.ts) in a mocked shared runtime: office-addin-mock
 * stands in for `Excel` (load/sync semantics included), a small stand-in for `CustomFunctions.Error`.
 * Checked: the blank-cell policy reads value types through Excel.run exactly when an argument from a
 * range holds a 0; errors arrive as CustomFunctions.Error with the mapped code and message; long
 * work goes to the worker (run in process here, same protocol) and is cancelled through
 * CancelableInvocation.onCanceled.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { OfficeMockObject } from 'office-addin-mock';
import * as entry from '../../src/functions/functions.js';
import { WorkerClient, inProcessWorker } from '../../src/functions/worker-client.js';
import { clearCaches } from '../../src/functions/engine.js';

class FakeCustomFunctionsError extends Error {
  constructor(
    readonly code: string,
    message?: string,
  ) {
    super(message);
  }
}

const g = globalThis as unknown as { Excel?: unknown; CustomFunctions?: unknown };
let reads: string[] = [];

/** A mocked workbook whose every range reports `types` as its value types. */
function mockExcel(types: string[][]): void {
  reads = [];
  const data = {
    context: {
      workbook: {
        worksheets: {
          sheet: { range: { valueTypes: types }, getRange(address: string) {
            reads.push(`range ${address}`);
            return (this as unknown as { range: unknown }).range;
          } },
          getItem(name: string) {
            reads.push(`sheet ${name}`);
            return (this as unknown as { sheet: unknown }).sheet;
          },
        },
      },
    },
    run: async function (callback: (context: unknown) => Promise<unknown>) {
      return callback((this as unknown as { context: unknown }).context);
    },
  };
  g.Excel = new OfficeMockObject(data as never);
}

beforeEach(() => {
  clearCaches();
  g.CustomFunctions = { Error: FakeCustomFunctionsError };
});
afterEach(() => {
  delete g.Excel;
  delete g.CustomFunctions;
});

const ysWithZero = [[1], [0], [2], [4]];
const xs = [[1], [2], [3], [4]];
const addresses = (n: number) => ['Data!B2:B5', 'Data!A2:A5', ...Array.from({ length: n - 2 }, () => '')];

describe('blank detection in the shared runtime (office-addin-mock)', () => {
  it('a 0 whose cell is Empty is a blank: its row is left out', async () => {
    mockExcel([['Double'], ['Empty'], ['Double'], ['Double']]);
    const out = await entry.fit(ysWithZero, xs, undefined, undefined, undefined, undefined, undefined, { parameterAddresses: addresses(5) });
    expect(out).toEqual([[1], [''], [2], [4]]);
    expect(reads).toEqual(['sheet Data', 'range B2:B5']); // only the argument with a 0 is read
  });
  it('a typed 0 stays 0', async () => {
    mockExcel([['Double'], ['Double'], ['Double'], ['Double']]);
    const out = await entry.fit(ysWithZero, xs, undefined, undefined, undefined, undefined, undefined, { parameterAddresses: addresses(5) });
    expect(out).toEqual([[0.5], [0.5], [2], [4]]);
  });
  it('no addresses (array constants, formula results): the values policy', async () => {
    mockExcel([['Empty'], ['Empty'], ['Empty'], ['Empty']]);
    const out = await entry.fit(ysWithZero, xs, undefined, undefined, undefined, undefined, undefined, {});
    expect(out).toEqual([[0.5], [0.5], [2], [4]]);
    expect(reads).toEqual([]);
  });
  it('the mock enforces load and sync, so the Empty result above proves the entry does both', () => {
    mockExcel([['Empty']]);
    type R = { valueTypes: unknown; load(p: string): void };
    const excel = g.Excel as { context: { workbook: { worksheets: { getItem(n: string): { getRange(a: string): R } } } } };
    const r = excel.context.workbook.worksheets.getItem('Data').getRange('A1');
    expect(r.valueTypes).toBe('Error, property was not loaded');
    r.load('valueTypes');
    expect(r.valueTypes).toBe('Error, context.sync() was not called');
  });
});

describe('errors reach Excel as CustomFunctions.Error through the one mapping', () => {
  it('#VALUE! with the message', async () => {
    mockExcel([['Double']]);
    await expect(entry.fit([[1], [2]], [[1], [2]], [[1]])).rejects.toMatchObject({
      code: '#VALUE!',
      message: 'knots: needs 0 (classic fit), a whole number of knots ≥ 2, or a range of knot positions; got 1.',
    });
  });
  it('#N/A with the message for an unreachable target', async () => {
    await expect(entry.invert([[9]], [[0, 0], [1, 1]])).rejects.toMatchObject({ code: '#N/A', message: "target_ys: 9 is outside the curve's range [0, 1]." });
  });
  it('an error cell arriving as an Excel error object propagates its code (no message for #DIV/0!)', async () => {
    await expect(entry.predict([[1]], [[1], [{ code: '#DIV/0!' }], [3]], [[1], [2], [3]])).rejects.toMatchObject({ code: '#DIV/0!', message: '' });
  });
  it('a scalar result stays scalar (BESTK); matrix results stay 2-D', async () => {
    const y = Array.from({ length: 30 }, (_, i) => [Math.sqrt(i) + (i % 3) * 0.1]);
    const x = Array.from({ length: 30 }, (_, i) => [i]);
    const k = await entry.bestKnotCount(y, x, [[2], [3], [4]], 3, 1, 0);
    expect([2, 3, 4]).toContain(k);
    expect(await entry.quantileKnotPositions([[1], [2], [3]], 2)).toEqual([[1], [3]]);
  });
});

describe('long work runs in the worker and can be cancelled', () => {
  const y = Array.from({ length: 40 }, (_, i) => [Math.log1p(i) + ((i * 7) % 5) * 0.05]);
  const x = Array.from({ length: 40 }, (_, i) => [i]);
  it('CV goes to the worker and gives the same table as the in-process implementation', async () => {
    const client = entry.workerClient(); // the entry's own client (in-process without a Worker global)
    const s0 = { ...client.stats };
    const viaWorker = await entry.crossValidation(y, x, [[0], [2], [3]], 4, 1, 0);
    expect(client.stats.completed - s0.completed).toBe(1);
    const { functionByName } = await import('../../src/functions/registry.js');
    expect(viaWorker).toEqual(functionByName('CV')!.invoke([y, x, [[0], [2], [3]], 4, 1, 0]));
  });
  it('onCanceled stops a queued or running CV: the call rejects with #N/A and the worker is replaced', async () => {
    const client = entry.workerClient(); // the entry's own client (in-process without a Worker global)
    const s0 = { ...client.stats };
    const first: { onCanceled?: () => void } = {};
    const second: { onCanceled?: () => void } = {};
    const p1 = entry.crossValidation(y, x, undefined, 5, 2, 3, undefined, undefined, undefined, undefined, first);
    const p2 = entry.bestKnotCount(y, x, undefined, 5, 2, 3, undefined, undefined, undefined, undefined, undefined, second);
    // Let both calls reach the worker client (microtasks only: the in-process worker runs on a timer).
    for (let i = 0; i < 50 && client.pending('cv') < 2; i++) await Promise.resolve();
    expect(client.pending('cv')).toBe(2);
    expect(typeof first.onCanceled).toBe('function');
    second.onCanceled!(); // queued behind the first: dropped
    first.onCanceled!(); // running: worker terminated
    await expect(p1).rejects.toMatchObject({ code: '#N/A', message: 'calculation cancelled.' });
    await expect(p2).rejects.toMatchObject({ code: '#N/A', message: 'calculation cancelled.' });
    expect(client.stats.cancelled - s0.cancelled).toBe(2);
    expect(client.stats.terminated - s0.terminated).toBe(1);
    // The lane keeps working with a fresh worker.
    const startedBefore = client.stats.started;
    await expect(entry.crossValidation(y, x, [[2]], 4, 1, 0)).resolves.toHaveLength(2);
    expect(client.stats.started - startedBefore).toBe(1);
  });
  it('in process (runner, task pane) CV honours an AbortSignal and reports progress', async () => {
    const { functionByName } = await import('../../src/functions/registry.js');
    const { mapError } = await import('../../src/adapter/errors.js');
    const controller = new AbortController();
    controller.abort();
    let thrown: unknown;
    try {
      functionByName('CV')!.invoke([y, x, [[2], [3]], 4, 1, 5], { signal: controller.signal });
    } catch (e) {
      thrown = e;
    }
    expect(mapError(thrown)).toEqual({ code: '#N/A', message: 'calculation cancelled.' });
    const seen: number[] = [];
    functionByName('CV')!.invoke([y, x, [[2], [3]], 4, 1, 5], { onProgress: (f) => seen.push(f) });
    expect(seen.length).toBe(8); // 2 candidates × 4 folds
    expect(seen[seen.length - 1]).toBe(1);
  });
  it('the worker forwards progress messages to the caller (task pane progress bar)', async () => {
    const client = new WorkerClient(() => inProcessWorker());
    const seen: number[] = [];
    const table = (await client.run('cv', 'CV', [y, x, [[2], [3]], 4, 1, 9], { onProgress: (f) => seen.push(f) })) as unknown[][];
    expect(table).toHaveLength(3);
    expect(seen).toHaveLength(8);
    expect(seen[7]).toBe(1);
    client.dispose();
  });
  it('a worker that cannot start or fails to load falls back to running the call in this thread', async () => {
    const throwing = new WorkerClient(
      () => {
        throw new Error('blocked by content policy');
      },
      () => inProcessWorker(),
    );
    await expect(throwing.run('cv', 'BESTK', [y, x, [[2], [3]], 4, 1, 0])).resolves.toBeTypeOf('number');
    const failing = new WorkerClient(
      () => ({
        onmessage: null,
        onerror: null,
        postMessage() {
          setTimeout(() => this.onerror?.({ message: 'script failed to load' }), 0);
        },
        terminate() {},
      }),
      () => inProcessWorker(),
    );
    await expect(failing.run('cv', 'BESTK', [y, x, [[2], [3]], 4, 1, 0])).resolves.toBeTypeOf('number');
    expect(failing.stats.started).toBe(2);
    await expect(failing.run('cv', 'BESTK', [y, x, [[2], [3]], 4, 1, 0])).resolves.toBeTypeOf('number');
    expect(failing.stats.started).toBe(2); // the lane stays on the fallback
    const noFallback = new WorkerClient(() => ({
      onmessage: null,
      onerror: null,
      postMessage() {
        setTimeout(() => this.onerror?.({ message: 'script failed to load' }), 0);
      },
      terminate() {},
    }));
    await expect(noFallback.run('cv', 'BESTK', [y, x])).rejects.toThrow('worker failed: script failed to load');
  });
  it('fits whose largest argument exceeds the cell threshold go to the fit lane', async () => {
    const client = entry.workerClient(); // the entry's own client (in-process without a Worker global)
    const s0 = { ...client.stats };
    const n = entry.WORKER_CELL_THRESHOLD + 1;
    const big = Array.from({ length: n }, (_, i) => [i]);
    const out = (await entry.predict([[n / 2]], big, big)) as number[][];
    expect(out[0]![0]).toBeCloseRel(n / 2, 1e-12);
    expect(client.stats.completed - s0.completed).toBe(1);
    await entry.predict([[3]], [[1], [2], [3]], [[1], [2], [3]]);
    expect(client.stats.completed - s0.completed).toBe(1); // small call: in process
  });
});
