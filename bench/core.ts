/**
 * Core benchmark (README, "Performance"): the classic isotonic fit against scikit-learn's
 * IsotonicRegression.fit on the same data in the same run, its peak extra memory per row, and the
 * knot fit against a one-pass baseline that sums x and y.
 *
 * - Classic fit: fitMonotone(x, y) on random unsorted x, and on x with many ties (1000 distinct
 *   values), at 1e5 and 1e6 rows. scikit-learn 1.2.1 (Debian's /usr/bin/python3) reads the same
 *   doubles from a temp file; each round starts a Python child that fits once to warm up and once
 *   timed, and ours likewise fits once untimed before the timed fit, after a JIT warm-up of 40
 *   fits (10 at 1e6) before the first round: V8 optimises the hot functions only after dozens of
 *   calls, and the first fits of a fresh runtime run about twice as long. Rounds alternate ours /
 *   scikit-learn's, 5 of them; min and median of the CPU time are
 *   reported (ms), the ratio of the minima (goal ≤ 0.5) and of the medians, and the ratio of the
 *   wall-time minima. Without that Python the bench says so and skips the ratios.
 * - Memory: the typed arrays one fit allocates at the largest size, per row, result included
 *   (bench/memory-child.ts, a fresh process; an upper bound of the peak), and for scikit-learn the
 *   peak that Python's tracemalloc reports for one fit. Goal ≤ 80 bytes.
 * - Knot fit, K = 20 evenly spaced, 1e5 and 1e6 rows: with fitted values, the knot table only
 *   (fitted: false), and with a weights array of ones, each against the summing pass in alternating
 *   rounds (goals ≤ 5, ≤ 3, and an array of ones no faster than no weights). Also timed in the
 *   same rounds: the floor of any exact assembly, each row's five products added to its interval's
 *   sums with the intervals computed beforehand (see intervalSums); the knot table needs that
 *   and a range pass over x, so its ratio cannot fall below the floor's ratio plus about one.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fitMonotone, knotRegression } from '../src/core/index.js';
import { risingData, tiedData, timeRounds, warmTimed, type BenchRecord, type OwnTime, type Spread } from './harness.js';

const PY = '/usr/bin/python3';

/** A Python child on data written once to a temp directory; null when scikit-learn is missing. */
class SklearnChild {
  private readonly dir: string;
  constructor(x: Float64Array, y: Float64Array) {
    this.dir = mkdtempSync(join(tmpdir(), 'ratchet-bench-'));
    writeFileSync(join(this.dir, 'x.bin'), Buffer.from(x.buffer, x.byteOffset, x.byteLength));
    writeFileSync(join(this.dir, 'y.bin'), Buffer.from(y.buffer, y.byteOffset, y.byteLength));
  }

  /**
   * 'time': "cpu wall" ms of one fit after a warm-up fit (time.process_time, time.perf_counter);
   * 'memory': tracemalloc's peak during one fit, bytes per row.
   */
  run(mode: 'time' | 'memory'): string | null {
    if (!existsSync(PY)) return null;
    const script = [
      'import sys, time, numpy as np',
      'try:',
      '    from sklearn.isotonic import IsotonicRegression',
      'except ImportError:',
      '    print("none"); sys.exit(0)',
      `x = np.fromfile(${JSON.stringify(join(this.dir, 'x.bin'))}, dtype="<f8")`,
      `y = np.fromfile(${JSON.stringify(join(this.dir, 'y.bin'))}, dtype="<f8")`,
      mode === 'time'
        ? 'IsotonicRegression().fit(x, y); c0 = time.process_time(); t0 = time.perf_counter(); IsotonicRegression().fit(x, y); print((time.process_time() - c0) * 1000, (time.perf_counter() - t0) * 1000)'
        : 'import tracemalloc; IsotonicRegression().fit(x[:70000], y[:70000]); tracemalloc.start(); m = IsotonicRegression().fit(x, y); print(tracemalloc.get_traced_memory()[1] / len(x))',
    ].join('\n');
    try {
      const out = execFileSync(PY, ['-c', script], { encoding: 'utf8' }).trim();
      return out === 'none' ? null : out;
    } catch {
      return null;
    }
  }

  close(): void {
    rmSync(this.dir, { recursive: true, force: true });
  }
}

/** Typed-array bytes per row that one classic fit allocates, in a fresh Node process (see bench/memory-child.ts). */
function oursMemory(n: number, kind: string): number | null {
  try {
    const child = join(import.meta.dirname, 'memory-child.ts');
    return Number(execFileSync(process.execPath, [...process.execArgv, child, String(n), kind], { encoding: 'utf8' }).trim());
  } catch {
    return null;
  }
}

/**
 * The interval of every row for K evenly spaced knots from the smallest to the largest x (the last
 * interval closed), as the knot fit finds it; computed outside the timing for {@link intervalSums}.
 */
function intervalsOf(x: Float64Array, K: number): Int32Array {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < x.length; i++) {
    lo = Math.min(lo, x[i]!);
    hi = Math.max(hi, x[i]!);
  }
  const out = new Int32Array(x.length);
  const scale = (K - 1) / (hi - lo);
  for (let i = 0; i < x.length; i++) out[i] = Math.min(Math.floor((x[i]! - lo) * scale), K - 2) * 8;
  return out;
}

