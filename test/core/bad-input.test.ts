/**
 * Bad input (README.md, "Errors"; DEVELOPERS.md, "Conventions"): every row is a typed RatchetError whose code AND full message
 * are checked. Message shape (src/core/errors.ts): "<argument>: <what it needs>[; <what it got>]."
 * A fuzz test then feeds arbitrary values and checks that nothing untyped is thrown and no NaN or
 * ±Infinity comes back silently.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { RatchetError, fitMonotone, invertAt, knotRegression, predict, quantileKnots, type ModelOptions } from '../../src/core/index.js';
import { isotonicRegression } from '../../src/core/isotonic.js';
import { type ErrorCode } from '../../src/core/errors.js';

fc.configureGlobal({ seed: Number(process.env.FC_SEED ?? 20240602), numRuns: Number(process.env.FC_RUNS ?? 400) });

/** Runs `call` and returns the RatchetError it throws (fails the test if it returns or throws anything else). */
function ratchetError(call: () => unknown): RatchetError {
  let result: unknown;
  try {
    result = call();
  } catch (e) {
    if (e instanceof RatchetError) return e;
    throw new Error(`expected a RatchetError, got ${String(e)}`, { cause: e });
  }
  throw new Error(`expected a RatchetError, got a result: ${JSON.stringify(result)?.slice(0, 120)}`);
}

interface Row {
  name: string;
  call: () => unknown;
  code: ErrorCode;
  message: string;
}

const x3 = [1, 2, 3];
const y3 = [1, 3, 2];

