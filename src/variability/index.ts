/**
 * Within-field variability of one nutrient: statistics, the empirical semivariogram and fitted models, spatial
 * dependence, sampling advice and the low spots (with the sulphate-S statements). Pure: no files, no printing.
 */
import type { Analyte, Field, Samples, Warning } from '../types.js';
import { describe, type Description } from '../stats/describe.js';
import { semivariogram, type Semivariogram } from './semivariogram.js';
import { fitModels, type FitOptions, type FittedModel } from './fit.js';
import { spatialDependence, type Dependence } from './dependence.js';
import { samplingAdvice, type SamplingAdvice } from './sampling.js';
import { areaShareBelow, sampleShareBelow } from './area-share.js';
import {
  NUTRIENT_LABEL,
  NUTRIENT_UNIT,
  defaultThreshold,
  S_FLOOR_DEFAULT,
  S_MARGINAL_UPPER,
  type Threshold,
} from './thresholds.js';

export * from './semivariogram.js';
export * from './models.js';
export * from './fit.js';
export * from './dependence.js';
export * from './sampling.js';
export * from './area-share.js';
export * from './thresholds.js';
export * from './charts.js';
export * from './text.js';
export * from './report-charts.js';
export * from './chance.js';

/** Lags with fewer pairs than this are flagged (common practice). */
export const MIN_PAIRS = 30;

