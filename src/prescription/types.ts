/** The prescription's shape: what `buildPrescription` returns, every output is derived from it. */
import type { Warning } from '../errors.js';
import type { Decision } from '../agronomy/decision.js';
import type { SoilValues } from '../agronomy/interpret.js';
import type { Plan } from '../agronomy/plan.js';
import type { Nutrient, Placement } from '../agronomy/tables.js';
import type { NutrientSurface } from '../surface/nutrientSurface.js';
import type { SurfaceThreads } from '../surface/parallel.js';
import type { FieldInputs, Grid, RingsPart } from '../types.js';
import type { ZoneDesign } from './zoneDesign.js';

export interface BuildOptions {
  /** grid cell size, m; default: about 1/200 of the field's longer side, rounded to 1, 2, 5, 10 or 20 m */
  cell?: number;
  /** progress for long steps: step name and share of it done, 0..1 (a new name starts a new step) */
  onProgress?: (step: string, done: number) => void;
  /** worker threads for the surfaces' per-cell work (default none; src/surface/parallel.ts) */
  threads?: SurfaceThreads;
  /**
   * called once the surfaces are made, before the zones, with the inputs they were made from (a field with
   * unsampled parts calls it with its sampled part), the grid and the surfaces (e.g. to start the report's
   * sulphate-S pages on another core: src/prescription/sulphurPages.ts)
   */
  onSurfaces?: (made: { inputs: FieldInputs; grid: Grid; surfaces: readonly NutrientSurface[] }) => void;
}

/** One zone of one zone set, with its decision. */
export interface PrescriptionZone {
  /** 1-based within its zone set */
  id: number;
  /** 1-based rate class (1 = lowest need); for zone-composite fields, the sampled zone's order */
  rateClass: number;
  /** sampled zone key for zone-composite fields, else null */
  key: string | null;
  parts: RingsPart[];
  lonlat: number[][][][];
  areaM2: number;
  areaAc: number;
  areaHa: number;
  /** area-weighted mean soil values over the zone (canonical units) */
  soil: SoilValues;
  /** sample ids inside the zone */
  samples: string[];
  decision: Decision;
}

/** A set of zones that one pass (or one product) follows. */
export interface ZoneSetResult {
  /** e.g. "shared", "p2o5", "sampled" */
  name: string;
  /** what draws the zones, for people */
  drivenBy: string;
  /** products whose rates this set carries */
  products: string[];
  zones: PrescriptionZone[];
  /** class breaks of the driving target (lb/ac), for legends; null for shared or sampled sets */
  breaks: number[] | null;
  minZoneAreaM2: number;
  /** per cell zone index (0-based into zones), -1 outside; null for sampled sets */
  zoneOfCell: Int32Array | null;
  /** how the zones came about (counts, minimum area and rate differences, pairs, vertices); null for sampled sets */
  design: ZoneDesign | null;
}

/** Product totals for ordering and loading. */
export interface ProductTotal {
  zoneSet: string;
  product: string;
  label: string;
  placement: Placement;
  /** total product, lb and kg */
  totalLb: number;
  totalKg: number;
  /** area-weighted mean, min and max product rate over the field, in the plan's unit */
  meanRate: number;
  minRate: number;
  maxRate: number;
  unit: string;
  /** area that receives this product, ac */
  appliedAc: number;
}

export interface Prescription {
  field: {
    name: string;
    areaM2: number;
    areaAc: number;
    areaHa: number;
    utm: FieldInputs['field']['utm'];
    parts: RingsPart[];
    lonlat: number[][][][];
  };
  plan: Plan;
  grid: Grid;
  surfaces: NutrientSurface[];
  /** per-cell targets, lb/ac (for maps) */
  targets: Record<Nutrient, Float64Array>;
  zoneSets: ZoneSetResult[];
  totals: ProductTotal[];
  /** zones where a target could not be met */
  infeasible: { zoneSet: string; zone: number; nutrient: string | null; reason: string }[];
  warnings: Warning[];
  sampled: boolean;
  /** sample id -> soil flags ("saline; high pH"), flagged samples only (src/agronomy/soilFlags.ts); no rate depends on them */
  soilFlags?: Record<string, string>;
}
