/**
 * Inverse-distance-weighted interpolation of sample values onto a grid's cell centres.
 * Value = sum(z_i w_i) / sum(w_i), w_i = 1 / d_i^power over the k nearest samples (optionally within a
 * search radius); a cell centre within 1e-13 m^2 squared distance of a sample takes that sample's value
 * (the rule GDAL's gdal_grid uses), so there is never a division by zero.
 */
import { visitCellNeighbours, type GridShape } from './cellNeighbours.js';

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

/**
 * IDW values at every cell centre of `grid` (row-major, north-up; NaN where not computed or too few neighbours).
 * Uses the k nearest samples found by bucketed, provably exact candidate sets per block of cells; samples at
 * equal distance are taken in input order (lower index first).
 *
 * @param xy sample positions x0 y0 x1 y1 ... (metres, same frame as the grid)
 * @param z sample values (finite; filter missing ones first)
 * @param grid grid geometry; its `fraction` (if any) chooses the cells computed unless `where` is given
 * @param opts power 2, neighbours 12, radius Infinity, minNeighbours 1
 * @example const v = idwSurface(xy, z, fieldGrid(field, 5), { power: 2, neighbours: 12 })
 */
export function idwSurface(xy: Float64Array, z: ArrayLike<number>, grid: GridShape & { fraction?: ArrayLike<number> }, opts: IdwOptions = {}): Float64Array {
  const power = opts.power ?? 2;
  const n = xy.length >> 1;
  const k = Math.min(opts.neighbours ?? 12, n);
  const radius = opts.radius ?? Infinity;
  const minN = Math.max(1, opts.minNeighbours ?? 1);
  const where = opts.where ?? grid.fraction;
  const { cols, rows, cell, xmin, ymax } = grid;
  const out = new Float64Array(cols * rows).fill(NaN);
  if (n === 0 || k < 1) return out;
  let zlo = Infinity, zhi = -Infinity;
  for (let i = 0; i < n; i++) { if (z[i] < zlo) zlo = z[i]; if (z[i] > zhi) zhi = z[i]; }
  const half = power / 2;
  const p2 = power === 2;

  if (k >= n && radius === Infinity) {
    // all samples for every cell: no search needed
    const sx = new Float64Array(n), sy = new Float64Array(n);
    for (let i = 0; i < n; i++) { sx[i] = xy[2 * i] - xmin; sy[i] = xy[2 * i + 1] - ymax; }
    if (n < minN) return out;
    for (let r = 0; r < rows; r++) {
      const qy = -(r + 0.5) * cell;
      for (let c = 0; c < cols; c++) {
        const i = r * cols + c;
        if (where && !(where[i] > 0)) continue;
        const qx = (c + 0.5) * cell;
        let num = 0, den = 0, hit = -1;
        for (let j = 0; j < n; j++) {
          const dx = sx[j] - qx, dy = sy[j] - qy;
          const d2 = dx * dx + dy * dy;
          if (d2 < COINCIDENT_D2) { hit = j; break; }
          const w = p2 ? 1 / d2 : 1 / Math.pow(d2, half);
          num += w * z[j];
          den += w;
        }
        const v = hit >= 0 ? z[hit] : num / den;
        out[i] = v < zlo ? zlo : v > zhi ? zhi : v;
      }
    }
    return out;
  }

  visitCellNeighbours(xy, grid, k, radius, where, (i, found, d2s, idx) => {
    if (found < minN) return;
    let num = 0, den = 0, hit = -1;
    for (let j = 0; j < found; j++) {
      const dd = d2s[j];
      if (dd < COINCIDENT_D2) { if (hit < 0 || idx[j] < idx[hit]) hit = j; continue; }
      const w = p2 ? 1 / dd : 1 / Math.pow(dd, half);
      num += w * z[idx[j]];
      den += w;
    }
    const v = hit >= 0 ? z[idx[hit]] : num / den;
    // a weighted mean can land one rounding step outside the samples' range: keep it inside
    out[i] = v < zlo ? zlo : v > zhi ? zhi : v;
  });
  return out;
}
