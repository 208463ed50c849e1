/**
 * Ordinary kriging on a local neighbourhood (the k nearest samples of each cell), with the kriging variance,
 * in gstat's conventions: the model is nugget + one structure (spherical, exponential, Gaussian; see
 * src/variability/models.ts), the covariance is C(h) = sill - gamma(h) with gamma(0) = 0, so the nugget belongs
 * to C(0) and the predictor honours the samples exactly (variance 0 at a sample).
 *
 * The system per cell, with C the neighbours' covariance matrix, c0 their covariances with the cell and mu the
 * Lagrange multiplier:  C w + mu 1 = c0,  1'w = 1;  prediction w'z;  variance C(0) - w'c0 - mu.
 * With the Cholesky factor C = L L' and v = L^-1 1, g = L^-1 z (both kept per neighbour set) and u = L^-1 c0
 * (one forward substitution per cell):  mu = (v'u - 1) / v'v,  prediction u'g - mu v'g,
 * variance C(0) - u'u + (v'u - 1)^2 / v'v. Neighbouring cells mostly share their neighbour set, so the
 * factorisation is reused until the set changes; all buffers are allocated once (no allocation per cell).
 */
import type { ModelKind } from '../variability/models.js';
import { visitCellNeighbours, type GridShape } from './cellNeighbours.js';
import { COINCIDENT_D2 } from './idw.js';

/** A semivariogram model in gstat's parameterisation: gamma(h) = nugget + psill * unit(h / range), h > 0. */
export interface KrigingModel {
  kind: ModelKind;
  nugget: number;
  /** partial sill (> 0) */
  psill: number;
  /** gstat's range parameter a, metres (> 0) */
  range: number;
}

/** Options for {@link krigingSurface}. */
export interface KrigingOptions {
  /** nearest samples per cell (default 16; at most the sample count) */
  neighbours?: number;
  /** cells to compute: where[i] > 0 (default grid.fraction when present, else every cell) */
  where?: ArrayLike<number>;
  /** also return the Lagrange multiplier per cell (for the lognormal back-transform; default false) */
  lagrange?: boolean;
}

/** Kriging mean and variance per cell (row-major, north-up; NaN where not computed). */
export interface KrigingResult {
  values: Float64Array;
  variance: Float64Array;
  /** Lagrange multiplier mu of C w + mu 1 = c0, when asked for */
  lagrange: Float64Array | null;
  /** cells left NaN because their neighbours' covariance matrix was not positive definite */
  singular: number;
}

/**
 * The covariance C(h) = sill - gamma(h) from a squared distance (C(0) = nugget + psill).
 * @example covariance({ kind: 'spherical', nugget: 1, psill: 2, range: 100 }, 50 * 50) // 0.625
 */
export function covariance(m: KrigingModel, d2: number): number {
  if (d2 <= 0) return m.nugget + m.psill;
  switch (m.kind) {
    case 'gaussian':
      return m.psill * Math.exp(-d2 / (m.range * m.range));
    case 'exponential':
      return m.psill * Math.exp(-Math.sqrt(d2) / m.range);
    default: {
      const t = Math.sqrt(d2) / m.range;
      return t >= 1 ? 0 : m.psill * (1 - t * (1.5 - 0.5 * t * t));
    }
  }
}

/**
 * One neighbourhood's ordinary-kriging system with preallocated buffers: {@link setNeighbours} factorises
 * C = L L' (Cholesky on a flat Float64Array) once per neighbour set, {@link predict} answers a location.
 * @example const s = new OkSolver(model, 16); s.setNeighbours(xs, ys, zs, 16); s.predict(x, y)
 */
export class OkSolver {
  readonly sill: number;
  private readonly L: Float64Array;
  private readonly v: Float64Array;
  private readonly gz: Float64Array;
  private readonly u: Float64Array;
  readonly xs: Float64Array;
  readonly ys: Float64Array;
  private m = 0;
  private vv = 0;
  private vg = 0;
  /** results of the last {@link predict} */
  mean = NaN;
  variance = NaN;
  mu = NaN;

  constructor(readonly model: KrigingModel, readonly kmax: number) {
    this.sill = model.nugget + model.psill;
    this.L = new Float64Array(kmax * kmax);
    this.v = new Float64Array(kmax);
    this.gz = new Float64Array(kmax);
    this.u = new Float64Array(kmax);
    this.xs = new Float64Array(kmax);
    this.ys = new Float64Array(kmax);
  }

  /**
   * Loads m neighbours (positions already in `xs`, `ys`; values `z[idx[t]]`) and factorises their covariance
   * matrix. Returns false when it is not positive definite (coincident samples without nugget, or a
   * Gaussian model on samples much closer than its range).
   */
  setNeighbours(z: ArrayLike<number>, idx: Int32Array, m: number): boolean {
    const { L, v, gz, xs, ys, model, sill } = this;
    this.m = m;
    for (let i = 0; i < m; i++) {
      const o = i * m;
      for (let j = 0; j < i; j++) {
        const dx = xs[i] - xs[j], dy = ys[i] - ys[j];
        L[o + j] = covariance(model, dx * dx + dy * dy);
      }
      L[o + i] = sill;
    }
    // in-place Cholesky, lower triangle, row by row
    for (let i = 0; i < m; i++) {
      const oi = i * m;
      for (let j = 0; j <= i; j++) {
        const oj = j * m;
        let s = L[oi + j];
        for (let t = 0; t < j; t++) s -= L[oi + t] * L[oj + t];
        if (i === j) {
          if (!(s > sill * 1e-12)) { this.m = 0; return false; }
          L[oi + i] = Math.sqrt(s);
        } else L[oi + j] = s / L[oj + j];
      }
    }
    forward(L, m, null, v, 1);
    forward(L, m, null, gz, 0, z, idx);
    let vv = 0, vg = 0;
    for (let i = 0; i < m; i++) { vv += v[i] * v[i]; vg += v[i] * gz[i]; }
    this.vv = vv;
    this.vg = vg;
    return true;
  }

