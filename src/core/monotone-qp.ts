/**
 * Exact solver for the tridiagonal monotone quadratic program behind the knot model.
 */
import { fail } from './errors.js';

/**
 * Relative tolerance of a multiplier per term summed: about 45 ulps (u = 2^-53 ≈ 1.1e-16), a
 * safety factor over the rounding of g = c − Hθ and of the subproblem solve. See docs/tolerances.md.
 */
const MULTIPLIER_TOL = 5e-15;

/**
 * Share of bᵢ = |cᵢ| + Σⱼ|Hᵢⱼθⱼ| kept in each multiplier's tolerance: 5e-19·bᵢ in all, far above
 * the rounding left after compensation and refinement (about u²·bᵢ times the conditioning) and far
 * below a light row's multiplier next to a row 1e15 times heavier. It stops the method from acting
 * on multipliers that are zero up to rounding (degenerate problems would cycle otherwise).
 */
const NOISE_FLOOR = 1e-4;

/** Veltkamp's splitting constant 2^27 + 1. */
const SPLIT = 134217729;

/** Error term of the product a·b (Dekker 1971): a·b = fl(a·b) + twoProductError(a, b, fl(a·b)) exactly. */
function twoProductError(a: number, b: number, p: number): number {
  let t = SPLIT * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLIT * b;
  const bh = t - (t - b);
  const bl = b - bh;
  return al * bl - (((p - ah * bh) - al * bh) - ah * bl);
}

/**
 * c − d·θ − eₗ·θₗ − eᵣ·θᵣ with error-free transformations (TwoSum, Dekker's TwoProduct; Ogita,
 * Rump & Oishi 2005, "Accurate sum and dot product", SIAM J. Sci. Comput. 26) — as accurate as if
 * computed in twice the working precision, then rounded. Falls back to the plain expression when
 * a splitting would overflow (entries beyond about 1e290, which the knot model never passes).
 */
function residualEntry(c: number, d: number, th: number, el: number, thl: number, er: number, thr: number): number {
  let s = c;
  let err = 0;
  const add = (p: number, pe: number): void => {
    // s + (−p) by TwoSum, then the errors of the product and of the sum are accumulated.
    const q = -p;
    const x = s + q;
    const z = x - s;
    err += (s - (x - z)) + (q - z) - pe;
    s = x;
  };
  let p = d * th;
  add(p, twoProductError(d, th, p));
  if (el !== 0) {
    p = el * thl;
    add(p, twoProductError(el, thl, p));
  }
  if (er !== 0) {
    p = er * thr;
    add(p, twoProductError(er, thr, p));
  }
  const r = s + err;
  return Number.isFinite(r) ? r : c - (d * th + el * thl + er * thr);
}

/** Solution of {@link solveMonotoneTridiagonal}. */
export interface MonotoneQpSolution {
  /** The optimal, non-decreasing θ (length m). */
  theta: Float64Array;
  /** Active-set iterations used (subproblem solves). */
  iterations: number;
  /**
   * Smallest ratio pivot / diagonal of the Thomas elimination in the final subproblem (1 when no
   * elimination was needed). About u/pivotRatio (u ≈ 1.1e-16) is the relative accuracy of the
   * least-determined direction of θ: a caller that needs 1e-9 refuses ratios below 1e-7.
   */
  pivotRatio: number;
}

