/**
 * One k-nearest search shared by every surface (IDW and ordinary kriging, and every cross-validation) built
 * from the same sample
 * sites. A cell's neighbours are kept as sample indices and squared distances in ascending (distance,
 * index) order, so the first k' of a k-list are exactly the k'-nearest: one search with the largest k any
 * surface needs serves them all, with the same answer as separate searches.
 *
 * Grid cells are streamed by bands of rows ({@link forEachNeighbourBand}) so that a 2.6 million cell grid
 * never holds 2.6 million x k neighbour slots; {@link cellNeighbours} collects the whole grid when that is
 * small enough to keep. {@link sampleNeighbours} answers the leave-one-out question for the samples.
 * See docs/surface.md ("One neighbour search") for the method.
 */
import type { Grid } from '../types.js';
import { buildBuckets, fourPerBucket, KnnGroup, type Buckets } from './knn.js';
import { ringsBbox } from '../geo/area.js';

/** The geometry of a north-up grid (see Grid in src/types.ts). */
export type GridShape = Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>;

/**
 * Neighbours of the searched cells of one band of grid rows. Reused between bands: copy what you keep.
 * Cell t (0 <= t < count) is grid cell `cells[t]`; its neighbours are slots t*k .. t*k + found[t] - 1.
 */
export interface NeighbourBand {
  /** grid rows [r0, r1) */
  r0: number;
  r1: number;
  /** neighbour slots per cell */
  k: number;
  /** cells searched in this band */
  count: number;
  /** row-major grid index of each searched cell */
  cells: Int32Array;
  /** neighbours found per cell (k, or fewer within the radius) */
  found: Int32Array;
  /** sample indices, k slots per cell, ascending by (squared distance, index) unless `sorted: false` */
  idx: Int32Array;
  /** squared distances (m^2) matching idx */
  d2: Float64Array;
  /** whether each cell's list is in ascending (squared distance, index) order (the search's `sorted` option) */
  sorted: boolean;
}

/** Options for the cell searches. */
export interface NeighbourOptions {
  /** only samples within this distance, metres (default Infinity) */
  radius?: number;
  /** cells to search: where[i] > 0 (default: every cell) */
  where?: ArrayLike<number>;
  /**
   * neighbours in ascending (squared distance, index) order (default true); false leaves each cell's k nearest
   * in the order the selection leaves them (kriging: its system needs no order, and sorting every cell's list
   * costs about a third of its time on a large grid)
   */
  sorted?: boolean;
}

/** How the grid is cut into blocks of S x S cells with matching sample buckets. */
interface Layout {
  buckets: Buckets;
  S: number;
  axL: number;
  ayT: number;
  ny: number;
  bcols: number;
  brows: number;
  ring: number;
}

/**
 * Bucket side about a quarter of the expected k-th neighbour distance, in whole cells; extra buckets around
 * the grid for samples outside it (capped: farther ones are clamped into the edge buckets, which keeps the
 * nearest-neighbour proof valid because they are still beyond every inner bucket edge).
 */
function layout(xy: Float64Array, grid: GridShape, k: number, radius: number): Layout {
  const n = xy.length >> 1;
  const { cols, rows, cell, xmin, ymax } = grid;
  const [sxmin, symin, sxmax, symax] = ringsBbox([xy]);
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
  const cap = 64;
  const axL = Math.min(cap, Math.max(0, Math.ceil((xmin - sxmin) / B)));
  const axR = Math.min(cap, Math.max(0, Math.ceil((sxmax - (xmin + bcols * B)) / B)));
  const ayT = Math.min(cap, Math.max(0, Math.ceil((symax - ymax) / B)));
  const ayB = Math.min(cap, Math.max(0, Math.ceil((ymax - brows * B - symin) / B)));
  const nx = axL + bcols + axR,
    ny = ayT + brows + ayB;
  const buckets = buildBuckets(xy, B, xmin - axL * B, ymax + ayT * B - ny * B, nx, ny, xmin, ymax);
  const ring = Math.max(1, Math.ceil((1.3 * Math.min(rk, radius)) / B));
  return { buckets, S, axL, ayT, ny, bcols, brows, ring };
}

/** True when some cell of rows [r0, r1) x cols [c0, c1) is to be searched. */
function anyWhere(
  where: ArrayLike<number> | undefined,
  cols: number,
  r0: number,
  r1: number,
  c0: number,
  c1: number,
): boolean {
  if (!where) return true;
  for (let r = r0; r < r1; r++) for (let c = c0; c < c1; c++) if (where[r * cols + c] > 0) return true;
  return false;
}

/**
 * A k-nearest search over the cells of a grid, one band of rows at a time, in any order (see
 * {@link neighbourSearch}). One instance per thread: it holds the search state.
 */
