/**
 * Shaped knot fits: concave, convex and smooth fits against the plain knot model on the same data
 * (x uniform on [0, 10), y = √x + uniform noise of width 1), timed alternately in one run; each
 * record prints the ratio shaped / plain and the active-set size of the answer.
 */
import { fitMonotone, type Curvature, type Degree } from '../src/core/index.js';
import { lcg, timePair, type BenchRecord } from './harness.js';

function data(n: number, seed = 11): { x: Float64Array; y: Float64Array } {
  const r = lcg(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = 10 * r();
    y[i] = Math.sqrt(x[i]!) + (r() - 0.5);
  }
  return { x, y };
}

export function run(emit: (r: BenchRecord) => void, { quick }: { quick: boolean }): void {
  const n = quick ? 10000 : 100000;
  const { x, y } = data(n);
  const shapes: [string, Curvature, Degree][] = [
    ['concave', -1, 1],
    ['convex', 1, 1],
    ['smooth', 0, 2],
    ['smooth concave', -1, 2],
  ];
  for (const K of quick ? [20, 100] : [20, 100, 1000]) {
    for (const [name, curvature, degree] of shapes) {
      const [ms, plain] = timePair(
        () => fitMonotone(x, y, { knots: K, curvature, degree }),
        () => fitMonotone(x, y, { knots: K }),
        quick ? 3 : 5,
      );
      const model = fitMonotone(x, y, { knots: K, curvature, degree });
      emit({ case: `shape ${name}`, n, knots: K, ms, plainMs: plain, ratio: ms / plain, active: model.shape!.active.length });
    }
  }
}
