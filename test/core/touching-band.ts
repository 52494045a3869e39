/**
 * The read-back specification at a band edge that touches the target without crossing it, shared
 * by the degree-1 and degree-2 reference tests: each file supplies its model and the reference
 * values it computed in R (the commands are recorded beside each fixture).
 */
import { expect, it } from 'vitest';
import { inverseBand, type BandModel } from '../../src/core/band.js';

/** Reference values of one touching case (see the fixture beside each caller for their source). */
export interface TouchingCase {
  /** The touching point and the lower edge's value there (its maximum on the last interval). */
  xt: number;
  y0: number;
  atTouch: { x: number; lower: number };
  below: { x: number; lower: number; upper: number };
  above: { x: number; lower: number; edgeMax: number };
}

/** Registers the four checks of a touching band edge for `model` against the R values in `c`. */
export function touchingBandSpecs(model: BandModel, c: TouchingCase): void {
  it('target = the maximum of the lower edge (R 4.2.2 polyroot): the touching point is the upper limit, to 1e-8 relative (a double root moves as the square root of a change in the target); lower limit and read-back to 1e-9', () => {
    const [r] = inverseBand(model, [c.y0], 0.95, 4);
    expect(r!.x as number).toBeCloseRel(c.atTouch.x, 1e-9);
    expect(r!.lower as number).toBeCloseRel(c.atTouch.lower, 1e-9);
    expect(r!.upper as number).toBeCloseRel(c.xt, 1e-8);
  });
  it('target 1e-6 below the touch (R 4.2.2 uniroot): the crossing just before the touching point', () => {
    const [r] = inverseBand(model, [c.y0 - 1e-6], 0.95, 4);
    expect(r!.x as number).toBeCloseRel(c.below.x, 1e-9);
    expect(r!.lower as number).toBeCloseRel(c.below.lower, 1e-9);
    expect(r!.upper as number).toBeCloseRel(c.below.upper, 1e-8);
  });
  it("target 1e-6 above the touch (R 4.2.2 optimize: the edge stays below): the upper limit is NOT_REACHABLE, the lower limit still R's", () => {
    expect(c.above.edgeMax).toBeLessThan(c.y0 + 1e-6);
    const [r] = inverseBand(model, [c.y0 + 1e-6], 0.95, 4);
    expect(r!.x as number).toBeCloseRel(c.above.x, 1e-9);
    expect(r!.lower as number).toBeCloseRel(c.above.lower, 1e-9);
    expect(r!.upper).toMatchObject({ code: 'NOT_REACHABLE' });
  });
  it('the tolerance rule (docs/bands.md): a miss of 1e-12 (below τ = 1e-12·(|values| + |y0| + t·σ̂) ≈ 4e-11) still touches; 1e-9 above is NOT_REACHABLE', () => {
    const [near] = inverseBand(model, [c.y0 + 1e-12], 0.95, 4);
    expect(near!.upper as number).toBeCloseRel(c.xt, 1e-8);
    const [off] = inverseBand(model, [c.y0 + 1e-9], 0.95, 4);
    expect(off!.upper).toMatchObject({ code: 'NOT_REACHABLE' });
  });
}
