/**
 * The worksheet-function machinery (src/functions/define.ts): arguments read by name, parsing by
 * kind, the one row pairing, messages derived from the parameter specs, renaming of core argument
 * names, the arity bound and the finiteness guard. The expected messages follow the one message
 * shape of DEVELOPERS.md, "Conventions" (common practice: the argument named, then what it needs).
 */
import { describe, expect, it } from 'vitest';
import { defineFunction, positionsOf, signatureOf } from '../../src/functions/define.js';
import { PARAMS as P } from '../../src/functions/params.js';
import { SHEET_FUNCTIONS } from '../../src/functions/registry.js';
import { fail } from '../../src/core/index.js';
import { mapError } from '../../src/adapter/errors.js';

const col = (...v: (number | null)[]) => v.map((x) => [x]);

/** A three-input function built only from the machinery: the sum of its paired rows, per column. */
const SUMS = defineFunction({
  name: 'SUMS',
  description: 'Column sums of the paired rows (a test function).',
  params: [P.surfaceYs, P.knownX1s, P.knownX2s, P.direction1, P.weights],
  returnsArray: true,
  run(a) {
    const data = a.rows(['known_ys', 'known_x1s', 'known_x2s'], 'weights');
    const dir = a.choice<string>('direction1');
    const p = data.columns.map((c) => c.vector.values);
    const used: number[] = [];
    for (let i = 0; i < p[0]!.length; i++) if (p.every((v) => v[i] === v[i])) used.push(i);
    return [[dir, ...p.map((v) => used.reduce((s, i) => s + v[i]!, 0))]];
  },
});

describe('defineFunction', () => {
  it('reads arguments by name in the order users type them, with choice defaults from the spec', () => {
    expect(SUMS.invoke([col(1, 2, null), col(10, 20, 30), col(100, null, 300)])).toEqual([['up', 1, 10, 100]]);
    expect(SUMS.invoke([col(1, 2), col(10, 20), col(100, 200), -1])).toEqual([['down', 3, 30, 300]]);
  });

  it('builds the choice message from the spec: codes and labels in order', () => {
    expect(mapError(catchOf(() => SUMS.invoke([col(1, 2), col(1, 2), col(1, 2), 7])))).toEqual({
      code: '#VALUE!',
      message: 'direction1: needs 1 (rising), -1 (falling), 0 (pick from the data) or 2 (no constraint); got 7.',
    });
  });

  it('refuses more arguments than parameters instead of ignoring them', () => {
    expect(mapError(catchOf(() => SUMS.invoke([col(1, 2), col(1, 2), col(1, 2), 1, col(1, 1), 9])))).toEqual({
      code: '#VALUE!',
      message: 'RATCHET.SUMS: takes at most 5 arguments; got 6.',
    });
  });

  it('renames core argument names to the parameter names given by coreName', () => {
    const f = defineFunction({
      name: 'RENAMED',
      description: 'Throws a core error about x1 (a test function).',
      params: [P.knownX1s],
      returnsArray: false,
      run: () => fail('NON_FINITE', 'x1', 'needs finite numbers'),
    });
    expect(mapError(catchOf(() => f.invoke([col(1)])))).toEqual({ code: '#VALUE!', message: 'known_x1s: needs finite numbers.' });
  });

  it('turns a non-finite number in a result into a NUMERICAL error (#NUM!), never a wrong number', () => {
    const f = defineFunction({ name: 'BAD', description: 'Returns NaN (a test function).', params: [P.count], returnsArray: false, run: () => NaN });
    expect(mapError(catchOf(() => f.invoke([2])))).toEqual({ code: '#NUM!', message: 'BAD: produced a non-finite number (a numerical failure).' });
  });

  it('rejects malformed specs when they are defined', () => {
    const base = { name: 'X', description: 'A malformed spec (a test function).', returnsArray: false, run: () => 0 };
    expect(() => defineFunction({ ...base, params: [P.count, P.count] })).toThrow(/declared twice/);
    expect(() => defineFunction({ ...base, params: [P.folds, P.count] })).toThrow(/after an optional one/);
    expect(() => defineFunction({ ...base, params: [{ name: 'c', kind: 'choice', optional: true, description: 'no choices' }] })).toThrow(/choice/);
  });

  it('a reader of another kind than the parameter declares is a programming error', () => {
    const f = defineFunction({ name: 'WRONG', description: 'Reads a number as knots (a test function).', params: [P.count], returnsArray: false, run: (a) => Number(a.knots('count')) });
    expect(() => f.invoke([2])).toThrow('no knots parameter count');
  });

  it('positionsOf gives each parameter its position, so Args.raw is read by name', () => {
    const params = [P.newXs, P.knownYs, P.knownXs, P.knots] as const;
    const at = positionsOf(params);
    expect(at).toEqual({ new_xs: 0, known_ys: 1, known_xs: 2, knots: 3 });
    const f = defineFunction({ name: 'RAW', description: 'Returns its knots argument (a test function).', params, returnsArray: false, run: (a) => a.raw[at.knots] as number });
    expect(f.invoke([1, col(1), col(1), 7])).toBe(7);
  });

  it('signatureOf writes optional parameters in brackets', () => {
    expect(signatureOf(SUMS)).toBe('RATCHET.SUMS(known_ys, known_x1s, known_x2s, [direction1], [weights])');
    expect(SHEET_FUNCTIONS.map((f) => f.name)).toEqual(['FIT', 'PREDICT', 'KNOTS', 'EVAL', 'INVERT', 'QKNOTS', 'CV', 'BESTK', 'STATS', 'BAND', 'INVERTBAND', 'SURFACE', 'GRID', 'CVGRID']);
  });
});

function catchOf(f: () => unknown): unknown {
  try {
    f();
  } catch (e) {
    return e;
  }
  throw new Error('expected a throw');
}
