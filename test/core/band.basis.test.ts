/**
 * bandModelChecked with a reduced design other than the monotone groups: a Z whose rows have three
 * adjacent non-zeros (bandwidth 2 in ZᵀHZ), as a shape-constrained fit might supply. The variance
 * factors are compared with a dense computation written out here: B̃ = BZ formed explicitly,
 * (B̃ᵀWB̃)⁻¹ by Gauss–Jordan elimination with partial pivoting, and z_jᵀ(B̃ᵀWB̃)⁻¹z_k.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { bandModelChecked, type ActiveSetBasis } from '../../src/core/index.js';
import { hatRow } from './fixtures.js';

function invert(a: number[][]): number[][] {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r]![c]!) > Math.abs(m[piv]![c]!)) piv = r;
    [m[c], m[piv]] = [m[piv]!, m[c]!];
    const d = m[c]![c]!;
    for (let k = 0; k < 2 * n; k++) m[c]![k]! /= d;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r]![c]!;
      for (let k = 0; k < 2 * n; k++) m[r]![k]! -= f * m[c]![k]!;
    }
  }
  return m.map((row) => row.slice(n));
}

describe('bandModelChecked with a general sparse Z (bandwidth 2)', () => {
  it('knot and cross variance factors equal the dense (BZ)ᵀW(BZ) inverse to 1e-10 relative', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 4, max: 8 }),
        fc.array(fc.double({ min: 0.2, max: 3, noNaN: true }), { minLength: 30, maxLength: 30 }),
        fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 30, maxLength: 30 }),
        (p, wRaw, noise) => {
          // K = p + 2 knots; row j of Z has non-zeros in columns j − 2 … j (clipped), so each
          // pair of neighbouring rows spans three columns.
          const K = p + 2;
          const t = Float64Array.from({ length: K }, (_, j) => j);
          const rowStart = new Int32Array(K + 1);
          const col: number[] = [];
          const val: number[] = [];
          const Z: number[][] = Array.from({ length: K }, () => new Array<number>(p).fill(0));
          for (let j = 0; j < K; j++) {
            rowStart[j] = col.length;
            for (let c = Math.max(0, j - 2); c <= Math.min(p - 1, j); c++) {
              const v = 1 + 0.25 * (j - c) + 0.1 * c;
              col.push(c);
              val.push(v);
              Z[j]![c] = v;
            }
          }
          rowStart[K] = col.length;
          const basis: ActiveSetBasis = { knots: K, size: p, rowStart, col: Int32Array.from(col), val: Float64Array.from(val) };
          const n = 30;
          const x = Float64Array.from({ length: n }, (_, i) => ((K - 1) * (i + 0.5)) / n);
          const w = Float64Array.from(wRaw);
          const BZ = Array.from(x, (xi) => {
            const [j, v, u] = hatRow(t, xi);
            return Array.from({ length: p }, (_, c) => v * Z[j]![c]! + u * Z[j + 1]![c]!);
          });
          const M = Array.from({ length: p }, (_, a) => Array.from({ length: p }, (_, b) => BZ.reduce((s, r, i) => s + w[i]! * r[a]! * r[b]!, 0)));
          const Minv = invert(M);
          // A curve in the span of Z (so the residuals are those of some β), plus noise.
          const beta = Array.from({ length: p }, (_, c) => c * 0.7 - 1);
          const knotY = Float64Array.from(Z, (row) => row.reduce((s, v, c) => s + v * beta[c]!, 0));
          const y = Float64Array.from(BZ, (r, i) => r.reduce((s, v, c) => s + v * beta[c]!, 0) + noise[i]!);
          const model = bandModelChecked(x, y, w, t, knotY, 'up', basis);
          const quad = (j: number, k: number) => Z[j]!.reduce((s, zj, a) => s + zj * Z[k]!.reduce((u, zk, b) => u + Minv[a]![b]! * zk, 0), 0);
          for (let j = 0; j < K; j++) expect(model.knotFactor[j]!).toBeCloseRel(quad(j, j), 1e-10);
          for (let j = 0; j + 1 < K; j++) expect(model.crossFactor[j]!).toBeCloseRel(quad(j, j + 1), 1e-10);
          expect(model.dfResid).toBe(n - p);
        },
      ),
      { numRuns: 100, seed: 7 },
    );
  });

  it('a basis with the wrong number of rows is BAD_KNOTS naming basis', () => {
    const basis: ActiveSetBasis = { knots: 3, size: 1, rowStart: Int32Array.of(0, 1, 2, 3), col: Int32Array.of(0, 0, 0), val: Float64Array.of(1, 1, 1) };
    expect(() => bandModelChecked(Float64Array.of(0, 1, 2), Float64Array.of(1, 2, 3), null, Float64Array.of(0, 2), Float64Array.of(2, 2), 'up', basis)).toThrow(
      'basis: needs one row per knot (2); got 3.',
    );
  });
});

describe('bandModelChecked basis checks', () => {
  it('a column outside [0, size) is BAD_KNOTS naming basis', () => {
    const basis: ActiveSetBasis = { knots: 2, size: 1, rowStart: Int32Array.of(0, 1, 2), col: Int32Array.of(0, 1), val: Float64Array.of(1, 1) };
    expect(() => bandModelChecked(Float64Array.of(0, 1, 2), Float64Array.of(1, 2, 3), null, Float64Array.of(0, 2), Float64Array.of(2, 2), 'up', basis)).toThrow(
      'basis: needs compressed rows with non-decreasing starts, columns from 0 to size − 1 and finite values.',
    );
  });
});