/**
 * A floor under any assembly of the knot fit's normal equations: each row's five products
 * (v², v·u, u², v·y, u·y with u its position in its interval) added to the sums of its interval,
 * with the intervals given (`slot`, eight sums per interval) and u taken as x's fractional part
 * (any number in [0, 1) costs the same). No range pass, no interval search, no checks: the least
 * work that keeps five separate sums per interval, which exact normal equations need (sums of
 * differences such as Σv² = N − 2Σu + Σu² cancel catastrophically when rows sit near a knot).
 */
function intervalSums(x: Float64Array, y: Float64Array, slot: Int32Array, sums: Float64Array): number {
  sums.fill(0);
  for (let i = 0; i < x.length; i++) {
    const b = slot[i]!;
    const u = x[i]! - Math.floor(x[i]!);
    const v = 1 - u;
    const yi = y[i]!;
    sums[b] = sums[b]! + v * v;
    sums[b + 1] = sums[b + 1]! + v * u;
    sums[b + 2] = sums[b + 2]! + u * u;
    sums[b + 3] = sums[b + 3]! + v * yi;
    sums[b + 4] = sums[b + 4]! + u * yi;
  }
  return sums[0]!;
}

/** The baseline: one pass that sums x and y (a module-level function, so it is optimised once). */
function sumPass(x: Float64Array, y: Float64Array): number {
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < x.length; i++) {
    sx += x[i]!;
    sy += y[i]!;
  }
  return sx + sy;
}

export function run(emit: (r: BenchRecord) => void, options: { quick: boolean }): void {
  const sizes = options.quick ? [1e4] : [1e5, 1e6];
  let sink = 0;
  let noPython = false;
  for (const n of sizes) {
    for (const [kind, data] of [['random', risingData(n)], ['ties', tiedData(n)]] as const) {
      const { x, y } = data;
      const sk = new SklearnChild(x, y);
      let skMissing = false;
      // V8 optimises the fit's hot functions only after many calls: warm the JIT first, so both
      // sides are timed as compiled code (scikit-learn's side is compiled ahead of time).
      const jitWarm = n >= 1e6 ? 10 : 40;
      for (let w = 0; w < jitWarm; w++) sink += fitMonotone(x, y).levels;
      const t = timeRounds(
        {
          ours: () =>
            warmTimed(() => {
              sink += fitMonotone(x, y).levels;
            }),
          sklearn: (): OwnTime => {
            const out = sk.run('time');
            if (out === null) skMissing = true;
            const [cpu, wall] = (out ?? '0 0').split(' ').map(Number);
            return { cpu: cpu!, wall: wall! };
          },
        },
        5,
        1,
      );
      const o = t.ours!;
      const rec: BenchRecord = { case: `classic fit, ${kind === 'random' ? 'random x' : 'x with many ties'}`, n, knots: 0, ms: o.min, median_ms: o.median };
      if (skMissing) noPython = true;
      else {
        const s = t.sklearn!;
        rec.sklearn_ms = s.min;
        rec.sklearn_median_ms = s.median;
        rec.ratio = o.min / s.min;
        rec.ratio_median = o.median / s.median;
        rec.wall_ratio = o.wallMin / s.wallMin;
        rec.goal = 0.5;
      }
      if (n === sizes[sizes.length - 1]) {
        const mem = oursMemory(n, kind);
        if (mem !== null) rec.bytes_per_row = mem;
        const skMem = skMissing ? null : sk.run('memory');
        if (skMem !== null) rec.sklearn_bytes_per_row = Number(skMem);
      }
      sk.close();
      emit(rec);
    }
  }
  if (noPython) console.log(`(${PY} with scikit-learn not found: the ratios to scikit-learn were skipped)`);

  for (const n of sizes) {
    const { x, y } = risingData(n);
    const ones = new Float64Array(n).fill(1);
    const slot = intervalsOf(x, 20);
    const slotSums = new Float64Array(8 * 19);
    const t = timeRounds(
      {
        sum: () => {
          sink += sumPass(x, y);
        },
        floor: () => {
          sink += intervalSums(x, y, slot, slotSums);
        },
        fitted: () => {
          sink += knotRegression(x, y, { knots: 20 }).knotY[0]!;
        },
        table: () => {
          sink += knotRegression(x, y, { knots: 20, fitted: false }).knotY[0]!;
        },
        ones: () => {
          sink += knotRegression(x, y, { knots: 20, weights: ones }).knotY[0]!;
        },
        onesTable: () => {
          sink += knotRegression(x, y, { knots: 20, weights: ones, fitted: false }).knotY[0]!;
        },
      },
      n >= 1e6 ? 9 : 21,
      3,
    );
    const base = t.sum!;
    emit({ case: 'baseline: one pass summing x and y', n, knots: '-', ms: base.min, median_ms: base.median });
    const row = (name: string, s: Spread, goal: number | string): void =>
      emit({ case: name, n, knots: 20, ms: s.min, median_ms: s.median, ratio: s.min / base.min, ratio_median: s.median / base.median, wall_ratio: s.wallMin / base.wallMin, goal });
    row('floor: the five interval sums alone', t.floor!, '-');
    row('knot fit, fitted values', t.fitted!, 5);
    row('knot fit, knot table only', t.table!, 3);
    row('knot fit, weights all 1', t.ones!, `vs ${(t.fitted!.min / base.min).toPrecision(3)}`);
    row('knot fit, table, weights all 1', t.onesTable!, `vs ${(t.table!.min / base.min).toPrecision(3)}`);
  }
  if (sink === 0.5) console.log('');
}