/**
 * Minimises ½ θᵀHθ − cᵀθ subject to lower ≤ θ₀ ≤ θ₁ ≤ … ≤ θ_{m−1} ≤ upper, for a symmetric
 * positive definite tridiagonal H (diagonal `d`, off-diagonal `e`), by a primal active-set method
 * on groups of adjacent equal values (Nocedal & Wright 2006, Numerical Optimization, §16.5).
 *
 * The working set is a set of chain constraints held with equality; joined positions form groups
 * with one value each, and the two bounds act as fixed anchors at either end. Each subproblem is
 * the tridiagonal system of the group values (the group basis keeps H tridiagonal), solved by the
 * Thomas algorithm in O(m). The method starts from the single pooled group (feasible), takes
 * steps to subproblem minimisers, adds a blocking constraint when a step would break the order,
 * and drops the constraint with the most negative multiplier when the subproblem is solved. With
 * g = c − Hθ, the multiplier of the constraint between k and k+1 inside a group starting at s is
 * λ_k = Σ_{i=s..k} g_i (from the right end for a group anchored at the lower bound). g is computed
 * with compensated (error-free) products and sums, and corrected inside each free group for the
 * rounding of the group's value; a multiplier counts as negative below −5e-15·(L + 1)·(Σ|gᵢ| over
 * its L terms + the coupling to the neighbouring groups). The tolerance is relative to the terms
 * that make up each multiplier — one heavy row (weight ratios up to 1e15) cannot mask the
 * multipliers of light ones — and scaling c (or H and c together) by a power of two scales the
 * answer exactly. The ratio test
 * only lets a constraint block when the candidate itself breaks it, and then even at a ratio that
 * rounds to 1, so the answer satisfies every constraint exactly.
 *
 * Cost: O(m) per iteration; the number of iterations is finite and in practice a small multiple
 * of the number of groups in the answer. Memory O(m).
 *
 * @param d diagonal of H, length m ≥ 1, entries > 0.
 * @param e off-diagonal of H, length m − 1.
 * @param c linear term, length m.
 * @param lower bound on θ₀ (−∞ allowed); upper bound on θ_{m−1} (+∞ allowed); lower ≤ upper.
 * @throws RatchetError NUMERICAL if H is not positive definite on a subproblem or the method
 *   fails to converge (neither happens for valid input; tests check the optimality conditions).
 * @example solveMonotoneTridiagonal([1, 1], [0], [2, 1], -Infinity, Infinity).theta // → [1.5, 1.5]
 */
