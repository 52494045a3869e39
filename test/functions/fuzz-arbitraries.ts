/**
 * Shared generators and checks of the fuzz tests (fuzz-*.test.ts; fixed seeds, another run with
 * RATCHET_FUZZ_SEED=N): 10,000 random argument grids per function (mixed types, NaN, ±Infinity, huge and tiny
 * magnitudes, subnormals, −0, blanks, text, numbers as text, logicals, error cells, empty and
 * ragged ranges, omitted arguments). Every call must give a value or an error the one mapping turns
 * into a cell error — never an uncaught exception, never a non-finite number in a result, and never
 * #NUM! (a numerical failure, which must not happen). Shapes of results follow the documented rules.
 */
import { expect, it } from 'vitest';
import fc from 'fast-check';
import { SHEET_FUNCTIONS } from '../../src/functions/registry.js';
import { InputCellError, isExpectedError, mapError } from '../../src/adapter/errors.js';
import { clearCaches } from '../../src/functions/engine.js';
import { STATS_LABELS } from '../../src/functions/implementations.js';
import type { CellArg, CellResult, CellValueIn } from '../../src/functions/types.js';

const RUNS = 10_000;
const errorCell = fc.constantFrom('#DIV/0!', '#N/A', '#NUM!', '#REF!', '#NAME?', '#VALUE!', '#NULL!', '#SPILL!').map((code) => ({ kind: 'error' as const, code }));

/** Magnitude classes: a grid draws its numbers mostly from one class, so tiny or huge data sets occur whole. */
const magnitude = fc.constantFrom(1, 1e-3, 1e6, 1e-300, 1e-310, 1e100, 1e150, 1e300);
/** Magnitudes inside the accepted range (so clean data reach the solvers), extremes included. */
const cleanMagnitude = fc.constantFrom(1, 1, 1e-3, 1e6, 1e-280, 1e-299, 1e90, 1e99);

function numberIn(scale: number, wild = true): fc.Arbitrary<number> {
  return fc.oneof(
    { weight: 6, arbitrary: fc.integer({ min: -20, max: 20 }).map((k) => k * scale) },
    { weight: 3, arbitrary: fc.double({ min: -1, max: 1, noNaN: true }).map((u) => u * scale) },
    {
      weight: 1,
      arbitrary: wild ? fc.constantFrom(0, -0, 5e-324, -5e-324, Number.MAX_VALUE, -Number.MIN_VALUE, 1e100, -1e100) : fc.constantFrom(0, -0, 1e100, -1e100, 1e-300),
    },
  );
}

function cellIn(scale: number): fc.Arbitrary<CellValueIn> {
  return fc.oneof(
    { weight: 30, arbitrary: numberIn(scale) },
    { weight: 2, arbitrary: fc.constantFrom<CellValueIn>(null, '') },
    { weight: 1, arbitrary: fc.constantFrom<CellValueIn>(NaN, Infinity, -Infinity) },
    { weight: 1, arbitrary: fc.constantFrom<CellValueIn>('abc', ' 3 ', '1e3', 'TRUE', '-', '0x10') },
    { weight: 1, arbitrary: fc.boolean() },
    { weight: 1, arbitrary: errorCell },
  );
}

/** A grid: mostly columns, sometimes rows, blocks, ragged rows, empty, a bare scalar or omitted. */
const grid: fc.Arbitrary<CellArg> = magnitude.chain((scale) =>
  fc.oneof(
    { weight: 10, arbitrary: fc.array(cellIn(scale), { minLength: 0, maxLength: 12 }).map((v) => v.map((c) => [c])) },
    { weight: 3, arbitrary: fc.array(cellIn(scale), { minLength: 1, maxLength: 12 }).map((v) => [v]) },
    { weight: 2, arbitrary: fc.array(fc.array(cellIn(scale), { minLength: 2, maxLength: 2 }), { minLength: 0, maxLength: 8 }) },
    { weight: 1, arbitrary: fc.array(fc.array(cellIn(scale), { minLength: 0, maxLength: 3 }), { minLength: 1, maxLength: 4 }) },
    { weight: 2, arbitrary: cellIn(scale) as fc.Arbitrary<CellArg> },
    { weight: 1, arbitrary: fc.constant<CellArg>(undefined) },
  ),
);

