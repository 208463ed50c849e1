/**
 * ESRI shapefile reader: .shp + .dbf through the `shapefile` package, plus what that package leaves out:
 * the .prj (coordinate system: WGS 84 / NAD83 degrees, or UTM metres reprojected with proj4) and the
 * .cpg (text encoding of the .dbf). Also a .zip holding one shapefile (fflate).
 * Takes bytes, never paths: src/cli reads the files.
 */
import { readZip } from './zip.js';
import proj4 from 'proj4';
import { UserError } from '../errors.js';
import type { RawPolygons, RawTable, RawValue } from './records.js';

/** The files of one shapefile: .shp required; .dbf, .prj, .cpg as found beside it. */
export interface ShapefileParts {
  /** name for messages (the .shp or .zip path) */
  name: string;
  shp: Uint8Array;
  dbf?: Uint8Array;
  prj?: string;
  cpg?: string;
}

export interface ShapefileOptions {
  /** no .prj: treat the coordinates as WGS 84 degrees instead of refusing (default false) */
  assumeWgs84?: boolean;
}

/** Geographic or UTM coordinates, told from a .prj WKT. */
export type PrjKind = { kind: 'geographic'; datum: string } | { kind: 'utm'; zone: number; south: boolean; datum: string; proj4: string };

/**
 * Recognises a .prj: geographic WGS 84 / NAD83 / NAD83(CSRS), or UTM on those datums (by name or by its
 * Transverse Mercator parameters). Anything else is a UserError: tilth will not guess a projection.
 * @example parsePrj('GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",...]]', 'b.prj') // { kind: 'geographic', datum: 'WGS 84' }
 */
export function parsePrj(wkt: string, file: string): PrjKind {
  const w = wkt.replace(/\s+/g, ' ').trim();
  const datumM = /DATUM\s*\[\s*"([^"]+)"/i.exec(w);
  const datumName = datumM ? datumM[1] : '';
  const d = datumName.toUpperCase().replace(/[^A-Z0-9]/g, '');
  const datum = /WGS84|WGS1984|WORLDGEODETICSYSTEM1984/.test(d) ? 'WGS 84' : /NAD83|NORTHAMERICAN1983|NORTHAMERICANDATUM1983/.test(d) ? (/CSRS/.test(d) ? 'NAD83(CSRS)' : 'NAD83') : null;
  const unsupported = (why: string) =>
    new UserError(
      `${file}: the coordinate system in the .prj is ${why}. tilth reads WGS 84 or NAD83 longitude/latitude, or UTM metres on those datums. ` +
        'Fix: reproject the shapefile, e.g. `ogr2ogr -t_srs EPSG:4326 out.shp in.shp`.',
      { file, value: w.slice(0, 120) },
    );
  if (!datum) throw unsupported(`on the datum "${datumName || 'unknown'}"`);
  const head = /^\s*(PROJCS|PROJCRS|GEOGCS|GEOGCRS|GEODCRS)\b/i.exec(w)?.[1]?.toUpperCase();
  if (head === 'GEOGCS' || head === 'GEOGCRS' || head === 'GEODCRS') return { kind: 'geographic', datum };
  if (head !== 'PROJCS' && head !== 'PROJCRS') throw unsupported('not one tilth can read');
  const nameM = /^\s*\w+\s*\[\s*"([^"]+)"/.exec(w);
  const name = nameM ? nameM[1] : '';
  let zone: number | null = null, south = false;
  const zm = /UTM[_ ]?zone[_ ]?(\d{1,2})\s*([NS])?/i.exec(name);
  if (zm) {
    zone = Number(zm[1]);
    south = (zm[2] ?? 'N').toUpperCase() === 'S';
  } else if (/Transverse_Mercator/i.test(w)) {
    const param = (p: string) => {
      const m = new RegExp(`PARAMETER\\s*\\[\\s*"${p}"\\s*,\\s*([-+0-9.eE]+)`, 'i').exec(w);
      return m ? Number(m[1]) : NaN;
    };
    const cm = param('central_meridian'), k = param('scale_factor'), fe = param('false_easting'), fn = param('false_northing'), lat0 = param('latitude_of_origin');
    if (k === 0.9996 && fe === 500000 && (fn === 0 || fn === 10000000) && (lat0 === 0 || Number.isNaN(lat0)) && Number.isInteger((cm + 183) / 6)) {
      zone = (cm + 183) / 6; south = fn === 10000000;
    }
  }
  if (zone === null || zone < 1 || zone > 60) throw unsupported(`the projection "${name}"`);
  if (!/UNIT\s*\[\s*"(metre|meter|m)"/i.test(w.slice(w.lastIndexOf('UNIT')))) throw unsupported(`"${name}" in units other than metres`);
  return { kind: 'utm', zone, south, datum, proj4: `+proj=utm +zone=${zone}${south ? ' +south' : ''} +datum=WGS84 +units=m +no_defs` };
}

