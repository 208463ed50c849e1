/**
 * The low spots of a variability study (samples below the threshold, the share of samples and of the mapped
 * area below it) and the sulphate-S statements: a not-low test is uncertain, what one composite would read,
 * the marginal band and the floor the plan applies regardless of the test.
 */
import type { Samples } from '../types.js';
import type { Description } from '../stats/describe.js';
import { areaShareBelow, sampleShareBelow } from './area-share.js';
import { S_FLOOR_DEFAULT, S_MARGINAL_UPPER, type Threshold } from './thresholds.js';
import { M2_PER_AC } from '../units/index.js';

export interface LowSample {
  id: string;
  value: number;
  /** -1 when the lab reported below detection */
  censored: number;
  lon: number;
  lat: number;
  x: number;
  y: number;
}

export interface SulphurFindings {
  /** the sentence every S result carries */
  notLowIsUncertain: string;
  /** mean of the samples: what one composite of equal cores would read, lb S/ac */
  compositeMean: number;
  compositeReadsNotLow: boolean;
  /** true when the composite would read not low while samples (or the map) show low ground */
  compositeHidesLow: boolean;
  compositeText: string;
  /** samples from the threshold up to 30 lb S/ac: the band where canola may still respond */
  marginal: LowSample[];
  marginalUpper: number;
  /** lb S/ac applied regardless of the test */
  floor: number;
  floorText: string;
}

/** Share below the threshold: of the samples, and of the interpolated area when a surface was given. */
export interface ShareBelow {
  samples: number;
  area: number | null;
  areaAc: number | null;
  surface: string | null;
}

/** An interpolated surface of the nutrient over the field (from the surface stage): cell values and in-field fractions. */
export interface SurfaceForShare {
  values: ArrayLike<number>;
  fraction: ArrayLike<number>;
  /** cell size, metres */
  cell: number;
  /** how the surface was made, for people (e.g. "IDW power 2, 12 neighbours, chosen by cross-validation") */
  note?: string;
}

const NOT_LOW_UNCERTAIN =
  'A sulphate-S test that is low is reliable; one that is not low says little. The test has a large error and ' +
  'fields vary greatly between hilltops, slopes and depressions, so a composite can hide deficient ground ' +
  '(Manitoba Agriculture, Soil Fertility Guide, Sulphur; common practice).';

/**
 * Samples below the threshold (at it too when inclusive), lowest first, and the shares below it.
 * @example lowSpots(samples, samples.values.so4_s, samples.censored.so4_s, { value: 20, unit: 'lb S/ac', source: '' })
 */
export function lowSpots(
  samples: Samples,
  values: ArrayLike<number>,
  cens: ArrayLike<number>,
  threshold: Threshold,
  surface?: SurfaceForShare,
): { low: LowSample[]; shareBelow: ShareBelow } {
  const inc = Boolean(threshold.inclusive);
  const low: LowSample[] = [];
  for (let i = 0; i < values.length; i++)
    if (Number.isFinite(values[i]) && (values[i] < threshold.value || (inc && values[i] === threshold.value)))
      low.push(sampleAt(samples, values, cens, i));
  low.sort((a, b) => a.value - b.value);
  let area: number | null = null,
    areaAc: number | null = null;
  if (surface) {
    const a = areaShareBelow(surface.values, surface.fraction, threshold.value, inc);
    area = a.share;
    areaAc = (a.belowCells * surface.cell * surface.cell) / M2_PER_AC;
  }
  return {
    low,
    shareBelow: {
      samples: sampleShareBelow(values, threshold.value, inc),
      area,
      areaAc,
      surface: surface ? (surface.note ?? 'interpolated surface') : null,
    },
  };
}

/** Sample i as a low-spot record (id, value, censoring, WGS 84 and UTM position). */
export function sampleAt(
  samples: Samples,
  values: ArrayLike<number>,
  cens: ArrayLike<number>,
  i: number,
): LowSample {
  return {
    id: samples.ids[i],
    value: values[i],
    censored: cens[i],
    lon: samples.lonlat[2 * i],
    lat: samples.lonlat[2 * i + 1],
    x: samples.xy[2 * i],
    y: samples.xy[2 * i + 1],
  };
}

/** What the sulphate-S statements need from the study. */
export interface SulphurInputs {
  samples: Samples;
  values: ArrayLike<number>;
  cens: ArrayLike<number>;
  stats: Description;
  threshold: Threshold | null;
  low: LowSample[];
  /** share of the mapped area below the threshold, or null without a surface */
  areaShare: number | null;
  /** lb S/ac applied regardless of the test (default 10) and where it comes from */
  floor?: number;
  floorSource?: string;
}

/**
 * The sulphate-S statements: the marginal band, what one composite would read and whether it hides low ground,
 * and the floor.
 * @example sulphurFindings({ samples, values, cens, stats, threshold, low, areaShare: 0.2 }).compositeText
 */
export function sulphurFindings(s: SulphurInputs): SulphurFindings {
  const { values, stats, threshold, low, areaShare } = s;
  const floor = s.floor ?? S_FLOOR_DEFAULT;
  const marginal: LowSample[] = [];
  const lowValue = threshold?.value ?? NaN;
  if (threshold && lowValue < S_MARGINAL_UPPER) {
    for (let i = 0; i < values.length; i++)
      if (values[i] >= lowValue && values[i] < S_MARGINAL_UPPER)
        marginal.push(sampleAt(s.samples, values, s.cens, i));
    marginal.sort((a, b) => a.value - b.value);
  }
  const mean = stats.mean;
  const readsNotLow = threshold ? mean >= lowValue : true;
  const lowArea = areaShare !== null && areaShare > 0;
  const hides = readsNotLow && (low.length > 0 || lowArea);
  const n = stats.n;
  const compositeText = !threshold
    ? `A single composite of these ${n} samples would read about ${mean.toFixed(1)} lb S/ac (their mean).`
    : hides
      ? `A single composite of these ${n} samples would read about ${mean.toFixed(1)} lb S/ac, not low (threshold ${lowValue} lb S/ac), while ${low.length} of ${n} samples${areaShare !== null ? ` and ${(100 * areaShare).toFixed(0)} % of the mapped area` : ''} are low: the composite would hide the deficient ground.`
      : readsNotLow
        ? `A single composite of these ${n} samples would read about ${mean.toFixed(1)} lb S/ac, not low, and no sample is below ${lowValue} lb S/ac; that is still no proof that no part of the field is low.`
        : `A single composite of these ${n} samples would read about ${mean.toFixed(1)} lb S/ac, which is low (below ${lowValue} lb S/ac).`;
  return {
    notLowIsUncertain: NOT_LOW_UNCERTAIN,
    compositeMean: mean,
    compositeReadsNotLow: readsNotLow,
    compositeHidesLow: hides,
    compositeText,
    marginal,
    marginalUpper: S_MARGINAL_UPPER,
    floor,
    floorText:
      floor <= 0
        ? `The plan applies no sulphate-S floor (${s.floorSource ?? 'set to 0'}); since a not-low result is uncertain, S on the low spots above rests on the test alone.`
        : `Whatever the test, the plan applies at least ${floor} lb S/ac as sulphate on every acre (${s.floorSource ?? 'canola default 10 lb S/ac, common practice; Canola Encyclopedia: 10-20 lb S/ac whatever the test'}).`,
  };
}
