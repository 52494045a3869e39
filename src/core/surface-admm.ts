/**
 * ADMM for large lattices: row and column steps are weighted pool-adjacent-violators runs; stopped
 * on the KKT certificate (see surface-solve.ts for the problem).
 */
import type { LatticeSystem } from './surface-lattice.js';
import { applyStencil } from './surface-lattice.js';
import { pavaSorted } from './pava.js';
import { fail } from './errors.js';
import { orderEnvelopeMean, type AxisDirection, type LatticeEdges, type LatticeSolution } from './surface-solve.js';
import { pcg, workspace } from './surface-sparse.js';
import { latticeCertificate } from './surface-certificate.js';

/** Over-relaxation factor of the ADMM sweeps (1 = plain ADMM; 1.5–1.8 is the usual range). */
const RELAX = 1.6;

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
