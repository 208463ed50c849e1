/**
 * Soil-test surfaces: the field grid, IDW interpolation, cross-validation, zone-composite maps and the
 * Esri ASCII grid writer. The build stage calls {@link nutrientSurface} once per nutrient on one grid.
 */
export { fieldGrid, gridWarnings, centreMask, coverage, MAX_CELLS, type FieldGridOptions } from './grid.js';
export { idwSurface, COINCIDENT_D2, type IdwOptions, type GridShape } from './idw.js';
export { buildBuckets, KnnGroup, type Buckets } from './knn.js';
export { crossValidate, pickBest, DEFAULT_POWERS, DEFAULT_NEIGHBOURS, type CvRow, type CvResult, type CvOptions } from './crossValidate.js';
export { nutrientPoints, SAME_PLACE_M, type NutrientPoints } from './prepare.js';
export { zoneSurface } from './zoneSurface.js';
export { nutrientSurface, analyteFromName, kName, ANALYTE_LABEL, type NutrientSurface, type NutrientSurfaceOptions } from './nutrientSurface.js';
export { formatAsc, utmPrj, readAsc, ASC_NODATA, type AscOptions } from './asc.js';
