/**
 * The pane's defaults and input guards (taskpane/guards.ts) and the digits rule of what it shows
 * (src/view/number-format.ts). Expected numbers come from JavaScript's own Number.prototype.
 * toPrecision (ECMA-262, "Number.prototype.toPrecision": round to n significant digits), checked
 * on random doubles with fast-check (fixed seed); the sample headers from scripts/samples/samples.ts.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { columnConflict, defaultY, knotCountWarning, readKnotField } from '../../taskpane/guards.js';
import { DIGIT_CHOICES, formatNumber } from '../../src/view/number-format.js';
import { buildSamples } from '../../scripts/samples/samples.js';
import { SAMPLES } from '../../taskpane/preview-mode.js';

const col = (name: string, numbers = 10) => ({ name, numbers });

describe('defaultY: the column y starts on', () => {
  it('coating-cure with x2 chosen: y is the named y (hardness), not the second column', () => {
    const cols = [col('oven temp °C'), col('dwell min'), col('hardness')];
    expect(defaultY(cols, 0, undefined, 'hardness')).toBe(2);
    expect(defaultY(cols, 0, 1, 'hardness')).toBe(2);
    // without a name: the first numeric column that is neither x nor x2
    expect(defaultY(cols, 0, 1)).toBe(2);
    expect(defaultY(cols, 0)).toBe(1);
  });

  it('skips columns without numbers and a named y that is x or x2', () => {
    expect(defaultY([col('x'), col('note', 0), col('y')], 0)).toBe(2);
    expect(defaultY([col('x'), col('y'), col('z')], 1, 2, 'y')).toBe(0);
    expect(defaultY([col('only')], 0)).toBe(0);
  });

  it('every bundled sample names a y header its workbook has, and it is not the x column', () => {
    const built = buildSamples();
    for (const s of SAMPLES) {
      const b = built.find((q) => q.file === s.file)!;
      expect(Object.values(b.headers)).toContain(s.y);
      expect(b.headers.A).not.toBe(s.y);
    }
  });
});

describe('columnConflict: refused column choices', () => {
  const names = ['weeks', 'tack', 'batch'];
  it('refuses x = y, x2 = x and x2 = y with a message naming the column', () => {
    expect(columnConflict(0, 0, undefined, names)).toBe('The y column cannot be the x column (both are "weeks"): choose another y.');
    expect(columnConflict(0, 1, 0, names)).toBe('The second input cannot be the x column (both are "weeks"): choose another x2, or none.');
    expect(columnConflict(0, 1, 1, names)).toBe('The second input cannot be the y column (both are "tack"): choose another x2, or none.');
  });
  it('accepts three different columns, or two without x2', () => {
    expect(columnConflict(0, 1, 2, names)).toBeUndefined();
    expect(columnConflict(2, 1, undefined, names)).toBeUndefined();
  });
});

describe('readKnotField: what the knot-count fields accept', () => {
  it('reads blank as 0 and takes 0 and whole numbers ≥ 2', () => {
    expect([readKnotField(''), readKnotField(' 0 '), readKnotField('2'), readKnotField('40')]).toEqual([
      { ok: true, knots: 0 },
      { ok: true, knots: 0 },
      { ok: true, knots: 2 },
      { ok: true, knots: 40 },
    ]);
  });
  it('explains 1, 2.5, text and negative numbers, and never offers a range of knot positions', () => {
    const msgs = ['1', '2.5', 'five', '-3', '1e9'].map((t) => {
      const r = readKnotField(t);
      if (r.ok) throw new Error(`${t} accepted`);
      return r.message;
    });
    expect(msgs).toEqual([
      'Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2; 1 knot would make the curve one flat value — use 0 for the classic fit or 2 or more knots.',
      'Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2; 2.5 is not a whole number.',
      'Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2; got "five".',
      'Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2; got "-3".',
      'Knot count: needs 0 (classic fit) or a whole number of knots ≥ 2 up to 100000; got 1e9.',
    ]);
    for (const m of msgs) expect(m).not.toContain('range of knot positions');
    const r = readKnotField('1', 'Knots along x2');
    expect(r.ok ? '' : r.message.startsWith('Knots along x2: needs')).toBe(true);
  });
});

describe('knotCountWarning', () => {
  it('warns with both numbers when the count exceeds the distinct x (500 on 39), and not at or below it', () => {
    expect(knotCountWarning(500, 39)).toBe('Knot count 500 is more than the 39 distinct x values of the rows used: at most 39 knots can each sit on data.');
    expect(knotCountWarning(39, 39)).toBeUndefined();
    expect(knotCountWarning(0, 3)).toBeUndefined();
  });
});

describe('formatNumber: the digits rule', () => {
  it('shows 4 significant digits by default (the values of the pane and demo examples)', () => {
    expect([0.89305718, 3.1361271, 0.50923226, 28.679391, 12345, 1234.5, -0.0001234567, 0, -0, 1e21].map((v) => formatNumber(v))).toEqual([
      '0.8931', '3.136', '0.5092', '28.68', '12350', '1235', '-0.0001235', '0', '0', '1e+21',
    ]);
    expect(formatNumber('rising (1)')).toBe('rising (1)');
    expect(formatNumber(Number.NaN)).toBe('NaN');
  });

  it('equals the shortest form of toPrecision(d) for every digits choice (fast-check, seed 15, 2,000 doubles)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom(...DIGIT_CHOICES), (v, d) => {
        const s = formatNumber(v, d);
        expect(Number(s)).toBe(v === 0 ? 0 : Number(v.toPrecision(d)));
        // never more significant digits than asked for
        const digits = s.replace(/e.*$/, '').replace(/[-.]/g, '').replace(/^0+/, '').replace(/0+$/, '');
        expect(digits.length).toBeLessThanOrEqual(d);
      }),
      { seed: 15, numRuns: 2000 },
    );
  });

  it('full precision at 17 digits: the shown text reads back as the same double', () => {
    for (const v of [Math.PI, 0.1 + 0.2, 1 / 3, 123456.789e-9]) expect(Number(formatNumber(v, 17))).toBe(v);
  });

  it('refuses digits outside 1 … 17', () => {
    expect(() => formatNumber(1, 0)).toThrow('digits: needs a whole number from 1 to 17; got 0');
    expect(() => formatNumber(1, 2.5)).toThrow('digits: needs a whole number from 1 to 17; got 2.5');
  });
});