export interface NeighbourSearch {
  /** bands of `rowsPerBand` grid rows (the last one may be shorter) */
  readonly bands: number;
  readonly rowsPerBand: number;
  /** neighbour slots per cell */
  readonly k: number;
  /** a band object with room for any band of this search (reuse it) */
  newBand(): NeighbourBand;
  /** fills `band` with band `i`'s searched cells and returns how many there are (0: none searched) */
  search(i: number, band: NeighbourBand): number;
}

/**
 * The k nearest samples of the searched cell centres of `grid`, band by band (the bands of
 * {@link forEachNeighbourBand}). With `sorted` (the default) each band's answer is exact and does not depend
 * on which bands were searched before it, so threads can share the bands out; unsorted lists hold the same
 * neighbours in an order that can depend on the bands searched before. Null when there are no samples or k < 1.
 *
 * @param opts radius Infinity, where: every cell, sorted true
 * @example const s = neighbourSearch(xy, grid, 12)!; const b = s.newBand(); for (let i = 0; i < s.bands; i++) s.search(i, b)
 */
export function neighbourSearch(
  xy: Float64Array,
  grid: GridShape,
  k: number,
  opts: NeighbourOptions = {},
): NeighbourSearch | null {
  const n = xy.length >> 1;
  k = Math.min(Math.floor(k), n);
  if (n === 0 || !(k >= 1)) return null;
  return new BandSearch(xy, grid, k, opts);
}

class BandSearch implements NeighbourSearch {
  readonly bands: number;
  readonly rowsPerBand: number;
  private readonly L: Layout;
  private readonly g: KnnGroup;
  private readonly where: ArrayLike<number> | undefined;
  private readonly sorted: boolean;

  constructor(
    xy: Float64Array,
    private readonly grid: GridShape,
    readonly k: number,
    opts: NeighbourOptions,
  ) {
    const radius = opts.radius ?? Infinity;
    this.where = opts.where;
    this.sorted = opts.sorted ?? true;
    this.L = layout(xy, grid, k, radius);
    this.g = new KnnGroup(this.L.buckets, k, radius * radius);
    this.bands = this.L.brows;
    this.rowsPerBand = this.L.S;
  }

  newBand(): NeighbourBand {
    const per = this.L.S * this.grid.cols,
      k = this.k;
    const cells = new Int32Array(per),
      found = new Int32Array(per);
    return {
      r0: 0,
      r1: 0,
      k,
      count: 0,
      cells,
      found,
      idx: new Int32Array(per * k),
      d2: new Float64Array(per * k),
      sorted: this.sorted,
    };
  }

  search(br: number, band: NeighbourBand): number {
    const { L, g, where, k, sorted } = this,
      { cols, rows, cell } = this.grid;
    const { cells, found, idx, d2 } = band,
      gd = g.d2,
      gi = g.idx;
    const by = L.ny - 1 - L.ayT - br;
    const r0 = br * L.S,
      r1 = Math.min(rows, r0 + L.S);
    let m = 0;
    for (let bc = 0; bc < L.bcols; bc++) {
      const c0 = bc * L.S,
        c1 = Math.min(cols, c0 + L.S);
      if (!anyWhere(where, cols, r0, r1, c0, c1)) continue;
      g.begin(L.axL + bc, L.axL + bc, by, by, L.ring);
      g.prune((c0 + 0.5) * cell, -(r1 - 0.5) * cell, (c1 - 0.5) * cell, -(r0 + 0.5) * cell, sorted);
      for (let r = r0; r < r1; r++) {
        const qy = -(r + 0.5) * cell;
        // serpentine order: each cell is next to the previous one, which keeps the search bound tight
        const fwd = ((r - r0) & 1) === 0;
        for (let t = c0; t < c1; t++) {
          const c = fwd ? t : c1 - 1 - (t - c0);
          const i = r * cols + c;
          if (where && !(where[i] > 0)) continue;
          const o = m * k;
          // sorted answers go straight into the band; unsorted ones are copied from the group's arrays
          const f = g.nearest((c + 0.5) * cell, qy, -1, sorted, d2, idx, o);
          cells[m] = i;
          found[m] = f;
          if (!sorted)
            for (let j = 0; j < f; j++) {
              idx[o + j] = gi[j];
              d2[o + j] = gd[j];
            }
          m++;
        }
      }
    }
    band.r0 = r0;
    band.r1 = r1;
    band.k = k;
    band.count = m;
    return m;
  }
}

/**
 * Streams the k nearest samples of every searched cell centre of `grid`, one band of rows at a time
 * (bands are a few tens of rows; the band object and its arrays are reused, so copy what you keep).
 * Exact: bucketed candidate sets per block of cells with a proof per query (see knn.ts); equal distances
 * go to the lower sample index. k is clamped to the number of samples; nothing is called when there are none.
 *
 * @param xy sample positions x0 y0 x1 y1 ... (metres, the grid's frame)
 * @param grid grid geometry (north-up, row-major)
 * @param k neighbours per cell (the largest any consumer needs)
 * @param opts radius Infinity, where: every cell, sorted true
 * @param onBand called once per band that has searched cells, top band first
 * @example forEachNeighbourBand(xy, grid, 16, { where: grid.fraction }, (b) => { for (let t = 0; t < b.count; t++) use(b.cells[t], b.idx[t * b.k]) })
 */
