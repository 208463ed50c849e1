/**
 * Coordinate reference systems: the one proj4 string builder, the one WKT (.prj) writer and the one .prj
 * reader. tilth writes WGS 84 longitude/latitude or WGS 84 / UTM, and reads geographic WGS 84 / NAD83 /
 * NAD83(CSRS) and UTM on those datums; anything else is reported as not recognised (a silently mis-read
 * projection would move the prescription), see docs/architecture.md.
 */
import type { UtmZone } from '../types.js';

/**
 * The proj4 definition of a WGS 84 UTM zone.
 * @example utmProj4(13, false) // '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs'
 */
export function utmProj4(zone: number, south: boolean): string {
  return `+proj=utm +zone=${zone}${south ? ' +south' : ''} +datum=WGS84 +units=m +no_defs`;
}

/**
 * A WGS 84 UTM zone with its EPSG code (326zz north, 327zz south) and proj4 definition.
 * @example utmZone(13, false).epsg // 32613
 */
export function utmZone(zone: number, south: boolean): UtmZone {
  return { zone, south, epsg: (south ? 32700 : 32600) + zone, proj4: utmProj4(zone, south) };
}

const GEOGCS_WGS84 =
  'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]';

/**
 * .prj text (ESRI WKT 1) for WGS 84 lon/lat (EPSG:4326) or a WGS 84 UTM zone (EPSG:326zz / 327zz), byte for
 * byte as GDAL 3.6.2 `ogr2ogr -t_srs EPSG:...` writes it beside a shapefile or an ASCII grid (one line, no newline).
 *
 * @param utm a UTM zone, or null for lon/lat
 * @example prjText(null) // 'GEOGCS["GCS_WGS_1984",...]'
 * @example prjText({ zone: 13, south: false }) // 'PROJCS["WGS_1984_UTM_Zone_13N",...]'
 */
export function prjText(utm: Pick<UtmZone, 'zone' | 'south'> | null): string {
  if (!utm) return GEOGCS_WGS84;
  const cm = 6 * utm.zone - 183;
  return (
    `PROJCS["WGS_1984_UTM_Zone_${utm.zone}${utm.south ? 'S' : 'N'}",${GEOGCS_WGS84},PROJECTION["Transverse_Mercator"],` +
    `PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",${utm.south ? '10000000.0' : '0.0'}],` +
    `PARAMETER["Central_Meridian",${cm.toFixed(1)}],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]`
  );
}

/** What a .prj (or a GeoJSON `crs` name) says, as far as tilth understands it. */
export interface CrsInfo {
  /** geographic lon/lat degrees, or UTM metres; null when not recognised */
  kind: 'lonlat' | 'utm' | null;
  zone?: number;
  south?: boolean;
  /** datum found in the text */
  datum: 'WGS84' | 'NAD83' | 'NAD83(CSRS)' | 'other';
  /** EPSG code when one is plain (4326, 4269, 4617, 326zz, 327zz, 269zz), else null */
  epsg: number | null;
  /** for messages */
  label: string;
  /** when not recognised: why, for a message ("on the datum "D_Tokyo"", "in units other than metres" ...) */
  problem?: string;
}

/** Datum of a WKT: from its DATUM["..."] name (any spelling ESRI, OGC or EPSG use), else from the whole text. */
function datumOf(w: string): CrsInfo['datum'] {
  const name = /DATUM\s*\[\s*"([^"]+)"/i.exec(w)?.[1] ?? w;
  const d = name.toUpperCase().replace(/[^A-Z0-9]/g, '');
  if (/WGS84|WGS1984|WORLDGEODETICSYSTEM1984/.test(d)) return 'WGS84';
  if (/NAD83|NORTHAMERICAN1983|NORTHAMERICANDATUM1983/.test(d))
    return /CSRS/.test(d) ? 'NAD83(CSRS)' : 'NAD83';
  return 'other';
}

/** UTM zone and hemisphere of a projected WKT: by its name, else by its Transverse Mercator parameters. */
function utmOf(w: string, name: string): { zone: number; south: boolean } | null {
  const param = (p: string) => {
    const m = new RegExp(`PARAMETER\\s*\\[\\s*"${p}"\\s*,\\s*([-+0-9.eE]+)`, 'i').exec(w);
    return m ? Number(m[1]) : NaN;
  };
  const fn = param('false_northing');
  const zm = /UTM[_ ]?zone[_ ]?(\d{1,2})\s*([NS])?/i.exec(name);
  if (zm) return { zone: Number(zm[1]), south: zm[2] ? zm[2].toUpperCase() === 'S' : fn > 0 };
  if (!/Transverse_Mercator/i.test(w)) return null;
  const cm = param('central_meridian'),
    k = param('scale_factor'),
    fe = param('false_easting'),
    lat0 = param('latitude_of_origin');
  if (
    k === 0.9996 &&
    fe === 500000 &&
    (fn === 0 || fn === 10000000) &&
    (lat0 === 0 || Number.isNaN(lat0)) &&
    Number.isInteger((cm + 183) / 6)
  ) {
    return { zone: (cm + 183) / 6, south: fn === 10000000 };
  }
  return null;
}