const table: Row[] = [
  // Empty input
  { name: 'empty input (classic)', call: () => fitMonotone([], []), code: 'EMPTY_INPUT', message: 'x: needs at least one value; got none.' },
  { name: 'empty input (knot model)', call: () => fitMonotone([], [], { knots: 3 }), code: 'EMPTY_INPUT', message: 'x: needs at least one value; got none.' },
  { name: 'empty input (isotonicRegression)', call: () => isotonicRegression([], []), code: 'EMPTY_INPUT', message: 'x: needs at least one value; got none.' },
  // A single point
  { name: 'a single point (classic)', call: () => fitMonotone([1], [2]), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values with positive weight; got 1.' },
  { name: 'a single point (knot model)', call: () => fitMonotone([1], [2], { knots: 2 }), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values with positive weight; got 1.' },
  // All x equal
  { name: 'all x equal (classic)', call: () => fitMonotone([3, 3, 3], x3), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values with positive weight; got 1.' },
  { name: 'all x equal (knot model)', call: () => knotRegression([3, 3, 3], x3, { knots: 4 }), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values with positive weight; got 1.' },
  { name: 'only one x keeps a positive weight', call: () => fitMonotone(x3, y3, { weights: [0, 1, 0] }), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values with positive weight; got 1.' },
  { name: 'an x range too narrow for K distinct knots', call: () => fitMonotone([1, 1 + 2 ** -52], [0, 1], { knots: 7 }), code: 'BAD_KNOTS', message: 'knots: needs an x range wide enough for 7 distinct knot positions; [1, 1.0000000000000002] is too narrow.' },
  // NaN / ±Infinity
  { name: 'NaN in x', call: () => fitMonotone([1, NaN, 3], y3), code: 'NON_FINITE', message: 'x: needs finite numbers; entry 2 is NaN.' },
  { name: '+Infinity in y', call: () => fitMonotone(x3, [1, Infinity, 3]), code: 'NON_FINITE', message: 'y: needs finite numbers; entry 2 is Infinity.' },
  { name: '−Infinity in y (knot model)', call: () => fitMonotone(x3, [1, 2, -Infinity], { knots: 2 }), code: 'NON_FINITE', message: 'y: needs finite numbers; entry 3 is -Infinity.' },
  { name: 'NaN in a Float64Array x (knot model, checked in place)', call: () => knotRegression(Float64Array.from([1, NaN, 3]), Float64Array.from(y3), { knots: 2 }), code: 'NON_FINITE', message: 'x: needs finite numbers; entry 2 is NaN.' },
  { name: 'NaN in a Float64Array y (knot model, checked in place)', call: () => knotRegression(Float64Array.from(x3), Float64Array.from([NaN, 2, 3]), { knots: 2 }), code: 'NON_FINITE', message: 'y: needs finite numbers; entry 1 is NaN.' },
  { name: 'a non-number in x', call: () => fitMonotone(['a', 2, 3] as unknown as number[], y3), code: 'NON_FINITE', message: 'x: needs finite numbers; entry 1 is string.' },
  { name: 'NaN in explicit knots', call: () => fitMonotone(x3, y3, { knots: [0, NaN, 4] }), code: 'NON_FINITE', message: 'knots: needs finite numbers; entry 2 is NaN.' },
  { name: 'NaN new x in predict', call: () => predict(fitMonotone(x3, y3), [0, NaN]), code: 'NON_FINITE', message: 'new_x: needs finite numbers; entry 2 is NaN.' },
  // Mismatched lengths
  { name: 'y shorter than x', call: () => fitMonotone(x3, [1, 2]), code: 'LENGTH_MISMATCH', message: 'y: needs one value per entry of x (3); got 2.' },
  { name: 'weights shorter than y', call: () => fitMonotone(x3, y3, { weights: [1, 1] }), code: 'LENGTH_MISMATCH', message: 'weights: needs one value per entry of y (3); got 2.' },
  // K < 2 or fractional
  { name: 'K = 1', call: () => fitMonotone(x3, y3, { knots: 1 }), code: 'BAD_KNOTS', message: 'knots: needs a whole number of knots ≥ 2; got 1.' },
  { name: 'K = −3', call: () => fitMonotone(x3, y3, { knots: -3 }), code: 'BAD_KNOTS', message: 'knots: needs a whole number of knots ≥ 2; got -3.' },
  { name: 'K = 2.5', call: () => fitMonotone(x3, y3, { knots: 2.5 }), code: 'BAD_KNOTS', message: 'knots: needs a whole number of knots ≥ 2; got 2.5.' },
  { name: 'K = NaN', call: () => knotRegression(x3, y3, { knots: NaN }), code: 'BAD_KNOTS', message: 'knots: needs a whole number of knots ≥ 2; got NaN.' },
  { name: 'K above the limit', call: () => fitMonotone(x3, y3, { knots: 100001 }), code: 'BAD_KNOTS', message: 'knots: needs at most 100000 knots; got 100001.' },
  { name: 'no knots option for knotRegression', call: () => knotRegression(x3, y3, {} as never), code: 'BAD_KNOTS', message: 'knots: needs a knot count or a list of knot positions.' },
  { name: 'quantile knots with a fractional count', call: () => quantileKnots(x3, 1.5), code: 'BAD_KNOTS', message: 'count: needs a whole number of knots ≥ 2; got 1.5.' },
  { name: 'quantile knots of a constant x', call: () => quantileKnots([4, 4, 4], 3), code: 'TOO_FEW_POINTS', message: 'x: needs at least 2 distinct values to place quantile knots.' },
  // Non-increasing explicit knots
  { name: 'repeated explicit knot', call: () => fitMonotone(x3, y3, { knots: [0, 2, 2, 4] }), code: 'BAD_KNOTS', message: 'knots: needs strictly increasing positions; position 3 (2) is not above 2.' },
  { name: 'decreasing explicit knots', call: () => fitMonotone(x3, y3, { knots: [3, 1] }), code: 'BAD_KNOTS', message: 'knots: needs strictly increasing positions; position 2 (1) is not above 3.' },
  { name: 'a single explicit knot', call: () => fitMonotone(x3, y3, { knots: [1] }), code: 'BAD_KNOTS', message: 'knots: needs at least 2 knot positions; got 1.' },
  // Bounds
  { name: 'lower > upper', call: () => fitMonotone(x3, y3, { lower: 5, upper: 1 }), code: 'BAD_BOUNDS', message: 'lower: needs to be ≤ upper (1); got 5.' },
  { name: 'lower > upper (knot model)', call: () => fitMonotone(x3, y3, { knots: 2, lower: 5, upper: 1 }), code: 'BAD_BOUNDS', message: 'lower: needs to be ≤ upper (1); got 5.' },
  { name: 'lower NaN', call: () => fitMonotone(x3, y3, { lower: NaN }), code: 'BAD_BOUNDS', message: 'lower: needs a number below +Infinity; got NaN.' },
  { name: 'upper −Infinity', call: () => fitMonotone(x3, y3, { upper: -Infinity }), code: 'BAD_BOUNDS', message: 'upper: needs a number above -Infinity; got -Infinity.' },
  // Weights
  { name: 'a negative weight', call: () => fitMonotone(x3, y3, { weights: [1, -1, 1] }), code: 'BAD_WEIGHT', message: 'weights: needs finite numbers ≥ 0; entry 2 is -1.' },
  { name: 'a NaN weight', call: () => fitMonotone(x3, y3, { weights: [1, NaN, 1] }), code: 'BAD_WEIGHT', message: 'weights: needs finite numbers ≥ 0; entry 2 is NaN.' },
  { name: 'an infinite weight', call: () => fitMonotone(x3, y3, { knots: 2, weights: [1, Infinity, 1] }), code: 'BAD_WEIGHT', message: 'weights: needs finite numbers ≥ 0; entry 2 is Infinity.' },
  { name: 'all weights zero', call: () => fitMonotone(x3, y3, { weights: [0, 0, 0] }), code: 'BAD_WEIGHT', message: 'weights: needs at least one positive weight; all are 0.' },
  // Direction
  { name: 'bad direction', call: () => fitMonotone(x3, y3, { direction: 'sideways' as never }), code: 'BAD_OPTION', message: "direction: needs 'up', 'down' or 'auto'; got sideways." },
  { name: 'bad direction (knot model)', call: () => fitMonotone(x3, y3, { knots: 3, direction: 'rising' as never }), code: 'BAD_OPTION', message: "direction: needs 'up', 'down' or 'auto'; got rising." },
  { name: 'x not a list', call: () => fitMonotone(null as never, y3), code: 'BAD_OPTION', message: 'x: needs a list of numbers.' },
  // Inverse
  { name: 'NOT_REACHABLE above the curve', call: () => invertAt([0, 1, 2], [0, 1, 2], 5), code: 'NOT_REACHABLE', message: "target: 5 is outside the curve's range [0, 2]." },
  { name: 'NOT_REACHABLE below a falling curve', call: () => invertAt([0, 1, 2], [2, 1, 0], -1), code: 'NOT_REACHABLE', message: "target: -1 is outside the curve's range [0, 2]." },
  { name: 'non-monotone knot table in invert', call: () => invertAt([0, 1, 2], [0, 2, 1], 1), code: 'BAD_KNOTS', message: 'knot_table: needs monotone values (all rising or all falling) to read back x.' },
  { name: 'knot table positions not increasing', call: () => invertAt([0, 2, 1], [0, 1, 2], 1), code: 'BAD_KNOTS', message: 'knot_table: needs strictly increasing positions; position 3 (1) is not above 2.' },
  { name: 'knot table of one knot', call: () => invertAt([0], [0], 0), code: 'BAD_KNOTS', message: 'knot_table: needs at least 2 knots to read back x.' },
  { name: 'knot table lengths differ', call: () => invertAt([0, 1, 2], [0, 1], 0.5), code: 'LENGTH_MISMATCH', message: 'knot_table values: needs one value per entry of knot_table positions (3); got 2.' },
  { name: 'NaN target', call: () => invertAt([0, 1, 2], [0, 1, 2], NaN), code: 'NON_FINITE', message: 'target: needs a finite number; got NaN.' },
  { name: 'bad tie rule', call: () => invertAt([0, 1, 2], [0, 1, 2], 1, 'mid' as never), code: 'BAD_OPTION', message: "tie: needs 'lowest', 'middle' or 'highest'; got mid." },
];

describe('bad input: each is a typed RatchetError with a stable code and an exact message', () => {
  for (const row of table) {
    it(`${row.name} → ${row.code}`, () => {
      const e = ratchetError(row.call);
      expect(e.code).toBe(row.code);
      expect(e.message).toBe(row.message);
      expect(e.name).toBe('RatchetError');
      // The message names the argument the error carries.
      expect(e.message.startsWith(`${e.argument}:`)).toBe(true);
    });
  }
});

describe('bad input: arbitrary values never escape as untyped errors or silent NaN', () => {
  const anyNumber = fc.oneof(
    fc.double(),
    fc.constantFrom(NaN, Infinity, -Infinity, 0, -0, 1, 1e308, -1e308, 5e-324),
    fc.integer({ min: -3, max: 3 }),
  );
  const anyValue = fc.oneof({ weight: 8, arbitrary: anyNumber }, { weight: 1, arbitrary: fc.constantFrom<unknown>(null, undefined, 'x', true, {}) });
  const optionsArb = fc.record(
    {
      knots: fc.oneof(fc.constant(undefined), anyNumber, fc.array(anyNumber, { maxLength: 6 })),
      weights: fc.oneof(fc.constant(undefined), fc.array(anyNumber, { maxLength: 12 })),
      direction: fc.constantFrom<unknown>('up', 'down', 'auto', undefined, 'left'),
      lower: fc.oneof(fc.constant(undefined), anyNumber),
      upper: fc.oneof(fc.constant(undefined), anyNumber),
    },
    { requiredKeys: [] },
  );

  it('fitMonotone returns finite numbers or throws a RatchetError', () => {
    fc.assert(
      fc.property(fc.array(anyValue, { maxLength: 12 }), fc.array(anyValue, { maxLength: 12 }), optionsArb, (x, y, options) => {
        let model;
        try {
          model = fitMonotone(x as number[], y as number[], options as ModelOptions);
        } catch (e) {
          expect(e).toBeInstanceOf(RatchetError);
          return;
        }
        for (const v of [...model.fitted, ...model.knotX, ...model.knotY, model.stats.sse, model.stats.rmse, model.stats.mae, model.stats.r2]) {
          expect(Number.isNaN(v)).toBe(false);
        }
        for (const v of [...model.fitted, ...model.knotX, ...model.knotY]) expect(Number.isFinite(v)).toBe(true);
      }),
    );
  });

  it('invertAt returns a finite x inside the table or throws a RatchetError', () => {
    fc.assert(
      fc.property(fc.array(anyNumber, { maxLength: 6 }), fc.array(anyNumber, { maxLength: 6 }), anyNumber, fc.constantFrom<unknown>('lowest', 'middle', 'highest', 'other'), (tx, ty, target, tie) => {
        let xr: number;
        try {
          xr = invertAt(tx, ty, target, tie as 'middle');
        } catch (e) {
          expect(e).toBeInstanceOf(RatchetError);
          return;
        }
        expect(Number.isFinite(xr)).toBe(true);
        expect(xr).toBeGreaterThanOrEqual(tx[0]!);
        expect(xr).toBeLessThanOrEqual(tx[tx.length - 1]!);
      }),
    );
  });
});
