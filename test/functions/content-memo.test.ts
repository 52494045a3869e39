/**
 * The parse memo and the result cache never return a stale result, whatever a caller does with
 * its argument arrays after a call (README.md, "Performance notes"; src/adapter/cells.ts): a cell
 * changed in place, a row appended, a text cell swapped for another, or clearCaches() between
 * calls. Each expected value is the same call computed from scratch (clearCaches, then fresh
 * copies of the arrays), so a cache that returned an earlier result would fail. The property test
 * uses fast-check with a fixed seed.
 */
import { afterEach, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { clearCaches } from '../../src/functions/engine.js';
import { functionByName } from '../../src/functions/registry.js';
import { readVector } from '../../src/adapter/cells.js';
import type { CellArg, CellResult, CellValueIn } from '../../src/functions/types.js';
import { mapError } from '../../src/adapter/errors.js';

const N = 100;
afterEach(() => clearCaches());

function column(values: readonly CellValueIn[]): CellValueIn[][] {
  return values.map((v) => [v]);
}
const copy = (a: CellValueIn[][]): CellValueIn[][] => a.map((r) => r.slice());

/** The result (or mapped error) of `name` on `args`. */
function run(name: string, args: readonly CellArg[], addresses?: readonly (string | undefined)[]): CellResult | { error: string } {
  try {
    return functionByName(name)!.invoke(args, addresses ? { addresses } : undefined);
  } catch (e) {
    return { error: `${mapError(e).code} ${mapError(e).message}` };
  }
}

/** The same call from scratch: empty caches, fresh copies of every array. */
function fresh(name: string, args: readonly CellArg[], addresses?: readonly (string | undefined)[]): CellResult | { error: string } {
  clearCaches();
  return run(name, args.map((a) => (Array.isArray(a) ? copy(a as CellValueIn[][]) : a)), addresses);
}

const xs = column(Array.from({ length: N }, (_, i) => i + 1));
const ysOf = () => column(Array.from({ length: N }, (_, i) => Math.sin(i / 7) + i / 20));

describe('no stale result after a caller mutates its arrays', () => {
  it('PREDICT sees a y cell changed in place in the same array object (was stale with the identity memo)', () => {
    const ys = ysOf();
    const before = run('PREDICT', [50.5, ys, xs, 4]);
    ys[10]![0] = 100;
    const after = run('PREDICT', [50.5, ys, xs, 4]);
    expect(after).toEqual(fresh('PREDICT', [50.5, ys, xs, 4]));
    expect(after).not.toEqual(before);
  });
  it('FIT sees an x cell blanked in place; the blank row comes back empty', () => {
    const ys = ysOf();
    const x = copy(xs);
    run('FIT', [ys, x]);
    x[3]![0] = null;
    const after = run('FIT', [ys, x]) as CellResult[][];
    expect(after[3]).toEqual(['']);
    expect(after).toEqual(fresh('FIT', [ys, x]));
  });
  it('a text cell swapped for another text is seen in the left-out list, not served from the memo', () => {
    const ys: CellValueIn[][] = ysOf();
    ys[5]![0] = 'n/a';
    const a = readVector('known_ys', ys, 'line', { reference: true });
    expect(a.leftOut).toEqual([{ index: 5, value: 'n/a' }]);
    ys[5]![0] = '47.6';
    expect(readVector('known_ys', ys, 'line', { reference: true }).leftOut).toEqual([{ index: 5, value: '47.6' }]);
  });
  it('the same cells read as a reference and given directly are not confused (text left out vs #VALUE!)', () => {
    const ys: CellValueIn[][] = ysOf();
    ys[5]![0] = 'n/a';
    expect(run('STATS', [ys, xs], ['Data!B1:B100', 'Data!A1:A100'])).not.toHaveProperty('error');
    expect(run('STATS', [ys, xs])).toEqual({ error: '#VALUE! known_ys: needs numbers or blanks; cell 6 is the text "n/a".' });
  });
  it('clearCaches() forgets the remembered parses too: the next read builds a new vector', () => {
    const ys = ysOf();
    const a = readVector('known_ys', ys);
    expect(readVector('known_ys', copy(ys))).toBe(a);
    clearCaches();
    expect(readVector('known_ys', ys)).not.toBe(a);
  });
  it('property: after random in-place edits (numbers, blanks, text, rows appended), every function equals its from-scratch result (fixed seed, 300 runs)', () => {
    const edit = fc.record({
      at: fc.nat({ max: N - 1 }),
      arg: fc.constantFrom(0, 1),
      value: fc.oneof(fc.double({ min: -50, max: 50, noNaN: true }), fc.constant(null), fc.constant('n/a'), fc.constant(true), fc.constant(-0)),
    });
    const names = ['FIT', 'PREDICT', 'KNOTS', 'STATS'] as const;
    fc.assert(
      fc.property(fc.array(edit, { minLength: 1, maxLength: 4 }), fc.constantFrom(...names), fc.boolean(), fc.boolean(), (edits, name, reference, grow) => {
        clearCaches();
        const data = [ysOf(), copy(xs)];
        const addresses = reference ? [undefined, 'Data!B1:B200', 'Data!A1:A200'] : undefined;
        const call = (): readonly CellArg[] => (name === 'PREDICT' ? [[[42.5], [7]], data[0], data[1], 3] : [data[0], data[1], 3]);
        const addr = name === 'PREDICT' ? addresses : addresses?.slice(1);
        run(name, call(), addr);
        for (const e of edits) data[e.arg]![e.at]![0] = e.value as CellValueIn;
        if (grow) for (const d of data) d.push([N + 1]);
        const got = run(name, call(), addr);
        expect(got).toEqual(fresh(name, call(), addr));
      }),
      { seed: 1207, numRuns: 300 },
    );
  });
});

describe('a remembered column of numbers only (the one-comparison-per-cell path) misses on any one changed cell', () => {
  // 10,002 rows: not a multiple of four, so the rows after the last block of four are checked too.
  const BIG = 10_002;
  const numbers = (): CellValueIn[][] => column(Array.from({ length: BIG }, (_, i) => 1 + (i % 97) / 8));
  const readAgain = (g: CellValueIn[][], reference = false) => readVector('known_ys', copy(g), 'line', { reference });

  it('the same numbers in fresh arrays are recognised: the remembered vector comes back', () => {
    const g = numbers();
    const a = readVector('known_ys', g);
    expect(readAgain(g)).toBe(a);
  });
  it.each([
    ['the middle row', 5_001],
    ['the first row', 0],
    ['the last row (after the blocks of four)', BIG - 1],
  ])('a number changed in %s is seen', (_, at) => {
    const g = numbers();
    const a = readVector('known_ys', g);
    g[at]![0] = (g[at]![0] as number) + 2 ** -40;
    const b = readAgain(g);
    expect(b).not.toBe(a);
    expect(b.values[at]).toBe((g[at]![0] as number));
  });
  it('a number flipped to text in the middle: #VALUE! given directly, its row left out as a reference', () => {
    const g = numbers();
    readVector('known_ys', g);
    readVector('known_ys', g, 'line', { reference: true });
    g[5_001]![0] = '7';
    expect(() => readAgain(g)).toThrow('known_ys: needs numbers or blanks; cell 5002 is the text "7" (a number stored as text: convert it with VALUE).');
    expect(readAgain(g, true).leftOut).toEqual([{ index: 5_001, value: '7' }]);
  });
  it.each([
    ['null', null],
    ['the empty string', ''],
    ['a logical', true],
  ] as const)('a number replaced by %s in the middle is not taken for the number', (_, value) => {
    const g = numbers();
    const a = readVector('known_ys', g, 'line', { reference: true });
    g[5_001]![0] = value;
    const b = readAgain(g, true);
    expect(b).not.toBe(a);
    expect(b.values[5_001]).toBeNaN();
  });
  it('a number replaced by an error cell in the middle propagates that error', () => {
    const g = numbers();
    readVector('known_ys', g);
    g[5_001]![0] = { kind: 'error', code: '#N/A' } as CellValueIn;
    let caught: unknown;
    try {
      readAgain(g);
    } catch (e) {
      caught = e;
    }
    expect(mapError(caught).code).toBe('#N/A');
  });
  it('a blank changed to 0 is seen (a column with a blank), and so is a 0 changed back to a blank', () => {
    const g = numbers();
    g[5_001]![0] = null;
    const a = readVector('known_ys', g);
    g[5_001]![0] = 0;
    const b = readAgain(g);
    expect(b).not.toBe(a);
    expect(b.values[5_001]).toBe(0);
    expect(b.blanks).toBe(0);
    g[5_001]![0] = null;
    expect(readAgain(g)).toBe(a);
  });
  it('a row that is no longer a one-cell array is not a match: two cells, a bare number, a typed array', () => {
    const g = numbers();
    const a = readVector('known_ys', g);
    const v = g[5_001]![0] as number;
    for (const row of [[v, v], v, Float64Array.of(v)]) {
      const h = copy(g);
      (h as unknown[])[5_001] = row;
      expect(() => readVector('known_ys', h)).toThrow('known_ys: needs a rectangular range.');
    }
    expect(readAgain(g)).toBe(a);
  });
  it('PREDICT over 10,002 rows with fresh copies: one changed y in the middle gives the from-scratch answer', () => {
    const ys = numbers();
    const xs2 = column(Array.from({ length: BIG }, (_, i) => i));
    const call = (): readonly CellArg[] => [[[5_001]], copy(ys), copy(xs2), 0];
    const before = run('PREDICT', call());
    expect(run('PREDICT', call())).toEqual(before);
    ys[5_001]![0] = 1e6;
    const after = run('PREDICT', call());
    expect(after).not.toEqual(before);
    expect(after).toEqual(fresh('PREDICT', call()));
  });
});
