/**
 * Tracing a zone raster into polygons: walks the cell edges between differently labelled cells once,
 * so the cost is linear in the number of cells (no union of cell squares). See docs/zones.md.
 */
import type { RingsPart } from '../types.js';
import { pointInRing, ringArea } from '../geo/area.js';

/** Raster placement of a zone raster: the Grid's geometry. */
export interface RasterFrame {
  xmin: number;
  ymax: number;
  cell: number;
  cols: number;
  rows: number;
}

// directions: 0 east, 1 north, 2 west, 3 south (j counts rows downwards)
const DI = [1, 0, -1, 0],
  DJ = [0, -1, 0, 1];
// cell on the left / right of an edge leaving vertex (i, j) in direction d, as offsets (dc, dr)
const LCX = [0, -1, -1, 0],
  LCY = [-1, -1, 0, 0];
const RCX = [0, 0, -1, -1],
  RCY = [0, -1, -1, 0];

/**
 * Traces each zone of a label raster (4-connected regions; -1 = no zone) into polygons in metres.
 *
 * Rings run along cell edges with the zone on their left, so exteriors are counter-clockwise and holes
 * clockwise (RFC 7946). Only corner vertices are kept (collinear staircase points never appear), and
 * two zones that share a border get exactly the same vertices along it. Where two cells of a zone touch
 * only at a corner, the ring turns so as to keep them apart (4-connectivity) and a ring that comes back
 * to the same corner is split there, so no ring touches itself (OGC-valid: rings may touch each other at
 * a point, never themselves).
 *
 * @param zone per cell: zone id 0..count-1 or -1
 * @returns per zone id: polygon parts (exterior + holes) in metres
 * @example const parts = traceZones(merged.zone, merged.count, grid); parts[0][0].exterior
 */
export function traceZones(zone: Int32Array, count: number, f: RasterFrame): RingsPart[][] {
  const W = f.cols + 1;
  const rings: Float64Array[][] = Array.from({ length: count }, () => []);
  for (const [L, loop] of walkRings(zone, count, f, true)) rings[L].push(keysToRing(loop, W, f));
  return rings.map(ringsToParts);
}

/**
 * Every ring of every zone (zone on the left, 4-connected), as [zone, node keys j * W + i] with the first node
 * not repeated; a ring that comes back to a node (two cells of the zone touching at a corner) is split there.
 * Each ring starts at the east end of the north side of its first cell in raster order. With `cornersOnly`
 * only the nodes where the ring turns are kept (traceZones); otherwise every node (zoneArcs cuts rings at
 * junctions, which may lie on a straight run).
 */
export function walkRings(
  zone: Int32Array,
  count: number,
  f: RasterFrame,
  cornersOnly: boolean,
): [number, number[]][] {
  const { cols, rows } = f;
  const W = cols + 1;
  const visited = new Uint8Array(W * (rows + 1)); // only west-going edges (north sides of cells) start rings
  const lab = (c: number, r: number) => (c < 0 || r < 0 || c >= cols || r >= rows ? -1 : zone[r * cols + c]);
  const out: [number, number[]][] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const L = zone[r * cols + c];
      if (L < 0 || L >= count || lab(c, r - 1) === L || visited[r * W + c + 1]) continue;
      // walk from node (c+1, r) going west
      const i0 = c + 1,
        j0 = r,
        d0 = 2;
      let i = i0,
        j = j0,
        d = d0,
        saddles = 0;
      const keys: number[] = [];
      for (;;) {
        if (d === 2) visited[j * W + i] = 1;
        i += DI[d];
        j += DJ[d];
        let nd: number;
        if (lab(i + LCX[d], j + LCY[d]) !== L) {
          nd = (d + 1) & 3;
          if (lab(i + RCX[d], j + RCY[d]) === L) saddles++;
        } else if (lab(i + RCX[d], j + RCY[d]) !== L) nd = d;
        else nd = (d + 3) & 3;
        if (!cornersOnly || nd !== d) keys.push(j * W + i);
        d = nd;
        if (i === i0 && j === j0 && d === d0) break;
      }
      for (const loop of saddles > 0 ? splitRing(keys, W, cornersOnly) : [keys]) out.push([L, loop]);
    }
  }
  return out;
}

