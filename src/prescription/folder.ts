/**
 * The whole output folder of a build as path -> bytes: prescription GeoJSON, zones.csv, summary.json,
 * shapefile sets, ISO 11783-10 task data, report-data.json and report.html (with the sulphate-S charts).
 * Pure: the CLI (src/cli/build.ts) writes the files.
 */
import type { Tables } from '../agronomy/index.js';
import type { FieldInputs } from '../types.js';
import { zipFiles } from '../io/zip.js';
import { renderReport, serializeReportInput } from '../report/index.js';
import { sulphurPages, sulphurPagesInput, type SulphurPages } from './sulphurPages.js';
import type { Prescription } from './types.js';
import {
  geojsonName,
  prescriptionGeojson,
  shapefileFeatures,
  summaryObject,
  zonesCsv,
  type Provenance,
} from './outputs.js';
import { reportInput } from './reportInput.js';
import { prescriptionFiles } from './shapefiles.js';
import { prescriptionTaskDataFiles } from './taskdata.js';

export interface FolderOptions {
  /** provenance (src/prescription/provenance.ts) written into summary.json and the report */
  provenance: Provenance;
  /** the tables were edited by the user (the report says so); default false */
  tablesEdited?: boolean;
  /** called before each slow part ("writing shapefiles ...") */
  onStep?: (step: string) => void;
  /**
   * the report's sulphate-S pages when the caller computed them already (from {@link sulphurPagesInput} of this
   * build, e.g. in a worker thread while the zones were drawn); default: computed here
   */
  sulphur?: SulphurPages;
}

/** A build's output folder: relative path -> text or bytes, and the summary object written as summary.json. */
export interface PrescriptionFolder {
  files: Map<string, string | Uint8Array>;
  summary: unknown;
}

/** The shapefile sets the plan asks for, one group per zone set, under shapefiles/. */
function shapefileSets(rx: Prescription, prov: Provenance, files: Map<string, string | Uint8Array>): void {
  const plan = rx.plan;
  for (const set of rx.zoneSets) {
    const fc = shapefileFeatures(rx, set);
    if (fc.features.length === 0) continue;
    const shp = prescriptionFiles(fc, {
      layout: plan.output.shapefile_layout,
      crs: plan.output.crs === 'utm' ? 'utm' : 'lonlat',
      utm: rx.field.utm,
      shortFileNames: plan.output.short_names,
      prefix: rx.zoneSets.length > 1 ? `rx_${set.name}` : 'rx',
      title: `${plan.farm ? plan.farm + ', ' : ''}${plan.field || rx.field.name}: ${plan.crop}, zone set ${set.name} (tilth ${prov.tilth}, inputs ${prov.id})`,
    });
    for (const [name, bytes] of Object.entries(shp.files)) files.set(`shapefiles/${name}`, bytes);
  }
}

/** TASKDATA/ and the same files zipped as taskdata.zip. */
function taskData(rx: Prescription, tables: Tables, files: Map<string, string | Uint8Array>): void {
  const o = rx.plan.output;
  const td = prescriptionTaskDataFiles(rx, tables, {
    layout: o.shapefile_layout,
    grid: o.isoxml_grid,
    gridCellM: o.isoxml_grid_cell_m ?? undefined,
  });
  const inFolder = Object.fromEntries(Object.entries(td).map(([n, b]) => [`TASKDATA/${n}`, b]));
  for (const [n, b] of Object.entries(inFolder)) files.set(n, b);
  files.set('taskdata.zip', zipFiles(inFolder));
}

/**
 * Every file of a build's output folder, from the built prescription. The plan's `output.formats` chooses the
 * shapefile sets and the task data; GeoJSON, zones.csv, summary.json and the report are always written.
 * @example
 * const rx = buildPrescription(inputs, plan, tables);
 * const { files } = prescriptionFolder(rx, inputs, tables, { provenance: provenance(named) });
 * files.get('prescription.geojson')
 */
export function prescriptionFolder(
  rx: Prescription,
  inputs: FieldInputs,
  tables: Tables,
  opts: FolderOptions,
): PrescriptionFolder {
  const plan = rx.plan;
  const say = opts.onStep ?? (() => {});
  const files = new Map<string, string | Uint8Array>();
  for (const set of rx.zoneSets) files.set(geojsonName(rx, set), prescriptionGeojson(rx, set));
  files.set('zones.csv', zonesCsv(rx));
  const summary = summaryObject(rx, opts.provenance);
  files.set('summary.json', JSON.stringify(summary, null, 2) + '\n');
  if (plan.output.formats.includes('shapefile')) {
    say('writing shapefiles ...');
    shapefileSets(rx, opts.provenance, files);
  }
  if (plan.output.formats.includes('isoxml')) {
    say('writing ISO 11783-10 task data ...');
    taskData(rx, tables, files);
  }
  say('drawing the report ...');
  // the sulphate-S variability charts and chance map, from the build's own S surface (or computed ahead)
  const { charts, chance } =
    opts.sulphur ?? sulphurPages(sulphurPagesInput(inputs, plan, tables, rx.grid, rx.surfaces));
  const ri = reportInput(rx, inputs, tables, opts.provenance, { tablesEdited: opts.tablesEdited, charts });
  if (chance) ri.chance = [chance];
  files.set('report-data.json', serializeReportInput(ri));
  files.set('report.html', renderReport(ri));
  return { files, summary };
}
