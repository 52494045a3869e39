/**
 * Solvers for the monotone lattice quadratic program
 *
 *   minimise ½ θᵀHθ − cᵀθ  subject to  θ_hi(e) − θ_lo(e) ≥ 0 for every lattice edge e,
 *
 * with H the 9-point stencil of {@link LatticeSystem} (positive definite after the tie-break):
 * an exact primal active-set method for small lattices and ADMM with weighted pool-adjacent-
 * violators row and column steps for large ones, both judged by the same optimality certificate.
 */
import type { LatticeSystem } from './surface-lattice.js';
import { applyStencil } from './surface-lattice.js';
import { pavaSorted } from './pava.js';
import { fail } from './errors.js';

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
 * Preconditioned conjugate gradients (Jacobi) for an SPD operator, in place on `x` (warm start).
 * Stops when ‖r‖ ≤ tol·‖b‖ or after maxIter steps. Returns the steps used.
 */
function pcg(
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

function workspace(m: number) {
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

/**
 * Checks the KKT conditions of the QP ½θᵀHθ − cᵀθ, θ_hi ≥ θ_lo at θ with multipliers λ (negative
 * entries count as 0). `applyH` computes H·v; `scaleSS` is the objective's natural size (weighted
 * total sum of squares of y). O(cost of H·v + E).
 */
export function kktCertificate(
  applyH: (v: Float64Array, out: Float64Array) => void,
  rhs: Float64Array,
  edges: LatticeEdges,
  theta: Float64Array,
  lambda: Float64Array,
  scaleSS: number,
): OptimalityCertificate {
  const N = rhs.length;
  const h = new Float64Array(N);
  applyH(theta, h);
  let scale = 0;
  let tmax = 0;
  const res = new Float64Array(N);
  for (let p = 0; p < N; p++) {
    res[p] = h[p]! - rhs[p]!;
    scale = Math.max(scale, Math.abs(h[p]!), Math.abs(rhs[p]!));
    tmax = Math.max(tmax, Math.abs(theta[p]!));
  }
  let comp = 0;
  let viol = 0;
  for (let e = 0; e < edges.lo.length; e++) {
    const l = Math.max(0, lambda[e]!);
    const lo = edges.lo[e]!;
    const hi = edges.hi[e]!;
    res[hi] = res[hi]! - l;
    res[lo] = res[lo]! + l;
    const slack = theta[hi]! - theta[lo]!;
    comp += l * Math.abs(slack);
    if (-slack > viol) viol = -slack;
  }
  let stat = 0;
  for (let p = 0; p < N; p++) stat = Math.max(stat, Math.abs(res[p]!));
  return {
    stationarity: scale > 0 ? stat / scale : stat,
    complementarity: comp / (scaleSS > 0 ? scaleSS : 1),
    feasibility: tmax > 0 ? viol / tmax : viol,
  };
}

/** {@link kktCertificate} for a lattice system in stencil form. */
export function latticeCertificate(
  sys: LatticeSystem,
  edges: LatticeEdges,
  theta: Float64Array,
  lambda: Float64Array,
  scaleSS: number,
): OptimalityCertificate {
  return kktCertificate((v, out) => applyStencil(sys.stencil, sys.k1, sys.k2, v, out), sys.rhs, edges, theta, lambda, scaleSS);
}

/** Cholesky solve of a small dense SPD system in place (b ← M⁻¹b); false if not positive definite. */
function denseSolve(M: Float64Array, b: Float64Array, G: number): boolean {
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

/** Over-relaxation factor of the ADMM sweeps (1 = plain ADMM; 1.5–1.8 is the usual range). */
const RELAX = 1.6;

/** Largest group count solved with a dense Cholesky factor (G² ≤ 1,000 values). */
const DENSE_GROUPS = 31;

/**
 * Exact primal active-set method (Nocedal & Wright 2006, §16.5) for ½θᵀAθ − cᵀθ subject to
 * θ_hi(e) ≥ θ_lo(e), A sparse symmetric positive definite. The working set is a forest of edges
 * held with equality (a blocking edge always joins two different groups, so it stays a forest and
 * its constraints stay linearly independent); each group of joined variables carries one value.
 * Subproblems — the group-reduced normal equations GᵀAG φ = Gᵀc — are solved by a dense Cholesky
 * factor when there are at most 31 groups (at most 961 matrix values) and otherwise by Jacobi-
 * preconditioned conjugate gradients to rounding level, warm-started. The multiplier of a working
 * edge is the sum of the gradient Aθ − c over the part of its tree on the edge's upper side. Starts
 * at θ = 0 (feasible, and every equality holds there) with an empty working set, or — given an
 * approximate solution `warm` — with a spanning forest of the edges it holds tight (within 1e-7 of
 * its value range); the method then only corrects that guess, and the answer is exact either way.
 *
 * Cost per iteration: O(nnz + E) plus the subproblem (O(nnz) per CG step); iterations are in
 * practice a small multiple of the number of variables. Returns null when `maxIterations` is
 * reached (the caller then falls back to ADMM).
 */
export function activeSetSparse(
  A: SparseSymmetric,
  rhs: Float64Array,
  edges: LatticeEdges,
  scaleSS: number,
  maxIterations?: number,
  warm?: Float64Array,
): LatticeSolution | null {
  const N = A.n;
  const E = edges.lo.length;
  const { lo, hi } = edges;
  const inW = new Uint8Array(E);
  if (warm) {
    // Warm start: join the edges the approximate solution holds tight (a forest, by union-find).
    let vmin = Infinity;
    let vmax = -Infinity;
    for (let p = 0; p < N; p++) {
      vmin = Math.min(vmin, warm[p]!);
      vmax = Math.max(vmax, warm[p]!);
    }
    const tight = 1e-7 * Math.max(vmax - vmin, Math.abs(vmax), 1e-300);
    const root = new Int32Array(N).map((_, i) => i);
    const top = (i: number): number => {
      while (root[i] !== i) {
        root[i] = root[root[i]!]!;
        i = root[i]!;
      }
      return i;
    };
    for (let e = 0; e < E; e++) {
      if (Math.abs(warm[hi[e]!]! - warm[lo[e]!]!) <= tight) {
        const a = top(lo[e]!);
        const b = top(hi[e]!);
        if (a !== b) {
          root[a] = b;
          inW[e] = 1;
        }
      }
    }
  }
  const theta = new Float64Array(N);
  const cand = new Float64Array(N);
  const group = new Int32Array(N);
  const parent = new Int32Array(N);
  const label = new Int32Array(N);
  const full = new Float64Array(N);
  const hv = new Float64Array(N);
  const grad = new Float64Array(N);
  const lambda = new Float64Array(E);
  const limit = maxIterations ?? 20 * (N + E) + 100;
  const gbAll = new Float64Array(N);
  const phiAll = new Float64Array(N);
  const gdAll = new Float64Array(N);
  const denseAll = new Float64Array(DENSE_GROUPS * DENSE_GROUPS);
  const work = workspace(N);
  let cscale = 0;
  for (let p = 0; p < N; p++) cscale = Math.max(cscale, Math.abs(rhs[p]!));
  for (let k = 0; k < A.val.length; k++) cscale = Math.max(cscale, Math.abs(A.val[k]!));

  const find = (i: number): number => {
    while (parent[i] !== i) {
      parent[i] = parent[parent[i]!]!;
      i = parent[i]!;
    }
    return i;
  };

  for (let iter = 1; iter <= limit; iter++) {
    // Groups of the working forest.
    for (let i = 0; i < N; i++) parent[i] = i;
    for (let e = 0; e < E; e++) {
      if (inW[e]) {
        const a = find(lo[e]!);
        const b = find(hi[e]!);
        if (a !== b) parent[a] = b;
      }
    }
    let G = 0;
    label.fill(-1);
    for (let i = 0; i < N; i++) {
      const r = find(i);
      if (label[r]! < 0) label[r] = G++;
      group[i] = label[r]!;
    }
    // Reduced system: diagonal (or the whole matrix when small), right side, warm start.
    const gb = gbAll.subarray(0, G).fill(0);
    const phi = phiAll.subarray(0, G);
    const dense = G <= DENSE_GROUPS ? denseAll.subarray(0, G * G).fill(0) : null;
    const gd = gdAll.subarray(0, G).fill(0);
    for (let i = 0; i < N; i++) {
      const g = group[i]!;
      gb[g] = gb[g]! + rhs[i]!;
      phi[g] = theta[i]!;
      for (let k = A.start[i]!; k < A.start[i + 1]!; k++) {
        const h = group[A.col[k]!]!;
        if (h === g) gd[g] = gd[g]! + A.val[k]!;
        if (dense) dense[g * G + h] = dense[g * G + h]! + A.val[k]!;
      }
    }
    for (let g = 0; g < G; g++) if (!(gd[g]! > 0)) fail('NUMERICAL', 'knots', 'internal: a group normal equation is not positive');
    let solved = false;
    if (dense) {
      const b = gb.slice();
      if (denseSolve(dense, b, G)) {
        phi.set(b);
        solved = true;
      }
    }
    if (!solved) {
      const apply = (v: Float64Array, out: Float64Array): void => {
        for (let p = 0; p < N; p++) full[p] = v[group[p]!]!;
        applySparse(A, full, hv);
        out.fill(0);
        for (let p = 0; p < N; p++) out[group[p]!] = out[group[p]!]! + hv[p]!;
      };
      const w = { r: work.r.subarray(0, G), z: work.z.subarray(0, G), p: work.p.subarray(0, G), q: work.q.subarray(0, G) };
      pcg(apply, gd, gb, phi, 1e-13, 10 * G + 100, w);
    }
    for (let p = 0; p < N; p++) cand[p] = phi[group[p]!]!;

    // Ratio test over the edges outside the working set.
    let alpha = 1;
    let block = -1;
    for (let e = 0; e < E; e++) {
      if (inW[e]) continue;
      const l = lo[e]!;
      const h = hi[e]!;
      if (group[l] === group[h]) continue;
      const slack = Math.max(0, theta[h]! - theta[l]!);
      const rate = cand[h]! - cand[l]! - (theta[h]! - theta[l]!);
      if (rate < 0 && -slack / rate < alpha) {
        alpha = -slack / rate;
        block = e;
      }
    }
    if (block >= 0) {
      for (let p = 0; p < N; p++) theta[p] = theta[p]! + alpha * (cand[p]! - theta[p]!);
      inW[block] = 1;
      // The two groups meet: give them one shared value.
      const gl = group[lo[block]!]!;
      const gh = group[hi[block]!]!;
      const v = theta[lo[block]!]!;
      for (let p = 0; p < N; p++) if (group[p] === gh || group[p] === gl) theta[p] = v;
      continue;
    }
    theta.set(cand);

    // Multipliers of the working edges: subtree sums of the gradient on each tree.
    applySparse(A, theta, hv);
    let gscale = cscale;
    for (let p = 0; p < N; p++) {
      grad[p] = hv[p]! - rhs[p]!;
      gscale = Math.max(gscale, Math.abs(hv[p]!));
    }
    forestMultipliers(N, edges, inW, grad, lambda);
    const tol = 1e-11 * gscale * Math.sqrt(N);
    let worst = -tol;
    let drop = -1;
    for (let e = 0; e < E; e++) {
      if (inW[e] && lambda[e]! < worst) {
        worst = lambda[e]!;
        drop = e;
      }
    }
    if (drop < 0) {
      for (let e = 0; e < E; e++) if (!inW[e] || lambda[e]! < 0) lambda[e] = 0;
      return {
        theta,
        lambda,
        solver: 'active-set',
        iterations: iter,
        certificate: kktCertificate((v, out) => applySparse(A, v, out), rhs, edges, theta, lambda, scaleSS),
      };
    }
    inW[drop] = 0;
  }
  return null;
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

/** λₑ for working edges: Σ of grad over the tree side holding hi(e). O(N + E). */
function forestMultipliers(N: number, edges: LatticeEdges, inW: Uint8Array, grad: Float64Array, lambda: Float64Array): void {
  const E = edges.lo.length;
  const deg = new Int32Array(N + 1);
  for (let e = 0; e < E; e++) {
    if (!inW[e]) continue;
    const a = edges.lo[e]! + 1;
    const b = edges.hi[e]! + 1;
    deg[a] = deg[a]! + 1;
    deg[b] = deg[b]! + 1;
  }
  for (let i = 0; i < N; i++) deg[i + 1] = deg[i + 1]! + deg[i]!;
  const adj = new Int32Array(deg[N]!);
  const fillAt = deg.slice(0, N);
  for (let e = 0; e < E; e++) {
    if (!inW[e]) continue;
    const a = edges.lo[e]!;
    const b = edges.hi[e]!;
    adj[fillAt[a]!] = e;
    fillAt[a] = fillAt[a]! + 1;
    adj[fillAt[b]!] = e;
    fillAt[b] = fillAt[b]! + 1;
  }
  const seen = new Uint8Array(N);
  const order = new Int32Array(N);
  const viaEdge = new Int32Array(N).fill(-1);
  const sub = new Float64Array(N);
  for (let root = 0; root < N; root++) {
    if (seen[root] || deg[root + 1] === deg[root]) continue;
    // Breadth-first order of this tree, then sums from the leaves up.
    let head = 0;
    let tail = 0;
    order[tail++] = root;
    seen[root] = 1;
    while (head < tail) {
      const u = order[head++]!;
      for (let k = deg[u]!; k < deg[u + 1]!; k++) {
        const e = adj[k]!;
        const v = edges.lo[e] === u ? edges.hi[e]! : edges.lo[e]!;
        if (seen[v]) continue;
        seen[v] = 1;
        viaEdge[v] = e;
        order[tail++] = v;
      }
    }
    for (let k = 0; k < tail; k++) sub[order[k]!] = grad[order[k]!]!;
    for (let k = tail - 1; k > 0; k--) {
      const v = order[k]!;
      const e = viaEdge[v]!;
      const u = edges.lo[e] === v ? edges.hi[e]! : edges.lo[e]!;
      sub[u] = sub[u]! + sub[v]!;
    }
    const total = sub[root]!;
    for (let k = 1; k < tail; k++) {
      const v = order[k]!;
      const e = viaEdge[v]!;
      lambda[e] = edges.hi[e] === v ? sub[v]! : total - sub[v]!;
    }
  }
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

/** Weighted PAVA projection of every chain along one axis, in place on `v`. */
function projectChains(v: Float64Array, wts: Float64Array, k1: number, k2: number, axis: 1 | 2, dir: AxisDirection, bufY: Float64Array, bufW: Float64Array): void {
  if (dir === 'none') return;
  const chains = axis === 1 ? k2 : k1;
  const len = axis === 1 ? k1 : k2;
  const stride = axis === 1 ? 1 : k1;
  const sign = dir === 'up' ? 1 : -1;
  for (let c = 0; c < chains; c++) {
    const start = axis === 1 ? c * k1 : c;
    for (let k = 0; k < len; k++) {
      const p = start + k * stride;
      bufY[k] = sign * v[p]!;
      bufW[k] = wts[p]!;
    }
    const { fitted } = pavaSorted(bufY.subarray(0, len), bufW.subarray(0, len));
    for (let k = 0; k < len; k++) v[start + k * stride] = sign * fitted[k]!;
  }
}

/**
 * Multipliers from a normal-cone vector per chain: along a chain in constraint order, the edge
 * multiplier is the partial sum of the vector (clipped at 0). Writes into λ for the edges of that
 * axis, matched by endpoints.
 */
function chainMultipliers(
  normal: Float64Array,
  k1: number,
  k2: number,
  axis: 1 | 2,
  dir: AxisDirection,
  edgeIndex: Int32Array,
  lambda: Float64Array,
): void {
  if (dir === 'none') return;
  const chains = axis === 1 ? k2 : k1;
  const len = axis === 1 ? k1 : k2;
  const stride = axis === 1 ? 1 : k1;
  for (let c = 0; c < chains; c++) {
    const start = axis === 1 ? c * k1 : c;
    let acc = 0;
    for (let j = 0; j + 1 < len; j++) {
      const k = dir === 'up' ? j : len - 1 - j;
      const p = start + k * stride;
      acc += normal[p]!;
      // Edge between p and its successor in constraint order.
      const q = dir === 'up' ? p + stride : p - stride;
      const e = edgeIndex[2 * Math.min(p, q) + (axis - 1)]!;
      lambda[e] = Math.max(0, acc);
    }
  }
}

/**
 * ADMM for the lattice QP (Boyd et al. 2011, Foundations and Trends in Machine Learning 3(1)) with
 * the splitting θ = z₁ = z₂, z₁ monotone along x1, z₂ along x2, in the metric of D = diag(H)
 * (floored at its mean, so nodes with little or no data still move with their neighbours). Steps: (H + 2ρD)θ = c + ρD(z₁ − u₁ + z₂ − u₂) by warm-started
 * Jacobi-PCG on the stencil; z₁, z₂ by weighted PAVA (weights D) on every row and column; dual
 * updates; ρ balanced every 25 sweeps (factor 2 when one residual exceeds 10× the other).
 *
 * Stopping rule (checked every 10 sweeps): θ̂ = {@link orderEnvelopeMean}(θ) (exactly feasible),
 * multipliers λ = partial sums of ρDu₁ along rows and ρDu₂ along columns (clipped ≥ 0), and stop
 * when both the stationarity and the complementarity of {@link latticeCertificate} are ≤ `tol`.
 *
 * Cost: O(9·K1K2) per CG step and O(K1K2) per sweep for the projections.
 * @throws RatchetError NUMERICAL when `maxSweeps` pass without meeting the tolerance (with
 *   `strict`; otherwise the last checked iterate is returned).
 */
export function admmLattice(
  sys: LatticeSystem,
  edges: LatticeEdges,
  d1: AxisDirection,
  d2: AxisDirection,
  scaleSS: number,
  tol: number,
  maxSweeps: number,
  strict = true,
): LatticeSolution {
  const { k1, k2, stencil, rhs } = sys;
  const N = k1 * k2;
  const E = edges.lo.length;
  // Edge lookup by (smaller endpoint, axis).
  const edgeIndex = new Int32Array(2 * N).fill(-1);
  for (let e = 0; e < E; e++) {
    const a = Math.min(edges.lo[e]!, edges.hi[e]!);
    const axis = Math.abs(edges.hi[e]! - edges.lo[e]!) === 1 && k1 > 1 ? 0 : 1;
    edgeIndex[2 * a + axis] = e;
  }
  const D = new Float64Array(N);
  let mean = 0;
  for (let p = 0; p < N; p++) mean += stencil[9 * p + 4]!;
  mean /= N;
  for (let p = 0; p < N; p++) D[p] = Math.max(stencil[9 * p + 4]!, mean);
  let rho = 1;
  const theta = new Float64Array(N);
  const z1 = new Float64Array(N);
  const z2 = new Float64Array(N);
  const u1 = new Float64Array(N);
  const u2 = new Float64Array(N);
  const z1old = new Float64Array(N);
  const z2old = new Float64Array(N);
  const r1 = new Float64Array(N);
  const r2 = new Float64Array(N);
  const b = new Float64Array(N);
  const diag = new Float64Array(N);
  const hv = new Float64Array(N);
  const bufY = new Float64Array(Math.max(k1, k2));
  const bufW = new Float64Array(Math.max(k1, k2));
  const normal = new Float64Array(N);
  const lambda = new Float64Array(E);
  const work = workspace(N);
  const setDiag = (): void => {
    for (let p = 0; p < N; p++) diag[p] = stencil[9 * p + 4]! + 2 * rho * D[p]!;
  };
  setDiag();
  const apply = (v: Float64Array, out: Float64Array): void => {
    applyStencil(stencil, k1, k2, v, hv);
    for (let p = 0; p < N; p++) out[p] = hv[p]! + 2 * rho * D[p]! * v[p]!;
  };
  // Start from the unconstrained optimum (θ = z = that point, u = 0).
  pcg((v, out) => applyStencil(stencil, k1, k2, v, out), stencil.filter((_, k) => k % 9 === 4), rhs, theta, 1e-12, 2000, work);
  z1.set(theta);
  z2.set(theta);
  let best: LatticeSolution | null = null;
  for (let sweep = 1; sweep <= maxSweeps; sweep++) {
    for (let p = 0; p < N; p++) b[p] = rhs[p]! + rho * D[p]! * (z1[p]! - u1[p]! + z2[p]! - u2[p]!);
    pcg(apply, diag, b, theta, 1e-12, 200, work);
    z1old.set(z1);
    z2old.set(z2);
    // Over-relaxation (Boyd et al. 2011, §3.4.3): θ̂ = αθ + (1 − α)z_old with α = RELAX.
    for (let p = 0; p < N; p++) {
      r1[p] = RELAX * theta[p]! + (1 - RELAX) * z1old[p]!;
      r2[p] = RELAX * theta[p]! + (1 - RELAX) * z2old[p]!;
      z1[p] = r1[p]! + u1[p]!;
      z2[p] = r2[p]! + u2[p]!;
    }
    projectChains(z1, D, k1, k2, 1, d1, bufY, bufW);
    projectChains(z2, D, k1, k2, 2, d2, bufY, bufW);
    let rp = 0;
    let rd = 0;
    for (let p = 0; p < N; p++) {
      u1[p] = u1[p]! + r1[p]! - z1[p]!;
      u2[p] = u2[p]! + r2[p]! - z2[p]!;
      const a = theta[p]! - z1[p]!;
      const c = theta[p]! - z2[p]!;
      rp += D[p]! * (a * a + c * c);
      const s = z1[p]! - z1old[p]! + z2[p]! - z2old[p]!;
      rd += D[p]! * s * s;
    }
    rd *= rho * rho;
    if (sweep % 10 === 0 || sweep === maxSweeps) {
      const hat = orderEnvelopeMean(theta, k1, k2, d1, d2);
      lambda.fill(0);
      for (let p = 0; p < N; p++) normal[p] = rho * D[p]! * u1[p]!;
      chainMultipliers(normal, k1, k2, 1, d1, edgeIndex, lambda);
      for (let p = 0; p < N; p++) normal[p] = rho * D[p]! * u2[p]!;
      chainMultipliers(normal, k1, k2, 2, d2, edgeIndex, lambda);
      const certificate = latticeCertificate(sys, edges, hat, lambda, scaleSS);
      const sol: LatticeSolution = { theta: hat, lambda: lambda.slice(), solver: 'admm', iterations: sweep, certificate };
      if (certificate.stationarity <= tol && certificate.complementarity <= tol) return sol;
      best = sol;
    }
    if (sweep % 25 === 0) {
      const ratio = Math.sqrt(rp / Math.max(rd, 1e-300));
      let factor = 1;
      if (ratio > 10) factor = 2;
      else if (ratio < 0.1) factor = 0.5;
      if (factor !== 1) {
        rho *= factor;
        for (let p = 0; p < N; p++) {
          u1[p] = u1[p]! / factor;
          u2[p] = u2[p]! / factor;
        }
        setDiag();
      }
    }
  }
  if (!strict) return best!;
  const c = best!.certificate;
  return fail(
    'NUMERICAL',
    'knots',
    `the iterative solver did not reach its tolerance ${tol} in ${maxSweeps} sweeps (stationarity ${c.stationarity.toPrecision(2)}, complementarity ${c.complementarity.toPrecision(2)}); use fewer knots`,
  );
}
