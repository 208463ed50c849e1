/** ESRI shapefile writing and reading for zone polygons (see docs/formats.md). */
export { writeShapefile, type ColumnSpec } from './write.js';
export { encodeDbf } from './dbf.js';
export { shortFieldNames, shortFileNames } from './names.js';
export { readShapefile } from './read.js';
