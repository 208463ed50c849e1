/**
 * The report's input: plain data that `tilth build` fills and writes beside its outputs as
 * `report-data.json` (see docs/report.md). Everything is already computed; the report only draws it.
 *
 * Coordinates are metres in the field's UTM zone. Rings are flat arrays x0 y0 x1 y1 ... (closed or not).
 * Raster values are row-major, north-up (row 0 is the northern row), NaN = no value (the `Grid` convention
 * of src/types.ts). In memory any `ArrayLike<number>` works (Float64Array, number[]); in JSON see
 * `serializeReportInput`.
 */
import type { Warning } from '../errors.js';

/** Format tag written into report-data.json; bump when the shape changes incompatibly. */
export const REPORT_SCHEMA = 'tilth-report/1';

/** One polygon part: exterior ring and holes, flat x y pairs in metres. */
export interface ReportPart {
  exterior: ArrayLike<number>;
  holes: ArrayLike<number>[];
}

/** The geometry of a north-up raster (see `Grid` in src/types.ts); masks are not needed: NaN marks outside. */
export interface ReportGrid {
  xmin: number;
  ymax: number;
  cell: number;
  cols: number;
  rows: number;
}

/** Values on a grid, row-major north-up, NaN where there is no value. */
export interface ReportRaster {
  grid: ReportGrid;
  values: ArrayLike<number>;
  /** legend notes, e.g. how a fine grid was shown coarser for display */
  notes?: string[];
}

/** A nutrient or soil property shown in the report. */
export interface ReportNutrient {
  /** key used in samples.values, surfaces, zone soilMeans: e.g. "p", "so4_s" */
  key: string;
  /** for people: "Olsen P", "Sulphate-S 0-24 in" */
  label: string;
  /** unit of the values: "ppm", "lb/ac" */
  unit: string;
  /** decimals to print (default 0) */
  decimals?: number;
}

export interface ReportTitle {
  farm: string;
  field: string;
  crop: string;
  /** e.g. "50 bu/ac" */
  targetYield: string;
  /** one or two sentences: strategy, products, placements */
  planSummary: string;
  /** ISO date of the build, e.g. "2026-12-01" */
  date: string;
  /** tilth version that built the plan */
  version: string;
  /** short hash of the input files and plan, so a printed copy can be matched to its files */
  hash: string;
  /** optional: who prepared it (an agronomist's name, for the farmer) */
  preparedBy?: string;
  /** free lines shown under the title (field legal land description, seeding date ...) */
  notes?: string[];
}

export interface ReportSamples {
  ids: string[];
  /** x0 y0 x1 y1 ... metres */
  xy: ArrayLike<number>;
  /** per nutrient key: one value per sample, NaN = not tested */
  values: Record<string, ArrayLike<number>>;
  /** per nutrient key: -1 below detection, 0 exact, +1 above range (optional) */
  censored?: Record<string, ArrayLike<number>>;
}

/** An interpolated surface and the class breaks its legend uses (the zones' classes). */
export interface ReportSurface {
  nutrient: string;
  raster: ReportRaster;
  /**
   * Ascending inner class breaks: [b1, b2, ...] makes classes < b1, b1-b2, ..., >= bn.
   * Give the breaks the zones were classed with, so the legend's breaks are the zones' classes.
   */
  breaks: number[];
  /** interpolation used, for the caption: "ordinary kriging, spherical" or "IDW power 2" */
  method?: string;
}

/** A class of a response-probability map: "about 75 % chance of a yield response". */
export interface ReportResponseClass {
  label: string;
}

/**
 * Response-probability classes of one nutrient (P, K ...). Either a raster of class indices
 * (0 = first class; NaN or -1 = none) or a class index per zone id of a zone set.
 */
export interface ReportResponseMap {
  nutrient: string;
  /** classes in order of increasing chance of a response */
  classes: ReportResponseClass[];
  raster?: ReportRaster;
  byZone?: { zoneSet: string; classes: Record<string, number> };
  /** the table the classes come from, for the caption */
  source?: string;
}

/**
 * The chance that a nutrient is below its low threshold, per cell, from kriging's mean and variance under a
 * stated Gaussian assumption (drawn beside the nutrient's surface map); or, when kriging was refused, why there
 * is no such map (the report then shows the reason in its place).
 */
