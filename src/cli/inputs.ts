/**
 * Shared input loading for every command that takes --samples and --boundary:
 * reads the files, then calls the library's readers, validation and projection.
 *
 * CONTRACT (used by surface, variability, build ...): keep this signature stable.
 */
import type { FieldInputs, PMethod } from '../types.js';
import { prepareInputs, type PolygonSource, type SampleSource } from '../validate/inputs.js';
import { readShapefile, shapefileFromZip, shapefilePoints, shapefilePolygons, type ShapefileParts } from '../io/shapefile.js';
import { existsSync, readdirSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { readInput } from './util.js';

export interface InputOptions {
  /** samples file: .geojson/.json, .csv (lab style), .shp (with .dbf/.prj/.cpg beside), or .zip */
  samples: string;
  /** boundary file: .geojson/.json, .shp or .zip */
  boundary: string;
  /** zone polygons for zone-composite samples (optional) */
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
}

type ShapefileRead = Awaited<ReturnType<typeof readShapefile>>;

/** Shapefiles (.shp/.zip) read ahead by preloadInputs, by path (the shapefile package is asynchronous). */
const preloaded = new Map<string, ShapefileRead>();

const isShapefile = (path: string) => /\.(shp|zip)$/i.test(path);

/** The files of a shapefile on disk: the .shp and its .dbf/.prj/.cpg siblings (any letter case). */
function shapefileParts(path: string, what: string): ShapefileParts {
  if (/\.zip$/i.test(path)) return shapefileFromZip(readInput(path, what), path);
  const dir = dirname(path);
  const base = basename(path).slice(0, -4);
  const names = existsSync(dir) ? readdirSync(dir) : [];
  const sib = (ext: string) => {
    const n = names.find((f) => f.toLowerCase() === (base + ext).toLowerCase());
    return n ? join(dir, n) : undefined;
  };
  const shp = readInput(path, what);
  const dbf = sib('.dbf'), prj = sib('.prj'), cpg = sib('.cpg');
  return {
    name: path, shp,
    dbf: dbf ? readInput(dbf, what) : undefined,
    prj: prj ? readInput(prj, what).toString('utf8') : undefined,
    cpg: cpg ? readInput(cpg, what).toString('utf8') : undefined,
  };
}

/**
 * Reads any shapefile inputs (.shp or .zip) ahead of loadInputs; the CLI calls it from a preAction hook
 * (src/cli/main.ts) for every command with --samples / --boundary / --zones, so commands stay synchronous.
 */
export async function preloadInputs(opts: Partial<InputOptions>): Promise<void> {
  for (const [path, what] of [[opts.samples, 'samples'], [opts.boundary, 'boundary'], [opts.zones, 'zones']] as const) {
    if (!path || !isShapefile(path) || preloaded.has(path)) continue;
    preloaded.set(path, await readShapefile(shapefileParts(path, what), { assumeWgs84: opts.assumeWgs84 }));
  }
}

function samplesSource(path: string): SampleSource {
  const pre = preloaded.get(path);
  if (pre) return shapefilePoints(pre);
  if (isShapefile(path)) throw new Error(`shapefile ${path} was not preloaded (call preloadInputs first)`);
  return { name: path, bytes: readInput(path, 'samples') };
}

function polygonSource(path: string, what: string): PolygonSource {
  const pre = preloaded.get(path);
  if (pre) return shapefilePolygons(pre, what);
  if (isShapefile(path)) throw new Error(`shapefile ${path} was not preloaded (call preloadInputs first)`);
  return { name: path, bytes: readInput(path, what) };
}

/** Reads, validates and projects the inputs. Throws UserError for anything the user must fix. */
export function loadInputs(opts: InputOptions): FieldInputs {
  return prepareInputs(samplesSource(opts.samples), polygonSource(opts.boundary, 'boundary'), opts.zones ? polygonSource(opts.zones, 'zones') : undefined, {
    columns: opts.columns,
    depthFactor: opts.depthFactor,
    dropOutside: opts.dropOutside,
    pMethod: opts.pMethod,
  });
}
