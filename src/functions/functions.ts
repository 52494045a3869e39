/**
 * Excel entry of the RATCHET functions (custom functions, shared runtime).
 *
 * The JSDoc `@customfunction` tags below are the source of functions.json: the webpack build runs
 * custom-functions-metadata-plugin over this file (it also appends the CustomFunctions.associate
 * calls). Every function delegates to the registry implementation of the same name through
 * {@link call}, which
 * 1. converts Excel's values to host-neutral cells (error objects → error cells);
 * 2. applies the blank-cell policy `'types'`: an argument that contains a 0 and comes from a
 *    worksheet range has its `valueTypes` read with Excel.run, and cells of type Empty become
 *    blanks (see src/adapter/blanks.ts);
 * 3. runs long work — CV, BESTK, and any call whose largest argument has more than
 *    {@link WORKER_CELL_THRESHOLD} cells — in a Web Worker with the same implementations, so the
 *    shared runtime (which also drives the task pane) is never blocked by a fit; CV and BESTK are
 *    cancelable: Excel cancels them when their inputs change, and the worker call is stopped;
 * 4. passes the arguments' addresses (`invocation.parameterAddresses`) on: a data argument that
 *    is a worksheet reference leaves its text and logical cells out, and messages name cells by
 *    address (src/adapter/cells.ts);
 * 5. maps anything thrown to a CustomFunctions.Error with the one mapping of src/adapter/errors.ts.
 */
/// <reference types="office-js" />
/// <reference types="custom-functions-runtime" />
/* eslint-disable @typescript-eslint/no-explicit-any -- the metadata generator reads `any` as "any cell value". */
import { functionByName } from './registry.js';
import type { CellArg, CellResult } from './types.js';
import { fromExcelArg, largestArgument, toExcelError, toExcelResult, type ExcelErrorConstructor } from '../adapter/excel.js';
import { resolveBlanks, type ValueTypeName, type ValueTypeReader } from '../adapter/blanks.js';
import { WorkerClient, inProcessWorker, type WorkerLike } from './worker-client.js';

/** Calls whose largest argument has more cells than this run in the worker (≈ 20 ms of fitting). */
export const WORKER_CELL_THRESHOLD = 50_000;

/**
 * Reads a range's value types in the shared runtime. Reading workbook data from a custom function
 * is supported only in a shared runtime, and a custom function must not change other cells
 * (Microsoft Learn, "Call Excel JavaScript APIs from a custom function"); this only loads.
 */
export const readValueTypes: ValueTypeReader = (sheet, range) =>
  Excel.run(async (context) => {
    const r = context.workbook.worksheets.getItem(sheet).getRange(range);
    r.load('valueTypes');
    await context.sync();
    return r.valueTypes as ValueTypeName[][];
  });

/** A Web Worker running worker.ts; where the host has none, the same protocol in this thread. */
function createWorker(): WorkerLike {
  if (typeof Worker === 'undefined') return inProcessWorker();
  return new Worker(/* webpackChunkName: "worker" */ new URL('./worker.ts', import.meta.url)) as unknown as WorkerLike;
}

let client: WorkerClient | undefined;

/** The worker client (created on first use; without a Worker global it runs in this thread). */
export function workerClient(): WorkerClient {
  // If a worker cannot start or load (a host's content policy), the call runs in this thread instead.
  client ??= new WorkerClient(createWorker, () => inProcessWorker());
  return client;
}

/**
 * Runs the registry function `name` for Excel: conversion, blank policy, worker routing and error
 * mapping as described at the top of this file.
 */
export async function call(name: string, raw: readonly unknown[], invocation?: CustomFunctions.Invocation | CustomFunctions.CancelableInvocation): Promise<CellResult> {
  const f = functionByName(name)!;
  const ErrorClass = CustomFunctions.Error as unknown as ExcelErrorConstructor;
  try {
    const converted: CellArg[] = raw.map(fromExcelArg);
    const addresses = invocation?.parameterAddresses;
    const args = await resolveBlanks(converted, addresses, readValueTypes);
    let result: CellResult;
    if (f.longWork || largestArgument(args) > WORKER_CELL_THRESHOLD) {
      const controller = new AbortController();
      if (f.longWork && invocation) (invocation as CustomFunctions.CancelableInvocation).onCanceled = () => controller.abort();
      result = await workerClient().run(f.longWork ? 'cv' : 'fit', name, args, { signal: controller.signal, addresses });
    } else {
      result = f.invoke(args, { addresses });
    }
    return toExcelResult(result, f.returnsArray, ErrorClass) as CellResult;
  } catch (e) {
    throw toExcelError(e, ErrorClass);
  }
}

