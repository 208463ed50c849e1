/**
 * The k nearest samples of every grid cell centre, visited block by block: the one search shared by the
 * interpolators (IDW in idw.ts, ordinary kriging in kriging.ts). Samples are bucketed once; each block of
 * cells gathers the buckets around it, drops candidates no cell of the block can use, and answers its cells
 * in serpentine order so the previous cell's k-th distance bounds the next search (see knn.ts and
 * docs/surface.md, "Why hand-written").
 */
import type { Grid } from '../types.js';
import { buildBuckets, KnnGroup } from './knn.js';

/** The geometry of a north-up grid (see Grid in src/types.ts). */
export type GridShape = Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>;

/**
 * Called once per computed cell: `found` neighbours, their squared distances in `d2[0..found)` and sample
 * indices in `idx[0..found)` (not sorted). The arrays are reused: copy what must outlive the call.
 */
export type CellVisitor = (cell: number, found: number, d2: Float64Array, idx: Int32Array) => void;

/**
 * Visits every cell of `grid` with `where[i] > 0` (every cell when `where` is omitted) with its k nearest
 * samples within `radius`. Samples at equal distance are taken in input order (lower index first).
 * Cells are visited in blocks, serpentine within a block; the order is otherwise unspecified.
 *
 * @param xy sample positions x0 y0 x1 y1 ... (metres, the grid's frame)
 * @param grid grid geometry
 * @param k neighbours per cell (at most the sample count)
 * @param radius search radius, metres (Infinity = none)
 * @param where cells to visit: where[i] > 0 (default every cell)
 * @param visit called per cell with its neighbours
 * @example visitCellNeighbours(xy, grid, 12, Infinity, grid.fraction, (i, m, d2, idx) => { out[i] = z[idx[0]]; })
 */
export function visitCellNeighbours(
  xy: Float64Array,
  grid: GridShape,
  k: number,
  radius: number,
  where: ArrayLike<number> | undefined,
  visit: CellVisitor,
): void {
  const n = xy.length >> 1;
  if (n === 0 || k < 1) return;
  const { cols, rows, cell, xmin, ymax } = grid;
  // bucket side: about a quarter of the expected k-th neighbour distance, in whole cells (see docs/surface.md)
  let sxmin = Infinity,
    sxmax = -Infinity,
    symin = Infinity,
    symax = -Infinity;
  for (let i = 0; i < n; i++) {
    const x = xy[2 * i],
      y = xy[2 * i + 1];
    if (x < sxmin) sxmin = x;
    if (x > sxmax) sxmax = x;
    if (y < symin) symin = y;
    if (y > symax) symax = y;
  }
  const gw = cols * cell,
    gh = rows * cell;
  const ux0 = Math.min(sxmin, xmin),
    ux1 = Math.max(sxmax, xmin + gw),
    uy0 = Math.min(symin, ymax - gh),
    uy1 = Math.max(symax, ymax);
  const areaEst = Math.max((ux1 - ux0) * (uy1 - uy0), cell * cell);
  const rk = Math.sqrt((k * areaEst) / (Math.PI * n));
  const S = Math.max(1, Math.min(256, Math.round(rk / 4 / cell)));
  const B = S * cell;
  const bcols = Math.ceil(cols / S),
    brows = Math.ceil(rows / S);
  // extra buckets around the grid for samples outside it (capped; farther ones are clamped into the edge buckets,
  // which keeps the nearest-neighbour proof valid because they are still beyond every inner bucket edge)
  const cap = 64;
  const axL = Math.min(cap, Math.max(0, Math.ceil((xmin - sxmin) / B)));
  const axR = Math.min(cap, Math.max(0, Math.ceil((sxmax - (xmin + bcols * B)) / B)));
  const ayT = Math.min(cap, Math.max(0, Math.ceil((symax - ymax) / B)));
  const ayB = Math.min(cap, Math.max(0, Math.ceil((ymax - brows * B - symin) / B)));
  const nx = axL + bcols + axR,
    ny = ayT + brows + ayB;
  const x0 = xmin - axL * B,
    y0 = ymax + ayT * B - ny * B;
  const g = new KnnGroup(buildBuckets(xy, B, x0, y0, nx, ny, xmin, ymax), k, radius * radius);
  const ring = Math.max(1, Math.ceil((1.3 * Math.min(rk, radius)) / B));

  for (let br = 0; br < brows; br++) {
    const by = ny - 1 - ayT - br;
    const r0 = br * S,
      r1 = Math.min(rows, r0 + S);
    for (let bc = 0; bc < bcols; bc++) {
      const c0 = bc * S,
        c1 = Math.min(cols, c0 + S);
      if (where && !anyIn(where, cols, r0, r1, c0, c1)) continue;
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
          visit(i, g.nearest((c + 0.5) * cell, qy), g.d2, g.idx);
        }
      }
    }
  }
}

function anyIn(
  where: ArrayLike<number>,
  cols: number,
  r0: number,
  r1: number,
  c0: number,
  c1: number,
): boolean {
  for (let r = r0; r < r1; r++) for (let c = c0; c < c1; c++) if (where[r * cols + c] > 0) return true;
  return false;
}
