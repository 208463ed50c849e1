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
 * factorisations of the last 1024 sets are kept and reused; all buffers are allocated once (no allocation
 * per cell).
 */
import type { ModelKind } from '../variability/models.js';
import { forEachNeighbourBand, type GridShape } from './neighbours.js';
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
  /**
   * compute only these cells (ascending cell indices, e.g. the cells a coarser map shows); the result's arrays
   * are then as long as `cells` and follow its order, which saves the memory of whole-grid arrays
   */
  cells?: Int32Array;
}

/** Kriging mean and variance per cell (row-major, north-up; NaN where not computed). */
export interface KrigingResult {
  values: Float64Array;
  variance: Float64Array;
  /** Lagrange multiplier mu of C w + mu 1 = c0, when asked for */
  lagrange: Float64Array | null;
  /** cells left NaN because their neighbours' covariance matrix was not positive definite */
  singular: number;
  /** neighbour sets factorised (a measure of work: cells that reuse the previous set cost one forward solve) */
  factorisations: number;
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
    default:
      return sph(m.psill, Math.sqrt(d2) / m.range);
  }
}

/** Spherical covariance at t = h / a. */
function sph(psill: number, t: number): number {
  return t >= 1 ? 0 : psill * (1 - t * (1.5 - 0.5 * t * t));
}

/** Neighbour sets whose factorisations are kept (about 2.7 KB each for 16 neighbours). */
export const KRIGING_CACHE_SETS = 1024;

/**
 * Ordinary-kriging systems of neighbour sets with preallocated buffers: {@link load} makes a set current,
 * factorising C = L L' (Cholesky on a flat Float64Array) only when the set is not among the last
 * `cacheSets` factorised (cells of one region share their k nearest samples, and the serpentine walk over a
 * block of cells comes back to the sets of the row before); {@link predict} answers a location.
 * @example const s = new OkSolver(model, 16, n); if (s.load(xy, 0, 0, z, idx, 16)) { s.predict(x, y); s.mean }
 */
export class OkSolver {
  readonly sill: number;
  private readonly stride: number;
  private readonly pool: Float64Array;
  private readonly members: Int32Array;
  /** per slot: neighbour count, or 0 when empty; ok: 1 factorised, 0 not positive definite */
  private readonly sizes: Int32Array;
  private readonly ok: Uint8Array;
  private readonly keys: Float64Array;
  private readonly scal: Float64Array;
  private readonly map = new Map<number, number>();
  private readonly mark: Int32Array;
  private readonly u: Float64Array;
  private stamp = 0;
  private next = 0;
  private cur = -1;
  /** how many sets were factorised */
  factorisations = 0;
  /** results of the last {@link predict} */
  mean = NaN;
  variance = NaN;
  mu = NaN;

  /**
   * @param model semivariogram model
   * @param kmax largest neighbour count
   * @param nSamples number of samples (indices are below it)
   * @param cacheSets factorisations kept (default 1024)
   */
  constructor(
    readonly model: KrigingModel,
    readonly kmax: number,
    nSamples: number,
    cacheSets = KRIGING_CACHE_SETS,
  ) {
    this.sill = model.nugget + model.psill;
    this.stride = kmax * kmax + 4 * kmax;
    this.pool = new Float64Array(cacheSets * this.stride);
    this.members = new Int32Array(cacheSets * kmax);
    this.sizes = new Int32Array(cacheSets);
    this.ok = new Uint8Array(cacheSets);
    this.keys = new Float64Array(cacheSets).fill(NaN);
    this.scal = new Float64Array(cacheSets * 2);
    this.mark = new Int32Array(nSamples);
    this.u = new Float64Array(kmax);
  }

