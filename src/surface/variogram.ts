/**
 * The semivariogram model kriging uses: fitted by the variability stage (gstat's binning and weighted
 * least-squares fit, src/variability/) on the samples of one nutrient, or refused with the reason when it
 * cannot carry a map: too few samples, too few pairs per lag, pure nugget, or no sill within the distances
 * examined (a trend).
 */
import { semivariogram, type Semivariogram } from '../variability/semivariogram.js';
import { fitModels, type FitOptions, type FittedModel } from '../variability/fit.js';
import type { KrigingModel } from './kriging.js';

/** Fewer samples than this: no kriging (common practice; a semivariogram from fewer is mostly noise). */
export const KRIGING_MIN_SAMPLES = 30;
/** Lags need this many pairs to count (common practice, as the variability stage flags them). */
export const KRIGING_MIN_PAIRS = 30;
/** At least this many lags with enough pairs. */
export const KRIGING_MIN_LAGS = 3;

/** A usable model, or the reason there is none. */
export interface VariogramChoice {
  model: KrigingModel | null;
  /** why kriging is refused (for people), or null */
  refused: string | null;
  /** the fitted model the choice came from (the best of spherical, exponential, Gaussian) */
  fit: FittedModel | null;
  semivariogram: Semivariogram | null;
  /** values were logged before the semivariogram (kriging on logarithms) */
  transform: 'none' | 'log';
}

/** Options of {@link chooseVariogram}. */
export interface VariogramChoiceOptions {
  /** natural logarithm of the values first (default false) */
  log?: boolean;
  /** model fit options (default gstat fit.method 7 from gstat's default start) */
  fit?: FitOptions;
}

/**
 * Fits the semivariogram of one nutrient's samples and says whether kriging may use it.
 * @param xy sample positions (metres), merged duplicates
 * @param z sample values (original unit; logged here when `log`)
 * @param opts log false, fit method 7
 * @example const c = chooseVariogram(pts.xy, pts.z); c.refused ?? c.model
 */
export function chooseVariogram(
  xy: Float64Array,
  z: ArrayLike<number>,
  opts: VariogramChoiceOptions = {},
): VariogramChoice {
  const transform = opts.log ? 'log' : 'none';
  const none = (
    refused: string,
    sv: Semivariogram | null = null,
    fit: FittedModel | null = null,
  ): VariogramChoice => ({ model: null, refused, fit, semivariogram: sv, transform });
  const n = z.length;
  if (n < KRIGING_MIN_SAMPLES) {
    return none(
      `only ${n} samples; kriging needs at least ${KRIGING_MIN_SAMPLES} to estimate a semivariogram (common practice)`,
    );
  }
  const zt = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (opts.log && !(z[i] > 0))
      return none(`a value of ${z[i]} has no logarithm; kriging on logarithms needs values above 0`);
    zt[i] = opts.log ? Math.log(z[i]) : z[i];
  }
  const sv = semivariogram(xy, zt);
  const good = sv.np.filter((p) => p >= KRIGING_MIN_PAIRS).length;
  if (good < KRIGING_MIN_LAGS) {
    return none(
      `only ${good} semivariogram lag${good === 1 ? '' : 's'} hold ${KRIGING_MIN_PAIRS} or more pairs; at least ${KRIGING_MIN_LAGS} are needed (common practice)`,
      sv,
    );
  }
  const { fits, best } = fitModels(sv, opts.fit);
  if (!best) {
    const atLimit = fits.some((f) => f.ok && f.rangeAtLimit);
    const why = atLimit
      ? 'the semivariogram does not level off within the distances examined (a trend across the field, or a range longer than the field)'
      : (fits.find((f) => f.problem)?.problem ?? 'no model could be fitted');
    return none(`no usable semivariogram model: ${why}`, sv);
  }
  if (!(best.psill > 0) || !(best.range > 0))
    return none('no spatial structure: the fitted partial sill is not positive (pure nugget)', sv, best);
  return {
    model: { kind: best.kind, nugget: best.nugget, psill: best.psill, range: best.range },
    refused: null,
    fit: best,
    semivariogram: sv,
    transform,
  };
}

/**
 * The model as people read it, e.g. "spherical, nugget 0.05, partial sill 0.59, range 897 m".
 * @example modelText({ kind: 'exponential', nugget: 8, psill: 60, range: 90 })
 */
export function modelText(m: KrigingModel, log = false): string {
  const g = (v: number) => String(Number(v.toPrecision(3)));
  return `${m.kind}, nugget ${g(m.nugget)}, partial sill ${g(m.psill)}, range ${g(m.range)} m${log ? ' (of ln values)' : ''}`;
}
