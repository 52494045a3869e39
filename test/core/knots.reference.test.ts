/**
 * The knot model against two independent exact solvers of the same quadratic program, each with its
 * own design matrix of hat functions:
 *  - R 4.2.2 `quadprog::solve.QP` (quadprog 1.5.8) on the identified knots with the chain constraints
 *    and the bounds as constraints (core_r.json, `Rscript test/reference/gen_core.R`);
 *  - SciPy 1.10.1 `scipy.optimize.lsq_linear(method='bvls')` on the cumulative-step form
 *    θ = a + L d, d ≥ 0 (core_bvls.json, `/usr/bin/python3 test/reference/gen_core.py`);
 * and the quantile knots against NumPy 1.24.2 `numpy.quantile(method='linear')` (Hyndman & Fan type 7).
 *
 * Knot values are compared only where the data determine them (quadprog: identified knots of a
 * positive definite reduced problem; bvls: the fixture's `unique` mask); fitted values always.
 * Tolerance 1e-7 relative (absolute 1e-7 near zero), as docs/tolerances.md explains for knot fits.
 */
import { describe, expect, it } from 'vitest';
import { fitMonotone, knotRegression, quantileKnots } from '../../src/core/index.js';
import { evenKnots } from '../../src/core/knots.js';
import { bvlsRefs, inputCase, rRefs, skRefs, type RKnotCase } from './fixtures.js';

const REL = 1e-7;

function fitFor(ref: RKnotCase) {
  const c = inputCase(ref.case);
  const explicit = ref.id.includes('explicit');
  const knots = explicit ? ref.knot_x : ref.knot_x.length;
  return { c, fit: knotRegression(c.x, c.y, { knots, weights: c.w, direction: ref.direction, lower: ref.lower, upper: ref.upper }) };
}

function bounds(ref: { lower?: number; upper?: number }): string {
  return `${ref.lower !== undefined ? ` lower=${ref.lower}` : ''}${ref.upper !== undefined ? ` upper=${ref.upper}` : ''}`;
}

describe('knot model = quadprog::solve.QP (R 4.2.2, quadprog 1.5.8, core_r.json)', () => {
  for (const ref of rRefs.knots) {
    const label = `${ref.id} (${ref.case}, K=${ref.knot_x.length}, ${ref.direction}${bounds(ref)})`;

    it(`${label}: knot positions are the ones the reference used`, () => {
      expect(fitFor(ref).fit.knotX).toBeAllCloseRel(ref.knot_x, 1e-15, 0);
    });

    if (ref.quadprog_fitted === undefined) {
      it(`${label}: quadprog not run (${ref.quadprog ?? ''}); fitted values equal bvls's instead`, () => {
        const other = bvlsRefs.knots.find((k) => k.id === ref.id)?.fitted;
        expect(other, 'neither reference covers this case').toBeDefined();
        expect(fitFor(ref).fit.fitted).toBeAllCloseRel(other!, REL);
      });
      continue;
    }
    const fittedRef = ref.quadprog_fitted;
    const thetaRef = ref.quadprog_theta_identified!;
    const identified = ref.identified!;

    it(`${label}: fitted values equal quadprog's`, () => {
      expect(fitFor(ref).fit.fitted).toBeAllCloseRel(fittedRef, REL);
    });

    it(`${label}: identified knot values equal quadprog's, and the identified flags agree`, () => {
      const { fit } = fitFor(ref);
      expect(Array.from(fit.identified)).toEqual(identified);
      const ours = Array.from(fit.knotY).filter((_, j) => identified[j] === 1);
      expect(ours).toBeAllCloseRel(thetaRef, REL);
    });

    it(`${label}: SSE equals quadprog's`, () => {
      const c = inputCase(ref.case);
      const knots = ref.id.includes('explicit') ? ref.knot_x : ref.knot_x.length;
      const model = fitMonotone(c.x, c.y, { knots, weights: c.w, direction: ref.direction, lower: ref.lower, upper: ref.upper });
      expect(model.stats.sse).toBeCloseRel(ref.quadprog_sse!, REL);
    });
  }
});

describe('knot model = scipy.optimize.lsq_linear bvls on θ = a + L d (SciPy 1.10.1, core_bvls.json)', () => {
  for (const ref of bvlsRefs.knots) {
    const label = `${ref.id} (${ref.case}, K=${ref.knot_x.length}, ${ref.direction}${bounds(ref)})`;
    if (ref.fitted === undefined) {
      it(`${label}: bvls not run (${ref.bvls ?? ''}); fitted values equal quadprog's instead`, () => {
        const rRef = rRefs.knots.find((k) => k.id === ref.id);
        expect(rRef?.quadprog_fitted, 'neither reference covers this case').toBeDefined();
        expect(fitFor(rRef!).fit.fitted).toBeAllCloseRel(rRef!.quadprog_fitted!, REL);
      });
      continue;
    }
    const fittedRef = ref.fitted;
    const thetaRef = ref.theta!;
    const unique = ref.unique!;
    const rRef = rRefs.knots.find((k) => k.id === ref.id)!;

    it(`${label}: fitted values equal bvls's, which stopped at an optimum (status 2 or 3)`, () => {
      expect([2, 3]).toContain(ref.bvls_status);
      expect(fitFor(rRef).fit.fitted).toBeAllCloseRel(fittedRef, REL);
    });

    it(`${label}: knot values equal bvls's wherever they are unique (${unique.filter(Boolean).length} of ${unique.length})`, () => {
      const { fit } = fitFor(rRef);
      const ours = Array.from(fit.knotY).filter((_, j) => unique[j]);
      expect(ours).toBeAllCloseRel(thetaRef.filter((_, j) => unique[j]), REL);
    });
  }
});

describe('quantile knot positions = numpy.quantile, type 7, duplicates collapsed (NumPy 1.24.2, core_sklearn.json)', () => {
  for (const ref of skRefs.quantile_knots) {
    it(`${ref.case}, K=${ref.K}: ${ref.knots.length} distinct positions equal numpy's`, () => {
      expect(quantileKnots(inputCase(ref.case).x, ref.K)).toBeAllCloseRel(ref.knots, 1e-12);
    });
  }
});

describe('evenly spaced knots (the same formula as the references use: t_j = min + j(max − min)/(K − 1))', () => {
  it('span the positive-weight x range exactly, ends included', () => {
    expect(Array.from(evenKnots(2, 5, 4))).toEqual([2, 3, 4, 5]);
  });
});
