/**
 * Child process of the core benchmark: the memory one classic fit needs, in bytes per row.
 * Run as `tsx bench/memory-child.ts <n> <random|ties>`; prints one number: the bytes of typed
 * arrays allocated during fitMonotone(x, y) on n rows (result included; garbage is collected
 * before, and the fit allocates nothing else of that size), divided by n. Freed scratch still
 * counts, so this is an upper bound of the peak. A fresh process, so earlier work does not mix in.
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { fitMonotone } from '../src/core/index.js';
import { risingData, tiedData } from './harness.js';

setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;
const n = Number(process.argv[2]);
const kind = process.argv[3];
const { x, y } = kind === 'ties' ? tiedData(n) : risingData(n);
const small = kind === 'ties' ? tiedData(70000, 7) : risingData(70000, 7);
for (let r = 0; r < 3; r++) fitMonotone(small.x, small.y);
gc();
const before = process.memoryUsage().arrayBuffers;
const model = fitMonotone(x, y);
const after = process.memoryUsage().arrayBuffers;
console.log(String((after - before) / n));
if (model.levels < 0) console.log('');
