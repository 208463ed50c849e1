/**
 * Shared data types of the tilth pipeline (see docs/architecture.md).
 * GeoJSON and files only at the edges; flat typed arrays inside.
 */
import type { Warning } from './errors.js';

/**
 * Soil analytes tilth knows, in their canonical units after validation:
 * - `no3_n`  nitrate-N, lb N/ac, 0-24 in (0-6 + 6-24 in, or 0-6 in x a user depth factor)
 * - `p`      P in ppm (mg/kg) 0-6 in, by the stated method (Olsen or modified Kelowna; never mixed)
 * - `k`      exchangeable K (ammonium acetate), ppm 0-6 in
 * - `so4_s`  sulphate-S, lb S/ac, 0-24 in (same depth rule as nitrate)
 * - `om`     organic matter, %, 0-6 in
 * - `ph`     pH (1:1 water), 0-6 in
 */
export type Analyte = 'no3_n' | 'p' | 'k' | 'so4_s' | 'om' | 'ph';
export const ANALYTES: readonly Analyte[] = ['no3_n', 'p', 'k', 'so4_s', 'om', 'ph'];

export type PMethod = 'olsen' | 'kelowna';
export type Texture = 'light' | 'medium' | 'heavy';

/** Censoring of a lab value: 0 = exact, -1 = below detection ("<2"), +1 = above range (">60"). */
export type Censor = -1 | 0 | 1;

/**
 * Validated, projected samples: one entry per sampling location (depths merged).
 * Values are NaN where not tested.
 */
export interface Samples {
  ids: string[];
  /** lon0, lat0, lon1, lat1, ... WGS 84 degrees */
  lonlat: Float64Array;
  /** x0, y0, x1, y1, ... metres in the field's UTM zone */
  xy: Float64Array;
  values: Record<Analyte, Float64Array>;
  /** per analyte, per sample: -1 below range, 0 exact, +1 above range (see docs/method.md for the substitution) */
  censored: Record<Analyte, Int8Array>;
  texture: (Texture | null)[];
  /** zone key for zone-composite samples (matches a zone polygon), else null */
  zone: (string | null)[];
  pMethod: PMethod;
  /** where each sample came from, for messages: "samples.csv rows 4-5" */
  origin: string[];
  /**
   * Soil values read and shown but used for no rate unless a plan says so, when the file has them (0-6 in):
   * `ec` soluble salts in dS/m (as the lab measured it, method in `ecMethod`), `carbonate` % CaCO3 equivalent.
   */
  extra?: Partial<Record<ExtraValue, Float64Array>>;
  /** the EC extraction as the header named it ("saturated paste", "1:2 water"), else null */
  ecMethod?: string | null;
  /** free lime rating as the lab wrote it, normalised: none, low, medium, high; null where not given */
  limeRating?: (LimeRating | null)[];
}

/** Soil values beyond the analytes: soluble salts (EC, dS/m) and carbonate / free lime (% CaCO3 equivalent). */
export type ExtraValue = 'ec' | 'carbonate';
export const EXTRA_VALUES: readonly ExtraValue[] = ['ec', 'carbonate'];
export type LimeRating = 'none' | 'low' | 'medium' | 'high';

/** One polygon part of a boundary: exterior ring and holes, each a closed ring x0 y0 ... xn yn (first == last). */
export interface RingsPart {
  exterior: Float64Array;
  holes: Float64Array[];
}

export interface UtmZone {
  zone: number;
  south: boolean;
  /** EPSG code, 326zz north or 327zz south */
  epsg: number;
  /** proj4 definition string */
  proj4: string;
}

/**
 * A field boundary: WGS 84 GeoJSON (as read, rings closed) and the same in UTM metres.
 * Exterior rings counter-clockwise and holes clockwise in both (RFC 7946 right-hand rule).
 */
export interface Field {
  name: string;
  /** MultiPolygon coordinates in lon/lat */
  lonlat: number[][][][];
  /** the same parts in metres */
  parts: RingsPart[];
  utm: UtmZone;
  /** ground area on the WGS 84 ellipsoid, m2 */
  areaM2: number;
  /** metres: [xmin, ymin, xmax, ymax] */
  bbox: [number, number, number, number];
}

/**
 * A north-up raster over the field, like an Esri ASCII grid or gdal_grid output:
 * row 0 is the northern row; cell (c, r) has its centre at
 * x = xmin + (c + 0.5) * cell, y = ymax - (r + 0.5) * cell. Arrays are row-major (index r * cols + c).
 */
export interface Grid {
  xmin: number;
  ymax: number;
  cell: number;
  cols: number;
  rows: number;
  /** 1 where the cell centre is inside the field (holes excluded) */
  mask: Uint8Array;
  /** share of each cell's area inside the field, 0..1 (so zone areas add up to the field's) */
  fraction: Float32Array;
}

export type { Warning };

/** Zone polygons that zone-composite samples are keyed to (one key per polygon). */
export interface SampleZones {
  keys: string[];
  /** per key: MultiPolygon coordinates in lon/lat */
  lonlat: number[][][][][];
  /** per key: the parts in metres (field's UTM zone) */
  parts: RingsPart[][];
}

/** Everything read, validated and projected from the user's input files. */
export interface FieldInputs {
  samples: Samples;
  field: Field;
  /** present when samples are zone composites */
  zones: SampleZones | null;
  warnings: Warning[];
  /** how the samples file's columns were read (shown by `tilth inspect` and `--verbose`) */
  reading?: ColumnReading[];
}

/** One column of the samples file as tilth read it. */
export interface ColumnReading {
  column: string;
  /** role (no3_n, p, id, lat ...) or null when the column is not read */
  role: string | null;
  unit: string | null;
  /** depth as used: "0-6 in", "from the depth column", or null */
  depth: string | null;
  method: string | null;
  /** how it was decided: header, header + second row, column map; or why it is not used */
  how: string;
  used: boolean;
  /** cells not read as values (e.g. "n/a", "QNS"), with their rows */
  refused: { where: string; value: string }[];
}
