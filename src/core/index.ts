/**
 * Public surface of the Ratchet core: pure TypeScript, no host APIs. Everything outside
 * `src/core` imports from here only (ESLint enforces it), and this index holds exactly what the
 * outer layers use; tests import internal modules directly. Adding an export is a deliberate
 * change (test/core/exports.test.ts lists the runtime names).
 */
export { RatchetError, fail, isRatchetError } from './errors.js';
export type { DirectionOption, TieRule } from './types.js';
export { quantileKnots } from './knots.js';
export { knotRegression } from './knot-fit.js';
export { interpolate, interpolateAt } from './interpolate.js';
export { invertAt, invertChecked, checkKnotTable } from './invert.js';
export { fitMonotone, predict, type ModelOptions, type MonotoneModel } from './model.js';
export type { Curvature, Degree } from './shape-fit.js';
export { SplitMix64, normalDeviates } from './prng.js';
export { kFoldAssignment } from './folds.js';
export { suggestKnots } from './scores.js';
export { crossValidate, defaultCandidates, type CrossValidationOptions, type CrossValidationResult } from './cross-validate.js';
export { fitSurface, predictSurface, type SurfaceModel, type AxisDirection, type AxisDirectionOption } from './surface.js';
export { crossValidateSurface, suggestSurfaceKnots, type SurfaceCrossValidationOptions, type SurfaceCrossValidationResult } from './surface-cv.js';
export { fitBandModel, fitShapedBandModel, bandAt, inverseBand, type BandModel, type BandKind, type InverseInterval } from './band.js';
export { spearman } from './direction.js';
export { checkDirection, type DirectionWarning } from './direction-check.js';
export { evaluateTable, invertTable, type TableInterpolation } from './smooth-table.js';