function fromEpsg(code: number, text: string): CrsInfo {
  if (code === 4326)
    return { kind: 'lonlat', datum: 'WGS84', epsg: 4326, label: 'WGS 84 longitude/latitude (EPSG:4326)' };
  if (code === 4269)
    return { kind: 'lonlat', datum: 'NAD83', epsg: 4269, label: 'NAD83 longitude/latitude (EPSG:4269)' };
  if (code === 4617)
    return {
      kind: 'lonlat',
      datum: 'NAD83(CSRS)',
      epsg: 4617,
      label: 'NAD83(CSRS) longitude/latitude (EPSG:4617)',
    };
  if (code > 32600 && code <= 32660)
    return {
      kind: 'utm',
      zone: code - 32600,
      south: false,
      datum: 'WGS84',
      epsg: code,
      label: `WGS 84 / UTM zone ${code - 32600}N (EPSG:${code})`,
    };
  if (code > 32700 && code <= 32760)
    return {
      kind: 'utm',
      zone: code - 32700,
      south: true,
      datum: 'WGS84',
      epsg: code,
      label: `WGS 84 / UTM zone ${code - 32700}S (EPSG:${code})`,
    };
  if (code > 26900 && code <= 26923)
    return {
      kind: 'utm',
      zone: code - 26900,
      south: false,
      datum: 'NAD83',
      epsg: code,
      label: `NAD83 / UTM zone ${code - 26900}N (EPSG:${code})`,
    };
  return { kind: null, datum: 'other', epsg: code, label: text, problem: `EPSG:${code}` };
}

/**
 * Reads a .prj (ESRI WKT, OGC WKT 1 or 2) or an EPSG / OGC URN name (a GeoJSON `crs` member): WGS 84, NAD83
 * and NAD83(CSRS) geographic systems, and UTM on those datums (by name or by its Transverse Mercator
 * parameters, in metres). Anything else comes back with `kind: null` and a `problem` for the message; the
 * caller decides whether that is an error. NAD83 variants are used as WGS 84 (1-2 m apart): say so.
 *
 * @example readPrj('PROJCS["WGS_1984_UTM_Zone_13N",...]') // { kind: 'utm', zone: 13, south: false, epsg: 32613, ... }
 * @example readPrj('urn:ogc:def:crs:OGC:1.3:CRS84').epsg // 4326
 */
export function readPrj(text: string): CrsInfo {
  const w = text.replace(/\s+/g, ' ').trim();
  const head = /^(PROJCS|PROJCRS|GEOGCS|GEOGCRS|GEODCRS)\b/i.exec(w)?.[1]?.toUpperCase();
  const epsgName = /EPSG:{1,2}(\d{4,5})\b/i.exec(w) ?? /^(\d{4,5})$/.exec(w);
  if (epsgName && !head) return fromEpsg(Number(epsgName[1]), w);
  if (/urn:ogc:def:crs:OGC:[\d.]*:CRS84/i.test(w)) return fromEpsg(4326, w);
  const datum = datumOf(w);
  const name = /^\s*\w+\s*\[\s*"([^"]*)"/.exec(w)?.[1] ?? '';
  const unknown = (problem: string, label = name || w.slice(0, 60) || 'empty'): CrsInfo => ({
    kind: null,
    datum,
    epsg: null,
    label,
    problem,
  });
  if (!head) return unknown('not one tilth can read');
  if (datum === 'other')
    return unknown(`on the datum "${/DATUM\s*\[\s*"([^"]+)"/i.exec(w)?.[1] ?? 'unknown'}"`);
  if (head.startsWith('GEOG') || head === 'GEODCRS') {
    const epsg = datum === 'WGS84' ? 4326 : datum === 'NAD83' ? 4269 : 4617;
    return { kind: 'lonlat', datum, epsg, label: `${datum} longitude/latitude (EPSG:${epsg})` };
  }
  const utm = utmOf(w, name);
  if (!utm || utm.zone < 1 || utm.zone > 60)
    return unknown(`the projection "${name}"`, name || 'unnamed projected system');
  if (!/UNIT\s*\[\s*"(metre|meter|m)"/i.test(w.slice(w.lastIndexOf('UNIT'))))
    return unknown(`"${name}" in units other than metres`);
  const { zone, south } = utm;
  const epsg =
    datum === 'WGS84'
      ? (south ? 32700 : 32600) + zone
      : datum === 'NAD83' && !south && zone <= 23
        ? 26900 + zone
        : null;
  return {
    kind: 'utm',
    zone,
    south,
    datum,
    epsg,
    label: `${datum} / UTM zone ${zone}${south ? 'S' : 'N'}${epsg ? ` (EPSG:${epsg})` : ''}`,
  };
}
