/**
 * A polygon layer as `tilth check` reads it, from a .geojson, a shapefile set or a zip holding either.
 * File bytes come in (the CLI reads them); nothing here touches the file system.
 */
import type { Feature } from 'geojson';
import { UserError } from '../errors.js';
import { readZip } from '../io/zip.js';
import { readShapefile } from '../io/shapefile/read.js';
import { setFilesProblem } from './setfiles.js';
import { shapefileSet } from '../io/inputs.js';
import { parseGeoJson } from '../io/geojson.js';
import { readPrj, type CrsInfo } from '../geo/crs.js';

/** One column of the layer's attributes. */
export interface LayerField {
  name: string;
  /** N/F columns of a .dbf, or GeoJSON properties whose values are all numbers or null */
  numeric: boolean;
}

/** A layer to check: features in the file's own coordinates. */
export interface CheckLayer {
  /** file name for messages */
  label: string;
  features: Feature[];
  fields: LayerField[];
  /** the coordinate system found, or null when the file names none (.shp without .prj) */
  crs: CrsInfo | null;
  /** where the coordinate system came from */
  crsSource: 'prj' | 'geojson' | 'none';
  /** raw text of each value per column (shapefiles), to tell "blank" from "text the reader dropped" */
  rawText?: Record<string, string[]>;
  /** cell size in metres when the zones are grid cells: overlap, gap and outside pieces thinner on average are ignored */
  resolutionM?: number;
}

const ext = (n: string) => (/\.([^./\\]+)$/.exec(n)?.[1] ?? '').toLowerCase();

/**
 * Parses GeoJSON text into a layer. RFC 7946 GeoJSON is WGS 84 lon/lat; an old-style `crs` member
 * naming another system is honoured when tilth knows it (UTM, NAD83) and refused otherwise.
 */
export function layerFromGeoJSON(text: string, label: string): CheckLayer {
  const o = parseGeoJson(text, label) as {
    type?: string;
    features?: unknown;
    crs?: { properties?: { name?: string } };
  };
  let features: Feature[];
  if (o?.type === 'FeatureCollection' && Array.isArray(o.features)) features = o.features as Feature[];
  else if (o?.type === 'Feature') features = [o as unknown as Feature];
  else
    throw new UserError(
      `${label}: is not a GeoJSON FeatureCollection or Feature (type is ${JSON.stringify(o?.type)}). Fix: give the zone polygons as a FeatureCollection.`,
      { file: label },
    );
  let crs: CrsInfo = {
    kind: 'lonlat',
    datum: 'WGS84',
    epsg: 4326,
    label: 'WGS 84 longitude/latitude (GeoJSON, RFC 7946)',
  };
  const named = o.crs?.properties?.name;
  if (typeof named === 'string') {
    crs = readPrj(named);
  }
  const names = new Map<string, boolean>();
  for (const f of features) {
    for (const [k, v] of Object.entries(f?.properties ?? {})) {
      const num = v === null || typeof v === 'number';
      names.set(k, (names.get(k) ?? true) && num);
    }
  }
  return {
    label,
    features,
    fields: [...names].map(([name, numeric]) => ({ name, numeric })),
    crs,
    crsSource: 'geojson',
  };
}

/**
 * Reads a layer from file bytes: `main` is the name of the .geojson/.json, .shp or .zip in `files`;
 * a .shp's .shx, .dbf, .prj and .cpg are looked up beside it (same base name, any letter case).
 * A zip is read in memory and must hold exactly one .shp or one .geojson.
 *
 * @example const layer = await readLayer({ 'rx.zip': bytes }, 'rx.zip')
 */
export async function readLayer(files: Record<string, Uint8Array>, main: string): Promise<CheckLayer> {
  const e = ext(main);
  const bytes = files[main];
  if (!bytes) throw new UserError(`${main}: not found. Fix: check the path.`, { file: main });
  if (e === 'geojson' || e === 'json') return layerFromGeoJSON(new TextDecoder().decode(bytes), main);
  if (e === 'shp') {
    const parts = shapefileSet(files, main);
    const set = await readShapefile(parts, main);
    // then what the reader lets through but GDAL reads differently, or not at all (src/check/setfiles.ts)
    const mismatch = setFilesProblem(parts.shp, parts.shx, parts.dbf);
    if (mismatch)
      throw new UserError(
        `${main}: the shapefile's files do not agree: ${mismatch}; GDAL and field terminals would read it differently or not at all. Fix: export the prescription again.`,
        { file: main },
      );
    if (set.shapeType !== 5) {
      throw new UserError(
        `${main}: holds shape type ${set.shapeType}, not polygons (type 5). Fix: give the zone polygons of the prescription, not points or lines.`,
        { file: main, value: set.shapeType },
      );
    }
    if (!shapefileSet(files, main).dbf) {
      throw new UserError(
        `${main}: the attribute table ${main.slice(0, -4)}.dbf is missing, so there are no rates. Fix: copy the .dbf beside the .shp (same name).`,
        { file: main },
      );
    }
    return {
      label: main,
      features: set.features,
      fields: set.fields.map((f) => ({
        name: f.name,
        numeric: f.type === 'N' || (f.type as string) === 'F',
      })),
      crs: set.prj === null ? null : readPrj(set.prj),
      crsSource: set.prj === null ? 'none' : 'prj',
      rawText: set.rawText,
    };
  }
  if (e === 'zip') {
    const entries = readZip(bytes, main);
    const names = Object.keys(entries);
    const shps = names.filter((n) => ext(n) === 'shp');
    const gj = names.filter((n) => ext(n) === 'geojson' || ext(n) === 'json');
    if (shps.length > 1 || (shps.length === 0 && gj.length > 1)) {
      throw new UserError(
        `${main}: holds ${shps.length > 1 ? shps.length + ' shapefiles' : gj.length + ' GeoJSON files'} (${(shps.length > 1 ? shps : gj).join(', ')}); tilth checks one layer at a time. Fix: zip one prescription per archive, or check the files themselves.`,
        { file: main },
      );
    }
    const inner = shps[0] ?? gj[0];
    if (!inner)
      throw new UserError(
        `${main}: holds no .shp (nor .geojson) file (entries: ${names.join(', ') || 'none'}). Fix: zip the .shp together with its .shx, .dbf, .prj and .cpg.`,
        { file: main },
      );
    const layer = await readLayer(entries, inner);
    return { ...layer, label: `${main}:${inner}` };
  }
  throw new UserError(
    `${main}: tilth checks .geojson, .json, .shp and .zip files, not ".${e}". Fix: give one of those.`,
    { file: main },
  );
}