/**
 * Splits a .zip into the parts of the one shapefile it holds.
 * @example shapefileFromZip(bytes, 'boundary.zip').shp.length
 */
export function shapefileFromZip(bytes: Uint8Array, name: string): ShapefileParts {
  const files = readZip(bytes, name); // size, ratio and entry-name limits (src/io/zip.ts)
  const shps = Object.keys(files).filter((f) => f.toLowerCase().endsWith('.shp') && !f.startsWith('__MACOSX'));
  if (shps.length === 0) throw new UserError(`${name} holds no .shp file. Fix: zip the shapefile's files (.shp, .shx, .dbf, .prj) together.`, { file: name });
  if (shps.length > 1) throw new UserError(`${name} holds several shapefiles (${shps.join(', ')}). Fix: zip one shapefile per file.`, { file: name });
  const base = shps[0].slice(0, -4);
  const get = (ext: string) => {
    const k = Object.keys(files).find((f) => f.toLowerCase() === (base + ext).toLowerCase());
    return k ? files[k] : undefined;
  };
  const dec = (b?: Uint8Array) => (b ? new TextDecoder('utf-8').decode(b) : undefined);
  return { name: `${name} (${shps[0]})`, shp: files[shps[0]], dbf: get('.dbf'), prj: dec(get('.prj')), cpg: dec(get('.cpg')) };
}

/**
 * Text encoding for the .dbf from a .cpg ("UTF-8", "1252", "ISO-8859-1" ...); windows-1252 without one.
 * @example encodingFromCpg('1252') // 'windows-1252'
 */
export function encodingFromCpg(cpg: string | undefined): string {
  if (!cpg || !cpg.trim()) return 'windows-1252';
  const c = cpg.trim().toLowerCase();
  if (/^utf-?8$/.test(c)) return 'utf-8';
  if (/^\d+$/.test(c)) return c === '65001' ? 'utf-8' : `windows-${c}`;
  if (/^(iso[-_ ]?)?8859[-_ ]?(\d+)$/.test(c)) return `iso-8859-${/(\d+)$/.exec(c)![1]}`;
  return c;
}

interface ShpFeature { where: string; props: Record<string, RawValue>; geometry: { type: string; coordinates: unknown } | null }

/**
 * Reads all features of a shapefile, in WGS 84 longitude/latitude.
 * @param opts assumeWgs84 (default false): read a shapefile without .prj as WGS 84
 * @throws UserError for a missing or unreadable part, an unknown .prj, or no .prj without assumeWgs84
 * @example const r = await readShapefile({ name: 'b.shp', shp, dbf, prj }); r.features[0].geometry
 */