export interface ReportChanceMap {
  nutrient: string;
  /** "low" is below this value, in `unit` */
  threshold: number;
  unit: string;
  /** chance 0..1 per cell (NaN = no value); absent when `refused` */
  raster?: ReportRaster;
  /** why there is no map (e.g. kriging refused: too few samples, pure nugget) */
  refused?: string;
  /** how the chance was made, for the caption: "ordinary kriging, spherical, nugget ..." */
  method: string;
  /** the assumption, stated in the legend */
  assumption: string;
  /** what it says for the field as a whole, for the caption (expected share below ...) */
  summary?: string;
}

/** A product rate of one zone. */
export interface ReportRate {
  product: string;
  /** "seed row", "side band", "broadcast" ... */
  placement: string;
  /** product rate in `unit` */
  rate: number;
  /** "lb/ac", "kg/ha", "US gal/ac" */
  unit: string;
}

export interface ReportZone {
  id: string;
  parts: ReportPart[];
  /** area in m2 (the report prints it in the plan's area unit) */
  areaM2: number;
  /** rate class index (0 = lowest), or null for zone-composite zones without classes */
  class: number | null;
  /** per nutrient key: the zone's mean soil value */
  soilMeans: Record<string, number>;
  /** nutrient targets, e.g. { "N": 95, "P2O5": 30 } in `targetUnit` of the zone set */
  targets: Record<string, number>;
  rates: ReportRate[];
  /** the limit that bound the rates ("seed-row N + K2O, canola, 1 in spread, 9 in rows"), or null */
  bindingLimit: string | null;
  /** problems of this zone (an infeasible target ...) */
  notes?: string[];
}

/** One set of zones: the plan makes one per product or one shared set for a multi-tank pass. */
export interface ReportZoneSet {
  name: string;
  /** products applied by these zones (each gets a rate map) */
  products: string[];
  /** unit of zone targets, e.g. "lb/ac" */
  targetUnit: string;
  zones: ReportZone[];
  /**
   * Rate differences smaller than these (per product and placement, in the rate's unit) do not count as a
   * different rate: rate maps keep such rates in close colours. Absent = every rate apart.
   */
  minDifference?: { product: string; placement: string; value: number }[];
  /** how the zones came about (their number and why, what keeps neighbours apart), one line each */
  design?: string[];
}

/** Totals of one product and placement for ordering and loading. */
export interface ReportTotal {
  product: string;
  placement: string;
  /** total mass (or volume) to order, in `totalUnit` */
  total: number;
  totalUnit: string;
  /** e.g. "44 bags of 50 lb" or "3.2 t" (already formatted by the build) */
  packaging?: string;
  /** area-weighted mean, min and max rate in `rateUnit` */
  meanRate: number;
  minRate: number;
  maxRate: number;
  rateUnit: string;
}

/** One row of the cross-validation table that chose the interpolation. */
export interface ReportCvRow {
  nutrient: string;
  method: string;
  /** root mean squared error, in the nutrient's unit */
  rmse: number;
  /** mean error (bias) */
  meanError: number;
  /** optional mean absolute error */
  mae?: number;
  chosen: boolean;
}

/** A default table the plan used, and where its values come from. */
export interface ReportTableUsed {
  name: string;
  source: string;
  /** "published", "common practice", "from memory", "user" */
  mark?: string;
  /** true when the user edited the table */
  edited?: boolean;
}

/** A chart made by another stage (variability ...): a complete <svg> document as a string. */
export interface ReportChart {
  title: string;
  svg: string;
  caption?: string;
}

/** Everything the report shows. */
export interface ReportInput {
  schema?: typeof REPORT_SCHEMA;
  title: ReportTitle;
  /** units of the plan: rates and areas are printed in these */
  units: { area: 'ac' | 'ha' };
  utm: { zone: number; south: boolean; epsg: number };
  field: { parts: ReportPart[]; areaM2: number };
  nutrients: ReportNutrient[];
  samples: ReportSamples;
  surfaces: ReportSurface[];
  response: ReportResponseMap[];
  /** chance-below-threshold maps (sulphate-S from the build); absent in files from older versions */
  chance?: ReportChanceMap[];
  zoneSets: ReportZoneSet[];
  totals: ReportTotal[];
  crossValidation: ReportCvRow[];
  warnings: Warning[];
  tablesUsed: ReportTableUsed[];
  cautions: string[];
  charts: ReportChart[];
}
