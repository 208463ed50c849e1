/**
 * The `--crs EPSG:XXXX` option for coordinate columns in a table (easting / northing): geographic WGS 84 / NAD83,
 * or UTM on WGS 84, NAD83 or NAD83(CSRS). NAD83 is treated as WGS 84 (1-2 m apart), as for shapefile .prj files.
 */
import { UserError } from '../errors.js';
import { utmProj4 } from '../geo/crs.js';

export interface TableCrs {
  /** "EPSG:26913" */
  code: string;
  /** for people: "NAD83 / UTM zone 13N" */
  label: string;
  /** null for geographic (x = longitude, y = latitude) */
  proj4: string | null;
}

/** NAD83(CSRS) UTM zones by EPSG code (EPSG registry; checked against GDAL in tests/io/crs.tool.test.ts). */
const CSRS: Record<number, number> = {
  3154: 7,
  3155: 8,
  3156: 9,
  3157: 10,
  2955: 11,
  2956: 12,
  2957: 13,
  3158: 14,
  3159: 15,
  3160: 16,
  2958: 17,
  2959: 18,
  2960: 19,
  2961: 20,
  2962: 21,
  3761: 22,
};

const utm = utmProj4;

/**
 * Parses `--crs`. Accepted: EPSG:4326, 4269, 4617 (degrees), 32601-32660 / 32701-32760 (WGS 84 / UTM),
 * 26901-26923 (NAD83 / UTM), NAD83(CSRS) / UTM zones 7-22.
 * @example parseCrs('EPSG:26913').label // 'NAD83 / UTM zone 13N'
 */
export function parseCrs(text: string): TableCrs {
  const m = /^\s*(?:epsg\s*:\s*)?(\d{4,5})\s*$/i.exec(text);
  const n = m ? Number(m[1]) : NaN;
  const code = `EPSG:${n}`;
  if (n === 4326 || n === 4269 || n === 4617)
    return {
      code,
      label: `${n === 4326 ? 'WGS 84' : n === 4269 ? 'NAD83' : 'NAD83(CSRS)'} degrees`,
      proj4: null,
    };
  if (n >= 32601 && n <= 32660)
    return { code, label: `WGS 84 / UTM zone ${n - 32600}N`, proj4: utm(n - 32600, false) };
  if (n >= 32701 && n <= 32760)
    return { code, label: `WGS 84 / UTM zone ${n - 32700}S`, proj4: utm(n - 32700, true) };
  if (n >= 26901 && n <= 26923)
    return { code, label: `NAD83 / UTM zone ${n - 26900}N`, proj4: utm(n - 26900, false) };
  if (CSRS[n]) return { code, label: `NAD83(CSRS) / UTM zone ${CSRS[n]}N`, proj4: utm(CSRS[n], false) };
  throw new UserError(
    `option --crs: "${text}" is not a coordinate system tilth reads for coordinate columns. ` +
      'Fix: give EPSG:326zz (WGS 84 / UTM zone zz north), EPSG:269zz (NAD83 / UTM), a NAD83(CSRS) / UTM code (e.g. EPSG:2957 for zone 13N), or EPSG:4326 for degrees.',
    { value: text },
  );
}
