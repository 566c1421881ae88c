/**
 * @psiform/orbitals: hydrogen-like (one-electron) wavefunctions psi_nlm = R_nl(r) Y_lm(theta, phi) in atomic
 * units (lengths in Bohr radii a0, nuclear charge Z). Pure functions, no I/O, usable in Node and in a
 * browser Web Worker. The Node-only parallel sampler is the subpath export '@psiform/orbitals/node'.
 * Many-electron atoms' orbitals differ from these one-electron model functions.
 */
export * from './units';
export { logFactorial, factorial, binomial } from './factorial';
export { genLaguerre, genLaguerreDerivative, gaussLaguerreRule, gaussLegendreRule, type QuadratureRule } from './laguerre';
export { MAX_N, L_LETTERS, validateQuantumNumbers, validateZ } from './quantum';
export { radialR, radialNorm, radialDistribution, radialConstants, type RadialConstants } from './radial';
export {
  assocLegendre,
  sphericalY,
  realY,
  solidHarmonic,
  realSolidHarmonic,
  evalPoly,
  type Complex,
  type Monomial,
} from './harmonics';
export {
  type Term,
  type OrbitalState,
  validateState,
  stateFromNlm,
  toComplexBasis,
  toRealBasis,
  stateNormSquared,
  normaliseState,
  isRealState,
} from './state';
export {
  parseOrbitalLabel,
  prettyLabel,
  hybridDirection,
  labelToComplexBasis,
  LabelError,
  F_GENERAL_SET,
  F_CUBIC_SET,
  REAL_LABEL_NAMES,
  HYBRID_SETS,
  type ParsedLabel,
} from './labels';
export { compileState, type CompiledState, type BoxSpec } from './compile';
export {
  type GridSpec,
  MAX_GRID_N,
  DEFAULT_GRID_BUDGET_BYTES,
  validateGridSpec,
  gridSpacing,
  voxelVolume,
  gridBytes,
  checkGridFits,
  GridTooLargeError,
  formatBytes,
} from './grid';
export { autoExtent } from './extent';
export {
  probabilityInside,
  probabilityOutside,
  radialOverlapOutside,
  stateProbabilityInside,
  radiusForProbability,
  radialNodes,
  mostProbableRadius,
  meanRadius,
  meanRadiusNumeric,
  classicalTurningPoint,
  innerTurningPoint,
  oneSEnclosingRadius,
  oneSEnclosingIsovalue,
  enclosedThreshold,
  enclosedFractionAt,
} from './probability';
export { radialSeries, type RadialSeries } from './series';
export {
  type RayQuadrature,
  type RayQuadratureOptions,
  type EnclosedLevel,
  rayQuadrature,
  enclosedProbability,
  fractionAtDensity,
  solveEnclosedLevel,
  superlevelHalfWidth,
} from './rays';
export { type LevelSolver, type FractionEstimate, levelSolver } from './level';
export { type DensityPeak, climbDensity, peakDensity } from './peak';
export { type RadialLobe, type RadialLobes, type LobeSide, radialLobes, lobeInterval, lobePin, radialProbabilityAbove } from './radial-lobes';
export { type SurfaceAnalysis, type SurfaceFeature, type SurfaceLayer, type TopologyCount, type FeatureKind, analyseSurface } from './features';
export { type FieldBound, fieldBound } from './bounds';
