/**
 * Linear algebra of the lattice solvers: a symmetric sparse matrix in compressed rows (built from
 * the lattice stencil), its product and positive-definiteness test, Jacobi-preconditioned conjugate
 * gradients, and a small dense Cholesky solve.
 */
import type { LatticeSystem } from './surface-lattice.js';

/**
 * Preconditioned conjugate gradients (Jacobi) for an SPD operator, in place on `x` (warm start).
 * Stops when ‖r‖ ≤ tol·‖b‖ or after maxIter steps. Returns the steps used.
 */
export function pcg(
  apply: (v: Float64Array, out: Float64Array) => void,
  diag: Float64Array,
  b: Float64Array,
  x: Float64Array,
  tol: number,
  maxIter: number,
  work: { r: Float64Array; z: Float64Array; p: Float64Array; q: Float64Array },
): number {
  const m = b.length;
  const { r, z, p, q } = work;
  apply(x, q);
  let bn = 0;
  let rz = 0;
  let rn = 0;
  for (let i = 0; i < m; i++) {
    r[i] = b[i]! - q[i]!;
    z[i] = r[i]! / diag[i]!;
    p[i] = z[i]!;
    rz += r[i]! * z[i]!;
    bn += b[i]! * b[i]!;
    rn += r[i]! * r[i]!;
  }
  const target = tol * tol * Math.max(bn, 1e-300);
  let it = 0;
  while (it < maxIter && rn > target && rz > 0) {
    apply(p, q);
    let pq = 0;
    for (let i = 0; i < m; i++) pq += p[i]! * q[i]!;
    if (!(pq > 0)) break;
    const alpha = rz / pq;
    let rzNew = 0;
    rn = 0;
    for (let i = 0; i < m; i++) {
      x[i] = x[i]! + alpha * p[i]!;
      r[i] = r[i]! - alpha * q[i]!;
      z[i] = r[i]! / diag[i]!;
      rzNew += r[i]! * z[i]!;
      rn += r[i]! * r[i]!;
    }
    const beta = rzNew / rz;
    rz = rzNew;
    for (let i = 0; i < m; i++) p[i] = z[i]! + beta * p[i]!;
    it++;
  }
  return it;
}

export function workspace(m: number) {
  return { r: new Float64Array(m), z: new Float64Array(m), p: new Float64Array(m), q: new Float64Array(m) };
}

/** A symmetric sparse matrix in compressed rows (each row lists its own column too). */
export interface SparseSymmetric {
  readonly n: number;
  readonly start: Int32Array;
  readonly col: Int32Array;
  readonly val: Float64Array;
}

/** out = A·v. O(nnz). */
export function applySparse(A: SparseSymmetric, v: ArrayLike<number>, out: Float64Array): void {
  const { n, start, col, val } = A;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let k = start[i]!; k < start[i + 1]!; k++) s += val[k]! * v[col[k]!]!;
    out[i] = s;
  }
}

/**
 * The stencil matrix restricted to the listed nodes, in compressed rows over their compact
 * indices (`index[node]` = compact index, −1 for nodes left out; couplings to left-out nodes are
 * dropped — callers leave out only nodes without couplings). O(9·m).
 */
export function stencilToSparse(sys: LatticeSystem, nodes: Int32Array, index: Int32Array): SparseSymmetric {
  const { k1, k2, stencil } = sys;
  const m = nodes.length;
  const start = new Int32Array(m + 1);
  const col: number[] = [];
  const val: number[] = [];
  for (let i = 0; i < m; i++) {
    const p = nodes[i]!;
    const a = p % k1;
    const b = (p - a) / k1;
    for (let db = -1; db <= 1; db++) {
      if (b + db < 0 || b + db >= k2) continue;
      for (let da = -1; da <= 1; da++) {
        if (a + da < 0 || a + da >= k1) continue;
        const v = stencil[9 * p + 3 * (db + 1) + (da + 1)]!;
        const j = index[p + da + db * k1]!;
        if (v !== 0 && j >= 0) {
          col.push(j);
          val.push(v);
        }
      }
    }
    start[i + 1] = col.length;
  }
  return { n: m, start, col: Int32Array.from(col), val: Float64Array.from(val) };
}

/**
 * True when the sparse matrix is numerically positive definite: banded Cholesky in the given
 * order (band storage n·(bw + 1) values, bw the largest |i − j| of a coupling), every pivot above
 * `relative` times its diagonal entry. Cost O(n·bw²).
 */
export function sparsePositiveDefinite(A: SparseSymmetric, relative = 1e-10): boolean {
  const { n, start, col, val } = A;
  let bw = 0;
  for (let i = 0; i < n; i++) for (let k = start[i]!; k < start[i + 1]!; k++) bw = Math.max(bw, Math.abs(col[k]! - i));
  const W = bw + 1;
  const L = new Float64Array(n * W); // L[i, j] (i − bw ≤ j ≤ i) at i·W + (j − i + bw)
  const row = new Float64Array(W);
  for (let i = 0; i < n; i++) {
    row.fill(0);
    let d = 0;
    for (let k = start[i]!; k < start[i + 1]!; k++) {
      const j = col[k]!;
      if (j <= i) row[j - i + bw] = row[j - i + bw]! + val[k]!;
      if (j === i) d = val[k]!;
    }
    const j0 = Math.max(0, i - bw);
    for (let j = j0; j <= i; j++) {
      let s = row[j - i + bw]!;
      for (let k = Math.max(j0, j - bw); k < j; k++) s -= L[i * W + (k - i + bw)]! * L[j * W + (k - j + bw)]!;
      if (j === i) {
        if (!(d > 0) || !(s > relative * d)) return false;
        L[i * W + bw] = Math.sqrt(s);
      } else L[i * W + (j - i + bw)] = s / L[j * W + bw]!;
    }
  }
  return true;
}

/** Cholesky solve of a small dense SPD system in place (b ← M⁻¹b); false if not positive definite. */
export function denseSolve(M: Float64Array, b: Float64Array, G: number): boolean {
  for (let j = 0; j < G; j++) {
    let d = M[j * G + j]!;
    for (let k = 0; k < j; k++) d -= M[j * G + k]! * M[j * G + k]!;
    if (!(d > 1e-14 * Math.abs(M[j * G + j]!)) || !(d > 0)) return false;
    const r = Math.sqrt(d);
    M[j * G + j] = r;
    for (let i = j + 1; i < G; i++) {
      let s = M[i * G + j]!;
      for (let k = 0; k < j; k++) s -= M[i * G + k]! * M[j * G + k]!;
      M[i * G + j] = s / r;
    }
  }
  for (let i = 0; i < G; i++) {
    let s = b[i]!;
    for (let k = 0; k < i; k++) s -= M[i * G + k]! * b[k]!;
    b[i] = s / M[i * G + i]!;
  }
  for (let i = G - 1; i >= 0; i--) {
    let s = b[i]!;
    for (let k = i + 1; k < G; k++) s -= M[k * G + i]! * b[k]!;
    b[i] = s / M[i * G + i]!;
  }
  return true;
}