/**
 * Splits a closed node sequence where it comes back to a node, into simple loops: corner loops lose the
 * vertices left collinear by the split and keep 3 or more, loops of every node keep 4 or more.
 */
function splitRing(keys: number[], W: number, cornersOnly: boolean): number[][] {
  const loops: number[][] = [];
  const path: number[] = [];
  const pos = new Map<number, number>();
  for (const v of keys) {
    const k = pos.get(v);
    if (k !== undefined) {
      loops.push(path.slice(k));
      for (let t = k + 1; t < path.length; t++) pos.delete(path[t]);
      path.length = k + 1;
    } else {
      pos.set(v, path.length);
      path.push(v);
    }
  }
  loops.push(path);
  if (!cornersOnly) return loops.filter((l) => l.length >= 4);
  return loops.map((l) => dropCollinear(l, W)).filter((l) => l.length >= 3);
}

/** Drops vertices whose neighbours share their row or column (left where a loop was split off). */
function dropCollinear(keys: number[], W: number): number[] {
  return keptVertices(
    keys,
    W,
    (ia, ja, ib, jb, ic, jc) => (ja === jb && jb === jc) || (ia === ib && ib === ic),
  );
}

/**
 * The vertices of a node ring (node keys j * W + i, closed, no repeat) that `drop` keeps, given the column i and
 * row j of each vertex and of the vertices before and after it, and its key. Rings under 4 vertices stay whole.
 * @example keptVertices(keys, W, (ia, ja, ib, jb, ic, jc) => ja === jb && jb === jc) // without the vertices inside a row
 */
export function keptVertices(
  keys: number[],
  W: number,
  drop: (ia: number, ja: number, ib: number, jb: number, ic: number, jc: number, b: number) => boolean,
): number[] {
  const n = keys.length;
  if (n < 4) return keys;
  const out: number[] = [];
  for (let t = 0; t < n; t++) {
    const a = keys[(t + n - 1) % n],
      b = keys[t],
      c = keys[(t + 1) % n];
    const ja = Math.floor(a / W),
      jb = Math.floor(b / W),
      jc = Math.floor(c / W);
    if (!drop(a - ja * W, ja, b - jb * W, jb, c - jc * W, jc, b)) out.push(b);
  }
  return out;
}

/** A ring in metres (closed) from node keys j * W + i (first not repeated). */
export function keysToRing(keys: number[], W: number, f: RasterFrame): Float64Array {
  const n = keys.length;
  const out = new Float64Array(2 * n + 2);
  for (let t = 0; t < n; t++) {
    const j = Math.floor(keys[t] / W),
      i = keys[t] - j * W;
    out[2 * t] = f.xmin + i * f.cell;
    out[2 * t + 1] = f.ymax - j * f.cell;
  }
  out[2 * n] = out[0];
  out[2 * n + 1] = out[1];
  return out;
}

/**
 * One zone's polygons from its rings (zone on the left): counter-clockwise rings are exteriors, clockwise rings
 * holes, each hole going to the smallest exterior that contains it (rings of zero area are dropped).
 */
export function ringsToParts(rings: Float64Array[]): RingsPart[] {
  const shells: { ring: Float64Array; area: number; holes: Float64Array[] }[] = [];
  const holes: Float64Array[] = [];
  for (const ring of rings) {
    const area = ringArea(ring);
    if (area > 0) shells.push({ ring, area, holes: [] });
    else if (area < 0) holes.push(ring);
  }
  if (shells.length === 1) shells[0].holes.push(...holes);
  else {
    shells.sort((p, q) => p.area - q.area);
    for (const h of holes) {
      const px = (h[0] + h[2]) / 2,
        py = (h[1] + h[3]) / 2;
      const s = shells.find((s) => pointInRing(s.ring, px, py));
      (s ?? shells[shells.length - 1]).holes.push(h);
    }
  }
  return shells.map((s) => ({ exterior: s.ring, holes: s.holes }));
}

export { pointInRing };