/**
 * Monotone fitted value for every row of known_ys, same shape; rows left out (blank x, y or weight) stay empty.
 * @customfunction FIT FIT
 * @helpurl https://localhost:3000/help.html#ratchetfit
 * @requiresParameterAddresses
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots] Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function fit(known_ys: any[][], known_xs: any[][], knots?: any[][], direction?: any, weights?: any[][], curvature?: any, degree?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('FIT', [known_ys, known_xs, knots, direction, weights, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * Value of the monotone curve fitted to known_ys and known_xs at each new x (flat beyond the data).
 * @customfunction PREDICT PREDICT
 * @helpurl https://localhost:3000/help.html#ratchetpredict
 * @requiresParameterAddresses
 * @param new_xs Inputs at which to read the curve: a cell or a range of any shape; blanks stay blank.
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots] Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function predict(new_xs: any[][], known_ys: any[][], known_xs: any[][], knots?: any[][], direction?: any, weights?: any[][], curvature?: any, degree?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('PREDICT', [new_xs, known_ys, known_xs, knots, direction, weights, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * The fitted model as a table: one row per knot, two columns (knot x, fitted value); a smooth fit adds midpoints and a third column of 2s.
 * @customfunction KNOTS KNOTS
 * @helpurl https://localhost:3000/help.html#ratchetknots
 * @requiresParameterAddresses
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots] Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function knots(known_ys: any[][], known_xs: any[][], knots?: any[][], direction?: any, weights?: any[][], curvature?: any, degree?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('KNOTS', [known_ys, known_xs, knots, direction, weights, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * Reads a knot table at each new x: straight lines between knots (a parabola per interval for a smooth table), flat beyond the ends. No refit.
 * @customfunction EVAL EVAL
 * @helpurl https://localhost:3000/help.html#ratcheteval
 * @requiresParameterAddresses
 * @param new_xs Inputs at which to read the curve: a cell or a range of any shape; blanks stay blank.
 * @param knot_table Two columns: knot x (strictly increasing) and value, e.g. the result of RATCHET.KNOTS.
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function evaluate(new_xs: any[][], knot_table: any[][], invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('EVAL', [new_xs, knot_table], invocation) as Promise<any[][]>;
}

/**
 * The x at which the curve of a knot table reaches each target value.
 * @customfunction INVERT INVERT
 * @helpurl https://localhost:3000/help.html#ratchetinvert
 * @requiresParameterAddresses
 * @param target_ys Curve values to read back: a cell or a range; blanks stay blank.
 * @param knot_table Two columns: knot x (strictly increasing) and value, e.g. the result of RATCHET.KNOTS.
 * @param [tie] Where the curve is flat at the target: -1 lowest x, 0 middle (default), 1 highest x.
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function invert(target_ys: any[][], knot_table: any[][], tie?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('INVERT', [target_ys, knot_table, tie], invocation) as Promise<any[][]>;
}

/**
 * count knot positions at quantiles of known_xs, as a column to pass as knots.
 * @customfunction QKNOTS QKNOTS
 * @helpurl https://localhost:3000/help.html#ratchetqknots
 * @requiresParameterAddresses
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param count Number of knots, a whole number ≥ 2.
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function quantileKnotPositions(known_xs: any[][], count: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('QKNOTS', [known_xs, count], invocation) as Promise<any[][]>;
}

/**
 * Cross-validation table: a header row, then per candidate knot count its cv_rmse, cv_se, cv_r2, cv_mae and train_rmse.
 * @customfunction CV CV
 * @helpurl https://localhost:3000/help.html#ratchetcv
 * @requiresParameterAddresses
 * @cancelable
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [candidates] Knot counts to compare (0 = classic fit): a number or a range, e.g. SEQUENCE(19,1,2). Default 2 to min(20, distinct x).
 * @param [folds] Number of folds, 2 to the number of rows. Default 5.
 * @param [repeats] Number of repeats with fresh shuffles, ≥ 1. Default 1.
 * @param [seed] Whole number for the shuffle; 0 means no shuffle (blocks in row order). Default 1.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses and cancellation.
 * @returns The spilled result.
 */
