/**
 * writeShapefile: polygon features (GeoJSON lon/lat) to the bytes of a shapefile set.
 * Why our own writer and not a library: docs/formats.md.
 */
import { csvCell } from '../csv-escape.js';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import type { UtmZone } from '../../types.js';
import { projector, utmZoneFor } from '../../geo/utm.js';
import { exteriorsBbox, orient } from '../../geo/area.js';
import { encodePolygons, type ShpPolygon } from './shp.js';
import { encodeDbf, type DbfField } from './dbf.js';
import { prjText } from '../../geo/crs.js';
import { shortFieldNames, shortFileNames } from './names.js';

/** One attribute column to write, taken from each feature's `properties[key]`. */
export interface ColumnSpec {
  /** property name in the features (any length) */
  key: string;
  /** N number, C text */
  type: 'N' | 'C';
  /** characters per value (N: digits + sign + point, at most 20; C: bytes, at most 254) */
  width: number;
  /** digits after the point (N only; default 0) */
  decimals?: number;
  /** wanted column name (default: `key`); cut to 10 characters and made unique */
  name?: string;
  /** one line for people, written to the column list beside the files */
  description?: string;
}

/** A column as written: its dBASE name beside the property it came from. */
export interface ResolvedColumn extends DbfField {
  key: string;
  description: string;
}

/** Options of {@link writeShapefile}. */
export interface ShapefileOptions {
  /** base file name without extension, e.g. "rx_seed_row" */
  name: string;
  /** coordinates to write: WGS 84 lon/lat (default, EPSG:4326) or UTM metres (EPSG:326zz/327zz) */
  crs?: 'lonlat' | 'utm';
  /** UTM zone for crs 'utm' (default: the zone of the centre of all features' bounding box) */
  utm?: UtmZone;
  /** 8.3 file names (upper case, base at most 8 characters) for older terminals; default false */
  shortFileName?: boolean;
  /** date in the .dbf header (default today, UTC) */
  date?: Date;
}

/**
 * The dBASE columns for the given specs: names at most 10 characters and unique.
 * @example resolveColumns([{ key: 'zone_id', type: 'N', width: 4 }])[0].name // 'zone_id'
 */
export function resolveColumns(specs: readonly ColumnSpec[]): ResolvedColumn[] {
  const names = shortFieldNames(specs.map((s) => s.name ?? s.key));
  return specs.map((s, i) => ({
    name: names[i],
    type: s.type,
    width: s.width,
    decimals: s.type === 'N' ? (s.decimals ?? 0) : 0,
    key: s.key,
    description: s.description ?? '',
  }));
}

/** The base file name the writer uses for `name` (8.3 upper case when asked). */
export function baseFileName(name: string, shortFileName = false): string {
  return shortFileName ? shortFileNames([name])[0] : name.replace(/[^A-Za-z0-9_.-]+/g, '_');
}

/** Polygon list of a feature's geometry (a Polygon is a one-part MultiPolygon). */
function polygonsOf(f: Feature, i: number): number[][][][] {
  const g = f.geometry;
  if (g?.type === 'Polygon') return [(g as Polygon).coordinates];
  if (g?.type === 'MultiPolygon') return (g as MultiPolygon).coordinates;
  throw new RangeError(
    `writeShapefile: feature ${i + 1} has geometry ${g ? g.type : 'null'}; only Polygon and MultiPolygon are written`,
  );
}

/** Closes a flat ring and orients it: clockwise (cw = true) or counter-clockwise. */
function shpRing(flat: number[], cw: boolean): Float64Array {
  const n = flat.length;
  const closed = flat[0] === flat[n - 2] && flat[1] === flat[n - 1];
  return orient(new Float64Array(closed ? flat : [...flat, flat[0], flat[1]]), !cw);
}

/**
 * Writes Polygon and MultiPolygon features (GeoJSON, WGS 84 lon/lat) as an ESRI shapefile set:
 * `.shp`, `.shx`, `.dbf`, `.prj`, `.cpg` (UTF-8) and a column list `.columns.csv` (8.3 mode: `.CSV`)
 * giving each short dBASE name, the property it holds, its type, width, decimals and description.
 * Exterior rings are written clockwise and holes counter-clockwise (ESRI technical description,
 * the opposite of GeoJSON); Polygons and MultiPolygons share one file (shape type 5). Pure: returns bytes.
 *
 * @param features polygon features, one record each, in order
 * @param columns attribute columns (widths explicit; a value too wide for its column throws RangeError)
 * @param opts file name, coordinates (default lon/lat), 8.3 names (default off)
 * @returns file name -> bytes
 * @example
 * const files = writeShapefile(fc.features, [{ key: 'zone_id', type: 'N', width: 4 }], { name: 'zones', crs: 'utm' });
 * // { 'zones.shp': ..., 'zones.shx': ..., 'zones.dbf': ..., 'zones.prj': ..., 'zones.cpg': ..., 'zones.columns.csv': ... }
 */
export function writeShapefile(
  features: readonly Feature[],
  columns: readonly ColumnSpec[],
  opts: ShapefileOptions,
): Record<string, Uint8Array> {
  const lonlatPolys = features.map((f, i) => polygonsOf(f, i));
  let utm: UtmZone | null = null;
  if (opts.crs === 'utm') {
    utm = opts.utm ?? null;
    if (!utm) {
      const [x0, y0, x1, y1] = exteriorsBbox(lonlatPolys.flat());
      utm = utmZoneFor((x0 + x1) / 2, (y0 + y1) / 2);
    }
  }
  const proj = utm ? projector(utm) : null;
  const shpPolys: ShpPolygon[] = lonlatPolys.map((polys, i) => {
    const rings: Float64Array[] = [];
    for (const poly of polys) {
      poly.forEach((ring, k) => {
        const flat = ring.flatMap((pt) => [pt[0], pt[1]]);
        if (ring.length < 3 || flat.some((v) => !Number.isFinite(v)))
          throw new RangeError(
            `writeShapefile: feature ${i + 1} has a ring with fewer than 3 points or a non-number coordinate`,
          );
        const xy = proj ? Array.from(proj.forward(flat)) : flat;
        rings.push(shpRing(xy, k === 0));
      });
    }
    return rings;
  });
  const cols = resolveColumns(columns);
  const rows = features.map((f) =>
    cols.map((c) => {
      const v = f.properties?.[c.key];
      if (v === undefined || v === null) return null;
      return c.type === 'N' ? (typeof v === 'number' ? v : Number.NaN) : String(v);
    }),
  );
  const { shp, shx } = encodePolygons(shpPolys);
  const base = baseFileName(opts.name, opts.shortFileName);
  const ext = (e: string) => `${base}.${opts.shortFileName ? e.toUpperCase() : e}`;
  const enc = new TextEncoder();
  const list =
    [
      'column,property,type,width,decimals,description',
      ...cols.map((c) => [c.name, c.key, c.type, c.width, c.decimals, c.description].map(csvCell).join(',')),
    ].join('\n') + '\n';
  return {
    [ext('shp')]: shp,
    [ext('shx')]: shx,
    [ext('dbf')]: encodeDbf(cols, rows, opts.date),
    [ext('prj')]: enc.encode(prjText(utm)),
    [ext('cpg')]: enc.encode('UTF-8'),
    [opts.shortFileName ? ext('csv') : `${base}.columns.csv`]: enc.encode(list),
  };
}
