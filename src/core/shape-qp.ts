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
  /**
   * Optional low-order parts of the same shape (H = bands + low exactly): normal equations
   * accumulated in twice the working precision, so that a heavy row's entries do not round away
   * the light rows' share. Used by the refinement of {@link solveBandedQp}.
   */
  readonly low?: readonly Float64Array[] | undefined;
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
  if (!(s > 0) || !Number.isFinite(s)) fail('NUMERICAL', 'knots', 'needs knots whose gaps are not so small that their reciprocals overflow (a shape constraint has no finite coefficient)');
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
 * Tolerance of a multiplier λₖ: a working constraint leaves the working set only when
 *   λₖ < −(MULTIPLIER_TOL·(ρ·sₖ + |λₖ|) + REFINE_SAFETY·|last refinement correction of λₖ|),
 * sₖ the smallest bⱼ/|aₖⱼ| over the constraint's columns j, bⱼ the sum of the magnitudes of the
 * terms of stationarity row j (|cⱼ| + Σᵢ|Hⱼᵢθᵢ| + Σₖ|aₖⱼλₖ|). Because H and c are carried in twice
 * the working precision and the KKT solve is refined, λ is accurate far below u·bⱼ (the rounding
 * of a row's terms, which a heavy row makes larger than a light row's multiplier): the remaining
 * error is what the refinement's last correction shows. ρ·MULTIPLIER_TOL·sₖ is a floor for
 * multipliers that are zero in exact arithmetic (degenerate problems, e.g. knots without data,
 * would cycle otherwise): ρ = 1 (the caller's `termShare`, default) where no row is much heavier
 * than the others, and 2^-40 (1e-24·sₖ in all) for weights far apart, where a light row's
 * multiplier can be 1e-15 of sₖ. See docs/tolerances.md, "Scale and weights".
 */
const MULTIPLIER_TOL = 1e-12;
/** Safety factor over the last refinement correction (an estimate of the error left before it). */
const REFINE_SAFETY = 16;

/** Refinement steps of one KKT solve before it counts as not converging. */
const MAX_REFINE = 12;

/** Veltkamp's splitting constant 2^27 + 1. */
const SPLIT = 134217729;

/**
 * The rounding error of a product: for p = fl(a·b), returns e with a·b = p + e exactly (Dekker 1971,
 * "A floating-point technique for extending the available precision", Numer. Math. 18; Veltkamp's
 * splitting). Cost O(1), about 17 flops.
 *
 * @param a finite, |a| below about 1e290 (the splitting multiplies by 2^27 + 1).
 * @param b finite, same range. @param p fl(a·b), the rounded product.
 * @returns the exact error term; 0 when a splitting overflows (then the error is not available,
 *   and callers fall back to the rounded product alone).
 * @example twoProductError(0.1, 0.1, 0.1 * 0.1) // → -8.326672684688674e-19
 */
export function twoProductError(a: number, b: number, p: number): number {
  let t = SPLIT * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLIT * b;
  const bh = t - (t - b);
  const bl = b - bh;
  const e = al * bl - (((p - ah * bh) - al * bh) - ah * bl);
  return Number.isFinite(e) ? e : 0;
}

/** Compensated accumulator (TwoSum and TwoProduct; Ogita, Rump & Oishi 2005): sum hi + lo. */
let accHi = 0;
let accLo = 0;
let accMag = 0;
function accReset(v: number, lo = 0): void {
  accHi = v;
  accLo = lo;
  accMag = Math.abs(v);
}
function accAdd(v: number): void {
  const s = accHi + v;
  const z = s - accHi;
  accLo += (accHi - (s - z)) + (v - z);
  accHi = s;
}
function accAddProduct(a: number, b: number): void {
  const p = a * b;
  accAdd(p);
  accLo += twoProductError(a, b, p);
  accMag += Math.abs(p);
}

/**
 * Minimises ½ θᵀHθ − cᵀθ subject to aᵢ·θ ≥ bᵢ for every row, for a symmetric positive definite
 * banded H, by a primal active-set method (Nocedal & Wright 2006, Numerical Optimization, §16.5).
 *
 * Each iteration solves the KKT system of the working set W,
 *   [ H  −A_Wᵀ ] [θ*]   [ c  ]
 *   [ −A_W  0  ] [λ ] = [ −b_W ],
 * ordered so that every constraint sits right after the last variable it touches: with H of
 * bandwidth p and constraints spanning at most q adjacent variables the system is banded. It is
 * equilibrated by powers of two (each variable by 1/√Hⱼⱼ, each constraint to a largest
 * coefficient of 1, so one heavy row does not make the others' pivots look like zero), factored
 * once by Gaussian elimination with partial pivoting inside the band, and then refined: residuals
 * of the unscaled system are computed with error-free products and sums (H and c may carry
 * low-order parts, `H.low` and `cLow`, so that normal equations of heavy rows keep the light rows'
 * share) and solved with the same factors until the correction stops shrinking (Higham 2002,
 * Accuracy and Stability of Numerical Algorithms, ch. 12). The step goes from the current point
 * toward θ*; a constraint outside W blocks only when θ* itself breaks it, and then it joins W.
 * When θ* is reached, the working constraint whose multiplier is most negative relative to its
 * tolerance leaves W. Tolerance: with ordinary weights (termShare 1) 1e-12 × the largest entry of
 * c and Hθ, which keeps the degenerate problems of knots without data from chasing rounding;
 * with weights far apart (termShare < 1) one relative to the terms the multiplier is made of (see
 * MULTIPLIER_TOL), so a heavy row cannot mask a light row's multiplier; a constraint dropped and re-added by the next step without movement is not
 * dropped again until a step moves θ. When none leaves, θ is optimal and the multipliers certify
 * it (stationarity Hθ − c = Aᵀλ, λ ≥ 0, Aθ ≥ b, λᵢ(aᵢ·θ − bᵢ) = 0).
 *
 * Cost: O(m·s²) per iteration (times the few refinement steps, usually one or two), s the band
 * width of the KKT system (a small constant for the shape constraints); the iteration count is
 * finite and in practice a small multiple of the number of constraints that change state.
 * Memory O(m·s).
 *
 * @param H symmetric positive definite banded matrix (m × m, m ≥ 1); optional `low` bands of the
 *   same shape hold the low-order parts (H = bands + low exactly).
 * @param c linear term, length m.
 * @param rows constraints; `start` must satisfy all of them.
 * @param start a feasible starting point (not modified).
 * @param working indices of constraints active at `start` that are linearly independent (the
 *   initial working set; may be empty).
 * @param cLow low-order part of c (default none).
 * @param termShare ρ in the multiplier tolerance (see MULTIPLIER_TOL): 1 (default) for ordinary
 *   weights, 2^-40 when the weights span a wide ratio; any value in (0, 1]. Below 1 the solve is
 *   also strict: a KKT solve that refinement does not bring to 1e-10 (scaled norm) is refused
 *   with NUMERICAL; at 1 the refined solution is used as it stands.
 * @throws RatchetError NUMERICAL (message for the user: what to change) when a KKT system is
 *   singular to working precision after equilibration (H not positive definite, a dependent
 *   working set, or heavy rows that leave a direction undetermined), when refinement does not
 *   bring a solve to 1e-10 relative, or when the method does not converge.
 * @example solveBandedQp({ bands: [Float64Array.of(1, 1)] }, [2, 1], [sparseRow([0, 1], [-1, 1])], [0, 0], []).theta
 *   // → Float64Array [1.5, 1.5]
 */
export function solveBandedQp(
  H: SymmetricBand,
  c: ArrayLike<number>,
  rows: readonly SparseRow[],
  start: ArrayLike<number>,
  working: readonly number[],
  cLow?: ArrayLike<number>,
  termShare = 1,
): BandedQpSolution {
  const m = c.length;
  const p = H.bands.length - 1;
  const nr = rows.length;
  const theta = Float64Array.from(start);
  const inW = new Uint8Array(nr);
  for (const r of working) inW[r] = 1;
  const candidate = new Float64Array(m);
  const lambda = new Float64Array(nr);
  const settled = new Uint8Array(nr);
  const hTheta = new Float64Array(m);
  let lastDropped = -1;
  const maxIterations = 20 * (m + nr) + 100;
  for (let iter = 1; iter <= maxIterations; iter++) {
    const W: number[] = [];
    for (let r = 0; r < nr; r++) if (inW[r]) W.push(r);
    const { lam, size } = kktSolve(H, p, c, cLow, rows, W, candidate, termShare);
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
      if (alpha > 0) settled.fill(0);
      else if (block === lastDropped) settled[block] = 1;
      lastDropped = -1;
      for (let i = 0; i < m; i++) theta[i] = theta[i]! + alpha * (candidate[i]! - theta[i]!);
      inW[block] = 1;
      continue;
    }
    for (let i = 0; i < m; i++) {
      if (candidate[i] !== theta[i]) {
        settled.fill(0);
        break;
      }
    }
    theta.set(candidate);
    // Ordinary weights (termShare 1, ratio below 2^20): a multiplier counts as negative below
    // −1e-12 × the largest entry of c or Hθ — at most about 1e-6 of a light row's share, and it
    // keeps knots without data (the tie-break's degenerate problems) from chasing rounding. Weights
    // far apart use the relative tolerance, since that floor would hide the light rows.
    let floor = 0;
    if (termShare === 1) {
      bandTimes(H, theta, hTheta);
      for (let i = 0; i < m; i++) floor = Math.max(floor, Math.abs(c[i]!), Math.abs(hTheta[i]!));
      floor *= MULTIPLIER_TOL;
    }
    let worst = 0;
    let drop = -1;
    for (let k = 0; k < W.length; k++) {
      const r = W[k]!;
      if (settled[r]) continue;
      const tol = termShare === 1 ? floor : size[k]!;
      if (!(lam[k]! < -tol)) continue;
      const score = tol > 0 ? lam[k]! / tol : -Infinity;
      if (drop === -1 || score < worst) {
        worst = score;
        drop = r;
      }
    }
    if (drop === -1) {
      for (let k = 0; k < W.length; k++) lambda[W[k]!] = Math.max(0, lam[k]!);
      return { theta, multipliers: lambda, active: Int32Array.from(W), iterations: iter };
    }
    lastDropped = drop;
    inW[drop] = 0;
  }
  return fail('NUMERICAL', 'knots', 'needs a better-determined problem: the shaped fit did not converge; use fewer knots or bring the weights within a ratio of about 1e12');
}

