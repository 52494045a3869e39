/**
 * The public surface of the core is src/core/index.ts alone. This list is the contract other
 * layers rely on: adding an export is a deliberate change to this file; removing or renaming one
 * breaks callers and must fail here first.
 */
import { describe, expect, it } from 'vitest';
import * as core from '../../src/core/index.js';

describe('src/core/index.ts', () => {
  it('exports exactly the documented runtime names', () => {
    expect(Object.keys(core).sort()).toEqual([
      'DIRECTION_P_THRESHOLD', 'DIRECTION_RHO_THRESHOLD', 'RatchetError', 'SURFACE_EXACT_NODES',
      'SURFACE_ITERATIVE_NODES', 'SURFACE_MAX_NODES', 'SplitMix64', 'admmLattice', 'assembleLattice',
      'averageRanks', 'bandAt', 'bandModelChecked', 'bandTimes', 'boundsPair', 'checkAxisDirection',
      'checkBandKnots', 'checkCurvature', 'checkDegree', 'checkDirection', 'checkFolds', 'checkInterpolation',
      'checkKnotCount', 'checkKnotPositions', 'checkKnotSpec', 'checkKnotTable', 'checkSeed',
      'checkShapeSpec', 'checkSurfaceKnots', 'checkTable', 'crossValidate', 'crossValidateSurface',
      'defaultCandidates', 'evaluateLattice', 'evaluateTable', 'evenKnots', 'fail', 'finiteArray',
      'finiteView', 'fitBandModel', 'fitChecked', 'fitMonotone', 'fitStatistics', 'fitSurface', 'foldSizes',
      'holdoutAssignment', 'holdoutSize', 'holdoutValidate', 'inducedOrder', 'interpolate', 'interpolateAt',
      'intervalIndex', 'inverseBand', 'invertAt', 'invertChecked', 'invertQuadraticChecked', 'invertTable',
      'isRatchetError', 'isotonicRegression', 'kFoldAssignment', 'knotRegression', 'latticeEdges', 'lerp',
      'locate', 'monotoneActiveSetBasis', 'nullSpaceBasis', 'orderEnvelopeMean', 'pavaSorted', 'poolTies',
      'predict', 'predictSurface', 'quadraticBasisAt', 'quantileKnots', 'quantileKnotsSorted', 'repeatState',
      'resolveDirection', 'rowDot', 'sameLength', 'seededPermutation', 'shapeChecked', 'shapeRegression',
      'share', 'smoothTableAt', 'solveBandedQp', 'solveMonotoneTridiagonal', 'sortOrder', 'sparseRow',
      'spearman', 'spreadStatistics', 'studentTCdf', 'studentTQuantile', 'suggestKnots',
      'suggestSurfaceKnots', 'surfaceChecked', 'weightArray',
    ]);
  });

  it('every exported function is a function and every error is a RatchetError', () => {
    for (const [name, value] of Object.entries(core)) {
      if (/^[A-Z_]+$/.test(name)) expect(typeof value).toBe('number');
      else expect(['function']).toContain(typeof value);
    }
    expect(() => core.fail('BAD_OPTION', 'folds', 'needs a whole number ≥ 2')).toThrow(core.RatchetError);
    expect(() => core.fail('BAD_OPTION', 'folds', 'needs a whole number ≥ 2')).toThrow('folds: needs a whole number ≥ 2.');
  });
});