export interface VariabilityOptions {
  /** analyte to study; default 'so4_s' */
  nutrient?: Analyte;
  /** "low" means below this, in the analyte's unit (a number: source "set by the user"; or a Threshold with its
   * source, e.g. from the plan's tables); default {@link defaultThreshold}; null for none */
  threshold?: number | Threshold | null;
  /** sulphate-S floor the plan applies regardless of the test, lb S/ac; default 10 (canola, common practice) */
  sFloor?: number;
  /** where the S floor comes from, for the statement (default: canola, common practice) */
  sFloorSource?: string;
  /** semivariogram of the values as given (default) or of their natural logarithm (skewed data) */
  transform?: 'none' | 'log';
  /** semivariogram cutoff and lag width, metres (defaults as gstat) */
  cutoff?: number;
  width?: number;
  /** model fitting: weights (gstat fit.method 7 default, or 2) and start */
  fit?: FitOptions;
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

export interface VariabilityReport {
  nutrient: Analyte;
  label: string;
  unit: string;
  stats: Description & { censoredBelow: number; censoredAbove: number };
  threshold: Threshold | null;
  /** share below the threshold: of the samples, and of the interpolated area when a surface was given */
  shareBelow: { samples: number; area: number | null; areaAc: number | null; surface: string | null } | null;
  transform: 'none' | 'log';
  semivariogram: Semivariogram;
  /** lag numbers holding fewer than 30 pairs */
  fewPairLags: number[];
  fits: FittedModel[];
  best: FittedModel | null;
  dependence: Dependence | null;
  sampling: SamplingAdvice;
  low: LowSample[];
  sulphur: SulphurFindings | null;
  warnings: Warning[];
}

const NOT_LOW_UNCERTAIN =
  'A sulphate-S test that is low is reliable; one that is not low says little. The test has a large error and ' +
  'fields vary greatly between hilltops, slopes and depressions, so a composite can hide deficient ground ' +
  '(Manitoba Agriculture, Soil Fertility Guide, Sulphur; common practice).';

/**
 * Studies the within-field variability of one nutrient.
 *
 * @param samples validated, projected samples (src/types.ts)
 * @param field the field boundary (its area sets the sampling density)
 * @param opts see {@link VariabilityOptions}; defaults: nutrient 'so4_s', the nutrient's default threshold,
 *   S floor 10 lb S/ac, no transform, gstat's cutoff / width, fit.method 7 from gstat's default start
 * @param surface optional interpolated surface for the share of area below the threshold
 * @example
 * const r = analyzeVariability(inputs.samples, inputs.field, { nutrient: 'so4_s' });
 * r.low.map((s) => s.id); r.dependence?.class; r.sampling.text;
 */
export function analyzeVariability(
  samples: Samples,
  field: Field,
  opts: VariabilityOptions = {},
  surface?: SurfaceForShare,
): VariabilityReport {
  const nutrient = opts.nutrient ?? 'so4_s';
  const values = samples.values[nutrient];
  const cens = samples.censored[nutrient];
  const warnings: Warning[] = [];
  const stats = describe(values);
  let censoredBelow = 0;
  let censoredAbove = 0;
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) continue;
    if (cens[i] < 0) censoredBelow++;
    else if (cens[i] > 0) censoredAbove++;
  }

  const threshold: Threshold | null =
    opts.threshold === null
      ? null
      : typeof opts.threshold === 'number'
        ? { value: opts.threshold, unit: NUTRIENT_UNIT[nutrient], source: 'set by the user' }
        : opts.threshold !== undefined
          ? opts.threshold
          : defaultThreshold(nutrient, samples.pMethod);

  // semivariogram on the tested samples
  const transform = opts.transform ?? 'none';
  const z = new Float64Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    z[i] = transform === 'log' ? (v > 0 ? Math.log(v) : NaN) : v;
  }
  if (transform === 'log') {
    let dropped = 0;
    for (let i = 0; i < values.length; i++)
      if (Number.isFinite(values[i]) && !Number.isFinite(z[i])) dropped++;
    if (dropped)
      warnings.push({
        code: 'variability.log-nonpositive',
        message: `${dropped} ${nutrient} value(s) are 0 or negative and have no logarithm; they are left out of the semivariogram.`,
        field: nutrient,
      });
  }
  if (samples.zone.some((k) => k !== null)) {
    warnings.push({
      code: 'variability.zone-composites',
      message:
        'these are zone-composite samples: each stands for a whole zone, not a point, so the semivariogram and the sampling advice describe the zone centres only. Grid or point samples are needed to measure variation within the zones.',
      field: nutrient,
    });
  }
  const xyUsed: number[] = [];
  for (let i = 0; i < values.length; i++)
    if (Number.isFinite(z[i])) xyUsed.push(samples.xy[2 * i], samples.xy[2 * i + 1]);
  if (xyUsed.length / 2 < 2) {
    warnings.push({
      code: 'variability.too-few',
      message: `only ${xyUsed.length / 2} sample(s) have a ${nutrient} value: no semivariogram can be computed.`,
      field: nutrient,
    });
  }
  const sv =
    xyUsed.length >= 4
      ? semivariogram(samples.xy, z, { cutoff: opts.cutoff, width: opts.width })
      : {
          cutoff: NaN,
          width: NaN,
          bboxDiagonal: NaN,
          n: xyUsed.length / 2,
          lag: [],
          np: [],
          dist: [],
          gamma: [],
        };
  const fewPairLags = sv.lag.filter((_, j) => sv.np[j] < MIN_PAIRS);
  if (fewPairLags.length) {
    warnings.push({
      code: 'variability.few-pairs',
      message: `${fewPairLags.length} of ${sv.lag.length} semivariogram lags hold fewer than ${MIN_PAIRS} pairs (common practice: at least ${MIN_PAIRS}); their semivariances are unreliable and the fitted model with them. Lags: ${fewPairLags.map((k) => k + 1).join(', ')}.`,
      field: nutrient,
    });
  }
  const { fits, best } = sv.lag.length ? fitModels(sv, opts.fit) : { fits: [], best: null };
  const dependence = best ? spatialDependence(best.nugget, best.psill) : null;
  if (!best)
    warnings.push({
      code: 'variability.no-fit',
      message: `no semivariogram model could be fitted to ${nutrient}: ${fits.find((f) => f.problem)?.problem ?? 'too few lags'}.`,
      field: nutrient,
    });
  else if (best.effectiveRange > sv.cutoff) {
    warnings.push({
      code: 'variability.range-beyond-cutoff',
      message: `the fitted effective range (${best.effectiveRange.toFixed(0)} m) is beyond the largest distance examined (${sv.cutoff.toFixed(0)} m): it is an extrapolation and uncertain.`,
      field: nutrient,
    });
  }
  const noSill = !best && fits.some((f) => f.ok && f.rangeAtLimit);
  const sampling = samplingAdvice({
    areaM2: field.areaM2,
    xy: xyUsed,
    effectiveRange: best ? best.effectiveRange : NaN,
    dependence: dependence?.class ?? null,
    firstLag: sv.dist[0] ?? NaN,
    noSill,
  });

  const sampleAt = (i: number): LowSample => ({
    id: samples.ids[i],
    value: values[i],
    censored: cens[i],
    lon: samples.lonlat[2 * i],
    lat: samples.lonlat[2 * i + 1],
    x: samples.xy[2 * i],
    y: samples.xy[2 * i + 1],
  });
  const low: LowSample[] = [];
  let shareBelow: VariabilityReport['shareBelow'] = null;
  let areaShare: number | null = null;
  if (threshold) {
    const inc = Boolean(threshold.inclusive);
    for (let i = 0; i < values.length; i++)
      if (
        Number.isFinite(values[i]) &&
        (values[i] < threshold.value || (inc && values[i] === threshold.value))
      )
        low.push(sampleAt(i));
    low.sort((a, b) => a.value - b.value);
    let areaAc: number | null = null;
    if (surface) {
      const a = areaShareBelow(surface.values, surface.fraction, threshold.value, inc);
      areaShare = a.share;
      areaAc = (a.belowCells * surface.cell * surface.cell) / 4046.8564224;
    }
    shareBelow = {
      samples: sampleShareBelow(values, threshold.value, inc),
      area: areaShare,
      areaAc,
      surface: surface ? (surface.note ?? 'interpolated surface') : null,
    };
  }

  let sulphur: SulphurFindings | null = null;
  if (nutrient === 'so4_s') {
    const floor = opts.sFloor ?? S_FLOOR_DEFAULT;
    const marginal: LowSample[] = [];
    const lowValue = threshold?.value ?? NaN;
    if (threshold && lowValue < S_MARGINAL_UPPER) {
      for (let i = 0; i < values.length; i++)
        if (values[i] >= lowValue && values[i] < S_MARGINAL_UPPER) marginal.push(sampleAt(i));
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
    sulphur = {
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
          ? `The plan applies no sulphate-S floor (${opts.sFloorSource ?? 'set to 0'}); since a not-low result is uncertain, S on the low spots above rests on the test alone.`
          : `Whatever the test, the plan applies at least ${floor} lb S/ac as sulphate on every acre (${opts.sFloorSource ?? 'canola default 10 lb S/ac, common practice; Canola Encyclopedia: 10-20 lb S/ac whatever the test'}).`,
    };
  }

  return {
    nutrient,
    label: NUTRIENT_LABEL[nutrient],
    unit: NUTRIENT_UNIT[nutrient],
    stats: { ...stats, censoredBelow, censoredAbove },
    threshold,
    shareBelow,
    transform,
    semivariogram: sv,
    fewPairLags,
    fits,
    best,
    dependence,
    sampling,
    low,
    sulphur,
    warnings,
  };
}
