/**
 * Inverse-distance-weighted interpolation of sample values onto a grid's cell centres.
 * Value = sum(z_i w_i) / sum(w_i), w_i = 1 / d_i^power over the k nearest samples (optionally within a
 * search radius); a cell centre within 1e-13 m^2 squared distance of a sample takes that sample's value
 * (the rule GDAL's gdal_grid uses), so there is never a division by zero.
 */
import type { GridShape } from './neighbours.js';
import { forEachNeighbourBand, type NeighbourBand } from './neighbours.js';

export type { GridShape };

/** Options for {@link idwSurface}. */
export interface IdwOptions {
  /** distance power (default 2) */
  power?: number;
  /** how many nearest samples to use; Infinity = all (default 12) */
  neighbours?: number;
  /** only samples within this distance, metres (default Infinity) */
  radius?: number;
  /** NaN where fewer than this many samples are within the radius (default 1) */
  minNeighbours?: number;
  /** cells to compute: where[i] > 0 (default grid.fraction when present, else every cell) */
  where?: ArrayLike<number>;
}

/** Squared distance under which a cell centre counts as on a sample (GDAL's threshold). */
export const COINCIDENT_D2 = 1e-13;

/** One surface to interpolate from shared neighbour lists: its values and IDW parameters. */
export interface IdwSpec {
  /** sample values (finite) */
  z: ArrayLike<number>;
  /** distance power (default 2) */
  power?: number;
  /** nearest samples used; Infinity = all (default 12) */
  neighbours?: number;
}

/**
 * IDW values at every cell centre of `grid` (row-major, north-up; NaN where not computed or too few neighbours).
 * Uses the k nearest samples found by bucketed, provably exact candidate sets per block of cells; samples at
 * equal distance are taken in input order (lower index first), and the weighted sum runs nearest first.
 *
 * @param xy sample positions x0 y0 x1 y1 ... (metres, same frame as the grid)
 * @param z sample values (finite; filter missing ones first)
 * @param grid grid geometry; its `fraction` (if any) chooses the cells computed unless `where` is given
 * @param opts power 2, neighbours 12, radius Infinity, minNeighbours 1
 * @example const v = idwSurface(xy, z, fieldGrid(field, 5), { power: 2, neighbours: 12 })
 */
export function idwSurface(
  xy: Float64Array,
  z: ArrayLike<number>,
  grid: GridShape & { fraction?: ArrayLike<number> },
  opts: IdwOptions = {},
): Float64Array {
  return idwSurfaces(xy, [{ z, power: opts.power, neighbours: opts.neighbours }], grid, opts)[0];
}

/**
 * Several IDW surfaces over the same sample sites (e.g. every analyte of one sample set) from ONE
 * k-nearest search per cell, with k the largest any surface needs: each surface weights the first k of its
 * own of the shared, nearest-first neighbour list, so every surface is identical to its own
 * {@link idwSurface}. A surface with all samples and no radius sums over every sample instead.
 *
 * @param specs one entry per surface: values, power (2), neighbours (12)
 * @param opts radius Infinity, minNeighbours 1, where: grid.fraction when present
 * @example const [p, k] = idwSurfaces(xy, [{ z: pVals, power: 1, neighbours: 16 }, { z: kVals, power: 2, neighbours: 8 }], grid)
 */
export function idwSurfaces(
  xy: Float64Array,
  specs: IdwSpec[],
  grid: GridShape & { fraction?: ArrayLike<number> },
  opts: Omit<IdwOptions, 'power' | 'neighbours'> = {},
): Float64Array[] {
  const n = xy.length >> 1;
  const radius = opts.radius ?? Infinity;
  const minN = Math.max(1, opts.minNeighbours ?? 1);
  const where = opts.where ?? grid.fraction;
  const outs = specs.map(() => new Float64Array(grid.cols * grid.rows).fill(NaN));
  if (n === 0) return outs;
  // surfaces that share a power share each neighbour's weight (computed once per cell and power)
  const byPower = new Map<number, { s: number; k: number; zlo: number; zhi: number }[]>();
  let kmax = 0;
  specs.forEach((sp, s) => {
    const k = Math.min(sp.neighbours ?? 12, n);
    if (!(k >= 1)) return;
    const power = sp.power ?? 2;
    if (k >= n && radius === Infinity) {
      if (n >= minN) allSamples(xy, sp.z, power, grid, where, outs[s]);
      return;
    }
    const [zlo, zhi] = range(sp.z, n);
    const list = byPower.get(power) ?? [];
    list.push({ s, k, zlo, zhi });
    byPower.set(power, list);
    kmax = Math.max(kmax, k);
  });
  if (!byPower.size) return outs;
  let w = new Float64Array(0);
  forEachNeighbourBand(xy, grid, kmax, { radius, where }, (b) => {
    if (w.length < b.d2.length) w = new Float64Array(b.d2.length);
    for (const [power, list] of byPower) {
      weights(b, Math.max(...list.map((q) => q.k)), power, w);
      for (const q of list) weighBand(b, w, specs[q.s].z, q.k, minN, q.zlo, q.zhi, outs[q.s]);
    }
  });
  return outs;
}

function range(z: ArrayLike<number>, n: number): [number, number] {
  let zlo = Infinity,
    zhi = -Infinity;
  for (let i = 0; i < n; i++) {
    if (z[i] < zlo) zlo = z[i];
    if (z[i] > zhi) zhi = z[i];
  }
  return [zlo, zhi];
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
function weighBand(
  b: NeighbourBand,
  w: Float64Array,
  z: ArrayLike<number>,
  k: number,
  minN: number,
  zlo: number,
  zhi: number,
  out: Float64Array,
): void {
  const { cells, found, idx, d2 } = b,
    K = b.k;
  for (let t = 0; t < b.count; t++) {
    const f = found[t] < k ? found[t] : k;
    if (f < minN) continue;
    const o = t * K;
    let num = 0,
      den = 0,
      hit = -1;
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

/** Every sample for every cell (no search), summed in sample order. */
function allSamples(
  xy: Float64Array,
  z: ArrayLike<number>,
  power: number,
  grid: GridShape,
  where: ArrayLike<number> | undefined,
  out: Float64Array,
): void {
  const n = xy.length >> 1,
    { cols, rows, cell, xmin, ymax } = grid;
  const [zlo, zhi] = range(z, n);
  const sx = new Float64Array(n),
    sy = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    sx[i] = xy[2 * i] - xmin;
    sy[i] = xy[2 * i + 1] - ymax;
  }
  for (let r = 0; r < rows; r++) {
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
        const w = idwWeight(d2, power);
        num += w * z[j];
        den += w;
      }
      const v = hit >= 0 ? z[hit] : num / den;
      out[i] = v < zlo ? zlo : v > zhi ? zhi : v;
    }
  }
}