/** Scalar options: usually small whole numbers (valid or near-valid), else anything. */
const option: fc.Arbitrary<CellArg> = fc.oneof(
  { weight: 6, arbitrary: fc.integer({ min: -2, max: 12 }) as fc.Arbitrary<CellArg> },
  { weight: 3, arbitrary: fc.constant<CellArg>(undefined) },
  { weight: 1, arbitrary: fc.constant<CellArg>(null) },
  { weight: 2, arbitrary: cellIn(1) as fc.Arbitrary<CellArg> },
  { weight: 1, arbitrary: grid },
);

/** Mostly clean numeric cells (occasional blanks), so fits get past the argument checks often. */
function cleanIn(scale: number): fc.Arbitrary<CellValueIn> {
  return fc.oneof({ weight: 40, arbitrary: numberIn(scale, false) }, { weight: 2, arbitrary: fc.constantFrom<CellValueIn>(null, '') }, { weight: 1, arbitrary: cellIn(scale) });
}

/** A data pair sharing one length, each with its own magnitude. */
const pair = fc.tuple(cleanMagnitude, cleanMagnitude, magnitude, fc.integer({ min: 0, max: 12 }), fc.boolean()).chain(([cx, cy, wild, n, clean]) => {
  const sx = clean ? cx : wild;
  const sy = clean ? cy : wild;
  const c = clean ? cleanIn : cellIn;
  return fc.tuple(fc.array(c(sy), { minLength: n, maxLength: n }), fc.array(c(sx), { minLength: n, maxLength: n })).map(([y, x]) => [y.map((v) => [v]), x.map((v) => [v])] as CellArg[]);
});

/** Options that are valid for most parameters, or omitted. */
const validOption: fc.Arbitrary<CellArg> = fc.oneof(
  { weight: 4, arbitrary: fc.constant<CellArg>(undefined) },
  { weight: 2, arbitrary: fc.constantFrom<CellArg>(0, 1, -1, 2, 3, 5) },
  { weight: 1, arbitrary: fc.constant<CellArg>(null) },
);

function argsFor(name: string, count: number): fc.Arbitrary<CellArg[]> {
  const wildArgs = fc.array(fc.oneof(grid, option), { minLength: count, maxLength: count });
  const validArgs = fc.array(validOption, { minLength: count, maxLength: count });
  const base = fc.oneof(wildArgs, validArgs);
  const withData = (offset: number, rest: fc.Arbitrary<CellArg[]>) =>
    fc.tuple(pair, rest).map(([[y, x], r]) => {
      const a = r.slice();
      a[offset] = y;
      a[offset + 1] = x;
      return a;
    });
  const dataFirst = (offset: number) =>
    fc.oneof({ weight: 1, arbitrary: base }, { weight: 4, arbitrary: withData(offset, validArgs) }, { weight: 1, arbitrary: withData(offset, wildArgs) });
  const knotTable = fc
    .array(fc.tuple(numberIn(1, false), numberIn(1, false)), { minLength: 0, maxLength: 6 })
    .map((rows) => rows.sort((p, q) => p[0] - q[0]).map(([a, b]) => [a, b] as CellValueIn[]));
  const monotoneTable = fc
    .uniqueArray(fc.integer({ min: -50, max: 50 }), { minLength: 2, maxLength: 6 })
    .chain((xs) => fc.array(fc.integer({ min: 0, max: 5 }), { minLength: xs.length, maxLength: xs.length }).map((steps) => {
      xs.sort((p, q) => p - q);
      let v = 0;
      return xs.map((x, i) => [x, (v += steps[i]!)] as CellValueIn[]);
    }));
  const targets = fc.array(cleanIn(1), { minLength: 1, maxLength: 5 }).map((xs) => xs.map((v) => [v]) as CellArg);
  switch (name) {
    case 'BAND':
    case 'INVERTBAND':
      // Mostly the knot model (knots 2 to 5), where the band is defined; sometimes anything.
      return fc.oneof(
        { weight: 1, arbitrary: fc.tuple(dataFirst(1), targets).map(([a, t]) => [t, ...a.slice(1)]) },
        {
          weight: 3,
          arbitrary: fc.tuple(dataFirst(1), targets, fc.integer({ min: 2, max: 5 })).map(([a, t, k]) => {
            const b = [t, ...a.slice(1)];
            b[3] = k;
            return b;
          }),
        },
      );
    case 'PREDICT':
      return fc.tuple(dataFirst(1), targets).map(([a, t]) => [t, ...a.slice(1)]);
    case 'EVAL':
    case 'INVERT':
      return fc.oneof(
        { weight: 1, arbitrary: base },
        { weight: 1, arbitrary: fc.tuple(wildArgs, knotTable, targets).map(([a, t, xs]) => [xs, t, ...a.slice(2)]) },
        { weight: 4, arbitrary: fc.tuple(validArgs, monotoneTable, targets).map(([a, t, xs]) => [xs, t, ...a.slice(2)]) },
      );
    case 'QKNOTS':
      return fc.oneof(base, fc.tuple(pair, option).map(([[, x], c]) => [x, c]));
    case 'BESTK':
      // Half the grids leave curvature and degree (the last two) omitted, as formulas written before them.
      return fc.oneof(dataFirst(0), dataFirst(0).map((a) => [...a.slice(0, -2), undefined, undefined]));
    default:
      return dataFirst(0);
  }
}

