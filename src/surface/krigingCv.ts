/**
 * Ordinary kriging at arbitrary points, and leave-one-out cross-validation of kriging (gstat `krige.cv`):
 * each sample is predicted from its k nearest others with the same model. Besides RMSE, MAE and bias the
 * table gives the mean standardized squared error, MSSE = mean(e^2 / kriging variance), which is near 1 when
 * the model's variance describes the real errors.
 */
import { fourPerBucket, KnnGroup } from './knn.js';
import { ringsBbox } from '../geo/area.js';
import { COINCIDENT_D2 } from './idw.js';
import { OkSolver, type KrigingModel } from './kriging.js';

/** Kriging at points: mean and variance per point (NaN where the system was singular). */
export interface PointKriging {
  mean: Float64Array;
  variance: Float64Array;
  lagrange: Float64Array;
}

/** Options of {@link krigingAtPoints}. */
export interface PointKrigingOptions {
  /** nearest samples per point (default 16) */
  neighbours?: number;
  /** leave-one-out: query q is sample q, left out of its own neighbourhood (default false) */
  leaveOneOut?: boolean;
}

/**
 * Ordinary kriging at the points `qxy` (or, with `leaveOneOut`, at every sample from the others).
 * @param xy sample positions (metres)
 * @param z sample values
 * @param qxy query positions x0 y0 ... (ignored with leaveOneOut)
 * @param model semivariogram model
 * @param opts neighbours 16, leaveOneOut false
 * @example krigingAtPoints(xy, z, new Float64Array([x, y]), model, { neighbours: 16 }).mean[0]
 */
export function krigingAtPoints(
  xy: Float64Array,
  z: ArrayLike<number>,
  qxy: Float64Array,
  model: KrigingModel,
  opts: PointKrigingOptions = {},
): PointKriging {
  const loo = opts.leaveOneOut ?? false;
  const n = xy.length >> 1;
  const q = loo ? xy : qxy;
  const nq = q.length >> 1;
  const k = Math.min(opts.neighbours ?? 16, loo ? n - 1 : n);
  const out: PointKriging = {
    mean: new Float64Array(nq).fill(NaN),
    variance: new Float64Array(nq).fill(NaN),
    lagrange: new Float64Array(nq).fill(NaN),
  };
  if (k < 1) return out;
  const b = fourPerBucket(xy, ringsBbox([xy, q]));
  const { x0, y0, size, nx, ny } = b;
  const g = new KnnGroup(b, k);
  const ring = Math.max(1, Math.ceil(Math.sqrt(k / 4) / 2 + 0.5));
  const solver = new OkSolver(model, k, n, loo ? 1 : undefined);
  for (let p = 0; p < nq; p++) {
    const qx = q[2 * p] - x0,
      qy = q[2 * p + 1] - y0;
    const bx = Math.min(nx - 1, Math.max(0, Math.floor(qx / size))),
      by = Math.min(ny - 1, Math.max(0, Math.floor(qy / size)));
    g.begin(bx, bx, by, by, ring);
    g.reset();
    const found = g.nearest(qx, qy, loo ? p : -1, true);
    if (g.d2[0] < COINCIDENT_D2) {
      out.mean[p] = z[g.idx[0]];
      out.variance[p] = 0;
      out.lagrange[p] = 0;
      continue;
    }
    if (!solver.load(xy, x0, y0, z, g.idx, found)) continue;
    solver.predict(qx, qy);
    out.mean[p] = solver.mean;
    out.variance[p] = solver.variance;
    out.lagrange[p] = solver.mu;
  }
  return out;
}

/** Leave-one-out summary of kriging. */
export interface KrigingCv {
  neighbours: number;
  rmse: number;
  mae: number;
  /** mean of (predicted - observed) */
  bias: number;
  /** mean standardized squared error, mean(e^2 / variance); near 1 when the variances are right */
  msse: number;
  /** samples predicted */
  n: number;
  /** per sample: prediction and kriging variance (in the units the errors are measured in) */
  pred: Float64Array;
  variance: Float64Array;
}

/**
 * Leave-one-out cross-validation of ordinary kriging (gstat `krige.cv` with `nmax` = neighbours).
 * With `back` the predictions are back-transformed before the errors are taken (e.g. kriging on logarithms,
 * errors in the original unit); MSSE is always taken on the kriged scale, where the variance belongs.
 *
 * @param xy sample positions (metres)
 * @param z values kriged (already transformed when `back` is given)
 * @param model semivariogram model of z
 * @param neighbours nearest samples per prediction (default 16)
 * @param observed values the errors are measured against (default z)
 * @param back back-transform of (mean, variance, lagrange) to the unit of `observed` (default none)
 * @example krigingCv(xy, z, model, 16).msse // near 1 for a good model
 */
export function krigingCv(
  xy: Float64Array,
  z: ArrayLike<number>,
  model: KrigingModel,
  neighbours = 16,
  observed: ArrayLike<number> = z,
  back?: (mean: number, variance: number, lagrange: number) => number,
): KrigingCv {
  const r = krigingAtPoints(xy, z, xy, model, { neighbours, leaveOneOut: true });
  const n = z.length;
  const pred = new Float64Array(n);
  let se = 0,
    sa = 0,
    sq = 0,
    ss = 0,
    m = 0,
    ms = 0;
  for (let i = 0; i < n; i++) {
    const mean = r.mean[i],
      v = r.variance[i];
    pred[i] = back ? back(mean, v, r.lagrange[i]) : mean;
    if (!Number.isFinite(pred[i])) continue;
    const e = pred[i] - observed[i];
    se += e;
    sa += Math.abs(e);
    sq += e * e;
    m++;
    if (v > 0) {
      const ez = mean - z[i];
      ss += (ez * ez) / v;
      ms++;
    }
  }
  return {
    neighbours: Math.min(neighbours, n - 1),
    rmse: m ? Math.sqrt(sq / m) : NaN,
    mae: m ? sa / m : NaN,
    bias: m ? se / m : NaN,
    msse: ms ? ss / ms : NaN,
    n: m,
    pred,
    variance: r.variance,
  };
}