  /**
   * Makes the m samples idx[off..off + m) the current neighbourhood (positions xy relative to (ox, oy), values z).
   * Returns false when their covariance matrix is not positive definite (coincident samples without
   * nugget, or a Gaussian model on samples much closer than its range).
   */
  load(
    xy: Float64Array,
    ox: number,
    oy: number,
    z: ArrayLike<number>,
    idx: Int32Array,
    m: number,
    off = 0,
  ): boolean {
    const { mark, members, sizes, kmax } = this;
    const stamp = ++this.stamp;
    let h1 = 0,
      h2 = 0;
    for (let t = 0; t < m; t++) {
      const j = idx[off + t];
      mark[j] = stamp;
      h1 = (h1 + Math.imul(j + 1, 0x9e3779b1)) | 0;
      h2 = (h2 + Math.imul((j + 1) ^ 0x5bd1e995, 0x85ebca6b)) | 0;
    }
    if (this.cur >= 0 && this.same(this.cur, m, stamp)) return this.ok[this.cur] === 1;
    const key = (h1 >>> 0) * 2097152 + ((h2 >>> 0) & 0x1fffff);
    const hit = this.map.get(key);
    if (hit !== undefined && this.same(hit, m, stamp)) {
      this.cur = hit;
      return this.ok[hit] === 1;
    }
    const slot = this.next;
    this.next = (slot + 1) % sizes.length;
    if (!Number.isNaN(this.keys[slot]) && this.map.get(this.keys[slot]) === slot)
      this.map.delete(this.keys[slot]);
    this.keys[slot] = key;
    this.map.set(key, slot);
    sizes[slot] = m;
    for (let t = 0; t < m; t++) members[slot * kmax + t] = idx[off + t];
    this.cur = slot;
    this.ok[slot] = this.factorise(slot, xy, ox, oy, z, idx, m, off) ? 1 : 0;
    return this.ok[slot] === 1;
  }

  /** Whether the slot holds exactly the m samples marked with `stamp`. */
  private same(slot: number, m: number, stamp: number): boolean {
    if (this.sizes[slot] !== m) return false;
    const o = slot * this.kmax;
    for (let t = 0; t < m; t++) if (this.mark[this.members[o + t]] !== stamp) return false;
    return true;
  }

  /** Builds and factorises the slot's covariance matrix; v = L^-1 1, g = L^-1 z and their products. */
  private factorise(
    slot: number,
    xy: Float64Array,
    ox: number,
    oy: number,
    z: ArrayLike<number>,
    idx: Int32Array,
    m: number,
    off: number,
  ): boolean {
    this.factorisations++;
    const { pool, model, sill, kmax } = this;
    const o = slot * this.stride,
      xo = o + kmax * kmax,
      yo = xo + kmax,
      vo = yo + kmax,
      go = vo + kmax;
    for (let t = 0; t < m; t++) {
      pool[xo + t] = xy[2 * idx[off + t]] - ox;
      pool[yo + t] = xy[2 * idx[off + t] + 1] - oy;
    }
    for (let i = 0; i < m; i++) {
      const r = o + i * m;
      for (let j = 0; j < i; j++) {
        const dx = pool[xo + i] - pool[xo + j],
          dy = pool[yo + i] - pool[yo + j];
        pool[r + j] = covariance(model, dx * dx + dy * dy);
      }
      pool[r + i] = sill;
    }
    // in-place Cholesky, lower triangle, row by row
    for (let i = 0; i < m; i++) {
      const ri = o + i * m;
      for (let j = 0; j <= i; j++) {
        const rj = o + j * m;
        let s = pool[ri + j];
        for (let t = 0; t < j; t++) s -= pool[ri + t] * pool[rj + t];
        if (i === j) {
          if (!(s > sill * 1e-12)) return false;
          pool[ri + i] = Math.sqrt(s);
        } else pool[ri + j] = s / pool[rj + j];
      }
    }
    let vv = 0,
      vg = 0;
    for (let i = 0; i < m; i++) {
      const ri = o + i * m;
      let sv = 1,
        sg = z[idx[off + i]];
      for (let t = 0; t < i; t++) {
        sv -= pool[ri + t] * pool[vo + t];
        sg -= pool[ri + t] * pool[go + t];
      }
      const d = pool[ri + i];
      pool[vo + i] = sv / d;
      pool[go + i] = sg / d;
      vv += pool[vo + i] * pool[vo + i];
      vg += pool[vo + i] * pool[go + i];
    }
    this.scal[2 * slot] = vv;
    this.scal[2 * slot + 1] = vg;
    return true;
  }

