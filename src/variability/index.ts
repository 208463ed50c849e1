/**
 * Within-field variability of one nutrient: statistics, the empirical semivariogram and fitted models, spatial
 * dependence, sampling advice and the low spots (with the sulphate-S statements). Pure: no files, no printing.
 */
import type { Analyte, Field, PMethod, Samples, Warning } from '../types.js';
import { describe, type Description } from '../stats/describe.js';
import { semivariogram, type Semivariogram } from './semivariogram.js';
import { fitModels, type FitOptions, type FittedModel } from './fit.js';
import { spatialDependence, type Dependence } from './dependence.js';
import { samplingAdvice, type SamplingAdvice } from './sampling.js';
import {
  lowSpots,
  sulphurFindings,
  type LowSample,
  type ShareBelow,
  type SulphurFindings,
  type SurfaceForShare,
} from './lowSpots.js';
import { ANALYTE_DEPTH_LABEL, ANALYTE_UNIT } from '../vocabulary.js';
import { defaultThreshold, type Threshold } from './thresholds.js';
import type { ChanceSummary } from './chanceMap.js';

export * from './semivariogram.js';
export * from './models.js';
export * from './fit.js';
export * from './dependence.js';
export * from './sampling.js';
export * from './area-share.js';
export * from './thresholds.js';
export * from './charts.js';
export * from './semivariogramChart.js';
export * from './sampleMap.js';
export * from './text.js';
export * from './chance.js';
export * from './lowSpots.js';
export * from './chanceMap.js';
export * from './chanceChart.js';
export * from './responseChance.js';

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

export interface VariabilityReport {
  nutrient: Analyte;
  label: string;
  unit: string;
  stats: Description & { censoredBelow: number; censoredAbove: number };
  threshold: Threshold | null;
  /** share below the threshold: of the samples, and of the interpolated area when a surface was given */
  shareBelow: ShareBelow | null;
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
  /** the chance below the threshold from kriging (chanceMap.ts), when the caller made one (the CLI does) */
  chance?: ChanceSummary;
  warnings: Warning[];
}

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
  const threshold = thresholdOf(opts.threshold, nutrient, samples.pMethod);
  const transform = opts.transform ?? 'none';
  const z = transformed(values, transform, nutrient, warnings);
  if (samples.zone.some((k) => k !== null)) {
    warnings.push({
      code: 'variability-zone-composites',
      message:
        'these are zone-composite samples: each stands for a whole zone, not a point, so the semivariogram and the sampling advice describe the zone centres only. Grid or point samples are needed to measure variation within the zones.',
      field: nutrient,
    });
  }
  const { sv, fewPairLags, xyUsed } = studySemivariogram(samples.xy, z, opts, nutrient, warnings);
  const { fits, best, dependence } = studyFits(sv, opts.fit, nutrient, warnings);
  const noSill = !best && fits.some((f) => f.ok && f.rangeAtLimit);
  const sampling = samplingAdvice({
    areaM2: field.areaM2,
    xy: xyUsed,
    effectiveRange: best ? best.effectiveRange : NaN,
    dependence: dependence?.class ?? null,
    firstLag: sv.dist[0] ?? NaN,
    noSill,
  });
  const spots = threshold ? lowSpots(samples, values, cens, threshold, surface) : null;
  const low = spots?.low ?? [];
  const sulphur =
    nutrient === 'so4_s'
      ? sulphurFindings({
          samples,
          values,
          cens,
          stats,
          threshold,
          low,
          areaShare: spots?.shareBelow.area ?? null,
          floor: opts.sFloor,
          floorSource: opts.sFloorSource,
        })
      : null;
  return {
    nutrient,
    label: ANALYTE_DEPTH_LABEL[nutrient],
    unit: ANALYTE_UNIT[nutrient],
    stats: { ...stats, ...censoredCounts(values, cens) },
    threshold,
    shareBelow: spots?.shareBelow ?? null,
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

/** Results reported below detection and above range among the tested samples. */
function censoredCounts(
  values: ArrayLike<number>,
  cens: ArrayLike<number>,
): { censoredBelow: number; censoredAbove: number } {
  let censoredBelow = 0;
  let censoredAbove = 0;
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) continue;
    if (cens[i] < 0) censoredBelow++;
    else if (cens[i] > 0) censoredAbove++;
  }
  return { censoredBelow, censoredAbove };
}

