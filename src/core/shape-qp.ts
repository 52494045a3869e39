/**
 * Exact solver for banded quadratic programs with sparse linear inequality constraints: the
 * engine under the concave, convex and smooth knot fits.
 */
import { fail } from './errors.js';

/**
 * One linear inequality Σₖ coefs[k]·θ[cols[k]] ≥ rhs. `cols` are ascending and span at most a few
 * adjacent positions (the shape constraints have at most three non-zeros).
 */
export interface SparseRow {
  readonly cols: Int32Array;
  readonly coefs: Float64Array;
  readonly rhs: number;
}

/** A symmetric banded matrix: `bands[k][i]` = H(i, i + k) for k = 0 … bandwidth. */
export interface SymmetricBand {
  readonly bands: readonly Float64Array[];
}

/** Solution of {@link solveBandedQp}. */
export interface BandedQpSolution {
  /** The optimal θ (length m). */
  readonly theta: Float64Array;
  /** Lagrange multiplier λᵢ ≥ 0 of every constraint (0 for inactive ones). */
  readonly multipliers: Float64Array;
  /** Indices (ascending) of the constraints held with equality in the final working set. */
  readonly active: Int32Array;
  /** Active-set iterations (KKT solves). */
  readonly iterations: number;
}

/**
 * Builds a {@link SparseRow} a·θ ≥ rhs, scaling coefficients and right-hand side by the largest
 * |coef| (so that multipliers of different rows share the units of the linear term). Cost O(q).
 *
 * @param cols ascending column indices (≥ 1). @param coefs one finite coefficient per column, not
 *   all 0. @param rhs right-hand side (default 0).
 * @throws RatchetError NUMERICAL when no coefficient is finite and non-zero.
 * @example sparseRow([0, 1], [-2, 2], 1) // → { cols: [0, 1], coefs: [-1, 1], rhs: 0.5 }
 */
export function sparseRow(cols: readonly number[], coefs: readonly number[], rhs = 0): SparseRow {
  let s = 0;
  for (const a of coefs) s = Math.max(s, Math.abs(a));
  if (!(s > 0) || !Number.isFinite(s)) fail('NUMERICAL', 'knots', 'internal: a constraint row has no finite non-zero coefficient');
  return { cols: Int32Array.from(cols), coefs: Float64Array.from(coefs, (a) => a / s), rhs: rhs / s };
}

/**
 * a·θ for a sparse row. Cost O(q) for q non-zeros.
 * @example rowDot(sparseRow([0, 1], [-1, 1]), [2, 5]) // → 3
 */
export function rowDot(row: SparseRow, theta: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k < row.cols.length; k++) s += row.coefs[k]! * theta[row.cols[k]!]!;
  return s;
}

/**
 * Hθ for a symmetric banded H (see {@link SymmetricBand}), written into `out` (default a new
 * array). Cost O(m·bandwidth).
 * @example bandTimes({ bands: [Float64Array.of(2, 2), Float64Array.of(1)] }, [1, 1]) // → Float64Array [3, 3]
 */
export function bandTimes(H: SymmetricBand, theta: ArrayLike<number>, out = new Float64Array(theta.length)): Float64Array {
  const m = theta.length;
  out.fill(0);
  const b0 = H.bands[0]!;
  for (let i = 0; i < m; i++) out[i] = b0[i]! * theta[i]!;
  for (let k = 1; k < H.bands.length; k++) {
    const bk = H.bands[k]!;
    for (let i = 0; i + k < m; i++) {
      out[i] = out[i]! + bk[i]! * theta[i + k]!;
      out[i + k] = out[i + k]! + bk[i]! * theta[i]!;
    }
  }
  return out;
}

