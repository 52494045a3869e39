/**
 * The worksheet functions under extreme scales: heavy rows and tiny numbers inside the documented
 * range give the exact fit, and a knot fit the normal equations cannot determine to 1e-9 gives
 * #NUM! with a message — never a silent wrong number.
 *
 * Reference values: test/reference/fixtures/scale.json (test/reference/gen_scale.py, exact rational
 * arithmetic with Python's fractions module; command `/usr/bin/python3 test/reference/gen_scale.py`).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { cell, col } from './helpers.js';

interface ScaleCase {
  name: string;
  x: number[];
  y: number[];
  w: number[];
  fitted: number[];
}
const cases = (
  JSON.parse(readFileSync(new URL('../reference/fixtures/scale.json', import.meta.url), 'utf8')) as { cases: ScaleCase[] }
).cases;
const named = (name: string): ScaleCase => cases.find((c) => c.name === name)!;

function column(result: unknown): number[] {
  return (result as number[][]).map((r) => r[0]!);
}

describe('RATCHET.FIT with extreme weights and scales', () => {
  it('=RATCHET.FIT(y, x, 3, , w) with weights 1e13, 1, 1, 1, 1, 1 spills the exact optimum (10, 11.7846, …), not 10 in every row', () => {
    const c = named('first row weight 1e13');
    const out = column(cell('FIT', col(...c.y), col(...c.x), 3, null, col(...c.w)));
    expect(out).toBeAllCloseRel(c.fitted, 1e-9, 0);
    expect(out[5]).toBeCloseRel(20.1538, 1e-5);
  });

  it('y × 1e-100 with all weights 1e-250: the unscaled fit × 1e-100, not 0 in every row', () => {
    const c = named('y times 1e-100, all weights 1e-250');
    const out = column(cell('FIT', col(...c.y), col(...c.x), 3, null, col(...c.w)));
    expect(out).toBeAllCloseRel(c.fitted, 1e-9, 0);
  });

  it('a row 1e15 times heavier strictly between two knots: #NUM! naming knots and what to change', () => {
    const c = named('third row weight 1e15');
    const out = cell('FIT', col(...c.y), col(...c.x), 3, null, col(...c.w)) as { error: { code: string; message: string } };
    expect(out.error.code).toBe('#NUM!');
    expect(out.error.message).toMatch(/^knots: needs normal equations that determine every knot value to 1e-9; .*less extreme weights\.$/);
  });
});
