/**
 * Inverse-distance-weighted interpolation of sample values onto a grid's cell centres.
 * Value = sum(z_i w_i) / sum(w_i), w_i = 1 / d_i^power over the k nearest samples (optionally within a
 * search radius); a cell centre within 1e-13 m^2 squared distance of a sample takes that sample's value
 * (the rule GDAL's gdal_grid uses), so there is never a division by zero.
 */
import type { GridShape } from './neighbours.js';
import { IdwBands, type IdwJob } from './idwBands.js';
import type { SurfacePool } from './parallel.js';

export type { GridShape };
export { COINCIDENT_D2, idwWeight } from './idwBands.js';

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
 * With a `pool` (parallel.ts) the bands of rows are shared with its worker threads; the result is the
 * same bit for bit, in grids backed by a SharedArrayBuffer.
 *
 * @param specs one entry per surface: values, power (2), neighbours (12)
 * @param opts radius Infinity, minNeighbours 1, where: grid.fraction when present, pool: none (this thread)
 * @example const [p, k] = idwSurfaces(xy, [{ z: pVals, power: 1, neighbours: 16 }, { z: kVals, power: 2, neighbours: 8 }], grid)
 */
export function idwSurfaces(
  xy: Float64Array,
  specs: IdwSpec[],
  grid: GridShape & { fraction?: ArrayLike<number> },
  opts: Omit<IdwOptions, 'power' | 'neighbours'> & { pool?: SurfacePool | null } = {},
): Float64Array[] {
  const n = xy.length >> 1;
  const pool = n > 0 ? (opts.pool ?? null) : null;
  const cells = grid.cols * grid.rows;
  const outs = specs.map(() => (pool ? pool.grid(cells) : new Float64Array(cells).fill(NaN)));
  if (n === 0) return outs;
  const radius = opts.radius ?? Infinity;
  const job: IdwJob = {
    xy,
    grid: { cols: grid.cols, rows: grid.rows, cell: grid.cell, xmin: grid.xmin, ymax: grid.ymax },
    radius,
    minN: Math.max(1, opts.minNeighbours ?? 1),
    where: opts.where ?? grid.fraction,
    kmax: 0,
    byPower: [],
    all: [],
  };
  // surfaces that share a power share each neighbour's weight (computed once per cell and power)
  specs.forEach((sp, s) => {
    const k = Math.min(sp.neighbours ?? 12, n);
    if (!(k >= 1)) return;
    const power = sp.power ?? 2;
    const [zlo, zhi] = range(sp.z, n);
    const surface = { z: sp.z, k, zlo, zhi, out: outs[s] };
    if (k >= n && radius === Infinity) {
      job.all.push({ power, surface });
      return;
    }
    let group = job.byPower.find((g) => g.power === power);
    if (!group) job.byPower.push((group = { power, surfaces: [] }));
    group.surfaces.push(surface);
    job.kmax = Math.max(job.kmax, k);
  });
  if (!job.byPower.length && !job.all.length) return outs;
  if (pool) pool.run(job);
  else {
    const bands = new IdwBands(job);
    for (let i = 0; i < bands.bands; i++) bands.run(i);
  }
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
