/**
 * The field grid: a north-up raster over a field's bounding box, with a centre-inside mask (scanline)
 * and each cell's exact share of area inside the boundary (signed-area accumulation).
 * See docs/surface.md for why these are hand-written.
 */
import { ringsBbox } from '../geo/area.js';
import { UserError } from '../errors.js';
import type { Field, Grid, RingsPart } from '../types.js';

/** Options for {@link fieldGrid}. */
export interface FieldGridOptions {
  /** refuse grids with more cells than this (default 50 million) */
  maxCells?: number;
  /** snap the grid origin to whole multiples of the cell size (default true), so grids of one field line up */
  snap?: boolean;
}

/** Default cap on grid cells (about 400 MB of working arrays). */
export const MAX_CELLS = 50_000_000;

/**
 * A grid over a field: origin snapped to multiples of `cell`, enough rows and columns to cover the boundary,
 * `mask` = cell centre inside the field (holes excluded), `fraction` = exact share of the cell inside.
 * Sum over cells of fraction * cell^2 equals the field's planar (UTM) area.
 *
 * @param field projected field (src/geo/field.ts)
 * @param cell cell size in metres (> 0)
 * @param opts maxCells (default 50 000 000), snap (default true)
 * @throws UserError when the grid would exceed maxCells (the message gives the cell size that fits)
 * @example const g = fieldGrid(field, 5); g.cols * g.rows // cells
 */
export function fieldGrid(
  field: Pick<Field, 'parts' | 'name'> & Partial<Pick<Field, 'bbox'>>,
  cell: number,
  opts: FieldGridOptions = {},
): Grid {
  if (!(cell > 0) || !Number.isFinite(cell)) {
    throw new UserError(
      `cell size ${cell} m is not a positive number. Fix: give a cell size in metres, e.g. --cell 5.`,
      { value: cell },
    );
  }
  const maxCells = opts.maxCells ?? MAX_CELLS;
  const [bx0, by0, bx1, by1] = field.bbox ?? bboxOf(field.parts);
  const snap = opts.snap ?? true;
  const xmin = snap ? Math.floor(bx0 / cell) * cell : bx0;
  const ymax = snap ? Math.ceil(by1 / cell) * cell : by1;
  const cols = Math.max(1, Math.ceil((bx1 - xmin) / cell - 1e-9));
  const rows = Math.max(1, Math.ceil((ymax - by0) / cell - 1e-9));
  if (cols * rows > maxCells) {
    const need = Math.sqrt(((bx1 - bx0 + cell) * (by1 - by0 + cell)) / maxCells);
    throw new UserError(
      `field "${field.name}": a ${cell} m cell needs ${cols} x ${rows} = ${(cols * rows).toLocaleString('en-US')} cells, more than the ${maxCells.toLocaleString('en-US')} allowed. ` +
        `Fix: use a cell size of at least ${Math.ceil(need * 100) / 100} m (--cell).`,
      { field: 'cell', value: cell },
    );
  }
  const grid: Grid = {
    xmin,
    ymax,
    cell,
    cols,
    rows,
    mask: new Uint8Array(cols * rows),
    fraction: new Float32Array(cols * rows),
  };
  centreMask(field.parts, grid, grid.mask);
  coverage(field.parts, grid, grid.fraction);
  return grid;
}

function bboxOf(parts: RingsPart[]): [number, number, number, number] {
  return ringsBbox(parts.flatMap((p) => [p.exterior, ...p.holes]));
}

/**
 * Marks cells whose centre lies inside the rings (even-odd over all rings, so holes are excluded),
 * one horizontal scanline per row through the cell centres. Writes 1 into `out` for inside cells.
 * @example centreMask(field.parts, grid, grid.mask)
 */
