/**
 * Soil-test surfaces: the field grid, IDW and ordinary-kriging interpolation, cross-validation, zone-composite maps and the
 * Esri ASCII grid writer. The build stage calls {@link nutrientSurface} once per nutrient on one grid.
 */
export { fieldGrid, gridWarnings, centreMask, coverage, MAX_CELLS, type FieldGridOptions } from './grid.js';
export {
  idwSurface,
  idwSurfaces,
  COINCIDENT_D2,
  type IdwOptions,
  type IdwSpec,
  type GridShape,
} from './idw.js';
export {
  forEachNeighbourBand,
  neighbourSearch,
  cellNeighbours,
  sampleNeighbours,
  type NeighbourBand,
  type NeighbourSearch,
  type NeighbourOptions,
  type CellNeighbours,
  type SampleNeighbours,
} from './neighbours.js';
export { buildBuckets, KnnGroup, type Buckets } from './knn.js';
export { SurfacePool, PARALLEL_MIN_CELLS, type SurfaceThreads } from './parallel.js';
export {
  crossValidate,
  crossValidateMany,
  pickBest,
  DEFAULT_POWERS,
  DEFAULT_NEIGHBOURS,
  type CvRow,
  type CvResult,
  type CvOptions,
} from './crossValidate.js';
export { nutrientPoints, SAME_PLACE_M, type NutrientPoints } from './prepare.js';
export { zoneSurface } from './zoneSurface.js';
export {
  nutrientSurface,
  nutrientSurfaces,
  analyteFromName,
  kName,
  SURFACE_METHODS,
  type NutrientSurface,
  type NutrientSurfaceOptions,
  type SurfaceMethod,
} from './nutrientSurface.js';
export {
  krigingSurface,
  covariance,
  OkSolver,
  type KrigingModel,
  type KrigingOptions,
  type KrigingResult,
} from './kriging.js';
export {
  krigingAtPoints,
  krigingCv,
  type KrigingCv,
  type PointKriging,
  type PointKrigingOptions,
} from './krigingCv.js';
export {
  krigingCandidate,
  krigeGrid,
  lognormalMean,
  KRIGING_NEIGHBOURS,
  type KrigingInfo,
  type KrigingChoiceOptions,
  type KrigedGrid,
} from './krigingChoice.js';
export {
  chooseVariogram,
  modelText,
  KRIGING_MIN_SAMPLES,
  KRIGING_MIN_PAIRS,
  KRIGING_MIN_LAGS,
  type VariogramChoice,
  type VariogramChoiceOptions,
} from './variogram.js';
export { formatAsc, readAsc, ASC_NODATA, type AscOptions } from './asc.js';
export {
  chanceBelow,
  chanceBelowAt,
  classProbabilities,
  type KrigedCells,
  type ResponseClasses,
} from './probability.js';
