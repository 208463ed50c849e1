/**
 * The .prj text (ESRI-style WKT) of the coordinate systems tilth writes, and recognition of
 * the .prj files other programs write.
 */
import type { UtmZone } from '../../types.js';

const GEOGCS_WGS84 =
  'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]';

/**
 * .prj text for WGS 84 lon/lat (EPSG:4326) or a WGS 84 UTM zone (EPSG:326zz / 327zz), byte for byte
 * as GDAL 3.6.2 `ogr2ogr -t_srs EPSG:...` writes it (one line, no newline).
 *
 * @param utm a UTM zone, or null for lon/lat
 * @example prjText(null) // 'GEOGCS["GCS_WGS_1984",...]'
 */
export function prjText(utm: UtmZone | null): string {
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
  /** EPSG code when one is plain (4326, 4269, 326zz, 327zz, 269zz), else null */
  epsg: number | null;
  /** for messages */
  label: string;
}

/**
 * Recognises WGS 84, NAD83 and NAD83(CSRS) geographic and UTM systems in a .prj (ESRI WKT or OGC WKT 1)
 * or an EPSG / OGC URN name. NAD83 variants are used as WGS 84 (1-2 m apart), which the caller should say.
 *
 * @example parseCrs('PROJCS["WGS_1984_UTM_Zone_13N",...]') // { kind: 'utm', zone: 13, south: false, epsg: 32613, ... }
 */
export function parseCrs(text: string): CrsInfo {
  const t = text.trim();
  const epsgName = /EPSG:{1,2}(\d{4,5})\b/i.exec(t) ?? /^(\d{4,5})$/.exec(t);
  if (epsgName && !/^(PROJCS|GEOGCS|PROJCRS|GEOGCRS)/i.test(t)) return fromEpsg(Number(epsgName[1]), t);
  if (/urn:ogc:def:crs:OGC:[\d.]*:CRS84/i.test(t)) return fromEpsg(4326, t);
  const datum = /CSRS/i.test(t) ? 'NAD83(CSRS)' : /North_American_1983|NAD(_)?83/i.test(t) ? 'NAD83' : /WGS[_ ]?(19)?84/i.test(t) ? 'WGS84' : 'other';
  if (/^PROJ(CS|CRS)/i.test(t)) {
    const m = /UTM[_ ]zone[_ ](\d{1,2})\s*([NS])?/i.exec(t);
    if (m && datum !== 'other') {
      const zone = Number(m[1]);
      const fn = /False_Northing",\s*([\d.]+)/i.exec(t);
      const south = m[2] ? m[2].toUpperCase() === 'S' : fn ? Number(fn[1]) > 0 : false;
      const epsg = datum === 'WGS84' ? (south ? 32700 : 32600) + zone : datum === 'NAD83' && !south && zone <= 23 ? 26900 + zone : null;
      return { kind: 'utm', zone, south, datum, epsg, label: `${datum} / UTM zone ${zone}${south ? 'S' : 'N'}${epsg ? ` (EPSG:${epsg})` : ''}` };
    }
    return { kind: null, datum, epsg: null, label: (/^PROJ(CS|CRS)\["([^"]*)"/i.exec(t)?.[2] ?? 'unnamed projected system') };
  }
  if (/^GEOG(CS|CRS)/i.test(t) && datum !== 'other' && /Degree/i.test(t)) {
    const epsg = datum === 'WGS84' ? 4326 : datum === 'NAD83' ? 4269 : 4617;
    return { kind: 'lonlat', datum, epsg, label: `${datum} longitude/latitude (EPSG:${epsg})` };
  }
  return { kind: null, datum, epsg: null, label: t.slice(0, 60) || 'empty' };
}

function fromEpsg(code: number, text: string): CrsInfo {
  if (code === 4326) return { kind: 'lonlat', datum: 'WGS84', epsg: 4326, label: 'WGS 84 longitude/latitude (EPSG:4326)' };
  if (code === 4269) return { kind: 'lonlat', datum: 'NAD83', epsg: 4269, label: 'NAD83 longitude/latitude (EPSG:4269)' };
  if (code === 4617) return { kind: 'lonlat', datum: 'NAD83(CSRS)', epsg: 4617, label: 'NAD83(CSRS) longitude/latitude (EPSG:4617)' };
  if (code > 32600 && code <= 32660) return { kind: 'utm', zone: code - 32600, south: false, datum: 'WGS84', epsg: code, label: `WGS 84 / UTM zone ${code - 32600}N (EPSG:${code})` };
  if (code > 32700 && code <= 32760) return { kind: 'utm', zone: code - 32700, south: true, datum: 'WGS84', epsg: code, label: `WGS 84 / UTM zone ${code - 32700}S (EPSG:${code})` };
  if (code > 26900 && code <= 26923) return { kind: 'utm', zone: code - 26900, south: false, datum: 'NAD83', epsg: code, label: `NAD83 / UTM zone ${code - 26900}N (EPSG:${code})` };
  return { kind: null, datum: 'other', epsg: code, label: text };
}
