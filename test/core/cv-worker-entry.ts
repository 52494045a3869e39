/** Worker-thread entry for cv-worker.test.ts: runs crossValidate on the data it is sent. */
import { parentPort, workerData } from 'node:worker_threads';
import { crossValidate } from '../../src/core/index.js';
import { holdoutValidate } from '../../src/core/cross-validate.js';

const { x, y, options, holdout } = workerData as { x: number[]; y: number[]; options: Record<string, unknown>; holdout: boolean };
parentPort!.postMessage(holdout ? holdoutValidate(x, y, options) : crossValidate(x, y, options));
