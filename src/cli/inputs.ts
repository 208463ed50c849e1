/**
 * Shared input loading for every command that takes --samples and --boundary:
 * reads the files, then calls the library's readers, validation and projection.
 *
 * CONTRACT (used by surface, variability, build ...): keep this signature stable.
 */
import type { FieldInputs, PMethod } from '../types.js';
import { UserError } from '../errors.js';
import { prepareInputs, type PolygonSource, type SampleSource } from '../validate/inputs.js';
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
}

/** Shapefiles (.shp/.zip) read ahead by preloadInputs (the shapefile reader is asynchronous). */
const preloaded = new Map<string, SampleSource | PolygonSource>();

function source(path: string, what: string): SampleSource & PolygonSource {
  const pre = preloaded.get(path);
  if (pre) return pre as SampleSource & PolygonSource;
  const lower = path.toLowerCase();
  if (lower.endsWith('.shp') || lower.endsWith('.zip') || lower.endsWith('.dbf')) {
    throw new UserError(`${what} file "${path}" is a shapefile, which must be read ahead (preloadInputs) before loadInputs. This is a bug in the command, please report it.`);
  }
  return { name: path, bytes: readInput(path, what) } as SampleSource & PolygonSource;
}

/** Reads, validates and projects the inputs. Throws UserError for anything the user must fix. */
export function loadInputs(opts: InputOptions): FieldInputs {
  return prepareInputs(source(opts.samples, 'samples'), source(opts.boundary, 'boundary'), opts.zones ? source(opts.zones, 'zones') : undefined, {
    columns: opts.columns,
    depthFactor: opts.depthFactor,
    dropOutside: opts.dropOutside,
    pMethod: opts.pMethod,
  });
}