export function forEachNeighbourBand(
  xy: Float64Array,
  grid: GridShape,
  k: number,
  opts: NeighbourOptions,
  onBand: (band: NeighbourBand) => void,
): void {
  const s = neighbourSearch(xy, grid, k, opts);
  if (!s) return;
  const band = s.newBand();
  for (let i = 0; i < s.bands; i++) if (s.search(i, band) > 0) onBand(band);
}

/** Every searched cell's neighbours at once (see {@link cellNeighbours}). */
export interface CellNeighbours {
  k: number;
  /** neighbours found per grid cell (0 for cells not searched) */
  found: Int32Array;
  /** k slots per grid cell (row-major), ascending by (squared distance, index); -1 in unused slots */
  idx: Int32Array;
  d2: Float64Array;
}

/**
 * The k nearest samples of every searched cell centre, for the whole grid at once: cols x rows x k slots
 * (12 bytes each), so prefer {@link forEachNeighbourBand} for large grids.
 * @param opts radius Infinity, where: every cell
 * @example const nb = cellNeighbours(xy, grid, 12); nb.idx[cell * nb.k] // nearest sample of `cell`
 */
export function cellNeighbours(
  xy: Float64Array,
  grid: GridShape,
  k: number,
  opts: NeighbourOptions = {},
): CellNeighbours {
  const kk = Math.max(0, Math.min(Math.floor(k), xy.length >> 1));
  const cellsN = grid.cols * grid.rows;
  const out: CellNeighbours = {
    k: kk,
    found: new Int32Array(cellsN),
    idx: new Int32Array(cellsN * kk).fill(-1),
    d2: new Float64Array(cellsN * kk).fill(NaN),
  };
  forEachNeighbourBand(xy, grid, kk, opts, (b) => {
    for (let t = 0; t < b.count; t++) {
      const c = b.cells[t],
        f = b.found[t];
      out.found[c] = f;
      for (let j = 0; j < f; j++) {
        out.idx[c * kk + j] = b.idx[t * kk + j];
        out.d2[c * kk + j] = b.d2[t * kk + j];
      }
    }
  });
  return out;
}

/** Leave-one-out neighbours of every sample (see {@link sampleNeighbours}). */
export interface SampleNeighbours {
  k: number;
  /** neighbours found per sample (k, or fewer within the radius) */
  found: Int32Array;
  /** k slots per sample, the sample itself left out, ascending by (squared distance, index) */
  idx: Int32Array;
  d2: Float64Array;
  /** the samples in the order they were searched (bucket by bucket); sums over samples follow it */
  order: Int32Array;
}

/**
 * The k nearest other samples of every sample (leave-one-out), exact, equal distances to the lower index.
 * Buckets hold about 4 samples; the search order is bucket by bucket (returned as `order`).
 * @param radius only samples within this distance, metres (default Infinity)
 * @example const nb = sampleNeighbours(xy, 16); nb.idx[i * nb.k] // the sample nearest sample i
 */
export function sampleNeighbours(xy: Float64Array, k: number, radius = Infinity): SampleNeighbours {
  const n = xy.length >> 1;
  k = Math.max(1, Math.min(Math.floor(k), Math.max(1, n - 1)));
  const out: SampleNeighbours = {
    k,
    found: new Int32Array(n),
    idx: new Int32Array(n * k),
    d2: new Float64Array(n * k),
    order: new Int32Array(n),
  };
  if (n < 2) {
    if (n === 1) out.order[0] = 0;
    return out;
  }
  const b = fourPerBucket(xy, ringsBbox([xy]));
  const { nx, ny } = b;
  const g = new KnnGroup(b, k, radius * radius);
  const ring = Math.max(1, Math.ceil(Math.sqrt(k / 4) / 2 + 0.5));
  let m = 0;
  for (let by = 0; by < ny; by++) {
    for (let bx = 0; bx < nx; bx++) {
      const bi = by * nx + bx,
        s = b.start[bi],
        e = b.start[bi + 1];
      if (s === e) continue;
      g.begin(bx, bx, by, by, ring);
      for (let j = s; j < e; j++) {
        const self = b.si[j];
        const f = g.nearest(b.sx[j], b.sy[j], self, true);
        out.order[m++] = self;
        out.found[self] = f;
        for (let t = 0; t < f; t++) {
          out.idx[self * k + t] = g.idx[t];
          out.d2[self * k + t] = g.d2[t];
        }
      }
    }
  }
  return out;
}
