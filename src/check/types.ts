/** The report of `tilth check` and its options. */
import type { Length, Speed } from '../units/index.js';
import type { CheckLayer } from './layer.js';

export type CheckStatus = 'pass' | 'warn' | 'fail' | 'skip';

/** One line of the report. */
export interface CheckLine {
  /** stable name: crs, geometry, overlap, outside, gaps, rate_field, rate_range, zone_size, total */
  check: string;
  status: CheckStatus;
  message: string;
  /** zone ids involved (as the file names them, or "feature N") */
  zones: string[];
}

/** Product over the whole prescription for one rate column. */
export interface RateTotal {
  field: string;
  /** unit read from the column name's ending (_lbac, _kgha, _galac, _lha), else null */
  unit: string | null;
  /** total product in `totalUnit`; with an unknown unit, rate x acres */
  total: number;
  totalUnit: string;
  areaAc: number;
}

export interface CheckReport {
  file: string;
  /** true when no line failed */
  ok: boolean;
  lines: CheckLine[];
  totals: RateTotal[];
}

/** Options of {@link checkPrescription}; every limit is off unless given. */
export interface CheckOptions {
  /** field boundary; enables the gap and outside checks */
  boundary?: CheckLayer;
  /** the rate column (default: columns ending in a unit, _lbac _kgha _galac _lha; else the single numeric column that is not an id or area) */
  rateField?: string;
  /** machine's lowest rate above 0 (a 0 rate is read as "off" and passes) */
  min?: number;
  /** machine's highest rate */
  max?: number;
  /** travel speed with its unit (`parseSpeed`): enables the zone size check; the report names it as given */
  speed?: Speed;
  /** swath width with its unit (`parseLength`): adds "zone smaller than one rate change x swath" to the size check */
  swath?: Length;
  /** travel speed, km/h, when `speed` is not given */
  speedKmh?: number;
  /** swath width, m, when `swath` is not given */
  swathM?: number;
  /** seconds to reach a new rate (default {@link DEFAULT_TRANSITION_S}) */
  transitionS?: number;
  /** refuse a layer without a coordinate system instead of reading it as WGS 84 */
  strict?: boolean;
}
