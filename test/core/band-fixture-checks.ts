/**
 * Checks shared by the band reference tests (band.reference.test.ts, band-smooth.reference.test.ts,
 * band-shapes.reference.test.ts): the band rows and read-back sets their R fixtures record, compared
 * with a model's `bandAt` and `inverseBand`. Each caller names its fixture and the command that made it.
 */
import { expect } from 'vitest';
import { bandAt, inverseBand, type BandModel } from '../../src/core/band.js';

/** One level of a fixture's bands: R predict.lm's fit and confidence and prediction limits at each new x. */
export interface BandRow {
  level: number;
  fit: number[];
  conf_lower: number[];
  conf_upper: number[];
  pred_lower: number[];
  pred_upper: number[];
}

/** One level and replicate count of a fixture's read-back intervals; a null limit is one R's scan did not find inside the data's x range. */
export interface InvertSet {
  level: number;
  replicates: number;
  intervals: { target: number; lower: number | null; x: number; upper: number | null }[];
}

/**
 * The fields a reduced-design band case of the smooth and shaped fixtures shares: the data, R's
 * coefficients and fit summary on the reduced design, and its bands and read-back sets.
 */
export interface ReducedDesignCase {
  name: string;
  source: string;
  knot_x: number[];
  x: number[];
  y: number[];
  w?: number[] | null;
  coefficients: number[];
  parameters: number;
  sigma: number;
  df_resid: number;
  new_x: number[];
  bands: BandRow[];
  invert: InvertSet[];
}

/** The model's confidence and prediction bands at `newX` against every row, entrywise to `rel` relative. */
export function expectBandRows(model: BandModel, newX: readonly number[], rows: readonly BandRow[], rel = 1e-9): void {
  for (const row of rows) {
    const conf = bandAt(model, newX, row.level, 'confidence');
    const pred = bandAt(model, newX, row.level, 'prediction');
    expect(conf.fit).toBeAllCloseRel(row.fit, rel);
    expect(conf.lower).toBeAllCloseRel(row.conf_lower, rel);
    expect(conf.upper).toBeAllCloseRel(row.conf_upper, rel);
    expect(pred.lower).toBeAllCloseRel(row.pred_lower, rel);
    expect(pred.upper).toBeAllCloseRel(row.pred_upper, rel);
  }
}

/**
 * INVERTBAND's three values against each set: the read-back x to `relX`, the limits to `relLimit`
 * relative; a null limit must be NOT_REACHABLE.
 */
export function expectInvertSets(model: BandModel, sets: readonly InvertSet[], relX = 1e-9, relLimit = 1e-8): void {
  for (const set of sets) {
    const got = inverseBand(model, set.intervals.map((r) => r.target), set.level, set.replicates);
    set.intervals.forEach((r, i) => {
      const g = got[i]!;
      expect(g.x as number).toBeCloseRel(r.x, relX);
      for (const side of ['lower', 'upper'] as const) {
        const want = r[side];
        if (want === null) expect(g[side]).toMatchObject({ code: 'NOT_REACHABLE' });
        else expect(g[side] as number).toBeCloseRel(want, relLimit);
      }
    });
  }
}
