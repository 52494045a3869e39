/**
 * Surface benchmark: the monotone surface on random data rising in both inputs — a 30 × 30 lattice
 * over 10⁴ rows and a 10 × 10 lattice over 10⁵ rows (target: under 1 s each), plus the
 * classic grid of distinct levels and the cross-validation of a few (K1, K2) pairs. Each record
 * reports which solver finished and the optimality certificate of the answer.
 */
import { crossValidateSurface, fitSurface } from '../src/core/index.js';
import { lcg, timeMs, type BenchRecord } from './harness.js';

/** x1, x2 uniform on [0, 100); y = log(1 + x1) + √x2 / 3 + uniform noise of width 2. */
function surfaceData(n: number, seed = 7): { x1: Float64Array; x2: Float64Array; y: Float64Array } {
  const r = lcg(seed);
  const x1 = new Float64Array(n);
  const x2 = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x1[i] = 100 * r();
    x2[i] = 100 * r();
    y[i] = Math.log1p(x1[i]!) + Math.sqrt(x2[i]!) / 3 + (r() - 0.5) * 2;
  }
  return { x1, x2, y };
}

/** Levels on a grid: x1, x2 whole numbers 0 … L − 1 (so the classic lattice is L × L). */
function gridData(n: number, levels: number, seed = 9): { x1: Float64Array; x2: Float64Array; y: Float64Array } {
  const r = lcg(seed);
  const x1 = new Float64Array(n);
  const x2 = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x1[i] = Math.floor(levels * r());
    x2[i] = Math.floor(levels * r());
    y[i] = 0.1 * x1[i]! + 0.05 * x2[i]! + (r() - 0.5) * 2;
  }
  return { x1, x2, y };
}

export function run(emit: (r: BenchRecord) => void, { quick }: { quick: boolean }): void {
  const cases: [string, number, number, number][] = [
    ['surface 30x30 lattice', 10000, 30, 30],
    ['surface 10x10 lattice', 100000, 10, 10],
    ['surface 20x20 lattice', 10000, 20, 20],
  ];
  for (const [name, n, k1, k2] of cases) {
    const d = surfaceData(n);
    let model = fitSurface(d.x1, d.x2, d.y, { knots1: k1, knots2: k2 });
    const ms = timeMs(() => (model = fitSurface(d.x1, d.x2, d.y, { knots1: k1, knots2: k2 })), quick ? 1 : 5);
    emit({
      case: name,
      n,
      knots: `${k1}x${k2}`,
      ms,
      solver: model.solver,
      iterations: model.iterations,
      stationarity: model.certificate.stationarity,
      complementarity: model.certificate.complementarity,
      rmse: model.stats.rmse,
    });
  }
  {
    // A hard case for the exact finish: almost no signal, so the optimum pools most of the lattice.
    const r = lcg(3);
    const n = 10000;
    const x1 = new Float64Array(n);
    const x2 = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x1[i] = r();
      x2[i] = r();
      y[i] = 0.01 * x1[i]! + 0.02 * x2[i]! + r();
    }
    let model = fitSurface(x1, x2, y, { knots1: 30, knots2: 30 });
    const ms = timeMs(() => (model = fitSurface(x1, x2, y, { knots1: 30, knots2: 30 })), quick ? 1 : 3);
    emit({ case: 'surface 30x30 lattice, flat signal', n, knots: '30x30', ms, solver: model.solver, iterations: model.iterations, stationarity: model.certificate.stationarity });
  }
  {
    const d = gridData(10000, 25);
    let model = fitSurface(d.x1, d.x2, d.y);
    const ms = timeMs(() => (model = fitSurface(d.x1, d.x2, d.y)), quick ? 1 : 3);
    emit({ case: 'surface classic 25x25 levels', n: 10000, knots: '0x0', ms, solver: model.solver, iterations: model.iterations });
  }
  {
    const d = surfaceData(quick ? 2000 : 10000);
    const pairs = [2, 3, 5, 8];
    const ms = timeMs(() => crossValidateSurface(d.x1, d.x2, d.y, { candidates1: pairs, candidates2: pairs, folds: 5 }), 1);
    emit({ case: 'surface CV 4x4 pairs, 5 folds', n: d.y.length, knots: '2..8', ms });
  }
}
