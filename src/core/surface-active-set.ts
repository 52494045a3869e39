/**
 * The exact primal active-set method for the lattice quadratic program on a forest of joined nodes
 * (see surface-solve.ts for the problem).
 */
import { fail } from './errors.js';
import type { LatticeEdges, LatticeSolution } from './surface-solve.js';
import { applySparse, denseSolve, pcg, workspace, type SparseSymmetric } from './surface-sparse.js';
import { kktCertificate } from './surface-certificate.js';

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
