/**
 * Kriging as a candidate of the surface stage: the model from the variability stage's fit (or the user's),
 * leave-one-out cross-validation in the nutrient's own unit (so its RMSE compares with IDW's), and the grid
 * with its kriging variance. Kriging on logarithms is back-transformed to the lognormal mean
 * exp(y + variance / 2 + mu) (Cressie 1993, Statistics for Spatial Data, sec. 3.2.2; mu is the Lagrange
 * multiplier of C w + mu 1 = c0, the negative of Cressie's m); see docs/surface.md.
 */
import type { CvRow } from './crossValidate.js';
import type { GridShape } from './neighbours.js';
import { krigingSurface, type KrigingModel } from './kriging.js';
import { krigingCv } from './krigingCv.js';
import { chooseVariogram, modelText, type VariogramChoice } from './variogram.js';
import type { FitOptions } from '../variability/fit.js';

/** Default neighbours per cell for kriging (gstat's nmax). */
export const KRIGING_NEIGHBOURS = 16;

/** Options for kriging in {@link nutrientSurface}. */
export interface KrigingChoiceOptions {
  /** nearest samples per cell (default 16) */
  neighbours?: number;
  /** krige the natural logarithm and back-transform (default false) */
  log?: boolean;
  /** use this model instead of fitting one (its parameters in the kriged scale: of ln values when log) */
  model?: KrigingModel;
  /** model fit options for the variability stage's fit (default gstat fit.method 7) */
  fit?: FitOptions;
}

/** What the surface stage knows about kriging for one nutrient. */
export interface KrigingInfo {
  model: KrigingModel | null;
  /** why kriging cannot be used, or null */
  refused: string | null;
  transform: 'none' | 'log';
  neighbours: number;
  /** leave-one-out row (method 'kriging'), null when refused */
  cv: CvRow | null;
  /** the model as text, e.g. "spherical, nugget 0.05, partial sill 0.59, range 897 m" */
  modelText: string;
  /** where the model came from, for people */
  modelSource: string;
}

/** Lognormal mean of a value kriged on logarithms (Cressie 1993, sec. 3.2.2). */
export function lognormalMean(y: number, variance: number, mu: number): number {
  return Math.exp(y + variance / 2 + mu);
}

/**
 * Chooses the model (or takes the given one) and cross-validates kriging on the samples.
 * @param xy sample positions (metres), merged duplicates
 * @param z sample values in the nutrient's unit
 * @param opts neighbours 16, log false, model fitted
 * @example const k = krigingCandidate(pts.xy, pts.z); k.refused ?? k.cv!.rmse
 */
export function krigingCandidate(
  xy: Float64Array,
  z: ArrayLike<number>,
  opts: KrigingChoiceOptions = {},
): KrigingInfo {
  const log = opts.log ?? false;
  const transform = log ? 'log' : 'none';
  const neighbours = Math.min(opts.neighbours ?? KRIGING_NEIGHBOURS, Math.max(1, z.length - 1));
  let choice: VariogramChoice | null = null;
  let model = opts.model ?? null;
  let refused: string | null = null;
  if (!model) {
    choice = chooseVariogram(xy, z, { log, fit: opts.fit });
    model = choice.model;
    refused = choice.refused;
  } else if (log) {
    for (let i = 0; i < z.length; i++)
      if (!(z[i] > 0)) {
        refused = `a value of ${z[i]} has no logarithm; kriging on logarithms needs values above 0`;
        break;
      }
  }
  if (z.length < 3 && !refused) refused = `only ${z.length} samples; cross-validation needs 3`;
  const source = opts.model
    ? 'given'
    : `fitted to the ${z.length} samples' semivariogram (gstat binning, weighted least squares; best of spherical, exponential, Gaussian)`;
  if (!model || refused)
    return {
      model: null,
      refused: refused ?? 'no model',
      transform,
      neighbours,
      cv: null,
      modelText: '',
      modelSource: source,
    };
  const zt = log ? Float64Array.from(z, Math.log) : z;
  const cv = krigingCv(xy, zt, model, neighbours, z, log ? lognormalMean : undefined);
  const row: CvRow = {
    method: 'kriging',
    power: NaN,
    neighbours,
    rmse: cv.rmse,
    mae: cv.mae,
    bias: cv.bias,
    msse: cv.msse,
    n: cv.n,
  };
  return {
    model,
    refused: null,
    transform,
    neighbours,
    cv: row,
    modelText: modelText(model, log),
    modelSource: source,
  };
}

/** Kriged grid: values in the nutrient's unit, plus mean and variance on the kriged scale (ln values when log). */
export interface KrigedGrid {
  values: Float64Array;
  /** kriging mean on the kriged scale (the same array as values without a transform) */
  mean: Float64Array;
  variance: Float64Array;
  singular: number;
}

/**
 * Kriges the samples onto the grid with a candidate's model; with `cells` (ascending) only those cells, the
 * arrays then following `cells`.
 * @example const g = krigeGrid(pts.xy, pts.z, grid, info); g.variance[i]
 */
export function krigeGrid(
  xy: Float64Array,
  z: ArrayLike<number>,
  grid: GridShape & { fraction?: ArrayLike<number> },
  info: KrigingInfo,
  cells?: Int32Array,
): KrigedGrid {
  if (!info.model) throw new Error('krigeGrid: no model (kriging was refused)');
  const log = info.transform === 'log';
  const zt = log ? Float64Array.from(z, Math.log) : z;
  const r = krigingSurface(xy, zt, grid, info.model, { neighbours: info.neighbours, lagrange: log, cells });
  if (!log) return { values: r.values, mean: r.values, variance: r.variance, singular: r.singular };
  const values = new Float64Array(r.values.length).fill(NaN);
  const mu = r.lagrange!;
  for (let i = 0; i < values.length; i++)
    if (!Number.isNaN(r.values[i])) values[i] = lognormalMean(r.values[i], r.variance[i], mu[i]);
  return { values, mean: r.values, variance: r.variance, singular: r.singular };
}
