/**
 * Inverse-distance-weighted interpolation of sample values onto a grid's cell centres.
 * Value = sum(z_i w_i) / sum(w_i), w_i = 1 / d_i^power over the k nearest samples (optionally within a
 * search radius); a cell centre within 1e-13 m^2 squared distance of a sample takes that sample's value
 * (the rule GDAL's gdal_grid uses), so there is never a division by zero.
 */
import type { Grid } from '../types.js';
import { buildBuckets, KnnGroup } from './knn.js';

/** The geometry of a north-up grid (see Grid in src/types.ts). */
export type GridShape = Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>;

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
  const maxD2 = radius * radius;
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

  // bucket side: about a quarter of the expected k-th neighbour distance, in whole cells (see docs/surface.md)
  let sxmin = Infinity, sxmax = -Infinity, symin = Infinity, symax = -Infinity;
  for (let i = 0; i < n; i++) {
    const x = xy[2 * i], y = xy[2 * i + 1];
    if (x < sxmin) sxmin = x; if (x > sxmax) sxmax = x;
    if (y < symin) symin = y; if (y > symax) symax = y;
  }
  const gw = cols * cell, gh = rows * cell;
  const ux0 = Math.min(sxmin, xmin), ux1 = Math.max(sxmax, xmin + gw), uy0 = Math.min(symin, ymax - gh), uy1 = Math.max(symax, ymax);
  const areaEst = Math.max((ux1 - ux0) * (uy1 - uy0), cell * cell);
  const rk = Math.sqrt((k * areaEst) / (Math.PI * n));
  const S = Math.max(1, Math.min(256, Math.round(rk / 4 / cell)));
  const B = S * cell;
  const bcols = Math.ceil(cols / S), brows = Math.ceil(rows / S);
  // extra buckets around the grid for samples outside it (capped; farther ones are clamped into the edge buckets,
  // which keeps the nearest-neighbour proof valid because they are still beyond every inner bucket edge)
  const cap = 64;
  const axL = Math.min(cap, Math.max(0, Math.ceil((xmin - sxmin) / B)));
  const axR = Math.min(cap, Math.max(0, Math.ceil((sxmax - (xmin + bcols * B)) / B)));
  const ayT = Math.min(cap, Math.max(0, Math.ceil((symax - ymax) / B)));
  const ayB = Math.min(cap, Math.max(0, Math.ceil((ymax - brows * B - symin) / B)));
  const nx = axL + bcols + axR, ny = ayT + brows + ayB;
  const x0 = xmin - axL * B, y0 = ymax + ayT * B - ny * B;
  const buckets = buildBuckets(xy, B, x0, y0, nx, ny, xmin, ymax);
  const g = new KnnGroup(buckets, k, maxD2);
  const ring = Math.max(1, Math.ceil((1.3 * Math.min(rk, radius)) / B));
  const d2s = g.d2, idx = g.idx;

  for (let br = 0; br < brows; br++) {
    const by = ny - 1 - ayT - br;
    const r0 = br * S, r1 = Math.min(rows, r0 + S);
    for (let bc = 0; bc < bcols; bc++) {
      const c0 = bc * S, c1 = Math.min(cols, c0 + S);
      let any = false;
      if (where) {
        for (let r = r0; r < r1 && !any; r++) for (let c = c0; c < c1; c++) if (where[r * cols + c] > 0) { any = true; break; }
        if (!any) continue;
      }
      const bx = axL + bc;
      g.begin(bx, bx, by, by, ring);
      g.prune((c0 + 0.5) * cell, -(r1 - 0.5) * cell, (c1 - 0.5) * cell, -(r0 + 0.5) * cell);
      for (let r = r0; r < r1; r++) {
        const qy = -(r + 0.5) * cell;
        // serpentine order: each cell is next to the previous one, which keeps the search bound tight
        const fwd = ((r - r0) & 1) === 0;
        for (let t = c0; t < c1; t++) {
          const c = fwd ? t : c1 - 1 - (t - c0);
          const i = r * cols + c;
          if (where && !(where[i] > 0)) continue;
          const found = g.nearest((c + 0.5) * cell, qy);
          if (found < minN) continue;
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
        }
      }
    }
  }
  return out;
}
