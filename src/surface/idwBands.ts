/**
 * The per-cell work of {@link idwSurfaces}: the shared k-nearest search and the weighted sums, cut into
 * bands of grid rows that any thread can run in any order. Every band writes only its own cells, and a
 * cell's value depends only on its neighbour list (exact, see knn.ts) and the surface's values, so the
 * result is the same bit for bit however the bands are shared out (parallel.ts).
 */
import type { GridShape } from './neighbours.js';
import { neighbourSearch, type NeighbourBand, type NeighbourSearch } from './neighbours.js';

/** Squared distance under which a cell centre counts as on a sample (GDAL's threshold). */
export const COINCIDENT_D2 = 1e-13;

/** Rows per band when no surface needs a search (every sample for every cell). */
const ALL_ROWS = 8;

/** One surface of a job: its sample values, value range and output grid (row-major, NaN-filled). */
export interface IdwJobSurface {
  z: ArrayLike<number>;
  /** nearest samples used (searched surfaces only) */
  k: number;
  zlo: number;
  zhi: number;
  out: Float64Array;
}

/** The whole per-cell IDW work over one grid: plain data, so it can be posted to a worker thread. */
export interface IdwJob {
  xy: Float64Array;
  grid: GridShape;
  radius: number;
  minN: number;
  /** cells to compute: where[i] > 0 (undefined: every cell) */
  where: ArrayLike<number> | undefined;
  /** neighbours searched per cell: the largest k of `byPower` (0 when none is searched) */
  kmax: number;
  /** searched surfaces grouped by power (one weight per neighbour and power) */
  byPower: { power: number; surfaces: IdwJobSurface[] }[];
  /** surfaces over every sample, no search */
  all: { power: number; surface: IdwJobSurface }[];
}

/**
 * Runs the bands of one {@link IdwJob} (one instance per thread: it holds that thread's search state and
 * scratch arrays).
 * @example const r = new IdwBands(job); for (let i = 0; i < r.bands; i++) r.run(i);
 */
export class IdwBands {
  /** number of bands */
  readonly bands: number;
  private readonly rowsPerBand: number;
  private readonly search: NeighbourSearch | null;
  private readonly band: NeighbourBand | null;
  private w = new Float64Array(0);
  private sx = new Float64Array(0);
  private sy = new Float64Array(0);

  constructor(private readonly job: IdwJob) {
    const { xy, grid, kmax, radius, where } = job;
    this.search = kmax >= 1 ? neighbourSearch(xy, grid, kmax, { radius, where }) : null;
    this.band = this.search ? this.search.newBand() : null;
    this.rowsPerBand = this.search ? this.search.rowsPerBand : ALL_ROWS;
    this.bands = Math.ceil(grid.rows / this.rowsPerBand);
    if (this.band) this.w = new Float64Array(this.band.d2.length);
    if (job.all.length) {
      const n = xy.length >> 1;
      this.sx = new Float64Array(n);
      this.sy = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        this.sx[i] = xy[2 * i] - grid.xmin;
        this.sy[i] = xy[2 * i + 1] - grid.ymax;
      }
    }
  }

  /** Computes band `i` (grid rows i * rowsPerBand ..) of every surface of the job. */
  run(i: number): void {
    const { job, band, w } = this;
    if (this.search && band && this.search.search(i, band) > 0) {
      for (const { power, surfaces } of job.byPower) {
        let kw = 0;
        for (const s of surfaces) if (s.k > kw) kw = s.k;
        weights(band, kw, power, w);
        for (const s of surfaces) weighBand(band, w, s, job.minN);
      }
    }
    const r0 = i * this.rowsPerBand,
      r1 = Math.min(job.grid.rows, r0 + this.rowsPerBand);
    for (const { power, surface } of job.all) this.allSamples(power, surface, r0, r1);
  }

  /** Every sample for every cell of rows [r0, r1) (no search), summed in sample order. */
  private allSamples(power: number, s: IdwJobSurface, r0: number, r1: number): void {
    const { grid, where, minN } = this.job;
    const { sx, sy } = this;
    const n = sx.length,
      { cols, cell } = grid,
      { z, zlo, zhi, out } = s;
    if (n < minN) return;
    for (let r = r0; r < r1; r++) {
      const qy = -(r + 0.5) * cell;
      for (let c = 0; c < cols; c++) {
        const i = r * cols + c;
        if (where && !(where[i] > 0)) continue;
        const qx = (c + 0.5) * cell;
        let num = 0,
          den = 0,
          hit = -1;
        for (let j = 0; j < n; j++) {
          const dx = sx[j] - qx,
            dy = sy[j] - qy;
          const d2 = dx * dx + dy * dy;
          if (d2 < COINCIDENT_D2) {
            hit = j;
            break;
          }
          const wj = idwWeight(d2, power);
          num += wj * z[j];
          den += wj;
        }
        const v = hit >= 0 ? z[hit] : num / den;
        out[i] = v < zlo ? zlo : v > zhi ? zhi : v;
      }
    }
  }
}