/** Message of a KKT system that is singular to working precision. */
const SINGULAR =
  'needs data that determine every coefficient of the shaped curve: its optimality system is singular to working precision; use fewer knots, put a knot at the x of any row far heavier than the others, or bring the weights within a ratio of about 1e12';

/**
 * Solves the KKT system of the working set W (see {@link solveBandedQp}) with equilibration and
 * iterative refinement; writes θ* into `out` and returns the multipliers of W in order, with the
 * scale of each multiplier (the smallest bⱼ/|aₖⱼ| over its columns).
 */
function kktSolve(
  H: SymmetricBand,
  p: number,
  c: ArrayLike<number>,
  cLow: ArrayLike<number> | undefined,
  rows: readonly SparseRow[],
  W: readonly number[],
  out: Float64Array,
  termShare: number,
): { lam: Float64Array; size: Float64Array } {
  const m = c.length;
  const N = m + W.length;
  const low = H.low;
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
  // Equilibration by powers of two: D = diag(scale) in the ordered positions.
  const scale = new Float64Array(N);
  const b0 = H.bands[0]!;
  for (let j = 0; j < m; j++) {
    const h = b0[j]!;
    scale[posVar[j]!] = h > 0 && Number.isFinite(h) ? 2 ** -Math.round(Math.log2(h) / 2) : 1;
  }
  W.forEach((r, k) => {
    const row = rows[r]!;
    let big = 0;
    for (let q = 0; q < row.cols.length; q++) big = Math.max(big, Math.abs(row.coefs[q]! * scale[posVar[row.cols[q]!]!]!));
    scale[posCon[k]!] = big > 0 ? 2 ** -Math.round(Math.log2(big)) : 1;
  });
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
  const at = (i: number, j: number) => i * width + (j - i + bw);
  for (let k = 0; k <= p; k++) {
    const bk = H.bands[k]!;
    for (let i = 0; i + k < m; i++) {
      const v = bk[i]!;
      if (v === 0) continue;
      const a = posVar[i]!;
      const b = posVar[i + k]!;
      const sv = v * scale[a]! * scale[b]!;
      A[at(a, b)] = A[at(a, b)]! + sv;
      if (k > 0) A[at(b, a)] = A[at(b, a)]! + sv;
    }
  }
  W.forEach((r, k) => {
    const row = rows[r]!;
    const pc = posCon[k]!;
    for (let q = 0; q < row.cols.length; q++) {
      const pv = posVar[row.cols[q]!]!;
      const sv = row.coefs[q]! * scale[pc]! * scale[pv]!;
      A[at(pc, pv)] = A[at(pc, pv)]! - sv;
      A[at(pv, pc)] = A[at(pv, pc)]! - sv;
    }
  });
  // LU with partial pivoting inside the band; multipliers kept below the diagonal.
  const pivot = new Int32Array(N);
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
    // Entries of the equilibrated system are at most about 2 in magnitude.
    if (!(best > 1e-13)) fail('NUMERICAL', 'knots', SINGULAR);
    pivot[k] = piv;
    const right = Math.min(N - 1, k + 2 * bw);
    if (piv !== k) {
      for (let j = k; j <= right; j++) {
        const u = A[at(k, j)]!;
        A[at(k, j)] = A[at(piv, j)]!;
        A[at(piv, j)] = u;
      }
    }
    const d = A[at(k, k)]!;
    for (let i = k + 1; i <= last; i++) {
      const f = A[at(i, k)]! / d;
      A[at(i, k)] = f;
      if (f === 0) continue;
      for (let j = k + 1; j <= right; j++) A[at(i, j)] = A[at(i, j)]! - f * A[at(k, j)]!;
    }
  }
  /** Solves the scaled system for the unscaled right-hand side r (in place: r becomes the correction). */
  const solveScaled = (r: Float64Array): void => {
    for (let i = 0; i < N; i++) r[i] = r[i]! * scale[i]!;
    for (let k = 0; k < N; k++) {
      const piv = pivot[k]!;
      if (piv !== k) {
        const u = r[k]!;
        r[k] = r[piv]!;
        r[piv] = u;
      }
      const last = Math.min(N - 1, k + bw);
      const rk = r[k]!;
      if (rk !== 0) for (let i = k + 1; i <= last; i++) r[i] = r[i]! - A[at(i, k)]! * rk;
    }
    for (let k = N - 1; k >= 0; k--) {
      let s = r[k]!;
      const right = Math.min(N - 1, k + 2 * bw);
      for (let j = k + 1; j <= right; j++) s -= A[at(k, j)]! * r[j]!;
      r[k] = s / A[at(k, k)]!;
    }
    for (let i = 0; i < N; i++) r[i] = r[i]! * scale[i]!;
  };
  // Column lists of the working constraints per variable, for the residual of row j.
  const conOf: number[][] = Array.from({ length: m }, () => []);
  W.forEach((r, k) => {
    for (let q = 0; q < rows[r]!.cols.length; q++) conOf[rows[r]!.cols[q]!]!.push(k, q);
  });
  const th = new Float64Array(m);
  const lam = new Float64Array(W.length);
  const mag = new Float64Array(m);
  const res = new Float64Array(N);
  /** Residual rhs − K·(θ, λ), compensated; also the magnitudes of the stationarity rows. */
  const residual = (): void => {
    for (let j = 0; j < m; j++) {
      accReset(c[j]!, cLow === undefined ? 0 : cLow[j]!);
      for (let k = 0; k <= p; k++) {
        const bk = H.bands[k]!;
        const lk = low?.[k];
        if (j + k < m) {
          accAddProduct(-bk[j]!, th[j + k]!);
          if (lk !== undefined) accAddProduct(-lk[j]!, th[j + k]!);
        }
        if (k > 0 && j - k >= 0) {
          accAddProduct(-bk[j - k]!, th[j - k]!);
          if (lk !== undefined) accAddProduct(-lk[j - k]!, th[j - k]!);
        }
      }
      const list = conOf[j]!;
      for (let t = 0; t < list.length; t += 2) accAddProduct(rows[W[list[t]!]!]!.coefs[list[t + 1]!]!, lam[list[t]!]!);
      res[posVar[j]!] = accHi + accLo;
      mag[j] = accMag;
    }
    W.forEach((r, k) => {
      const row = rows[r]!;
      accReset(-row.rhs);
      for (let q = 0; q < row.cols.length; q++) accAddProduct(row.coefs[q]!, th[row.cols[q]!]!);
      res[posCon[k]!] = accHi + accLo;
    });
  };
  // First solve, then refinement.
  const sol = new Float64Array(N);
  for (let j = 0; j < m; j++) sol[posVar[j]!] = c[j]!;
  W.forEach((r, k) => {
    sol[posCon[k]!] = -rows[r]!.rhs;
  });
  solveScaled(sol);
  const unpack = (): void => {
    for (let j = 0; j < m; j++) th[j] = sol[posVar[j]!]!;
    for (let k = 0; k < W.length; k++) lam[k] = sol[posCon[k]!]!;
  };
  unpack();
  let previous = Infinity;
  let converged = false;
  const lastCorrection = new Float64Array(W.length);
  for (let step = 0; step < MAX_REFINE; step++) {
    residual();
    solveScaled(res);
    for (let k = 0; k < W.length; k++) lastCorrection[k] = Math.abs(res[posCon[k]!]!);
    let dn = 0;
    let xn = 0;
    let componentwise = true;
    for (let i = 0; i < N; i++) {
      dn = Math.max(dn, Math.abs(res[i]! / scale[i]!));
      xn = Math.max(xn, Math.abs(sol[i]! / scale[i]!));
      if (!(Math.abs(res[i]!) <= 4e-16 * Math.abs(sol[i]!))) componentwise = false;
    }
    // A correction that does not shrink is rounding (or divergence): it is not applied.
    if (!Number.isFinite(dn) || dn >= previous) {
      converged = dn <= 1e-10 * xn;
      break;
    }
    for (let i = 0; i < N; i++) sol[i] = sol[i]! + res[i]!;
    unpack();
    // Converged: every component (θ and λ alike) changed by at most a few ulps, or the correction
    // vanished in the scaled norm.
    if (componentwise || dn === 0) {
      converged = true;
      break;
    }
    // Stagnation at the level of rounding: the correction shrinks too slowly to go on.
    if (dn > 0.5 * previous) {
      converged = dn <= 1e-10 * xn;
      break;
    }
    previous = dn;
  }
  // Ordinary weights keep the refined solution as it is (near-singular H is the tie-break's case,
  // see shapeRegression); weights far apart (termShare < 1) need the solve to 1e-10.
  if (!converged && termShare < 1) fail('NUMERICAL', 'knots', SINGULAR);
  residual();
  out.set(th);
  const size = new Float64Array(W.length);
  W.forEach((r, k) => {
    const row = rows[r]!;
    let s = Infinity;
    for (let q = 0; q < row.cols.length; q++) s = Math.min(s, mag[row.cols[q]!]! / Math.abs(row.coefs[q]!));
    size[k] = MULTIPLIER_TOL * (termShare * s + Math.abs(lam[k]!)) + REFINE_SAFETY * lastCorrection[k]!;
  });
  return { lam, size };
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