/**
 * Minimises ½ θᵀHθ − cᵀθ subject to aᵢ·θ ≥ bᵢ for every row, for a symmetric positive definite
 * banded H, by a primal active-set method (Nocedal & Wright 2006, Numerical Optimization, §16.5).
 *
 * Each iteration solves the KKT system of the working set W,
 *   [ H  −A_Wᵀ ] [θ*]   [ c  ]
 *   [ −A_W  0  ] [λ ] = [ −b_W ],
 * ordered so that every constraint sits right after the last variable it touches: with H of
 * bandwidth p and constraints spanning at most q adjacent variables the system is banded, and
 * Gaussian elimination with partial pivoting inside the band solves it in O(m·(p + q + |W|/m)²).
 * The step goes from the current point toward θ*; a constraint outside W blocks only when θ*
 * itself breaks it, and then it joins W. When θ* is reached, the working constraint with the most
 * negative multiplier (below −1e-12·max|c|, |Hθ|, in the units of c because rows are scaled to
 * a largest coefficient of 1) leaves W; when none does, θ is optimal and the multipliers certify
 * it (stationarity Hθ − c = Aᵀλ, λ ≥ 0, Aθ ≥ b, λᵢ(aᵢ·θ − bᵢ) = 0).
 *
 * Cost: O(m·s²) per iteration, s the band width of the KKT system (a small constant for the shape
 * constraints); the iteration count is finite and in practice a small multiple of the number of
 * constraints that change state. Memory O(m·s).
 *
 * @param H symmetric positive definite banded matrix (m × m, m ≥ 1).
 * @param c linear term, length m.
 * @param rows constraints; `start` must satisfy all of them.
 * @param start a feasible starting point (not modified).
 * @param working indices of constraints active at `start` that are linearly independent (the
 *   initial working set; may be empty).
 * @throws RatchetError NUMERICAL when a KKT system is singular (H not positive definite, or a
 *   dependent working set) or the method does not converge — neither happens for the shape
 *   problems; tests check the certificate.
 * @example solveBandedQp({ bands: [Float64Array.of(1, 1)] }, [2, 1], [sparseRow([0, 1], [-1, 1])], [0, 0], []).theta
 *   // → Float64Array [1.5, 1.5]
 */
export function solveBandedQp(
  H: SymmetricBand,
  c: ArrayLike<number>,
  rows: readonly SparseRow[],
  start: ArrayLike<number>,
  working: readonly number[],
): BandedQpSolution {
  const m = c.length;
  const p = H.bands.length - 1;
  const nr = rows.length;
  const theta = Float64Array.from(start);
  const inW = new Uint8Array(nr);
  for (const r of working) inW[r] = 1;
  const candidate = new Float64Array(m);
  const lambda = new Float64Array(nr);
  const hTheta = new Float64Array(m);
  let cScale = 0;
  for (let i = 0; i < m; i++) cScale = Math.max(cScale, Math.abs(c[i]!));
  const maxIterations = 20 * (m + nr) + 100;
  for (let iter = 1; iter <= maxIterations; iter++) {
    const W: number[] = [];
    for (let r = 0; r < nr; r++) if (inW[r]) W.push(r);
    const lam = kktSolve(H, p, c, rows, W, candidate);
    // Ratio test: largest step toward the candidate that keeps the constraints outside W.
    let alpha = 1;
    let block = -1;
    for (let r = 0; r < nr; r++) {
      if (inW[r]) continue;
      const row = rows[r]!;
      const after = rowDot(row, candidate) - row.rhs;
      if (!(after < 0)) continue;
      const slack = Math.max(0, rowDot(row, theta) - row.rhs);
      const ratio = Math.min(1, slack / (slack - after));
      if (block === -1 || ratio < alpha) {
        alpha = ratio;
        block = r;
      }
    }
    if (block !== -1) {
      for (let i = 0; i < m; i++) theta[i] = theta[i]! + alpha * (candidate[i]! - theta[i]!);
      inW[block] = 1;
      continue;
    }
    theta.set(candidate);
    bandTimes(H, theta, hTheta);
    let scale = cScale;
    for (let i = 0; i < m; i++) scale = Math.max(scale, Math.abs(hTheta[i]!));
    let worst = -1e-12 * scale;
    let drop = -1;
    for (let k = 0; k < W.length; k++) {
      if (lam[k]! < worst) {
        worst = lam[k]!;
        drop = W[k]!;
      }
    }
    if (drop === -1) {
      for (let k = 0; k < W.length; k++) lambda[W[k]!] = Math.max(0, lam[k]!);
      return { theta, multipliers: lambda, active: Int32Array.from(W), iterations: iter };
    }
    inW[drop] = 0;
  }
  return fail('NUMERICAL', 'knots', 'internal: the shape active-set method did not converge');
}

