/**
 * tilth as a library: the pipeline's pure stages. Nothing here reads files, prints or exits;
 * `src/cli/` does that. See docs/architecture.md.
 *
 * @example
 * import { readInputs, prepareInputs, parsePlan, defaultTables, buildPrescription } from 'tilth';
 * const raw = await readInputs({ samples: { name: 'samples.csv', bytes }, boundary: { name: 'boundary.geojson', bytes: b } });
 * const inputs = prepareInputs(raw);
 * const tables = defaultTables();
 * const rx = buildPrescription(inputs, parsePlan(planYaml, 'plan.yaml', tables), tables);
 */
export * from './types.js';
export { UserError, isUserError, type Warning } from './errors.js';
export * as units from './units/index.js';
export {
  ANALYTE_TERMS,
  ANALYTE_NAME,
  ANALYTE_LABEL,
  NUTRIENT_NAME,
  PLACEMENT_NAME,
  CAUTION,
  type AnalyteTerms,
} from './vocabulary.js';
export { VERSION } from './version.js';
export { prepareInputs } from './validate/inputs.js';
export { readInputs, type InputFiles, type RawInputs } from './io/inputs.js';
export { projectField } from './geo/field.js';
export { utmZoneFor, projector, type Projector } from './geo/utm.js';
export * from './surface/index.js';
export * from './agronomy/index.js';
export * from './zones/index.js';
export {
  buildPrescription,
  defaultCell,
  type Prescription,
  type PrescriptionZone,
  type ZoneSetResult,
  type ProductTotal,
  type BuildOptions,
} from './prescription/index.js';
export {
  prescriptionGeojson,
  zonesCsv,
  summaryObject,
  summaryText,
  shapefileFeatures,
  type Provenance,
} from './prescription/outputs.js';
export { reportInput } from './prescription/reportInput.js';
export { prescriptionFolder, type FolderOptions, type PrescriptionFolder } from './prescription/folder.js';
export { provenance, inputsHash } from './prescription/provenance.js';
export { writeShapefile, readShapefile } from './io/shapefile/index.js';
export { prescriptionFiles } from './prescription/shapefiles.js';
export {
  prescriptionTaskData,
  prescriptionTaskDataFiles,
  type TaskDataOptions,
} from './prescription/taskdata.js';
export { readTaskData, taskDataFiles, taskDataXml, type TaskData } from './io/isoxml/index.js';
export { zipFiles, readZip } from './io/zip.js';
export { checkPrescription } from './check/index.js';
export { layersFromTaskData, layersFromTaskDataFiles } from './check/taskdata.js';
export { renderReport, serializeReportInput, parseReportInput } from './report/index.js';