  /** Kriging mean, variance (>= 0) and Lagrange multiplier at (x, y) (relative to the origin given to load). */
  predict(x: number, y: number): void {
    const { pool, u, model, kmax } = this;
    const slot = this.cur,
      m = this.sizes[slot];
    const o = slot * this.stride,
      xo = o + kmax * kmax,
      yo = xo + kmax,
      vo = yo + kmax,
      go = vo + kmax;
    // covariances with the location first, one model branch for all of them
    const ps = model.psill,
      ia = 1 / model.range,
      ia2 = ia * ia;
    if (model.kind === 'exponential') {
      for (let i = 0; i < m; i++) {
        const dx = pool[xo + i] - x,
          dy = pool[yo + i] - y,
          d2 = dx * dx + dy * dy;
        u[i] = d2 > 0 ? ps * Math.exp(-Math.sqrt(d2) * ia) : this.sill;
      }
    } else if (model.kind === 'gaussian') {
      for (let i = 0; i < m; i++) {
        const dx = pool[xo + i] - x,
          dy = pool[yo + i] - y,
          d2 = dx * dx + dy * dy;
        u[i] = d2 > 0 ? ps * Math.exp(-d2 * ia2) : this.sill;
      }
    } else {
      for (let i = 0; i < m; i++) {
        const dx = pool[xo + i] - x,
          dy = pool[yo + i] - y,
          d2 = dx * dx + dy * dy;
        u[i] = d2 > 0 ? sph(ps, Math.sqrt(d2) * ia) : this.sill;
      }
    }
    let uu = 0,
      vu = 0,
      ug = 0;
    for (let i = 0; i < m; i++) {
      let s = u[i];
      const ri = o + i * m;
      for (let t = 0; t < i; t++) s -= pool[ri + t] * u[t];
      const ui = s / pool[ri + i];
      u[i] = ui;
      uu += ui * ui;
      vu += pool[vo + i] * ui;
      ug += ui * pool[go + i];
    }
    const vv = this.scal[2 * slot];
    const mu = (vu - 1) / vv;
    this.mu = mu;
    this.mean = ug - mu * this.scal[2 * slot + 1];
    const s2 = this.sill - uu + ((vu - 1) * (vu - 1)) / vv;
    this.variance = s2 > 0 ? s2 : 0;
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
export function krigingSurface(
  xy: Float64Array,
  z: ArrayLike<number>,
  grid: GridShape & { fraction?: ArrayLike<number> },
  model: KrigingModel,
  opts: KrigingOptions = {},
): KrigingResult {
  const n = xy.length >> 1;
  const k = Math.min(opts.neighbours ?? 16, n);
  const N = grid.cols * grid.rows;
  const only = opts.cells ?? null;
  const size = only ? only.length : N;
  const values = new Float64Array(size).fill(NaN);
  const variance = new Float64Array(size).fill(NaN);
  const lagrange = opts.lagrange ? new Float64Array(size).fill(NaN) : null;
  const res: KrigingResult = { values, variance, lagrange, singular: 0, factorisations: 0 };
  if (n === 0 || k < 1) return res;
  const solver = new OkSolver(model, k, n);
  const { xmin, ymax, cell, cols } = grid;
  const search = { where: only ? cellMask(N, only) : (opts.where ?? grid.fraction), sorted: false };
  forEachNeighbourBand(xy, grid, k, search, (b) => {
    for (let t = 0; t < b.count; t++) {
      const cellIndex = b.cells[t],
        i = only ? position(only, cellIndex) : cellIndex,
        found = b.found[t],
        o = t * b.k;
      // a cell on a sample takes its value (the lowest index when several coincide)
      let hit = -1;
      for (let j = o; j < o + found; j++)
        if (b.d2[j] < COINCIDENT_D2 && (hit < 0 || b.idx[j] < hit)) hit = b.idx[j];
      if (hit >= 0) {
        values[i] = z[hit];
        variance[i] = 0;
        if (lagrange) lagrange[i] = 0;
        continue;
      }
      if (!solver.load(xy, xmin, ymax, z, b.idx, found, o)) {
        res.singular++;
        continue;
      }
      solver.predict(((cellIndex % cols) + 0.5) * cell, -(Math.floor(cellIndex / cols) + 0.5) * cell);
      values[i] = solver.mean;
      variance[i] = solver.variance;
      if (lagrange) lagrange[i] = solver.mu;
    }
  });
  res.factorisations = solver.factorisations;
  return res;
}

/** A mask of N cells, 1 at `cells`. */
function cellMask(N: number, cells: Int32Array): Uint8Array {
  const m = new Uint8Array(N);
  for (let j = 0; j < cells.length; j++) m[cells[j]] = 1;
  return m;
}

/** Where cell `i` is in the ascending list `cells` (binary search; it is there). */
function position(cells: Int32Array, i: number): number {
  let lo = 0,
    hi = cells.length - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (cells[mid] < i) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
