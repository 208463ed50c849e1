/**
 * Shapefile inputs in WGS 84 longitude/latitude: the .prj read by the one .prj reader (src/geo/crs.ts), UTM
 * reprojected with proj4, and the features turned into the raw records the validate stage judges
 * (points for samples, polygons for a boundary or zones).
 */
import proj4 from 'proj4';
import { UserError } from '../../errors.js';
import { readPrj, utmProj4, type CrsInfo } from '../../geo/crs.js';
import type { RawPolygons, RawTable, RawValue } from '../records.js';
import type { ShapefileRead } from './read.js';

export interface LonLatOptions {
  /** no .prj: treat the coordinates as WGS 84 degrees instead of refusing (default false) */
  assumeWgs84?: boolean;
}

/** One shapefile feature in lon/lat with its attributes as read (text trimmed). */
export interface LonLatFeature {
  where: string;
  props: Record<string, RawValue>;
  geometry: { type: string; coordinates: unknown } | null;
}

/** A shapefile in lon/lat: its features and the coordinate system it came in, in words. */
export interface LonLatShapefile {
  file: string;
  features: LonLatFeature[];
  crs: string;
}

const DATUM_WORDS: Record<CrsInfo['datum'], string> = {
  WGS84: 'WGS 84',
  NAD83: 'NAD83',
  'NAD83(CSRS)': 'NAD83(CSRS)',
  other: 'other',
};

/** The .prj as tilth reads inputs: WGS 84 / NAD83 degrees or UTM metres, else a UserError with the fix. */
function inputCrs(read: ShapefileRead, opts: LonLatOptions): CrsInfo | null {
  const file = read.file;
  if (read.prj === null) {
    if (opts.assumeWgs84) return null;
    throw new UserError(
      `${file}: there is no .prj file beside it, so its coordinate system is unknown (a wrong guess moves the field by up to hundreds of metres). ` +
        'Fix: copy the .prj that came with the shapefile, or, if you know the coordinates are WGS 84 longitude/latitude, add --assume-wgs84.',
      { file },
    );
  }
  const crs = readPrj(read.prj);
  if (crs.kind === null) {
    throw new UserError(
      `${file} .prj: the coordinate system in the .prj is ${crs.problem}. tilth reads WGS 84 or NAD83 longitude/latitude, or UTM metres on those datums. ` +
        'Fix: reproject the shapefile, e.g. `ogr2ogr -t_srs EPSG:4326 out.shp in.shp`.',
      { file: `${file} .prj`, value: read.prj.replace(/\s+/g, ' ').trim().slice(0, 120) },
    );
  }
  return crs;
}

/**
 * A shapefile's features in WGS 84 longitude/latitude.
 * @param opts assumeWgs84 (default false): read a shapefile without .prj as WGS 84
 * @throws UserError for no .prj without assumeWgs84, or a .prj tilth does not read
 * @example shapefileLonLat(await readShapefile(files, 'b.shp')).features[0].geometry
 */
export function shapefileLonLat(read: ShapefileRead, opts: LonLatOptions = {}): LonLatShapefile {
  const crs = inputCrs(read, opts);
  const conv = crs?.kind === 'utm' ? proj4(utmProj4(crs.zone!, crs.south!), 'EPSG:4326') : null;
  const mapCoords = (c: unknown): unknown => {
    if (Array.isArray(c) && typeof c[0] === 'number') {
      const p = conv ? conv.forward([c[0], c[1]]) : [c[0], c[1]];
      return [p[0], p[1]];
    }
    return Array.isArray(c) ? c.map(mapCoords) : c;
  };
  const features = read.features.map((f, i): LonLatFeature => {
    const props: Record<string, RawValue> = {};
    for (const [k, v] of Object.entries(f.properties ?? {})) {
      props[k] =
        v === undefined || v === null
          ? null
          : typeof v === 'number' || typeof v === 'boolean'
            ? v
            : typeof v === 'string'
              ? v.trim()
              : String(v);
    }
    const g = f.geometry as unknown as { type: string; coordinates: unknown } | null;
    return {
      where: `record ${i + 1}`,
      props,
      geometry: g ? { type: g.type, coordinates: mapCoords(g.coordinates) } : null,
    };
  });
  const words =
    crs === null
      ? 'WGS 84 (assumed)'
      : crs.kind === 'utm'
        ? `UTM zone ${crs.zone}${crs.south ? 'S' : 'N'} (${DATUM_WORDS[crs.datum]}), reprojected to WGS 84`
        : DATUM_WORDS[crs.datum];
  return { file: read.file, features, crs: words };
}

/**
 * Shapefile points to sample records (for src/validate/samples.ts).
 * @example buildSamples(shapefilePoints(shapefileLonLat(await readShapefile(files, 's.shp'))))
 */
export function shapefilePoints(r: LonLatShapefile): RawTable {
  const columns: string[] = [];
  for (const f of r.features) for (const k of Object.keys(f.props)) if (!columns.includes(k)) columns.push(k);
  if (columns.length === 0) {
    throw new UserError(
      `${r.file}: the samples have no attributes (no .dbf beside the .shp, or a .dbf with no columns). Fix: copy the .dbf that belongs to the .shp beside it, or export the layer again; the soil-test values are in it.`,
      { file: r.file },
    );
  }
  return {
    file: r.file,
    columns,
    crs: r.crs,
    records: r.features.map((f) => {
      const g = f.geometry;
      let c: unknown = null;
      if (g?.type === 'Point') c = g.coordinates;
      else if (g?.type === 'MultiPoint' && Array.isArray(g.coordinates) && g.coordinates.length === 1)
        c = g.coordinates[0];
      if (!Array.isArray(c)) {
        throw new UserError(
          `${r.file} ${f.where}: a soil sample must be a point, not ${g ? g.type : 'an empty shape'}. Fix: give the samples as a point layer.`,
          { file: r.file, where: f.where },
        );
      }
      return { where: f.where, lon: c[0] as number, lat: c[1] as number, props: f.props };
    }),
  };
}

/**
 * Shapefile polygons to polygon features (boundary or zones).
 * @example shapefilePolygons(shapefileLonLat(await readShapefile(files, 'b.shp')), 'boundary').features[0].coordinates
 */
export function shapefilePolygons(r: LonLatShapefile, what: string): RawPolygons {
  return {
    file: r.file,
    features: r.features.map((f) => {
      const g = f.geometry;
      if (g?.type === 'Polygon')
        return { where: f.where, props: f.props, coordinates: [g.coordinates as number[][][]] };
      if (g?.type === 'MultiPolygon')
        return { where: f.where, props: f.props, coordinates: g.coordinates as number[][][][] };
      throw new UserError(
        `${r.file} ${f.where}: the ${what} must be a polygon, not ${g ? g.type : 'an empty shape'}. Fix: give the ${what} as a polygon layer.`,
        { file: r.file, where: f.where },
      );
    }),
  };
}
