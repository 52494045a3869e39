/**
 * The monotone lattice quadratic program
 *
 *   minimise ½ θᵀHθ − cᵀθ  subject to  θ_hi(e) − θ_lo(e) ≥ 0 for every lattice edge e,
 *
 * with H the 9-point stencil of `LatticeSystem` (surface-lattice.ts; positive definite after the tie-break): its
 * shared vocabulary — axis directions, the order edges, the solution and certificate shapes — and
 * the order on the lattice (edges, the order induced on a subset, the envelope that makes values
 * order-feasible). The solvers live beside it, one concept per module: surface-sparse.ts (sparse
 * matrix, PCG, small dense Cholesky), surface-active-set.ts (the exact method),
 * surface-admm.ts (ADMM for large lattices) and surface-certificate.ts (the KKT certificate both
 * are judged by).
 */

/** Direction along one lattice axis: rising, falling, or unconstrained. */
export type AxisDirection = 'up' | 'down' | 'none';

/** The order constraints of a lattice: θ[hi[e]] ≥ θ[lo[e]] for every edge e. */
export interface LatticeEdges {
  readonly lo: Int32Array;
  readonly hi: Int32Array;
}

/** How well a lattice satisfies the optimality (KKT) conditions; all three are 0 at the optimum. */
export interface OptimalityCertificate {
  /**
   * Stationarity: max |Hθ − c − Aᵀλ| over nodes, relative to max(‖c‖∞, ‖Hθ‖∞), with λ ≥ 0 the
   * multipliers the solver reports (A: one row θ_hi − θ_lo per edge).
   */
  readonly stationarity: number;
  /** Complementarity Σ λₑ (θ_hi − θ_lo) relative to the weighted total sum of squares of y. */
  readonly complementarity: number;
  /** Largest order violation max(0, θ_lo − θ_hi) relative to max |θ| (0 for returned fits). */
  readonly feasibility: number;
}

/** Result of a lattice solve. */
export interface LatticeSolution {
  readonly theta: Float64Array;
  /** Multiplier λₑ ≥ 0 per edge. */
  readonly lambda: Float64Array;
  readonly solver: 'active-set' | 'admm';
  /** Active-set iterations or ADMM sweeps. */
  readonly iterations: number;
  readonly certificate: OptimalityCertificate;
}

/**
 * Edges of the lattice order for the two directions: along x1 every (a, b)–(a + 1, b) pair, along
 * x2 every (a, b)–(a, b + 1) pair, oriented so that θ[hi] ≥ θ[lo]; none along a `'none'` axis.
 * Cost O(K1K2). Preconditions: K1, K2 ≥ 1 whole numbers (not checked).
 * @example latticeEdges(2, 2, 'up', 'down') // → lo Int32Array [0, 2, 3, 2], hi Int32Array [1, 0, 1, 3]
 */
export function latticeEdges(k1: number, k2: number, d1: AxisDirection, d2: AxisDirection): LatticeEdges {
  const lo: number[] = [];
  const hi: number[] = [];
  for (let b = 0; b < k2; b++) {
    for (let a = 0; a < k1; a++) {
      const p = b * k1 + a;
      if (d1 !== 'none' && a + 1 < k1) {
        lo.push(d1 === 'up' ? p : p + 1);
        hi.push(d1 === 'up' ? p + 1 : p);
      }
      if (d2 !== 'none' && b + 1 < k2) {
        lo.push(d2 === 'up' ? p : p + k1);
        hi.push(d2 === 'up' ? p + k1 : p);
      }
    }
  }
  return { lo: Int32Array.from(lo), hi: Int32Array.from(hi) };
}

/**
 * The lattice order induced on a subset of nodes (`index[node]` ≥ 0 for members, their compact
 * index): one edge per covering pair p < q — q above p along both constrained axes (equal along an
 * unconstrained one) with no member strictly between. Keeps every order relation among the members
 * that passes through left-out nodes. O(m² log m) for m members.
 *
 * @param k1 knots along x1 (node p sits at a = p mod K1, b = ⌊p / K1⌋).
 * @param nodes the members, ascending node indices; edges use their positions in this list.
 * @example inducedOrder(3, 'up', 'up', Int32Array.from([0, 2, 4])) // → lo Int32Array [0, 0], hi Int32Array [2, 1]
 */
