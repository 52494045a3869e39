/**
 * Data generators shared by the core's property tests (fast-check): x with many ties (small
 * integers) or spread out (doubles), y with flat stretches (small integers) or noise, optional
 * weights with zeros. Each test file adds the filter its solver needs.
 */
import fc from 'fast-check';

/** One generated data set (weights undefined: unweighted). */
export interface Data {
  x: number[];
  y: number[];
  w: number[] | undefined;
}

/**
 * Doubles in [min, max] whose squares stay normal (|v| < 1e-150 becomes 0): real data never hold
 * 1e-200 next to 1, and products of such values would underflow to 0 or to subnormals.
 */
export function real(min: number, max: number): fc.Arbitrary<number> {
  return fc.double({ min, max, noNaN: true, noDefaultInfinity: true }).map((v) => (Math.abs(v) < 1e-150 ? 0 : v));
}

/**
 * Data sets of `minN` to 40 rows; tied x are integers 0 … `maxTiedX`.
 * @param minN fewest rows (≥ 1). @param maxTiedX largest integer x of the tied variant.
 */
export function dataSets(minN: number, maxTiedX: number): fc.Arbitrary<Data> {
  return fc.integer({ min: minN, max: 40 }).chain((n) =>
    fc.record({
      x: fc.oneof(
        fc.array(fc.integer({ min: 0, max: maxTiedX }), { minLength: n, maxLength: n }),
        fc.array(real(-50, 50), { minLength: n, maxLength: n }),
      ),
      y: fc.oneof(
        fc.array(fc.integer({ min: -5, max: 5 }), { minLength: n, maxLength: n }),
        fc.array(real(-1e3, 1e3), { minLength: n, maxLength: n }),
      ),
      w: fc.option(fc.array(fc.oneof(fc.constant(0), fc.double({ min: 0.01, max: 10, noNaN: true })), { minLength: n, maxLength: n }), {
        nil: undefined,
      }),
    }),
  );
}
