/**
 * How sure the soil test is, cell by cell, from the kriging mean and variance. Assumption (stated in every
 * output that uses these): at each cell the true value is Gaussian with the kriging mean and variance, or, when
 * kriging was on logarithms, its logarithm is (lognormal). Under that assumption
 *   P(value < t) = Phi((t' - mean) / sd),   t' = t, or ln t on the log scale,
 * class probabilities are differences of that at the class limits, and the expected response chance is the sum
 * of class probability x the class's response chance. Where the variance is 0 (a cell on a sample) the value is
 * certain and the chance is 0 or 1 (a value exactly at a limit is not below it, as in the rate engine's
 * classes). Docs: docs/surface.md, "Maps of how sure the soil test is".
 */
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';

/** Mean and variance per cell on the kriged scale (see NutrientSurface.krigedMean / variance). */
export interface KrigedCells {
  mean: ArrayLike<number>;
  variance: ArrayLike<number>;
  /** the kriged scale: values as measured, or their natural logarithms */
  transform: 'none' | 'log';
}

/** Response classes as half-open intervals [previous limit, below): `below` ascending, the last null (no upper limit). */
export interface ResponseClasses {
  names: string[];
  below: (number | null)[];
  /** chance of a yield response to the nutrient in each class, 0..1 */
  chance: number[];
}

/**
 * P(value < t) for a Gaussian with this mean and sd. With sd 0 (a cell on a sample) the value is certain and
 * "below" is strict, as the rate engine's half-open classes: a value exactly at t is not below it.
 */
function below(t: number, mean: number, sd: number): number {
  return sd > 0 ? normalCdf(t, mean, sd) : mean < t ? 1 : 0;
}

/** The threshold on the kriged scale: ln t for log kriging (-Infinity for t <= 0). */
function scaled(t: number, transform: 'none' | 'log'): number {
  if (transform === 'none') return t;
  return t > 0 ? Math.log(t) : -Infinity;
}

/**
 * Chance that the value is below `threshold` at one cell (Gaussian, or lognormal when transform is 'log').
 * @example chanceBelowAt(25, 16, 20, 'none') // Phi(-1.25) = 0.106
 */
export function chanceBelowAt(
  mean: number,
  variance: number,
  threshold: number,
  transform: 'none' | 'log' = 'none',
): number {
  if (!Number.isFinite(mean) || !(variance >= 0)) return NaN;
  return below(scaled(threshold, transform), mean, Math.sqrt(variance));
}

/**
 * Chance below a threshold per cell (NaN where the mean is NaN), e.g. sulphate-S below the crop's low level.
 * @example chanceBelow({ mean, variance, transform: 'none' }, 20) // Float32Array of 0..1
 */
export function chanceBelow(k: KrigedCells, threshold: number): Float32Array {
  const n = k.mean.length;
  const out = new Float32Array(n);
  for (let i = 0; i < n; i++) out[i] = chanceBelowAt(k.mean[i], k.variance[i], threshold, k.transform);
  return out;
}

/**
 * Probability of each response class per cell, and the expected response chance
 * (sum over classes of probability x class chance). Class probabilities sum to 1 in every computed cell.
 * @param k kriging mean and variance
 * @param classes class limits and response chances (e.g. P classes of the tables)
 * @returns probability[c] per class (Float32Array per cell) and expected chance per cell
 * @example const { probability, expected } = classProbabilities(k, { names: ['low', 'high'], below: [10, null], chance: [0.7, 0.2] })
 */
export function classProbabilities(
  k: KrigedCells,
  classes: ResponseClasses,
): { probability: Float32Array[]; expected: Float32Array } {
  const n = k.mean.length,
    C = classes.names.length;
  const probability = classes.names.map(() => new Float32Array(n));
  const expected = new Float32Array(n);
  const limits = classes.below.map((b) => (b === null ? Infinity : scaled(b, k.transform)));
  for (let i = 0; i < n; i++) {
    const m = k.mean[i],
      v = k.variance[i];
    if (!Number.isFinite(m) || !(v >= 0)) {
      for (let c = 0; c < C; c++) probability[c][i] = NaN;
      expected[i] = NaN;
      continue;
    }
    const sd = Math.sqrt(v);
    let prev = 0,
      e = 0;
    for (let c = 0; c < C; c++) {
      const cum = limits[c] === Infinity ? 1 : below(limits[c], m, sd);
      const p = Math.max(0, cum - prev);
      probability[c][i] = p;
      e += p * classes.chance[c];
      prev = Math.max(prev, cum);
    }
    expected[i] = e;
  }
  return { probability, expected };
}