export function centreMask(
  parts: RingsPart[],
  g: Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>,
  out: Uint8Array,
  value = 1,
): Uint8Array {
  const rings: Float64Array[] = [];
  for (const p of parts) rings.push(p.exterior, ...p.holes);
  // edge table: rows spanned by each edge, so a row only visits its own edges
  const edges: number[] = [];
  for (const r of rings) {
    const n = r.length >> 1;
    for (let i = 0, j = n - 1; i < n; j = i++) {
      const ya = r[2 * j + 1],
        yb = r[2 * i + 1];
      if (ya === yb) continue;
      edges.push(r[2 * j], ya, r[2 * i], yb);
    }
  }
  const ne = edges.length / 4;
  // bucket edges by first row they may cross
  const byRow: number[][] = Array.from({ length: g.rows }, () => []);
  const lastRow = new Int32Array(ne);
  for (let e = 0; e < ne; e++) {
    const ylo = Math.min(edges[4 * e + 1], edges[4 * e + 3]),
      yhi = Math.max(edges[4 * e + 1], edges[4 * e + 3]);
    // rows whose centre y = ymax - (r + .5) cell lies in [ylo, yhi]
    const r0 = Math.max(0, Math.floor((g.ymax - yhi) / g.cell - 0.5));
    const r1 = Math.min(g.rows - 1, Math.ceil((g.ymax - ylo) / g.cell - 0.5));
    if (r0 > r1) continue;
    byRow[r0].push(e);
    lastRow[e] = r1;
  }
  let active: number[] = [];
  const xs: number[] = [];
  for (let row = 0; row < g.rows; row++) {
    active = active.filter((e) => lastRow[e] >= row);
    for (const e of byRow[row]) active.push(e);
    const yc = g.ymax - (row + 0.5) * g.cell;
    xs.length = 0;
    for (const e of active) {
      const xa = edges[4 * e],
        ya = edges[4 * e + 1],
        xb = edges[4 * e + 2],
        yb = edges[4 * e + 3];
      if (ya > yc !== yb > yc) xs.push(xa + ((yc - ya) * (xb - xa)) / (yb - ya));
    }
    if (xs.length < 2) continue;
    xs.sort((a, b) => a - b);
    const base = row * g.cols;
    for (let k = 0; k + 1 < xs.length; k += 2) {
      // centres x = xmin + (c + .5) cell in [xa, xb)
      const c0 = Math.max(0, Math.ceil((xs[k] - g.xmin) / g.cell - 0.5));
      const c1 = Math.min(g.cols, Math.ceil((xs[k + 1] - g.xmin) / g.cell - 0.5));
      for (let c = c0; c < c1; c++) out[base + c] = value;
    }
  }
  return out;
}

/**
 * Exact signed area of the rings inside each cell, as a share of the cell (Float64, row-major, north-up).
 * Exterior rings and holes must have opposite orientations (as src/geo/field.ts makes them); the result
 * is then +-1 inside, 0 outside, the exact fraction on edge cells. Each edge adds trapezoid areas to the
 * cells it crosses and a running sum along each row completes them (the scheme of font rasterizers).
 * @example const cov = coverage(field.parts, grid); Math.abs(cov[i]) // share of cell i inside
 */
export function coverage(
  parts: RingsPart[],
  g: Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>,
): Float64Array;
/**
 * The same, written as fractions 0..1 into `into` (absolute value; within 1e-9 of 1 written as 1, below 1e-12 as 0).
 */
export function coverage(
  parts: RingsPart[],
  g: Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>,
  into: Float32Array,
): Float32Array;
export function coverage(
  parts: RingsPart[],
  g: Pick<Grid, 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>,
  into?: Float32Array,
): Float64Array | Float32Array {
  const W = g.cols + 2; // one spare column each side of the accumulation row
  const acc = new Float64Array(W * g.rows);
  const inv = 1 / g.cell;
  for (const p of parts) {
    for (const r of [p.exterior, ...p.holes]) {
      const n = r.length >> 1;
      for (let i = 0, j = n - 1; i < n; j = i++) {
        // to cell units: u east from xmin, v south from ymax
        const ua = (r[2 * j] - g.xmin) * inv,
          va = (g.ymax - r[2 * j + 1]) * inv;
        const ub = (r[2 * i] - g.xmin) * inv,
          vb = (g.ymax - r[2 * i + 1]) * inv;
        addLine(acc, W, g.rows, g.cols, ua, va, ub, vb);
      }
    }
  }
  if (into) {
    for (let row = 0; row < g.rows; row++) {
      const b = row * W;
      let s = acc[b];
      for (let c = 0; c < g.cols; c++) {
        s += acc[b + c + 1];
        const v = s < 0 ? -s : s;
        into[row * g.cols + c] = v > 1 - 1e-9 ? 1 : v < 1e-12 ? 0 : v;
      }
    }
    return into;
  }
  const out = new Float64Array(g.cols * g.rows);
  for (let row = 0; row < g.rows; row++) {
    const b = row * W;
    // column -1 (index 0 of the row) holds nothing inside the grid; include it in the running sum
    let s = acc[b];
    for (let c = 0; c < g.cols; c++) {
      s += acc[b + c + 1];
      out[row * g.cols + c] = s;
    }
  }
  return out;
}

