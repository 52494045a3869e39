/**
 * Same numbers in a worker thread as on the main thread: cross-validation (seeded folds,
 * repeats, auto direction, weights) run through node:worker_threads with the TypeScript sources
 * loaded by tsx gives results identical to the last bit to a run in the test's own thread.
 */
import { describe, expect, it } from 'vitest';
import { Worker } from 'node:worker_threads';
import { crossValidate, type CrossValidationResult } from '../../src/core/index.js';
import { holdoutValidate } from '../../src/core/cross-validate.js';

function inWorker(data: { x: number[]; y: number[]; options: Record<string, unknown>; holdout: boolean }): Promise<CrossValidationResult> {
  return new Promise((resolve, reject) => {
    // The worker registers tsx's ESM loader, then imports the TypeScript entry.
    const entry = new URL('./cv-worker-entry.ts', import.meta.url).href;
    const code = `import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(entry)}); })`;
    const w = new Worker(code, { eval: true, workerData: data });
    w.once('message', (m: CrossValidationResult) => {
      resolve(m);
      void w.terminate();
    });
    w.once('error', reject);
  });
}

describe('worker and non-worker execution', () => {
  const x = Array.from({ length: 200 }, (_, i) => ((i * 37) % 101) / 3);
  const y = x.map((v, i) => Math.log1p(v) + Math.sin(i) / 2);
  const weights = x.map((_, i) => (i % 7 === 0 ? 0 : 1 + (i % 3)));

  it('K-fold: seeded, 3 repeats, auto direction, weights, quantile knots — identical results', async () => {
    const options = { candidates: [0, 2, 3, 5, 8], folds: 7, repeats: 3, seed: 2026, direction: 'auto', weights, placement: 'quantile' };
    const here = crossValidate(x, y, options as Parameters<typeof crossValidate>[2]);
    const there = await inWorker({ x, y, options, holdout: false });
    expect(there).toEqual(here);
  }, 30000);

  it('hold-out: identical results', async () => {
    const options = { candidates: [0, 2, 4], seed: 5, testFraction: 0.3 };
    const here = holdoutValidate(x, y, options);
    const there = await inWorker({ x, y, options, holdout: true });
    expect(there).toEqual(here);
  }, 30000);
});