/**
 * Solves the KKT system of the working set W (see {@link solveBandedQp}); writes θ* into `out`
 * and returns the multipliers of W in order.
 */
function kktSolve(
  H: SymmetricBand,
  p: number,
  c: ArrayLike<number>,
  rows: readonly SparseRow[],
  W: readonly number[],
  out: Float64Array,
): Float64Array {
  const m = c.length;
  const N = m + W.length;
  // Ordering: variable j, then the working constraints whose last column is j.
  const posVar = new Int32Array(m);
  const posCon = new Int32Array(W.length);
  const byLast: number[][] = Array.from({ length: m }, () => []);
  W.forEach((r, k) => {
    const cols = rows[r]!.cols;
    byLast[cols[cols.length - 1]!]!.push(k);
  });
  let pos = 0;
  for (let j = 0; j < m; j++) {
    posVar[j] = pos++;
    for (const k of byLast[j]!) posCon[k] = pos++;
  }
  // Half-bandwidth of the ordered system.
  let bw = 0;
  for (let j = 0; j < m; j++) {
    const q = Math.min(m - 1, j + p);
    bw = Math.max(bw, posVar[q]! - posVar[j]!);
  }
  W.forEach((r, k) => {
    for (const col of rows[r]!.cols) bw = Math.max(bw, Math.abs(posCon[k]! - posVar[col]!));
  });
  // Band storage: row i holds columns i − bw … i + 2bw (room for fill from row swaps).
  const width = 3 * bw + 1;
  const A = new Float64Array(N * width);
  const rhs = new Float64Array(N);
  const at = (i: number, j: number) => i * width + (j - i + bw);
  for (let k = 0; k <= p; k++) {
    const bk = H.bands[k]!;
    for (let i = 0; i + k < m; i++) {
      const v = bk[i]!;
      if (v === 0) continue;
      const a = posVar[i]!;
      const b = posVar[i + k]!;
      A[at(a, b)] = A[at(a, b)]! + v;
      if (k > 0) A[at(b, a)] = A[at(b, a)]! + v;
    }
  }
  for (let j = 0; j < m; j++) rhs[posVar[j]!] = c[j]!;
  W.forEach((r, k) => {
    const row = rows[r]!;
    const pc = posCon[k]!;
    for (let q = 0; q < row.cols.length; q++) {
      const pv = posVar[row.cols[q]!]!;
      A[at(pc, pv)] = A[at(pc, pv)]! - row.coefs[q]!;
      A[at(pv, pc)] = A[at(pv, pc)]! - row.coefs[q]!;
    }
    rhs[pc] = -row.rhs;
  });
  // Gaussian elimination with partial pivoting inside the band.
  let normA = 0;
  for (let i = 0; i < A.length; i++) normA = Math.max(normA, Math.abs(A[i]!));
  for (let k = 0; k < N; k++) {
    const last = Math.min(N - 1, k + bw);
    let piv = k;
    let best = Math.abs(A[at(k, k)]!);
    for (let i = k + 1; i <= last; i++) {
      const v = Math.abs(A[at(i, k)]!);
      if (v > best) {
        best = v;
        piv = i;
      }
    }
    if (!(best > 1e-14 * normA)) fail('NUMERICAL', 'knots', 'internal: a shape KKT system is singular');
    const right = Math.min(N - 1, k + 2 * bw);
    if (piv !== k) {
      for (let j = k; j <= right; j++) {
        const u = A[at(k, j)]!;
        A[at(k, j)] = A[at(piv, j)]!;
        A[at(piv, j)] = u;
      }
      const u = rhs[k]!;
      rhs[k] = rhs[piv]!;
      rhs[piv] = u;
    }
    const d = A[at(k, k)]!;
    for (let i = k + 1; i <= last; i++) {
      const f = A[at(i, k)]! / d;
      if (f === 0) continue;
      A[at(i, k)] = 0;
      for (let j = k + 1; j <= right; j++) A[at(i, j)] = A[at(i, j)]! - f * A[at(k, j)]!;
      rhs[i] = rhs[i]! - f * rhs[k]!;
    }
  }
  const sol = new Float64Array(N);
  for (let k = N - 1; k >= 0; k--) {
    let s = rhs[k]!;
    const right = Math.min(N - 1, k + 2 * bw);
    for (let j = k + 1; j <= right; j++) s -= A[at(k, j)]! * sol[j]!;
    sol[k] = s / A[at(k, k)]!;
  }
  for (let j = 0; j < m; j++) out[j] = sol[posVar[j]!]!;
  const lam = new Float64Array(W.length);
  for (let k = 0; k < W.length; k++) lam[k] = sol[posCon[k]!]!;
  return lam;
}

