/**
 * The surface worksheet functions — RATCHET.SURFACE, RATCHET.GRID and RATCHET.CVGRID — on the same
 * machinery as the one-input functions (src/functions/define.ts): one spec each, parameters from
 * the one table (src/functions/params.ts), the one row pairing with the blank-cell rule (three data
 * columns instead of two) and the one result cache (src/functions/engine.ts).
 */
import { fail, predictSurface, type AxisDirectionOption } from '../core/index.js';
import type { CellOut } from './types.js';
import { defineFunction, type Args } from './define.js';
import { cachedSurface, cachedSurfaceCrossValidation } from './engine.js';
import { PARAMS as P } from './params.js';
import type { SurfaceModel } from '../core/index.js';

const SURFACE_PARAMS = [P.surfaceYs, P.knownX1s, P.knownX2s, P.knots1, P.knots2, P.direction1, P.direction2, P.weights] as const;
type SurfaceName = (typeof SURFACE_PARAMS)[number]['name'];

/**
 * The surface fit of the call's data, knots and directions, from the cache or computed once.
 * Directions (PARAMS.direction1/2): 1 rising, −1 falling, 0 picked from the data — the sign of
 * Spearman's rank correlation of that input with known_ys over the rows the fit uses (rising when
 * it is 0 or undefined, as in RATCHET.FIT) — and 2 no constraint along that input.
 */
function surfaceOf(a: Args<SurfaceName>): SurfaceModel {
  const data = a.rows(['known_ys', 'known_x1s', 'known_x2s'], 'weights');
  const knots1 = a.knots('knots1');
  const knots2 = a.knots('knots2');
  const direction1 = a.choice<AxisDirectionOption>('direction1');
  const direction2 = a.choice<AxisDirectionOption>('direction2');
  return cachedSurface(data, { knots1, knots2, direction1, direction2 });
}

/**
 * RATCHET.SURFACE(new_x1s, new_x2s, known_ys, known_x1s, known_x2s, [knots1], [knots2],
 * [direction1], [direction2], [weights]): the fitted surface at each new (x1, x2) pair, in the shape
 * of new_x1s; a pair with a blank stays blank. Cost: the fit (cached) plus O(log K) per pair.
 */
export const SURFACE = defineFunction({
  name: 'SURFACE',
  description: 'Value of the monotone surface fitted to known_ys over two inputs at each new (x1, x2) pair (flat beyond the knots).',
  params: [P.newX1s, P.newX2s, ...SURFACE_PARAMS],
  returnsArray: true,
  run(a) {
    const n1 = a.cells('new_x1s');
    const n2 = a.cells('new_x2s');
    if (n2.values.length !== n1.values.length) {
      fail('LENGTH_MISMATCH', 'new_x2s', `needs one cell per cell of new_x1s (${n1.values.length}); got ${n2.values.length}`);
    }
    const model = surfaceOf(a);
    const x1 = n1.values;
    const x2 = n2.values;
    const idx: number[] = [];
    for (let i = 0; i < x1.length; i++) if (x1[i] === x1[i] && x2[i] === x2[i]) idx.push(i);
    const values = predictSurface(
      model,
      idx.map((i) => x1[i]!),
      idx.map((i) => x2[i]!),
    );
    const flat: CellOut[] = new Array<CellOut>(x1.length).fill('');
    idx.forEach((i, k) => (flat[i] = values[k]!));
    const out: CellOut[][] = [];
    for (let r = 0; r < n1.rows; r++) out.push(flat.slice(r * n1.cols, (r + 1) * n1.cols));
    return out;
  },
});

/**
 * RATCHET.GRID(known_ys, known_x1s, known_x2s, [knots1], [knots2], [direction1], [direction2],
 * [weights]): the fitted lattice as a table — first row the x1 knot positions (after an empty
 * corner cell), first column the x2 knot positions, body the lattice values (row = x2 knot,
 * column = x1 knot). Cost: the fit (cached) plus O(K1·K2).
 */
export const GRID = defineFunction({
  name: 'GRID',
  description: 'The fitted surface as a table: x1 knots across the first row, x2 knots down the first column, fitted values inside.',
  params: SURFACE_PARAMS,
  returnsArray: true,
  run(a) {
    const m = surfaceOf(a);
    const k1 = m.knots1.length;
    const out: CellOut[][] = [['', ...Array.from(m.knots1)]];
    for (let b = 0; b < m.knots2.length; b++) out.push([m.knots2[b]!, ...Array.from(m.values.subarray(b * k1, (b + 1) * k1))]);
    return out;
  },
});

/** Column headers of the CVGRID table. */
export const CVGRID_HEADER: readonly string[] = ['knots1', 'knots2', 'cv_rmse', 'cv_se', 'cv_r2'];

/**
 * RATCHET.CVGRID(known_ys, known_x1s, known_x2s, [candidates1], [candidates2], [folds], [repeats],
 * [seed], [direction1], [direction2], [weights]): a header row, then one row per (knots1, knots2)
 * pair — candidates1 outer — with cv_rmse, cv_se and cv_r2 from crossValidateSurface (the folds
 * and seeds of RATCHET.CV). Long work: cancelable through the context's signal.
 */
export const CVGRID = defineFunction({
  name: 'CVGRID',
  description: 'Cross-validation of knot pairs for the surface: a header row, then knots1, knots2, cv_rmse, cv_se and cv_r2 per pair.',
  params: [P.surfaceYs, P.knownX1s, P.knownX2s, P.candidates1, P.candidates2, P.folds, P.repeats, P.seed, P.direction1, P.direction2, P.weights],
  returnsArray: true,
  longWork: true,
  run(a, ctx) {
    const data = a.rows(['known_ys', 'known_x1s', 'known_x2s'], 'weights');
    const candidates = a.list('candidates1');
    const candidates2 = a.list('candidates2');
    const folds = a.number('folds');
    const repeats = a.number('repeats');
    const seed = a.number('seed');
    const direction1 = a.choice<AxisDirectionOption>('direction1');
    const direction2 = a.choice<AxisDirectionOption>('direction2');
    const result = cachedSurfaceCrossValidation(data, { candidates, candidates2, folds, repeats, seed, direction1, direction2 }, ctx);
    const out: CellOut[][] = [CVGRID_HEADER.slice()];
    for (const s of result.scores) out.push([s.knots1, s.knots2, s.cvRmse, s.cvSe, s.cvR2]);
    return out;
  },
});