/** The threshold asked for: a number (set by the user), a Threshold, null (none) or the nutrient's default. */
function thresholdOf(
  t: VariabilityOptions['threshold'],
  nutrient: Analyte,
  pMethod: PMethod,
): Threshold | null {
  if (t === null) return null;
  if (typeof t === 'number') return { value: t, unit: ANALYTE_UNIT[nutrient], source: 'set by the user' };
  return t ?? defaultThreshold(nutrient, pMethod);
}

/** The values the semivariogram is of: as given, or their natural logarithm (NaN, with a warning, for <= 0). */
function transformed(
  values: ArrayLike<number>,
  transform: 'none' | 'log',
  nutrient: Analyte,
  warnings: Warning[],
): Float64Array {
  const z = new Float64Array(values.length);
  let dropped = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    z[i] = transform === 'log' ? (v > 0 ? Math.log(v) : NaN) : v;
    if (Number.isFinite(v) && !Number.isFinite(z[i])) dropped++;
  }
  if (dropped)
    warnings.push({
      code: 'variability-log-nonpositive',
      message: `${dropped} ${nutrient} value(s) are 0 or negative and have no logarithm; they are left out of the semivariogram.`,
      field: nutrient,
    });
  return z;
}

/** The empirical semivariogram of the tested samples (none under 4), its lags with few pairs, the positions used. */
function studySemivariogram(
  xy: Float64Array,
  z: Float64Array,
  opts: VariabilityOptions,
  nutrient: Analyte,
  warnings: Warning[],
): { sv: Semivariogram; fewPairLags: number[]; xyUsed: number[] } {
  const xyUsed: number[] = [];
  for (let i = 0; i < z.length; i++) if (Number.isFinite(z[i])) xyUsed.push(xy[2 * i], xy[2 * i + 1]);
  const n = xyUsed.length / 2;
  if (n < 2) {
    warnings.push({
      code: 'variability-too-few',
      message: `only ${n} sample(s) have a ${nutrient} value: no semivariogram can be computed.`,
      field: nutrient,
    });
  }
  const sv: Semivariogram =
    n >= 2
      ? semivariogram(xy, z, { cutoff: opts.cutoff, width: opts.width })
      : { cutoff: NaN, width: NaN, bboxDiagonal: NaN, n, lag: [], np: [], dist: [], gamma: [] };
  const fewPairLags = sv.lag.filter((_, j) => sv.np[j] < MIN_PAIRS);
  if (fewPairLags.length) {
    warnings.push({
      code: 'variability-few-pairs',
      message: `${fewPairLags.length} of ${sv.lag.length} semivariogram lags hold fewer than ${MIN_PAIRS} pairs (common practice: at least ${MIN_PAIRS}); their semivariances are unreliable and the fitted model with them. Lags: ${fewPairLags.map((k) => k + 1).join(', ')}.`,
      field: nutrient,
    });
  }
  return { sv, fewPairLags, xyUsed };
}

/** The model fits, the best one and its spatial dependence; warnings when none fits or its range is beyond the data. */
function studyFits(
  sv: Semivariogram,
  fit: FitOptions | undefined,
  nutrient: Analyte,
  warnings: Warning[],
): { fits: FittedModel[]; best: FittedModel | null; dependence: Dependence | null } {
  const { fits, best } = sv.lag.length ? fitModels(sv, fit) : { fits: [], best: null };
  const dependence = best ? spatialDependence(best.nugget, best.psill) : null;
  if (!best)
    warnings.push({
      code: 'variability-no-fit',
      message: `no semivariogram model could be fitted to ${nutrient}: ${fits.find((f) => f.problem)?.problem ?? 'too few lags'}.`,
      field: nutrient,
    });
  else if (best.effectiveRange > sv.cutoff) {
    warnings.push({
      code: 'variability-range-beyond-cutoff',
      message: `the fitted effective range (${best.effectiveRange.toFixed(0)} m) is beyond the largest distance examined (${sv.cutoff.toFixed(0)} m): it is an extrapolation and uncertain.`,
      field: nutrient,
    });
  }
  return { fits, best, dependence };
}
