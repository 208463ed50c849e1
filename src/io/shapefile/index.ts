/** ESRI shapefile writing and reading for zone polygons (see docs/formats.md). */
export {
  writeShapefile,
  resolveColumns,
  baseFileName,
  type ColumnSpec,
  type ResolvedColumn,
  type ShapefileOptions,
} from './write.js';
export { encodePolygons, inspectShp, type ShpPolygon, type ShpLayout } from './shp.js';
export { encodeDbf, inspectDbf, formatNumber, type DbfField, type DbfHeader } from './dbf.js';
export { shortFieldNames, shortFileNames } from './names.js';
export { readShapefile, encodingFromCpg, type ShapefileBytes, type ShapefileRead } from './read.js';
export { shapefileLonLat, shapefilePoints, shapefilePolygons } from './lonlat.js';
