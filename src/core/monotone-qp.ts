/**
 * Exact solver for the tridiagonal monotone quadratic program behind the knot model.
 */
import { fail } from './errors.js';

/** Solution of {@link solveMonotoneTridiagonal}. */
export interface MonotoneQpSolution {
  /** The optimal, non-decreasing θ (length m). */
  theta: Float64Array;
  /** Active-set iterations used (subproblem solves). */
  iterations: number;
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
 * λ_k = Σ_{i=s..k} g_i (from the right end for a group anchored at the lower bound). A multiplier
 * counts as negative below −1e-13·m·max|cᵢ|, |(Hθ)ᵢ| — a tolerance in the units of the multipliers,
 * so scaling c (or H and c together) by a power of two scales the answer exactly. The ratio test
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
    return { theta, iterations: 0 };
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
  const maxIterations = 50 * m + 1000;

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
    if (b >= a) {
      if (firstFixed) rhs[a] = rhs[a]! - ge[0]! * lower;
      if (lastFixed) rhs[b] = rhs[b]! - ge[b]! * upper;
      // Thomas algorithm on the free groups (symmetric positive definite tridiagonal).
      let piv = gd[a]!;
      if (!(piv > 0)) fail('NUMERICAL', 'knots', 'internal: a group normal equation is not positive definite');
      cp[a] = ge[a]! / piv;
      dp[a] = rhs[a]! / piv;
      for (let k = a + 1; k <= b; k++) {
        piv = gd[k]! - ge[k - 1]! * cp[k - 1]!;
        if (!(piv > 1e-14 * gd[k]!)) {
          fail('NUMERICAL', 'knots', 'internal: a group normal equation is not positive definite');
        }
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
    theta.set(candidate);

    // Subproblem solved: multipliers of the working set from g = c − Hθ. The tolerance is in the
    // units of the multipliers (those of c and Hθ, i.e. weight × y), so the decisions do not depend
    // on the scale of y: a multiplier counts as negative only beyond the rounding of the sums.
    let gScale = 0;
    for (let i = 0; i < m; i++) {
      let h = d[i]! * theta[i]!;
      if (i > 0) h += e[i - 1]! * theta[i - 1]!;
      if (i + 1 < m) h += e[i]! * theta[i + 1]!;
      g[i] = c[i]! - h;
      gScale = Math.max(gScale, Math.abs(c[i]!), Math.abs(h));
    }
    let worst = -1e-13 * m * gScale;
    let drop = -3;
    for (let k = 0; k < G; k++) {
      const s = starts[k]!;
      const t = ends[k]!;
      if (k === 0 && firstFixed && !(k === G - 1 && lastFixed)) {
        // Anchored at lower: λ_j = −Σ_{i=j+1..t} g_i for chain j in [s, t), and λ_lo = −Σ_{i=s..t} g_i.
        let acc = 0;
        for (let j = t - 1; j >= s; j--) {
          acc -= g[j + 1]!;
          if (acc < worst) {
            worst = acc;
            drop = j;
          }
        }
        acc -= g[s]!;
        if (acc < worst) {
          worst = acc;
          drop = -1;
        }
      } else if (k === 0 && firstFixed) {
        // Pinned at both bounds (lower < upper): only possible for a single position? Never: the
        // values differ. Treat as anchored at lower for safety.
        fail('NUMERICAL', 'knots', 'internal: a group is pinned at both bounds');
      } else {
        // Free group, or anchored at upper: λ_j = Σ_{i=s..j} g_i, and λ_hi = Σ_{i=s..t} g_i.
        let acc = 0;
        for (let j = s; j < t; j++) {
          acc += g[j]!;
          if (acc < worst) {
            worst = acc;
            drop = j;
          }
        }
        if (k === G - 1 && lastFixed) {
          acc += g[t]!;
          if (acc < worst) {
            worst = acc;
            drop = -2;
          }
        }
      }
    }
    if (drop === -3) return { theta, iterations: iter };
    if (drop === -1) loActive = false;
    else if (drop === -2) hiActive = false;
    else join[drop] = 0;
  }
  return fail('NUMERICAL', 'knots', 'internal: the active-set method did not converge');
}
