/**
 * Shared input loading for every command that takes --samples and --boundary:
 * reads the files, then calls the library's readers, validation and projection.
 *
 * CONTRACT (used by surface, variability, build ...): keep this signature stable.
 */
import type { FieldInputs, PMethod } from '../types.js';
import { prepareInputs } from '../validate/inputs.js';
import { readInputs } from '../io/inputs.js';
import type { InputFile } from '../io/records.js';
import { existsSync, readdirSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { numberOption, readInput } from './util.js';
import { formatReading } from '../validate/reading.js';
import type { OutlierMode } from './safety/plausible.js';
import { applyOutlierTest, type OutlierSource } from './safety/readiness.js';

export interface InputOptions {
  /** samples file: .geojson/.json, .csv (lab style), .shp (with .dbf/.prj/.cpg beside), or .zip */
  samples: string;
  /** boundary file: .geojson/.json, .shp or .zip */
  boundary: string;
  /** zone polygons for zone-composite samples (optional; a GeoJSON samples file of zone polygons carries its own) */
  zones?: string;
  /** CSV column map "id=Sample ID,lat=Latitude,..." (optional; headers are detected otherwise) */
  columns?: string;
  /** factor from 0-6 in nitrate/sulphate lb/ac to 0-24 in, when only 0-6 in was sampled; no default */
  depthFactor?: number;
  /** drop samples outside the boundary instead of only warning */
  dropOutside?: boolean;
  /** P test method when the samples file does not name it (olsen | kelowna); never mixed */
  pMethod?: PMethod;
  /** a shapefile without .prj: read its coordinates as WGS 84 degrees instead of refusing */
  assumeWgs84?: boolean;
  /** coordinate system of easting / northing columns in a samples table, e.g. "EPSG:26913" */
  crs?: string;
  /** sheet of an .xlsx samples file (default: the first) */
  sheet?: string;
  /** print the column reading on stderr */
  verbose?: boolean;
  /** values the neighbour outlier test flags: keep them in the maps (default) or drop them from interpolation */
  outliers?: OutlierMode;
  /** where `outliers` came from, for the message (default: the option when set) */
  outliersFrom?: OutlierSource;
}

/**
 * One input file with, for a .shp, the files beside it (same base name, any letter case: .shx, .dbf, .prj, .cpg).
 * @example readInputFile('field.shp', 'boundary').beside
 */
export function readInputFile(path: string, what: string): InputFile {
  const bytes = readInput(path, what);
  if (!/\.shp$/i.test(path)) return { name: path, bytes };
  const dir = dirname(path);
  const prefix = path.slice(0, path.length - basename(path).length);
  const base = basename(path).slice(0, -4).toLowerCase();
  const beside: Record<string, Uint8Array> = {};
  for (const n of existsSync(dir) ? readdirSync(dir) : []) {
    const l = n.toLowerCase();
    if (l.startsWith(base + '.') && l.length === base.length + 4 && /\.(shx|dbf|prj|cpg)$/.test(l))
      beside[prefix + n] = readInput(join(dir, n), what);
  }
  return { name: path, bytes, beside };
}

/**
 * Reads, validates and projects the inputs, then runs the neighbour outlier test (src/cli/safety/readiness.ts
 * applyOutlierTest: warnings, and with `outliers: 'drop'` the flagged values left out). Throws UserError for
 * anything the user must fix. Defaults: no depth factor (0-6 in only is an error), samples outside the boundary
 * kept with a warning, shapefiles without .prj refused, P method from the file (else an error), outliers kept.
 * @example const inp = await loadInputs({ samples: 'sample-fields/quarter/samples.csv', boundary: 'sample-fields/quarter/boundary.geojson' });
 */
export async function loadInputs(opts: InputOptions): Promise<FieldInputs> {
  const files = {
    samples: readInputFile(opts.samples, 'samples'),
    boundary: readInputFile(opts.boundary, 'boundary'),
    zones: opts.zones ? readInputFile(opts.zones, 'zones') : undefined,
  };
  const raw = await readInputs(files, {
    columns: opts.columns,
    assumeWgs84: opts.assumeWgs84,
    crs: opts.crs,
    sheet: opts.sheet,
  });
  const inputs = prepareInputs(raw, {
    columns: opts.columns,
    depthFactor: opts.depthFactor,
    dropOutside: opts.dropOutside,
    pMethod: opts.pMethod,
    crs: opts.crs,
  });
  const from = opts.outliers === undefined ? 'default' : (opts.outliersFrom ?? 'option');
  applyOutlierTest(inputs, opts.samples, opts.outliers ?? 'keep', from);
  if (opts.verbose && inputs.reading)
    process.stderr.write(`${formatReading(inputs.reading, `columns of ${opts.samples}`)}\n`);
  return inputs;
}

/**
 * Adds the input options every command that loads a field shares: --samples and --boundary (required),
 * --zones, --columns, --p-method, --depth-factor, --drop-outside, --outliers, --assume-wgs84. Pair with inputOptionsFrom.
 * @example addInputOptions(program.command('surface')).action((o) => { const inp = await loadInputs(inputOptionsFrom(o)); ... })
 */
export function addInputOptions(cmd: Command): Command {
  return cmd
    .requiredOption('--samples <file>', 'soil samples (.geojson, .csv, .xlsx, .shp, .zip)')
    .requiredOption('--boundary <file>', 'field boundary (.geojson, .shp, .zip)')
    .option('--zones <file>', 'zone polygons that zone-composite samples are keyed to (.geojson, .shp, .zip)')
    .option(
      '--columns <map>',
      'column map, e.g. "id=Sample ID,lat=Lat,lon=Long,p=P Olsen:ppm,ph=pH (1:2)@0-6" (headers are recognised otherwise; the map always wins)',
    )
    .option('--sheet <name>', 'sheet of an .xlsx samples file (default: the first sheet)')
    .option(
      '--crs <EPSG:code>',
      'coordinate system of easting/northing columns in a samples table, e.g. EPSG:26913 (NAD83 / UTM 13N)',
    )
    .option('--verbose', 'print how each column of the samples file was read (on stderr)')
    .option('--p-method <method>', 'P test method when the file does not name it: olsen or kelowna')
    .option(
      '--depth-factor <x>',
      'factor from 0-6 in to 0-24 in nitrate and sulphate when only 0-6 in was sampled (no default: ask your lab or agronomist)',
    )
    .option('--drop-outside', 'leave out samples outside the boundary (default: keep them and warn)')
    .option(
      '--outliers <keep|drop>',
      "values far from their 6 nearest samples (neighbour outlier test, named in a warning): keep them in the maps, or drop them from interpolation (the dropped sample ids are listed in the warnings, summary and report); default keep, or the plan's soil_test.outliers for build",
    )
    .option(
      '--assume-wgs84',
      'read a shapefile that has no .prj as WGS 84 longitude/latitude (default: refuse)',
    );
}

/**
 * Turns the parsed options of addInputOptions into InputOptions, checking their values (UserError).
 * @example await loadInputs(inputOptionsFrom(cmd.opts()))
 */
export function inputOptionsFrom(o: Record<string, unknown>): InputOptions {
  let pMethod: PMethod | undefined;
  if (o.pMethod !== undefined) {
    const m = String(o.pMethod).toLowerCase();
    if (m !== 'olsen' && m !== 'kelowna')
      throw new UserError(
        `option --p-method: "${o.pMethod}" is not olsen or kelowna. Fix: give --p-method olsen or --p-method kelowna.`,
      );
    pMethod = m;
  }
  let outliers: OutlierMode | undefined;
  if (o.outliers !== undefined) {
    const m = String(o.outliers).toLowerCase();
    if (m !== 'keep' && m !== 'drop')
      throw new UserError(
        `option --outliers: "${o.outliers}" is not keep or drop. Fix: give --outliers keep (the default) or --outliers drop.`,
      );
    outliers = m;
  }
  return {
    samples: String(o.samples),
    boundary: String(o.boundary),
    zones: o.zones === undefined ? undefined : String(o.zones),
    columns: o.columns === undefined ? undefined : String(o.columns),
    pMethod,
    depthFactor: numberOption('--depth-factor', o.depthFactor as string | undefined, { min: 1, max: 10 }),
    dropOutside: Boolean(o.dropOutside),
    assumeWgs84: Boolean(o.assumeWgs84),
    crs: o.crs === undefined ? undefined : String(o.crs),
    sheet: o.sheet === undefined ? undefined : String(o.sheet),
    verbose: Boolean(o.verbose),
    outliers,
  };
}
