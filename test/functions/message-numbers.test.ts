/**
 * Messages round numbers to 6 significant digits (README, "Errors"): the core states ranges and
 * values at full precision, the one error mapping (src/adapter/errors.ts) rounds them for cells.
 */
import { describe, expect, it } from 'vitest';
import { mapError, roundNumbersIn } from '../../src/adapter/errors.js';
import { functionByName } from '../../src/functions/registry.js';

describe('numbers in messages', () => {
  it('rounds long numbers to 6 significant digits and leaves short ones and quoted cell text alone', () => {
    expect(roundNumbersIn('target_ys: needs a value in [27.693950453842106, 149.79140378405756].')).toBe('target_ys: needs a value in [27.694, 149.791].');
    expect(roundNumbersIn('knots: needs at most 200; got 2.5 and 1e-7.')).toBe('knots: needs at most 200; got 2.5 and 1e-7.');
    expect(roundNumbersIn('cell 4 is the text "47.612345678"; 0.33333333333 too')).toBe('cell 4 is the text "47.612345678"; 0.333333 too');
    expect(roundNumbersIn('-1.2345678901e-200')).toBe('-1.23457e-200');
  });
  it('a read-back target outside the curve names its range with at most 6 significant digits', () => {
    // Invented knot table: x = 1, 2, 4 with values x/3, a curve whose range is [1/3, 4/3].
    const invert = functionByName('INVERT')!;
    let caught: unknown;
    try {
      invert.invoke([10, [[1, 1 / 3], [2, 2 / 3], [4, 4 / 3]]]);
    } catch (e) {
      caught = e;
    }
    const mapped = mapError(caught);
    expect(mapped.code).toBe('#N/A');
    expect(mapped.message).toContain('0.333333');
    expect(mapped.message).not.toMatch(/\d\.\d{7,}/);
  });
});