/**
 * A basis Z of the null space of the given constraint rows: the directions along which a fit may
 * move while every one of those constraints stays active. Used to build the reduced design B·Z on
 * which a constrained optimum is the plain least-squares fit (bands conditional on the active set).
 *
 * Computed by Gaussian elimination with partial pivoting on the dense (a × m) matrix of the rows,
 * then one basis vector per free column (back substitution); columns of Z are in ascending order
 * of their free variable. Cost O(a·m²) time, O(m²) memory — for knot tables (m ≤ a few hundred),
 * not for data rows.
 *
 * @param m number of variables (≥ 1).
 * @param rows the active constraint rows (e.g. `constraints` indexed by `active` of a shape fit).
 * @returns Z as an array of columns, each a Float64Array of length m; a pivot below 1e-12 of the
 *   row's scale counts as zero (dependent rows are ignored).
 * @example nullSpaceBasis(3, [sparseRow([0, 1], [-1, 1])]) // → [[1, 1, 0], [0, 0, 1]]
 */
export function nullSpaceBasis(m: number, rows: readonly SparseRow[]): Float64Array[] {
  const a = rows.length;
  const M = rows.map((row) => {
    const r = new Float64Array(m);
    for (let q = 0; q < row.cols.length; q++) r[row.cols[q]!] = row.coefs[q]!;
    return r;
  });
  const pivotCol: number[] = [];
  let rank = 0;
  for (let col = 0; col < m && rank < a; col++) {
    let piv = -1;
    let best = 1e-12;
    for (let i = rank; i < a; i++) {
      const v = Math.abs(M[i]![col]!);
      if (v > best) {
        best = v;
        piv = i;
      }
    }
    if (piv === -1) continue;
    [M[rank], M[piv]] = [M[piv]!, M[rank]!];
    const pr = M[rank]!;
    const d = pr[col]!;
    for (let j = col; j < m; j++) pr[j] = pr[j]! / d;
    for (let i = 0; i < a; i++) {
      if (i === rank) continue;
      const f = M[i]![col]!;
      if (f === 0) continue;
      const ri = M[i]!;
      for (let j = col; j < m; j++) ri[j] = ri[j]! - f * pr[j]!;
    }
    pivotCol.push(col);
    rank++;
  }
  const isPivot = new Uint8Array(m);
  for (const col of pivotCol) isPivot[col] = 1;
  const Z: Float64Array[] = [];
  for (let free = 0; free < m; free++) {
    if (isPivot[free]) continue;
    const z = new Float64Array(m);
    z[free] = 1;
    for (let r = 0; r < rank; r++) z[pivotCol[r]!] = 0 - M[r]![free]!;
    Z.push(z);
  }
  return Z;
}
