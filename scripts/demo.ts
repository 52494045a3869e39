/**
 * `npm run demo`: evaluates every sample workbook headlessly and prints, per sample, the
 * suggested knot count, its cv_rmse and the knot table (for the surface sample: the suggested
 * lattice and its RATCHET.GRID table); writes an SVG of each fit (or a heat-map) to out/; then
 * one invented scenario per shape (concave, convex, smooth) → out/shape-<name>.svg.
 */
import { join } from 'node:path';
import '../src/runner/ratchet.js';
import { runDemo } from './samples/demo.js';
import { runShapeDemo } from './samples/shape-demos.js';

const root = join(import.meta.dirname, '..');
console.log('Ratchet demo: the sample workbooks evaluated headlessly (all scenarios and data are invented).\n');
const results = await runDemo(root);
const shapes = runShapeDemo(join(root, 'out'));
console.log(`${results.length} samples and ${shapes.length} shape scenarios evaluated; pictures in out/.`);