export async function crossValidation(known_ys: any[][], known_xs: any[][], candidates?: any[][], folds?: any, repeats?: any, seed?: any, direction?: any, weights?: any[][], curvature?: any, degree?: any, invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return call('CV', [known_ys, known_xs, candidates, folds, repeats, seed, direction, weights, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * The knot count suggested by cross-validation (one-standard-error rule by default).
 * @customfunction BESTK BESTK
 * @helpurl https://localhost:3000/help.html#ratchetbestk
 * @requiresParameterAddresses
 * @cancelable
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [candidates] Knot counts to compare (0 = classic fit): a number or a range, e.g. SEQUENCE(19,1,2). Default 2 to min(20, distinct x).
 * @param [folds] Number of folds, 2 to the number of rows. Default 5.
 * @param [repeats] Number of repeats with fresh shuffles, ≥ 1. Default 1.
 * @param [seed] Whole number for the shuffle; 0 means no shuffle (blocks in row order). Default 1.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [rule] 1 one-standard-error rule: fewest knots within one SE of the best (default); 0 the minimum.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses and cancellation.
 * @returns The suggested knot count.
 */
export async function bestKnotCount(known_ys: any[][], known_xs: any[][], candidates?: any[][], folds?: any, repeats?: any, seed?: any, direction?: any, weights?: any[][], rule?: any, curvature?: any, degree?: any, invocation?: CustomFunctions.CancelableInvocation): Promise<number> {
  return call('BESTK', [known_ys, known_xs, candidates, folds, repeats, seed, direction, weights, rule, curvature, degree], invocation) as Promise<number>;
}

/**
 * Fit statistics as label/value rows: n, dropped, knots, direction, r2, rmse, mae, sse, levels, text_rows, sigma, df_resid, spearman.
 * @customfunction STATS STATS
 * @helpurl https://localhost:3000/help.html#ratchetstats
 * @requiresParameterAddresses
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots] Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function statistics(known_ys: any[][], known_xs: any[][], knots?: any[][], direction?: any, weights?: any[][], curvature?: any, degree?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('STATS', [known_ys, known_xs, knots, direction, weights, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * Lower edge, fitted value and upper edge of the knot model’s confidence or prediction band at each new x.
 * @customfunction BAND BAND
 * @helpurl https://localhost:3000/help.html#ratchetband
 * @requiresParameterAddresses
 * @param new_xs Inputs at which to read the curve: a cell or a range of any shape; blanks stay blank.
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots] Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [level] Confidence level, strictly between 0 and 1. Default 0.95.
 * @param [kind] 1 confidence band for the curve (default), 2 prediction band for one new observation of weight 1.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function band(new_xs: any[][], known_ys: any[][], known_xs: any[][], knots?: any[][], direction?: any, weights?: any[][], level?: any, kind?: any, curvature?: any, degree?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('BAND', [new_xs, known_ys, known_xs, knots, direction, weights, level, kind, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * Lower x, read-back x and upper x of the calibration interval for each target y (the x whose prediction band contains it).
 * @customfunction INVERTBAND INVERTBAND
 * @helpurl https://localhost:3000/help.html#ratchetinvertband
 * @requiresParameterAddresses
 * @param target_ys Curve values to read back: a cell or a range; blanks stay blank.
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in known_xs or in weights are left out.
 * @param known_xs Inputs, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots] Omitted or 0: classic fit at every distinct x. A whole number K ≥ 2: K evenly spaced knots. A range of ≥ 2 increasing numbers: knot positions.
 * @param [direction] 1 rising (default), -1 falling, 0 pick from the data (sign of the rank correlation).
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param [level] Confidence level, strictly between 0 and 1. Default 0.95.
 * @param [replicates] Number of new measurements averaged into each target, ≥ 1. Default 1.
 * @param [curvature] Knot model only: 0 any (default), -1 concave (slopes never increase), 1 convex (slopes never decrease).
 * @param [degree] Knot model only: 1 piecewise linear (default), 2 smooth monotone curve (quadratic B-spline).
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function invertBand(target_ys: any[][], known_ys: any[][], known_xs: any[][], knots?: any[][], direction?: any, weights?: any[][], level?: any, replicates?: any, curvature?: any, degree?: any, invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('INVERTBAND', [target_ys, known_ys, known_xs, knots, direction, weights, level, replicates, curvature, degree], invocation) as Promise<any[][]>;
}

/**
 * Value of the monotone surface fitted to known_ys over two inputs at each new (x1, x2) pair (flat beyond the knots).
 * @customfunction SURFACE SURFACE
 * @helpurl https://localhost:3000/help.html#ratchetsurface
 * @requiresParameterAddresses
 * @param new_x1s First inputs at which to read the surface: a cell or a range of any shape; blanks stay blank.
 * @param new_x2s Second inputs, one per new_x1s cell (same number of cells).
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in an input or in weights are left out.
 * @param known_x1s First input, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param known_x2s Second input, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots1] Knots along the first input. Omitted or 0: every distinct value. A whole number K from 2 to 200: K evenly spaced knots. A range: knot positions.
 * @param [knots2] Knots along the second input, as knots1. The surface has knots1 × knots2 values: keep it small.
 * @param [direction1] Along the first input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.
 * @param [direction2] Along the second input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function surface(new_x1s: any[][], new_x2s: any[][], known_ys: any[][], known_x1s: any[][], known_x2s: any[][], knots1?: any[][], knots2?: any[][], direction1?: any, direction2?: any, weights?: any[][], invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('SURFACE', [new_x1s, new_x2s, known_ys, known_x1s, known_x2s, knots1, knots2, direction1, direction2, weights], invocation) as Promise<any[][]>;
}

/**
 * The fitted surface as a table: x1 knots across the first row, x2 knots down the first column, fitted values inside.
 * @customfunction GRID GRID
 * @helpurl https://localhost:3000/help.html#ratchetgrid
 * @requiresParameterAddresses
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in an input or in weights are left out.
 * @param known_x1s First input, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param known_x2s Second input, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [knots1] Knots along the first input. Omitted or 0: every distinct value. A whole number K from 2 to 200: K evenly spaced knots. A range: knot positions.
 * @param [knots2] Knots along the second input, as knots1. The surface has knots1 × knots2 values: keep it small.
 * @param [direction1] Along the first input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.
 * @param [direction2] Along the second input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param invocation Supplied by Excel: parameter addresses.
 * @returns The spilled result.
 */
export async function surfaceGrid(known_ys: any[][], known_x1s: any[][], known_x2s: any[][], knots1?: any[][], knots2?: any[][], direction1?: any, direction2?: any, weights?: any[][], invocation?: CustomFunctions.Invocation): Promise<any[][]> {
  return call('GRID', [known_ys, known_x1s, known_x2s, knots1, knots2, direction1, direction2, weights], invocation) as Promise<any[][]>;
}

/**
 * Cross-validation of knot pairs for the surface: a header row, then knots1, knots2, cv_rmse, cv_se and cv_r2 per pair.
 * @customfunction CVGRID CVGRID
 * @helpurl https://localhost:3000/help.html#ratchetcvgrid
 * @requiresParameterAddresses
 * @cancelable
 * @param known_ys Observed values: one column or one row. Rows with a blank here, in an input or in weights are left out.
 * @param known_x1s First input, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param known_x2s Second input, one per known_ys cell (a column or a row). Blank cells leave their row out.
 * @param [candidates1] Knot counts to compare along the first input (0 = every level): a number or a range. Default 2 to 6.
 * @param [candidates2] Knot counts to compare along the second input, as candidates1. Every pair is scored.
 * @param [folds] Number of folds, 2 to the number of rows. Default 5.
 * @param [repeats] Number of repeats with fresh shuffles, ≥ 1. Default 1.
 * @param [seed] Whole number for the shuffle; 0 means no shuffle (blocks in row order). Default 1.
 * @param [direction1] Along the first input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.
 * @param [direction2] Along the second input: 1 rising (default), -1 falling, 0 pick from the data (sign of its rank correlation with y), 2 no constraint.
 * @param [weights] Optional weight ≥ 0 per row, same size as known_ys; a blank weight leaves its row out.
 * @param invocation Supplied by Excel: parameter addresses and cancellation.
 * @returns The spilled result.
 */
export async function surfaceCrossValidation(known_ys: any[][], known_x1s: any[][], known_x2s: any[][], candidates1?: any[][], candidates2?: any[][], folds?: any, repeats?: any, seed?: any, direction1?: any, direction2?: any, weights?: any[][], invocation?: CustomFunctions.CancelableInvocation): Promise<any[][]> {
  return call('CVGRID', [known_ys, known_x1s, known_x2s, candidates1, candidates2, folds, repeats, seed, direction1, direction2, weights], invocation) as Promise<any[][]>;
}