/** Adds the signed area contribution of one edge (cell units) to the accumulation rows. */
function addLine(
  acc: Float64Array,
  W: number,
  rows: number,
  cols: number,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
): void {
  if (y0 === y1) return;
  let dir = 1;
  if (y0 > y1) {
    dir = -1;
    let t = x0;
    x0 = x1;
    x1 = t;
    t = y0;
    y0 = y1;
    y1 = t;
  }
  const dxdy = (x1 - x0) / (y1 - y0);
  const rStart = Math.max(0, Math.floor(y0));
  const rEnd = Math.min(rows, Math.ceil(y1));
  for (let row = rStart; row < rEnd; row++) {
    const ya = Math.max(row, y0),
      yb = Math.min(row + 1, y1);
    const dy = yb - ya;
    if (dy <= 0) continue;
    const xa = x0 + (ya - y0) * dxdy,
      xb = x0 + (yb - y0) * dxdy;
    const d = dy * dir;
    let xl = xa < xb ? xa : xb,
      xr = xa < xb ? xb : xa;
    // clamp to the grid (the boundary lies inside it; guard rounding)
    if (xl < 0) xl = 0;
    if (xr > cols) xr = cols;
    if (xl > xr) xl = xr;
    const base = row * W + 1; // column c at base + c
    const cl = Math.floor(xl);
    if (xr <= cl + 1) {
      // within one column: the part of the cell right of the edge gets d * (1 - xmid frac)
      const xm = 0.5 * (xl + xr) - cl;
      acc[base + cl] += d * (1 - xm);
      acc[base + cl + 1] += d * xm;
    } else {
      // crosses several columns: area right of the line, per column, for a line from xl to xr over height dy
      const s = 1 / (xr - xl);
      const cr = Math.ceil(xr);
      const x0f = xl - cl;
      const a0 = 0.5 * s * (1 - x0f) * (1 - x0f);
      const x1f = xr - cr + 1;
      const am = 0.5 * s * x1f * x1f;
      acc[base + cl] += d * a0;
      if (cr === cl + 2) {
        acc[base + cl + 1] += d * (1 - a0 - am);
      } else {
        const a1 = s * (1.5 - x0f);
        acc[base + cl + 1] += d * (a1 - a0);
        for (let c = cl + 2; c < cr - 1; c++) acc[base + c] += d * s;
        const a2 = a1 + (cr - cl - 3) * s;
        acc[base + cr - 1] += d * (1 - a2 - am);
      }
      acc[base + cr] += d * am;
    }
  }
}

/**
 * Warnings about a grid for people: a field smaller than one cell (the map is then one or a few cells).
 * @example gridWarnings(grid, 'Home quarter') // [] for a normal field
 */
export function gridWarnings(grid: Grid, name: string): { code: string; message: string; field?: string }[] {
  let s = 0;
  for (let i = 0; i < grid.fraction.length; i++) s += grid.fraction[i];
  if (s < 1) {
    return [
      {
        code: 'surface-field-smaller-than-cell',
        message: `field "${name}" (${Math.round(s * grid.cell * grid.cell)} m2) is smaller than one ${grid.cell} m cell; the map has ${grid.cols * grid.rows} cell(s). Fix: use a smaller --cell.`,
        field: 'cell',
      },
    ];
  }
  return [];
}