export function solveMonotoneTridiagonal(
  d: ArrayLike<number>,
  e: ArrayLike<number>,
  c: ArrayLike<number>,
  lower: number,
  upper: number,
): MonotoneQpSolution {
  const m = d.length;
  const theta = new Float64Array(m);
  // join[k] = 1 when the constraint θ_k ≤ θ_{k+1} is in the working set (k = 0 … m−2).
  const join = new Uint8Array(Math.max(m - 1, 0));
  let loActive = false;
  let hiActive = false;
  if (lower === upper) {
    theta.fill(lower);
    return { theta, iterations: 0, pivotRatio: 1 };
  }
  // Start: one pooled group at its optimal constant value, clipped to the bounds.
  {
    let num = 0;
    let den = 0;
    for (let i = 0; i < m; i++) {
      num += c[i]!;
      den += d[i]! + (i + 1 < m ? 2 * e[i]! : 0);
    }
    if (!(den > 0)) fail('NUMERICAL', 'knots', 'internal: the pooled normal equation is not positive');
    let v = num / den;
    if (v <= lower) {
      v = lower;
      loActive = true;
    } else if (v >= upper) {
      v = upper;
      hiActive = true;
    }
    theta.fill(v);
    join.fill(1);
  }

  const starts = new Int32Array(m);
  const ends = new Int32Array(m);
  const gd = new Float64Array(m);
  const ge = new Float64Array(m);
  const rhs = new Float64Array(m);
  const value = new Float64Array(m);
  const cp = new Float64Array(m);
  const dp = new Float64Array(m);
  const candidate = new Float64Array(m);
  const g = new Float64Array(m);
  const pv = new Float64Array(m);
  const magnitude = new Float64Array(m);
  const suffix = new Float64Array(m);
  const suffixSize = new Float64Array(m);
  const shift = new Float64Array(m);
  // settled[k] = 1: constraint k was dropped and the very next step re-added it without moving, so
  // its negative multiplier was rounding; it is not dropped again until a step makes progress.
  const settled = new Uint8Array(Math.max(m - 1, 0));
  // The same for the two bounds: a bound whose multiplier is negative only by rounding is re-added
  // at once by the ratio test (the free step would cross it) and would otherwise cycle forever.
  let settledLo = false;
  let settledHi = false;
  let lastDropped = -3;
  const maxIterations = 50 * m + 1000;

  let pivotRatio: number;
  for (let iter = 1; iter <= maxIterations; iter++) {
    // Groups from the working set.
    let G = 0;
    starts[0] = 0;
    for (let i = 0; i < m; i++) {
      if (i === m - 1 || join[i] === 0) {
        ends[G] = i;
        G++;
        if (i < m - 1) starts[G] = i + 1;
      }
    }
    const firstFixed = loActive; // group 0 is pinned at lower
    const lastFixed = hiActive; // group G−1 is pinned at upper
    // Group normal equations: gd_g = Σ_{i,j∈g} H_ij, ge_g = H between last of g and first of g+1.
    for (let k = 0; k < G; k++) {
      let s = 0;
      let r = 0;
      for (let i = starts[k]!; i <= ends[k]!; i++) {
        s += d[i]!;
        if (i < ends[k]!) s += 2 * e[i]!;
        r += c[i]!;
      }
      gd[k] = s;
      rhs[k] = r;
      ge[k] = k + 1 < G ? e[ends[k]!]! : 0;
    }
    if (firstFixed) value[0] = lower;
    if (lastFixed) value[G - 1] = upper;
    const a = firstFixed ? 1 : 0;
    const b = lastFixed ? G - 2 : G - 1; // free groups a … b
    pivotRatio = 1;
    if (b >= a) {
      if (firstFixed) rhs[a] = rhs[a]! - ge[0]! * lower;
      if (lastFixed) rhs[b] = rhs[b]! - ge[b]! * upper;
      // Thomas algorithm on the free groups (symmetric positive definite tridiagonal).
      let piv = gd[a]!;
      if (!(piv > 0)) fail('NUMERICAL', 'knots', 'internal: a group normal equation is not positive definite');
      pv[a] = piv;
      cp[a] = ge[a]! / piv;
      dp[a] = rhs[a]! / piv;
      for (let k = a + 1; k <= b; k++) {
        piv = gd[k]! - ge[k - 1]! * cp[k - 1]!;
        if (!(piv > 1e-14 * gd[k]!)) {
          fail('NUMERICAL', 'knots', 'internal: a group normal equation is not positive definite');
        }
        pivotRatio = Math.min(pivotRatio, piv / gd[k]!);
        pv[k] = piv;
        cp[k] = ge[k]! / piv;
        dp[k] = (rhs[k]! - ge[k - 1]! * dp[k - 1]!) / piv;
      }
      value[b] = dp[b]!;
      for (let k = b - 1; k >= a; k--) value[k] = dp[k]! - cp[k]! * value[k + 1]!;
    }
    for (let k = 0; k < G; k++) candidate.fill(value[k]!, starts[k]!, ends[k]! + 1);

    // Largest step α ∈ [0, 1] toward the candidate that keeps the inactive constraints. Only a
    // constraint that the candidate itself breaks can block, and it blocks even when its ratio
    // rounds to 1 (otherwise the candidate would be taken with a violation of an ulp or so).
    let alpha = 1;
    let block = -3; // −1 lower bound, −2 upper bound, k ≥ 0 chain constraint k
    if (!loActive && candidate[0]! < lower) {
      const slack = theta[0]! - lower;
      const ratio = Math.min(1, Math.max(0, slack / (theta[0]! - candidate[0]!)));
      if (block === -3 || ratio < alpha) {
        alpha = ratio;
        block = -1;
      }
    }
    if (!hiActive && candidate[m - 1]! > upper) {
      const slack = upper - theta[m - 1]!;
      const ratio = Math.min(1, Math.max(0, slack / (candidate[m - 1]! - theta[m - 1]!)));
      if (block === -3 || ratio < alpha) {
        alpha = ratio;
        block = -2;
      }
    }
    for (let k = 0; k + 1 < G; k++) {
      const i = ends[k]!;
      if (!(candidate[i + 1]! < candidate[i]!)) continue;
      const slack = theta[i + 1]! - theta[i]!;
      const ratio = Math.min(1, Math.max(0, slack / (slack - (candidate[i + 1]! - candidate[i]!))));
      if (block === -3 || ratio < alpha) {
        alpha = ratio;
        block = i;
      }
    }
    if (block !== -3) {
      if (alpha > 0) {
        settled.fill(0);
        settledLo = false;
        settledHi = false;
      } else if (block === lastDropped) {
        if (block >= 0) settled[block] = 1;
        else if (block === -1) settledLo = true;
        else settledHi = true;
      }
      lastDropped = -3;
      for (let i = 0; i < m; i++) theta[i] = theta[i]! + alpha * (candidate[i]! - theta[i]!);
      if (block === -1) {
        loActive = true;
        for (let i = starts[0]!; i <= ends[0]!; i++) theta[i] = lower;
      } else if (block === -2) {
        hiActive = true;
        for (let i = starts[G - 1]!; i <= ends[G - 1]!; i++) theta[i] = upper;
      } else {
        join[block] = 1;
        // The two groups meet: give them exactly one shared value.
        const v = theta[block]!;
        for (let i = block + 1; i < m && (i === block + 1 || join[i - 1] === 1); i++) theta[i] = v;
      }
      continue;
    }
    for (let i = 0; i < m; i++) {
      if (candidate[i] !== theta[i]) {
        settled.fill(0); // progress: every multiplier may be acted on again
        settledLo = false;
        settledHi = false;
        break;
      }
    }
    theta.set(candidate);

    // Subproblem solved: multipliers of the working set from g = c − Hθ, in three steps that keep
    // them accurate relative to the rows they come from (not to the largest entry of c, so that a
    // heavy row cannot hide the multipliers of light ones; see docs/tolerances.md):
    // 1. g is computed with error-free products and sums (compensated, rounded once at the end),
    //    so each gᵢ is exact for the θ at hand up to one rounding of gᵢ itself.
    // 2. Every position of a free group holds the same rounded value; the errors δ of the group
    //    values shift g by −Hδ and leave group totals Tₖ = Σ_{i∈k} gᵢ that are 0 at the exact
    //    subproblem optimum. One step of iterative refinement solves for δ and corrects g (below).
    //    This matters with heavy rows: their share of g changes by more than the light rows'
    //    multipliers when a group value moves by one ulp.
    // 3. A multiplier, a partial sum of g over one side of its constraint, counts as negative only
    //    below −MULTIPLIER_TOL·(L + 1)·(Σ (|gᵢ| + NOISE_FLOOR·bᵢ) over the L terms, bᵢ = |cᵢ| +
    //    Σⱼ|Hᵢⱼθⱼ|, + the coupling |Hᵢⱼθⱼ| to the
    //    neighbouring groups, whose values carry their own rounding).
    for (let i = 0; i < m; i++) {
      const el = i > 0 ? e[i - 1]! : 0;
      const thl = i > 0 ? theta[i - 1]! : 0;
      const er = i + 1 < m ? e[i]! : 0;
      const thr = i + 1 < m ? theta[i + 1]! : 0;
      g[i] = residualEntry(c[i]!, d[i]!, theta[i]!, el, thl, er, thr);
      magnitude[i] = Math.abs(c[i]!) + Math.abs(d[i]! * theta[i]!) + Math.abs(el * thl) + Math.abs(er * thr);
    }
    if (b >= a) {
      // One step of iterative refinement of the group values, applied to g only: the group
      // residuals Tₖ = Σ_{i∈k} gᵢ, solved with the Thomas factors above, give the correction δ
      // of each free group's value, and g(θ + δ) = g(θ) − Hδ.
      for (let k = a; k <= b; k++) {
        let total = 0;
        for (let i = starts[k]!; i <= ends[k]!; i++) total += g[i]!;
        dp[k] = (k > a ? total - ge[k - 1]! * dp[k - 1]! : total) / pv[k]!;
      }
      for (let k = b; k >= a; k--) {
        value[k] = k < b ? dp[k]! - cp[k]! * value[k + 1]! : dp[k]!;
      }
      shift.fill(0);
      for (let k = a; k <= b; k++) shift.fill(value[k]!, starts[k]!, ends[k]! + 1);
      for (let i = 0; i < m; i++) {
        let h = d[i]! * shift[i]!;
        if (i > 0) h += e[i - 1]! * shift[i - 1]!;
        if (i + 1 < m) h += e[i]! * shift[i + 1]!;
        g[i] = g[i]! - h;
      }
    }
    let worst = 0;
    let drop = -3;
    const consider = (lambda: number, size: number, terms: number, which: number): void => {
      if (which >= 0 ? settled[which] === 1 : which === -1 ? settledLo : settledHi) return;
      // Ranked in units of each multiplier's own tolerance, so constraints of different scales compare fairly.
      const tol = MULTIPLIER_TOL * (terms + 1) * size;
      if (!(lambda < -tol)) return;
      const score = tol > 0 ? lambda / tol : -Infinity;
      if (drop === -3 || score < worst) {
        worst = score;
        drop = which;
      }
    };
    for (let i = 0; i < m; i++) magnitude[i] = Math.abs(g[i]!) + NOISE_FLOOR * magnitude[i]!;
    for (let k = 0; k < G; k++) {
      const s = starts[k]!;
      const t = ends[k]!;
      const coupling = (s > 0 ? Math.abs(e[s - 1]! * theta[s - 1]!) : 0) + (t + 1 < m ? Math.abs(e[t]! * theta[t + 1]!) : 0);
      if (k === 0 && firstFixed && !(k === G - 1 && lastFixed)) {
        // Anchored at lower (its value is the bound itself, no rounding): λ_j = −Σ_{i=j+1..t} g_i
        // for chain j in [s, t), and λ_lo = −Σ_{i=s..t} g_i.
        let acc = 0;
        let size = coupling;
        for (let j = t - 1; j >= s; j--) {
          acc -= g[j + 1]!;
          size += magnitude[j + 1]!;
          consider(acc, size, t - j, j);
        }
        acc -= g[s]!;
        size += magnitude[s]!;
        consider(acc, size, t - s + 1, -1);
      } else if (k === 0 && firstFixed) {
        // Pinned at both bounds (lower < upper): only possible for a single position? Never: the
        // values differ. Treat as anchored at lower for safety.
        fail('NUMERICAL', 'knots', 'internal: a group is pinned at both bounds');
      } else {
        // Free group, or anchored at upper: λ_j = Σ_{i=s..j} g_i, and λ_hi = Σ_{i=s..t} g_i.
        // In a free group Σ g = 0 (after the refinement), so λ_j = −Σ_{i=j+1..t} g_i as well; the
        // side with the smaller magnitudes is used, so a heavy row on one side does not blur the
        // multipliers computed from the other.
        const free = !(k === G - 1 && lastFixed);
        if (free) {
          let sAcc = 0;
          let sSize = coupling;
          for (let j = t - 1; j >= s; j--) {
            sAcc -= g[j + 1]!;
            sSize += magnitude[j + 1]!;
            suffix[j] = sAcc;
            suffixSize[j] = sSize;
          }
        }
        let acc = 0;
        let size = coupling;
        for (let j = s; j < t; j++) {
          acc += g[j]!;
          size += magnitude[j]!;
          if (free && suffixSize[j]! < size) consider(suffix[j]!, suffixSize[j]!, t - j, j);
          else consider(acc, size, j - s + 1, j);
        }
        if (!free) {
          acc += g[t]!;
          size += magnitude[t]!;
          consider(acc, size, t - s + 1, -2);
        }
      }
    }
    if (drop === -3) return { theta, iterations: iter, pivotRatio };
    lastDropped = drop;
    if (drop === -1) loActive = false;
    else if (drop === -2) hiActive = false;
    else join[drop] = 0;
  }
  return fail('NUMERICAL', 'knots', 'internal: the active-set method did not converge');
}
