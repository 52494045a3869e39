/**
 * Geometry and normal equations of the bilinear knot lattice behind the monotone surface.
 *
 * Node (a, b) — x1 knot a, x2 knot b — has index p = b·K1 + a, so a lattice stored this way reads
 * as a table with one row per x2 knot and one column per x1 knot.
 */

/** The bilinear normal equations of a K1 × K2 lattice in 9-point stencil form (no dense matrix). */
export interface LatticeSystem {
  readonly k1: number;
  readonly k2: number;
  /**
   * H = BᵀWB (+ tie-break) as a stencil: entry 9p + 3(db + 1) + (da + 1) couples node p with node
   * p + da + db·K1 (da, db ∈ {−1, 0, 1}). Length 9·K1·K2.
   */
  readonly stencil: Float64Array;
  /** Bᵀ W y, length K1·K2. */
  readonly rhs: Float64Array;
  /** Σ wᵢ bᵢₚ² over rows: positive exactly when the data touch node p. */
  readonly dataDiagonal: Float64Array;
}

/** Position of every row in the lattice: lower-left node and the two interpolation shares. */
export interface LatticeLocation {
  /** Index of the lower-left node of the row's cell. */
  readonly node: Int32Array;
  /** Share u1 ∈ [0, 1] along x1 and u2 along x2 (0 on the lower knot, 1 on the upper). */
  readonly u1: Float64Array;
  readonly u2: Float64Array;
}

/** Largest j ≤ K − 2 with t_j ≤ x (0 below t₀), and the share u ∈ [0, 1] (x clamped). O(log K). */
export function locateOnAxis(t: Float64Array, x: number): [number, number] {
  const K = t.length;
  if (x <= t[0]!) return [0, 0];
  if (x >= t[K - 1]!) return [K - 2, 1];
  let lo = 0;
  let hi = K - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >>> 1;
    if (t[mid]! <= x) lo = mid;
    else hi = mid - 1;
  }
  return [lo, (x - t[lo]!) / (t[lo + 1]! - t[lo]!)];
}

/**
 * Cell and shares of every (x1, x2) pair on knots t1 × t2 (each x clamped to its knot range).
 * Cost O(n log K). Preconditions: strictly increasing finite knots (≥ 2 each), finite x.
 * @example locate(Float64Array.from([0, 2]), Float64Array.from([0, 1]), [1], [5]) // → node [0], u1 [0.5], u2 [1]
 */
export function locate(t1: Float64Array, t2: Float64Array, x1: ArrayLike<number>, x2: ArrayLike<number>): LatticeLocation {
  const n = x1.length;
  const k1 = t1.length;
  const node = new Int32Array(n);
  const u1 = new Float64Array(n);
  const u2 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const [a, s] = locateOnAxis(t1, x1[i]!);
    const [b, r] = locateOnAxis(t2, x2[i]!);
    node[i] = b * k1 + a;
    u1[i] = s;
    u2[i] = r;
  }
  return { node, u1, u2 };
}

/**
 * Bilinear value of lattice `values` (layout p = b·K1 + a) at located rows: linear along x1 on the
 * lower and upper edge of the cell, then linear along x2 between them. O(n).
 * @example evaluateLattice([1, 2, 3, 4], 2, { node: Int32Array.from([0]), u1: Float64Array.from([0.5]), u2: Float64Array.from([0.5]) })
 *   // → Float64Array [2.5]
 */
export function evaluateLattice(values: ArrayLike<number>, k1: number, loc: LatticeLocation): Float64Array {
  const n = loc.node.length;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const p = loc.node[i]!;
    const s = loc.u1[i]!;
    const r = loc.u2[i]!;
    const v00 = values[p]!;
    const v10 = values[p + 1]!;
    const v01 = values[p + k1]!;
    const v11 = values[p + k1 + 1]!;
    const lower = v00 === v10 ? v00 : v00 + s * (v10 - v00);
    const upper = v01 === v11 ? v01 : v01 + s * (v11 - v01);
    out[i] = lower === upper ? lower : lower + r * (upper - lower);
  }
  return out;
}

/**
 * Assembles H = BᵀWB and BᵀWy in one pass over the rows (16 stencil updates per row), where B is
 * the n × K1K2 bilinear basis. Rows with weight 0 are skipped (they get no share of H). O(n + K1K2)
 * time and memory; no n × K1K2 matrix. Preconditions: finite y, weights ≥ 0, `loc` from {@link locate}.
 * @example assembleLattice(2, 1, { node: Int32Array.from([0]), u1: Float64Array.from([0.5]), u2: Float64Array.from([0]) },
 *   Float64Array.from([4]), Float64Array.from([1])).rhs // → Float64Array [2, 2]
 */