  /** Kriging mean, variance (>= 0) and Lagrange multiplier at (x, y), from the loaded neighbours. */
  predict(x: number, y: number): void {
    const { L, v, gz, u, xs, ys, model, m } = this;
    for (let i = 0; i < m; i++) {
      const dx = xs[i] - x, dy = ys[i] - y;
      u[i] = covariance(model, dx * dx + dy * dy);
    }
    forward(L, m, u, u, 0);
    let uu = 0, vu = 0, ug = 0;
    for (let i = 0; i < m; i++) { uu += u[i] * u[i]; vu += v[i] * u[i]; ug += u[i] * gz[i]; }
    const mu = (vu - 1) / this.vv;
    this.mu = mu;
    this.mean = ug - mu * this.vg;
    const s2 = this.sill - uu + (vu - 1) * (vu - 1) / this.vv;
    this.variance = s2 > 0 ? s2 : 0;
  }
}

/**
 * Forward substitution L y = b in place into `out`: b is `rhs` when given, else the constant `c`, or
 * z[idx[i]] when z is given.
 */
function forward(L: Float64Array, m: number, rhs: Float64Array | null, out: Float64Array, c: number, z?: ArrayLike<number>, idx?: Int32Array): void {
  for (let i = 0; i < m; i++) {
    const o = i * m;
    let s = rhs ? rhs[i] : z ? z[idx![i]] : c;
    for (let t = 0; t < i; t++) s -= L[o + t] * out[t];
    out[i] = s / L[o + i];
  }
}

/**
 * Ordinary kriging of sample values onto a grid's cell centres, k nearest samples per cell (gstat `krige()`
 * with `nmax` = k). A cell centre within 1e-13 m^2 of a sample takes its value with variance 0.
 *
 * @param xy sample positions x0 y0 x1 y1 ... (metres, the grid's frame); no two at one place
 * @param z sample values
 * @param grid grid geometry; its `fraction` (if any) chooses the cells computed unless `where` is given
 * @param model semivariogram model (psill > 0, range > 0)
 * @param opts neighbours 16, where grid.fraction, lagrange false
 * @example const { values, variance } = krigingSurface(xy, z, grid, { kind: 'spherical', nugget: 0.05, psill: 0.59, range: 897 })
 */
export function krigingSurface(xy: Float64Array, z: ArrayLike<number>, grid: GridShape & { fraction?: ArrayLike<number> }, model: KrigingModel, opts: KrigingOptions = {}): KrigingResult {
  const n = xy.length >> 1;
  const k = Math.min(opts.neighbours ?? 16, n);
  const N = grid.cols * grid.rows;
  const values = new Float64Array(N).fill(NaN);
  const variance = new Float64Array(N).fill(NaN);
  const lagrange = opts.lagrange ? new Float64Array(N).fill(NaN) : null;
  const res: KrigingResult = { values, variance, lagrange, singular: 0 };
  if (n === 0 || k < 1) return res;
  const solver = new OkSolver(model, k);
  const set = new Int32Array(k).fill(-1), cur = new Int32Array(k), curD2 = new Float64Array(k);
  let setSize = 0, setOk = false;
  const { xmin, ymax, cell, cols } = grid;
  visitCellNeighbours(xy, grid, k, Infinity, opts.where ?? grid.fraction, (i, found, d2, idx) => {
    // neighbours sorted by sample index: the set's identity and the matrix order
    for (let t = 0; t < found; t++) {
      const id = idx[t], dd = d2[t];
      let p = t;
      while (p > 0 && cur[p - 1] > id) { cur[p] = cur[p - 1]; curD2[p] = curD2[p - 1]; p--; }
      cur[p] = id; curD2[p] = dd;
    }
    for (let t = 0; t < found; t++) {
      if (curD2[t] < COINCIDENT_D2) { values[i] = z[cur[t]]; variance[i] = 0; if (lagrange) lagrange[i] = 0; return; }
    }
    let same = found === setSize;
    for (let t = 0; same && t < found; t++) if (cur[t] !== set[t]) same = false;
    if (!same) {
      for (let t = 0; t < found; t++) {
        set[t] = cur[t];
        solver.xs[t] = xy[2 * cur[t]] - xmin;
        solver.ys[t] = xy[2 * cur[t] + 1] - ymax;
      }
      setSize = found;
      setOk = solver.setNeighbours(z, set, found);
    }
    if (!setOk) { res.singular++; return; }
    solver.predict((i % cols + 0.5) * cell, -(Math.floor(i / cols) + 0.5) * cell);
    values[i] = solver.mean;
    variance[i] = solver.variance;
    if (lagrange) lagrange[i] = solver.mu;
  });
  return res;
}
