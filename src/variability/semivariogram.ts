/**
 * The empirical semivariogram (Matheron's method-of-moments estimator), binned the way R's gstat
 * `variogram()` bins it, so the two agree to rounding (tests/variability/gstat.tool.test.ts).
 *
 * gamma(h_j) = 1 / (2 N_j) * sum over the N_j pairs in lag j of (z_a - z_b)^2
 *
 * gstat 2.1.0 rules reproduced here (src/sem.c, read for behaviour, not copied):
 * - default cutoff = one third of the diagonal of the samples' bounding box; default width = cutoff / 15;
 * - a pair farther apart than the cutoff is left out; a pair at exactly the cutoff is kept;
 * - lag j holds distances in (j * width, (j + 1) * width]: a distance exactly on a boundary goes to the lower lag,
 *   and pairs at distance 0 (two samples at one spot) go into the first lag;
 * - `dist` is the mean distance of the pairs in the lag, not the lag's centre; lags without pairs are omitted.
 */

/** Options of {@link semivariogram}; both default as in gstat. */
export interface SemivariogramOptions {
  /** largest pair distance used, metres; default one third of the bounding-box diagonal */
  cutoff?: number;
  /** lag width, metres; default cutoff / 15 */
  width?: number;
}

/** An empirical semivariogram: one entry per lag that holds at least one pair, nearest first. */
export interface Semivariogram {
  cutoff: number;
  width: number;
  /** diagonal of the bounding box of the samples used, metres */
  bboxDiagonal: number;
  /** number of samples with a value */
  n: number;
  /** lag number j (0-based): the lag covers (j * width, (j + 1) * width] */
  lag: number[];
  /** pairs in the lag (N_j) */
  np: number[];
  /** mean distance of those pairs, metres (h_j) */
  dist: number[];
  /** semivariance, in the squared unit of the values */
  gamma: number[];
}

/**
 * Computes the empirical semivariogram of `values` at points `xy` (x0 y0 x1 y1 ..., metres).
 * Samples whose value is NaN are skipped. Needs at least two samples with a value.
 *
 * @example
 * const v = semivariogram(new Float64Array([0, 0, 10, 0, 0, 10]), [1, 2, 4]);
 * // v.cutoff = sqrt(200) / 3, v.width = v.cutoff / 15
 */
export function semivariogram(
  xy: ArrayLike<number>,
  values: ArrayLike<number>,
  opts: SemivariogramOptions = {},
): Semivariogram {
  if (xy.length !== 2 * values.length)
    throw new Error(`semivariogram: ${xy.length} coordinates for ${values.length} values`);
  let n = 0;
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) n++;
  const xs = new Float64Array(n),
    ys = new Float64Array(n),
    zs = new Float64Array(n);
  for (let i = 0, m = 0; i < values.length; i++) {
    const z = values[i];
    if (!Number.isFinite(z)) continue;
    xs[m] = xy[2 * i];
    ys[m] = xy[2 * i + 1];
    zs[m++] = z;
  }
  let xmin = Infinity,
    xmax = -Infinity,
    ymin = Infinity,
    ymax = -Infinity;
  for (let i = 0; i < n; i++) {
    if (xs[i] < xmin) xmin = xs[i];
    if (xs[i] > xmax) xmax = xs[i];
    if (ys[i] < ymin) ymin = ys[i];
    if (ys[i] > ymax) ymax = ys[i];
  }
  const bboxDiagonal = n > 0 ? Math.sqrt((xmax - xmin) * (xmax - xmin) + (ymax - ymin) * (ymax - ymin)) : 0;
  // gstat: a zero diagonal gives a cutoff of 1
  const cutoff = opts.cutoff ?? (bboxDiagonal === 0 ? 1 : bboxDiagonal / 3);
  const width = opts.width ?? cutoff / 15;
  if (!(cutoff > 0) || !(width > 0))
    throw new Error(`semivariogram: cutoff ${cutoff} and width ${width} must be positive`);

  const nLags = Math.floor(cutoff / width) + 1;
  const sumSq = new Float64Array(nLags);
  const sumDist = new Float64Array(nLags);
  const count = new Float64Array(nLags);
  // pairs whose squared distance is surely beyond the cutoff skip the square root (the margin keeps every pair
  // the exact test `d > cutoff` would keep); the sums run in the same order as a plain double loop
  const far2 = cutoff * cutoff * (1 + 1e-9);
  for (let i = 0; i < n; i++) {
    const xi = xs[i],
      yi = ys[i],
      zi = zs[i];
    for (let j = 0; j < i; j++) {
      const dx = xi - xs[j];
      const dy = yi - ys[j];
      const d2 = dx * dx + dy * dy;
      if (d2 > far2) continue;
      const d = Math.sqrt(d2);
      if (d > cutoff) continue;
      const k = lagIndex(d, width);
      if (k >= nLags) continue; // cannot happen for d <= cutoff; guards rounding
      const diff = zi - zs[j];
      sumSq[k] += diff * diff;
      sumDist[k] += d;
      count[k]++;
    }
  }
  const out: Semivariogram = { cutoff, width, bboxDiagonal, n, lag: [], np: [], dist: [], gamma: [] };
  for (let k = 0; k < nLags; k++) {
    if (count[k] === 0) continue;
    out.lag.push(k);
    out.np.push(count[k]);
    out.dist.push(sumDist[k] / count[k]);
    out.gamma.push(sumSq[k] / (2 * count[k]));
  }
  return out;
}

/**
 * The lag a pair distance falls in: (j * width, (j + 1) * width] is lag j; 0 goes to lag 0.
 * @example lagIndex(10, 10) // 0, since 10 is on the boundary and goes to the lower lag
 */
export function lagIndex(d: number, width: number): number {
  const frac = d / width;
  const f = Math.floor(frac);
  return d > 0 && frac === f ? f - 1 : f;
}
