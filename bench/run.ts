/**
 * `npm run bench` prints a table; `npm run bench -- --json` prints one JSON object per line.
 * Each suite module exports `run(emit)`; suites are listed here.
 */
import type { BenchRecord } from './harness.js';
import { run as coreSuite } from './core.js';
import { run as cvSuite } from './cv.js';
import { run as surfaceSuite } from './surface.js';
import { run as runnerSuite } from './runner.js';
import { run as functionsSuite } from './functions.js';
import { run as shapesSuite } from './shapes.js';

type Suite = (emit: (r: BenchRecord) => void, options: { quick: boolean }) => Promise<void> | void;
const suites: [string, Suite][] = [['core', coreSuite]];
suites.push(['cv', cvSuite]);
suites.push(['surface', surfaceSuite]);
suites.push(['runner', runnerSuite]);
suites.push(['functions', functionsSuite]);
suites.push(['shapes', shapesSuite]);

const json = process.argv.includes('--json');
const quick = process.argv.includes('--quick');
const only = process.argv.find((a) => a.startsWith('--only='))?.slice(7);

function emit(r: BenchRecord): void {
  if (json) {
    console.log(JSON.stringify(r));
    return;
  }
  const extra = Object.entries(r)
    .filter(([k]) => !['case', 'n', 'knots', 'ms'].includes(k))
    .map(([k, v]) => `${k}=${typeof v === 'number' ? (Number.isInteger(v) ? v : Number(v.toPrecision(4))) : String(v)}`)
    .join(' ');
  console.log(`${r.case.padEnd(34)} ${String(r.n).padStart(8)} ${String(r.knots).padStart(6)} ${r.ms.toFixed(2).padStart(10)} ms  ${extra}`);
}

if (!json) console.log(`${'case'.padEnd(34)} ${'n'.padStart(8)} ${'knots'.padStart(6)} ${'time'.padStart(13)}`);
for (const [name, suite] of suites) {
  if (only && only !== name) continue;
  await suite(emit, { quick });
}
