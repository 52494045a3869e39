/**
 * Core benchmark: classic isotonic fits and knot fits on random unsorted data, a one-pass
 * baseline that sums x and y, and — when Debian's python3 has scikit-learn — scikit-learn's
 * IsotonicRegression.fit on the same data in the same run.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fitMonotone, knotRegression } from '../src/core/index.js';
import { risingData, timeMs, type BenchRecord } from './harness.js';

const PY = '/usr/bin/python3';

/** Times sklearn's IsotonicRegression.fit on the given data (median of 5 after a warm-up), or null. */
function sklearnMs(x: Float64Array, y: Float64Array): number | null {
  if (!existsSync(PY)) return null;
  const dir = mkdtempSync(join(tmpdir(), 'ratchet-bench-'));
  try {
    writeFileSync(join(dir, 'x.bin'), Buffer.from(x.buffer));
    writeFileSync(join(dir, 'y.bin'), Buffer.from(y.buffer));
    const script = [
      'import sys, time, numpy as np',
      'try:',
      '    from sklearn.isotonic import IsotonicRegression',
      'except ImportError:',
      '    print("none"); sys.exit(0)',
      `x = np.fromfile(${JSON.stringify(join(dir, 'x.bin'))}, dtype="<f8")`,
      `y = np.fromfile(${JSON.stringify(join(dir, 'y.bin'))}, dtype="<f8")`,
      'IsotonicRegression().fit(x, y)',
      'ts = []',
      'for _ in range(5):',
      '    t0 = time.perf_counter(); IsotonicRegression().fit(x, y); ts.append(time.perf_counter() - t0)',
      'ts.sort(); print(ts[2] * 1000)',
    ].join('\n');
    const out = execFileSync(PY, ['-c', script], { encoding: 'utf8' }).trim();
    return out === 'none' ? null : Number(out);
  } catch {
    return null;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
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
  const sizes = options.quick ? [1e3, 1e4] : [1e3, 1e4, 1e5, 1e6];
  for (const n of sizes) {
    const { x, y } = risingData(n);
    const runs = n >= 1e6 ? 5 : n <= 1e4 ? 41 : 9;
    let sink = 0;
    const sumMs = timeMs(() => {
      sink += sumPass(x, y);
    }, runs);
    emit({ case: 'baseline: one pass summing x and y', n, knots: '-', ms: sumMs });
    const classicMs = timeMs(() => fitMonotone(x, y), runs);
    const sk = sklearnMs(x, y);
    const rec: BenchRecord = { case: 'classic isotonic fit', n, knots: 0, ms: classicMs };
    if (sk !== null) {
      rec.sklearn_ms = sk;
      rec.ratio_to_sklearn = classicMs / sk;
    }
    emit(rec);
    for (const K of [10, 50]) {
      const ms = timeMs(() => knotRegression(x, y, { knots: K }), runs);
      const withStats = timeMs(() => fitMonotone(x, y, { knots: K }), runs);
      emit({ case: "knot fit, evenly spaced", n, knots: K, ms, ratio_to_baseline: ms / sumMs, with_stats_ms: withStats });
    }
    if (sink === 0.5) console.log('');
  }
}