export async function readShapefile(parts: ShapefileParts, opts: ShapefileOptions = {}): Promise<{ file: string; features: ShpFeature[]; crs: string }> {
  const file = parts.name;
  if (parts.shp.length === 0) throw new UserError(`${file}: the .shp file is empty (0 bytes). Fix: export the layer again.`, { file });
  if (parts.dbf && parts.dbf.length === 0) {
    throw new UserError(`${file}: the .dbf file beside it is empty (0 bytes), so the attributes are lost. Fix: export the layer again, or copy the whole set of files (.shp, .shx, .dbf, .prj, .cpg).`, { file });
  }
  let crs: PrjKind;
  if (parts.prj === undefined || parts.prj.trim() === '') {
    if (!opts.assumeWgs84) {
      throw new UserError(
        `${file}: there is no .prj file beside it, so its coordinate system is unknown (a wrong guess moves the field by up to hundreds of metres). ` +
          'Fix: copy the .prj that came with the shapefile, or, if you know the coordinates are WGS 84 longitude/latitude, add --assume-wgs84.',
        { file },
      );
    }
    crs = { kind: 'geographic', datum: 'WGS 84 (assumed)' };
  } else crs = parsePrj(parts.prj, `${file} .prj`);
  const encoding = encodingFromCpg(parts.cpg);
  let fc;
  // loaded only when a shapefile is read: the package and its text-encoding polyfill cost about 0.1 s of
  // start-up for every command otherwise (docs/performance.md)
  const shapefile = await import('shapefile');
  try {
    fc = await shapefile.read(parts.shp, parts.dbf, { encoding });
  } catch (e) {
    throw new UserError(`${file} cannot be read as a shapefile (${(e as Error).message}). Fix: export the layer again.`, { file });
  }
  const conv = crs.kind === 'utm' ? proj4(crs.proj4, 'EPSG:4326') : null;
  const mapCoords = (c: unknown): unknown => {
    if (Array.isArray(c) && typeof c[0] === 'number') {
      const p = conv ? conv.forward([c[0], c[1]]) : [c[0], c[1]];
      return [p[0], p[1]];
    }
    return Array.isArray(c) ? c.map(mapCoords) : c;
  };
  const features: ShpFeature[] = fc.features.map((f, i) => {
    const props: Record<string, RawValue> = {};
    for (const [k, v] of Object.entries(f.properties ?? {})) {
      props[k] = v === undefined || v === null ? null : typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean' ? (typeof v === 'string' ? v.trim() : v) : String(v);
    }
    const g = f.geometry as unknown as { type: string; coordinates: unknown } | null;
    return { where: `record ${i + 1}`, props, geometry: g ? { type: g.type, coordinates: mapCoords(g.coordinates) } : null };
  });
  const crsText = crs.kind === 'utm' ? `UTM zone ${crs.zone}${crs.south ? 'S' : 'N'} (${crs.datum}), reprojected to WGS 84` : crs.datum;
  return { file, features, crs: crsText };
}

/**
 * Shapefile points to sample records (for src/validate/samples.ts).
 * @example buildSamples(shapefilePoints(await readShapefile(parts)))
 */
export function shapefilePoints(r: { file: string; features: ShpFeature[]; crs: string }): RawTable {
  const columns: string[] = [];
  for (const f of r.features) for (const k of Object.keys(f.props)) if (!columns.includes(k)) columns.push(k);
  if (columns.length === 0) {
    throw new UserError(`${r.file}: the samples have no attributes (no .dbf beside the .shp?). Fix: copy the .dbf with the .shp; the soil-test values are in it.`, { file: r.file });
  }
  return {
    file: r.file, columns, crs: r.crs,
    records: r.features.map((f) => {
      const g = f.geometry;
      let c: unknown = null;
      if (g?.type === 'Point') c = g.coordinates;
      else if (g?.type === 'MultiPoint' && Array.isArray(g.coordinates) && g.coordinates.length === 1) c = g.coordinates[0];
      if (!Array.isArray(c)) {
        throw new UserError(`${r.file} ${f.where}: a soil sample must be a point, not ${g ? g.type : 'an empty shape'}. Fix: give the samples as a point layer.`, { file: r.file, where: f.where });
      }
      return { where: f.where, lon: c[0] as number, lat: c[1] as number, props: f.props };
    }),
  };
}

/**
 * Shapefile polygons to polygon features (boundary or zones).
 * @example shapefilePolygons(await readShapefile(parts), 'boundary').features[0].coordinates
 */
export function shapefilePolygons(r: { file: string; features: ShpFeature[] }, what: string): RawPolygons {
  return {
    file: r.file,
    features: r.features.map((f) => {
      const g = f.geometry;
      if (g?.type === 'Polygon') return { where: f.where, props: f.props, coordinates: [g.coordinates as number[][][]] };
      if (g?.type === 'MultiPolygon') return { where: f.where, props: f.props, coordinates: g.coordinates as number[][][][] };
      throw new UserError(`${r.file} ${f.where}: the ${what} must be a polygon, not ${g ? g.type : 'an empty shape'}. Fix: give the ${what} as a polygon layer.`, { file: r.file, where: f.where });
    }),
  };
}