/**
 * The IDW weight 1 / d^power from the squared distance, with square-root forms for the usual powers
 * (1, 1.5, 2, 3: several times faster than Math.pow, within an ulp or two of it); cross-validation uses
 * the same forms, so a map and its cross-validation weigh alike.
 * @example idwWeight(4, 1) // 0.5
 */
export function idwWeight(d2: number, power: number): number {
  if (power === 2) return 1 / d2;
  if (power === 1) return 1 / Math.sqrt(d2);
  if (power === 3) return 1 / (d2 * Math.sqrt(d2));
  if (power === 1.5) return 1 / Math.sqrt(d2 * Math.sqrt(d2));
  return 1 / Math.pow(d2, power / 2);
}

/** w = idwWeight(d2, power) for the first k neighbours of each cell of the band (one loop per usual power). */
function weights(b: NeighbourBand, k: number, power: number, w: Float64Array): void {
  const { found, d2 } = b,
    K = b.k;
  for (let t = 0; t < b.count; t++) {
    const o = t * K,
      e = o + (found[t] < k ? found[t] : k);
    if (power === 2) for (let j = o; j < e; j++) w[j] = 1 / d2[j];
    else if (power === 1) for (let j = o; j < e; j++) w[j] = 1 / Math.sqrt(d2[j]);
    else if (power === 1.5)
      for (let j = o; j < e; j++) {
        const x = d2[j];
        w[j] = 1 / Math.sqrt(x * Math.sqrt(x));
      }
    else if (power === 3)
      for (let j = o; j < e; j++) {
        const x = d2[j];
        w[j] = 1 / (x * Math.sqrt(x));
      }
    else for (let j = o; j < e; j++) w[j] = 1 / Math.pow(d2[j], power / 2);
  }
}

/**
 * IDW from one band of shared neighbour lists: the first k (nearest first) of each cell with their weights
 * `w`; a neighbour within COINCIDENT_D2 gives its value (the lowest index of several).
 */
function weighBand(b: NeighbourBand, w: Float64Array, s: IdwJobSurface, minN: number): void {
  const { cells, found, idx, d2 } = b,
    K = b.k;
  const { z, k, zlo, zhi, out } = s;
  // sorted lists (nearest first): when the nearest is not on the cell, none is, and the sum needs no test
  const sorted = b.sorted;
  for (let t = 0; t < b.count; t++) {
    const f = found[t] < k ? found[t] : k;
    if (f < minN) continue;
    const o = t * K;
    let num = 0,
      den = 0,
      hit = -1;
    if (sorted && f > 0 && !(d2[o] < COINCIDENT_D2)) {
      for (let j = o; j < o + f; j++) {
        const wj = w[j];
        num += wj * z[idx[j]];
        den += wj;
      }
      const v = num / den;
      out[cells[t]] = v < zlo ? zlo : v > zhi ? zhi : v;
      continue;
    }
    for (let j = o; j < o + f; j++) {
      if (d2[j] < COINCIDENT_D2) {
        if (hit < 0 || idx[j] < idx[hit]) hit = j;
        continue;
      }
      const wj = w[j];
      num += wj * z[idx[j]];
      den += wj;
    }
    const v = hit >= 0 ? z[idx[hit]] : num / den;
    // a weighted mean can land one rounding step outside the samples' range: keep it inside
    out[cells[t]] = v < zlo ? zlo : v > zhi ? zhi : v;
  }
}
