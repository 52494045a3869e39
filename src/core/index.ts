/**
 * Public surface of the Ratchet core: pure TypeScript, no host APIs. Everything outside
 * `src/core` imports from here only.
 */
export { RatchetError, fail, isRatchetError, type ErrorCode } from './errors.js';
export type { Direction, DirectionOption, TieRule, CommonFitOptions } from './types.js';
export { sortOrder } from './sort-order.js';
export { poolTies, type PooledData } from './pool-ties.js';
export { pavaSorted, type PavaResult } from './pava.js';
export { averageRanks, spearman, resolveDirection } from './direction.js';
export { isotonicRegression, type IsotonicFit } from './isotonic.js';
export { evenKnots, quantileKnots, quantileKnotsSorted, checkKnotCount, checkKnotPositions } from './knots.js';
export { solveMonotoneTridiagonal, type MonotoneQpSolution } from './monotone-qp.js';
export { knotRegression, type KnotFit, type KnotFitOptions } from './knot-fit.js';
export { interpolate, interpolateAt, intervalIndex, lerp, share } from './interpolate.js';
export { invertAt, invertChecked, checkKnotTable } from './invert.js';
export { fitStatistics, type FitStatistics } from './statistics.js';
export { fitMonotone, fitChecked, predict, checkKnotSpec, checkShapeSpec, type ModelOptions, type MonotoneModel, type KnotSpec, type ShapeSpec, type ShapeDetails } from './model.js';
export { shapeRegression, shapeChecked, checkCurvature, checkDegree, quadraticBasisAt, type ShapeFit, type ShapeFitOptions, type Curvature, type Degree } from './shape-fit.js';
export { solveBandedQp, sparseRow, rowDot, bandTimes, nullSpaceBasis, type SparseRow, type SymmetricBand, type BandedQpSolution } from './shape-qp.js';
export { smoothTableAt, evaluateTable, invertTable, invertQuadraticChecked, checkTable, checkInterpolation, type TableInterpolation } from './smooth-table.js';
export { finiteArray, finiteView, weightArray, boundsPair, sameLength, type NumericInput } from './validate.js';
export { SplitMix64, checkSeed } from './prng.js';
export { foldSizes, repeatState, seededPermutation, kFoldAssignment, checkFolds, holdoutSize, holdoutAssignment } from './folds.js';
export { suggestKnots, type SuggestionRule, type Suggestion, type ScoreForSuggestion } from './suggest-knots.js';
export { crossValidate, holdoutValidate, defaultCandidates, type CrossValidationOptions, type CrossValidationResult, type CandidateScore, type HoldoutOptions, type KnotPlacement } from './cross-validate.js';
export { fitSurface, surfaceChecked, predictSurface, checkSurfaceKnots, checkAxisDirection, SURFACE_MAX_NODES, SURFACE_EXACT_NODES, SURFACE_ITERATIVE_NODES, type SurfaceOptions, type SurfaceModel, type SurfaceKnotSpec, type AxisDirection, type OptimalityCertificate } from './surface.js';
export { latticeEdges, orderEnvelopeMean, admmLattice, inducedOrder, type LatticeEdges, type LatticeSolution } from './surface-solve.js';
export { locate, evaluateLattice, assembleLattice, type LatticeSystem, type LatticeLocation } from './surface-lattice.js';
export { crossValidateSurface, suggestSurfaceKnots, type SurfaceCrossValidationOptions, type SurfaceCrossValidationResult, type SurfaceCandidateScore, type SurfaceSuggestion } from './surface-cv.js';
export { studentTCdf, studentTQuantile } from './student-t.js';
export { fitBandModel, bandModelChecked, monotoneActiveSetBasis, checkBandKnots, bandAt, inverseBand, type ActiveSetBasis, type BandFitOptions, type BandModel, type BandKind, type Band, type InverseInterval } from './band.js';
export { spreadStatistics, type SpreadStatistics } from './statistics.js';
export { checkDirection, DIRECTION_RHO_THRESHOLD, DIRECTION_P_THRESHOLD, type DirectionWarning } from './direction-check.js';