function check(ok: boolean, what: string): void {
  if (!ok) throw new Error(what);
}

function assertResult(name: string, args: CellArg[], r: CellResult): void {
  // An error cell (a read-back limit the band does not reach, a statistic the data do not define) is #N/A with a message.
  const errorCell = (v: unknown) => typeof v === 'object' && v !== null && (v as { code?: unknown }).code === '#N/A' && String((v as { message?: unknown }).message).length > 0;
  const okCell = (v: unknown) => (typeof v === 'number' && Number.isFinite(v)) || typeof v === 'string' || typeof v === 'boolean' || errorCell(v);
  if (Array.isArray(r)) {
    check(r.length > 0, 'empty result');
    const w = r[0]!.length;
    for (const row of r) {
      check(row.length === w, 'ragged result');
      for (const v of row) check(okCell(v), `bad result cell ${String(v)}`);
    }
  } else check(okCell(r), `bad result ${String(r)}`);
  const shapeOf = (a: CellArg) => (Array.isArray(a) ? `${a.length}x${(a[0] as unknown[]).length}` : '1x1');
  const dims = Array.isArray(r) ? `${r.length}x${r[0]!.length}` : '1x1';
  if (['FIT', 'PREDICT', 'EVAL', 'INVERT'].includes(name)) check(dims === shapeOf(args[0]), `shape ${dims} vs ${shapeOf(args[0])}`);
  if (name === 'KNOTS') check(dims.endsWith('x2') || (dims.endsWith('x3') && args[6] === 2), 'KNOTS needs two columns (three for degree 2)');
  if (name === 'STATS') check(dims === `${STATS_LABELS.length}x2`, 'STATS shape');
  if (name === 'BAND' || name === 'INVERTBAND') {
    const a = args[0];
    const n = Array.isArray(a) ? a.length * (a[0] as unknown[]).length : 1;
    const row = Array.isArray(a) && a.length === 1 && (a[0] as unknown[]).length > 1;
    check(dims === (row ? `3x${n}` : `${n}x3`), `${name} shape ${dims} for ${n} cells`);
  }
  if (name === 'CV') check(dims.endsWith('x6'), 'CV shape');
  if (name === 'BESTK') check(typeof r === 'number', 'BESTK scalar');
}

/** Registers the fuzz test of one function. */
export function fuzzFunction(name: string): void {
  const index = SHEET_FUNCTIONS.findIndex((f) => f.name === name);
  const f = SHEET_FUNCTIONS[index]!;
  it(`RATCHET.${f.name}: ${RUNS} random argument grids give a value or a mapped cell error`, () => {
    clearCaches();
    const seen = { values: 0, errors: 0 };
    fc.assert(
      fc.property(argsFor(f.name, f.params.length), (args) => {
        let r: CellResult;
        try {
          r = f.invoke(args);
        } catch (e) {
          if (!isExpectedError(e)) throw new Error(`uncaught ${String(e)} for ${JSON.stringify(args)}`, { cause: e });
          const m = mapError(e);
          if (e instanceof InputCellError) {
            // A propagated error cell: its own code when returnable, else #VALUE!.
            check(m.code === e.code || m.code === '#VALUE!', `propagated ${e.code} as ${m.code}`);
          } else {
            check(m.code !== '#NUM!', `#NUM! (${m.message}) for ${JSON.stringify(args)}`);
            check(m.code === '#VALUE!' || m.code === '#N/A', `unexpected ${m.code}`);
          }
          check(m.message.length > 0, 'empty message');
          seen.errors++;
          return;
        }
        assertResult(f.name, args, r);
        seen.values++;
      }),
      { numRuns: RUNS, seed: Number(process.env.RATCHET_FUZZ_SEED ?? 4242) + index },
    );
    // The generators must reach the solvers often, not only the argument checks.
    expect(seen.values).toBeGreaterThan(RUNS / 50);
    expect(seen.errors).toBeGreaterThan(RUNS / 50);
  });
}
