/**
 * The optimality (KKT) certificate of the lattice quadratic program, by which both the exact
 * active-set method and ADMM are judged: stationarity, complementarity and feasibility.
 */
import type { LatticeSystem } from './surface-lattice.js';
import { applyStencil } from './surface-lattice.js';
import type { LatticeEdges, OptimalityCertificate } from './surface-solve.js';

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