export function assembleLattice(k1: number, k2: number, loc: LatticeLocation, y: Float64Array, w: Float64Array): LatticeSystem {
  const N = k1 * k2;
  const stencil = new Float64Array(9 * N);
  const rhs = new Float64Array(N);
  const n = y.length;
  const off = [0, 1, k1, k1 + 1];
  const da = [0, 1, 0, 1];
  const db = [0, 0, 1, 1];
  const b = new Float64Array(4);
  for (let i = 0; i < n; i++) {
    const wi = w[i]!;
    if (!(wi > 0)) continue;
    const p = loc.node[i]!;
    const s = loc.u1[i]!;
    const r = loc.u2[i]!;
    b[0] = (1 - s) * (1 - r);
    b[1] = s * (1 - r);
    b[2] = (1 - s) * r;
    b[3] = s * r;
    const wy = wi * y[i]!;
    for (let q = 0; q < 4; q++) {
      const bq = b[q]!;
      if (bq === 0) continue;
      const node = p + off[q]!;
      rhs[node] = rhs[node]! + wy * bq;
      const base = 9 * node + 4; // centre entry
      const wb = wi * bq;
      for (let t = 0; t < 4; t++) {
        const bt = b[t]!;
        if (bt === 0) continue;
        const k = base + 3 * (db[t]! - db[q]!) + (da[t]! - da[q]!);
        stencil[k] = stencil[k]! + wb * bt;
      }
    }
  }
  const dataDiagonal = new Float64Array(N);
  for (let p = 0; p < N; p++) dataDiagonal[p] = stencil[9 * p + 4]!;
  return { k1, k2, stencil, rhs, dataDiagonal };
}

/**
 * Adds the tie-break ε Σ_edges (θ_p − θ_q)² over every lattice edge (the graph Laplacian of the
 * lattice, unit weight per edge — free of the units and spacing of x, so extreme knot spacings
 * cannot overflow it), with ε = `relative` · tr(BᵀWB) / tr(L). It makes H positive definite (the
 * lattice graph is connected and some node carries data), so the optimum is unique; fitted values
 * move by about `relative` in relative terms. O(K1K2).
 */
export function addTieBreak(sys: LatticeSystem, relative: number): void {
  const { k1, k2, stencil } = sys;
  const N = k1 * k2;
  let trH = 0;
  for (let p = 0; p < N; p++) trH += stencil[9 * p + 4]!;
  const trL = 2 * (k2 * (k1 - 1) + k1 * (k2 - 1));
  if (!(trL > 0) || !(trH > 0)) return;
  const g = (relative * trH) / trL;
  for (let b = 0; b < k2; b++) {
    for (let a = 0; a < k1; a++) {
      const p = b * k1 + a;
      if (a + 1 < k1) {
        stencil[9 * p + 4] = stencil[9 * p + 4]! + g;
        stencil[9 * (p + 1) + 4] = stencil[9 * (p + 1) + 4]! + g;
        stencil[9 * p + 5] = stencil[9 * p + 5]! - g; // (da, db) = (1, 0)
        stencil[9 * (p + 1) + 3] = stencil[9 * (p + 1) + 3]! - g; // (−1, 0)
      }
      if (b + 1 < k2) {
        stencil[9 * p + 4] = stencil[9 * p + 4]! + g;
        stencil[9 * (p + k1) + 4] = stencil[9 * (p + k1) + 4]! + g;
        stencil[9 * p + 7] = stencil[9 * p + 7]! - g; // (0, 1)
        stencil[9 * (p + k1) + 1] = stencil[9 * (p + k1) + 1]! - g; // (0, −1)
      }
    }
  }
}

/** out = H·v for the stencil matrix. O(9·K1K2). */
export function applyStencil(stencil: Float64Array, k1: number, k2: number, v: ArrayLike<number>, out: Float64Array): void {
  for (let b = 0; b < k2; b++) {
    for (let a = 0; a < k1; a++) {
      const p = b * k1 + a;
      const base = 9 * p;
      let s = stencil[base + 4]! * v[p]!;
      const aLo = a > 0;
      const aHi = a + 1 < k1;
      if (aLo) s += stencil[base + 3]! * v[p - 1]!;
      if (aHi) s += stencil[base + 5]! * v[p + 1]!;
      if (b > 0) {
        const q = p - k1;
        s += stencil[base + 1]! * v[q]!;
        if (aLo) s += stencil[base]! * v[q - 1]!;
        if (aHi) s += stencil[base + 2]! * v[q + 1]!;
      }
      if (b + 1 < k2) {
        const q = p + k1;
        s += stencil[base + 7]! * v[q]!;
        if (aLo) s += stencil[base + 6]! * v[q - 1]!;
        if (aHi) s += stencil[base + 8]! * v[q + 1]!;
      }
      out[p] = s;
    }
  }
}