export function inducedOrder(k1: number, d1: AxisDirection, d2: AxisDirection, nodes: Int32Array): LatticeEdges {
  const m = nodes.length;
  const s1 = d1 === 'up' ? 1 : d1 === 'down' ? -1 : 0;
  const s2 = d2 === 'up' ? 1 : d2 === 'down' ? -1 : 0;
  const A = new Float64Array(m);
  const B = new Float64Array(m);
  const rawA = new Int32Array(m);
  const rawB = new Int32Array(m);
  for (let i = 0; i < m; i++) {
    const p = nodes[i]!;
    rawA[i] = p % k1;
    rawB[i] = (p - rawA[i]!) / k1;
    A[i] = s1 * rawA[i]!;
    B[i] = s2 * rawB[i]!;
  }
  const lo: number[] = [];
  const hi: number[] = [];
  const cands: number[] = [];
  for (let i = 0; i < m; i++) {
    cands.length = 0;
    for (let j = 0; j < m; j++) {
      if (j === i) continue;
      const okA = s1 === 0 ? rawA[j] === rawA[i] : A[j]! >= A[i]!;
      const okB = s2 === 0 ? rawB[j] === rawB[i] : B[j]! >= B[i]!;
      if (okA && okB) cands.push(j);
    }
    cands.sort((x, y) => A[x]! - A[y]! || B[x]! - B[y]!);
    let minB = Infinity;
    for (const j of cands) {
      if (B[j]! < minB) {
        lo.push(i);
        hi.push(j);
        minB = B[j]!;
      }
    }
  }
  return { lo: Int32Array.from(lo), hi: Int32Array.from(hi) };
}

/**
 * Makes θ satisfy the lattice order exactly: the mean of its smallest monotone majorant (running
 * maximum over the lower set of each node) and largest monotone minorant (running minimum over
 * the upper set). Moves each value by at most the largest order violation. When `mask` is given,
 * only masked nodes enter the envelopes, and nodes with no masked node below (above) use the
 * smallest (largest) masked value: this is the fill of unidentified nodes. Masked nodes keep their
 * values exactly when they already respect the order among themselves. Cost O(K1K2), two sweeps.
 *
 * @param theta lattice values, layout b·K1 + a; not modified.
 * @param mask optional 0/1 per node; without it every node counts.
 * @example orderEnvelopeMean(Float64Array.from([3, 1]), 2, 1, 'up', 'none') // → Float64Array [2, 2]
 * @example orderEnvelopeMean(Float64Array.from([1, 2, 0, 3, 5, 0]), 3, 2, 'up', 'up', Uint8Array.from([1, 1, 0, 1, 1, 0]))
 *   // → Float64Array [1, 2, 3.5, 3, 5, 5]
 */
export function orderEnvelopeMean(
  theta: Float64Array,
  k1: number,
  k2: number,
  d1: AxisDirection,
  d2: AxisDirection,
  mask?: Uint8Array,
): Float64Array {
  const N = k1 * k2;
  const low = new Float64Array(N).fill(-Infinity);
  const high = new Float64Array(N).fill(Infinity);
  let vmin = Infinity;
  let vmax = -Infinity;
  for (let p = 0; p < N; p++) {
    if (mask && !mask[p]) continue;
    vmin = Math.min(vmin, theta[p]!);
    vmax = Math.max(vmax, theta[p]!);
  }
  // Predecessor step along each axis in the order's direction (0 = unconstrained).
  const s1 = d1 === 'up' ? 1 : d1 === 'down' ? -1 : 0;
  const s2 = d2 === 'up' ? 1 : d2 === 'down' ? -1 : 0;
  const aOrder = (i: number): number => (s1 >= 0 ? i : k1 - 1 - i);
  const bOrder = (i: number): number => (s2 >= 0 ? i : k2 - 1 - i);
  for (let ib = 0; ib < k2; ib++) {
    const b = bOrder(ib);
    for (let ia = 0; ia < k1; ia++) {
      const a = aOrder(ia);
      const p = b * k1 + a;
      let v = mask && !mask[p] ? -Infinity : theta[p]!;
      if (s1 !== 0 && ia > 0) v = Math.max(v, low[p - s1]!);
      if (s2 !== 0 && ib > 0) v = Math.max(v, low[p - s2 * k1]!);
      low[p] = v;
    }
  }
  for (let ib = k2 - 1; ib >= 0; ib--) {
    const b = bOrder(ib);
    for (let ia = k1 - 1; ia >= 0; ia--) {
      const a = aOrder(ia);
      const p = b * k1 + a;
      let v = mask && !mask[p] ? Infinity : theta[p]!;
      if (s1 !== 0 && ia < k1 - 1) v = Math.min(v, high[p + s1]!);
      if (s2 !== 0 && ib < k2 - 1) v = Math.min(v, high[p + s2 * k1]!);
      high[p] = v;
    }
  }
  const out = new Float64Array(N);
  for (let p = 0; p < N; p++) {
    const l = low[p] === -Infinity ? vmin : low[p]!;
    const h = high[p] === Infinity ? vmax : high[p]!;
    out[p] = l === h ? l : 0.5 * l + 0.5 * h;
  }
  return out;
}
