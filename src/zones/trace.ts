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
  const { cols, rows, xmin, ymax, cell } = f;
  const W = cols + 1,
    V = W * (rows + 1);
  const visited = new Uint8Array(V); // only west-going edges (north sides of cells) start rings
  const lab = (c: number, r: number) => (c < 0 || r < 0 || c >= cols || r >= rows ? -1 : zone[r * cols + c]);
  const rings: number[][][] = Array.from({ length: count }, () => []);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const L = zone[r * cols + c];
      if (L < 0 || lab(c, r - 1) === L || visited[r * W + c + 1]) continue;
      // trace from vertex (c+1, r) going west
      const i0 = c + 1,
        j0 = r,
        d0 = 2;
      let i = i0,
        j = j0,
        d = d0;
      const verts: number[] = []; // vertex keys j * W + i
      let saddles = 0;
      for (;;) {
        if (d === 2) visited[j * W + i] = 1;
        i += DI[d];
        j += DJ[d];
        const la = lab(i + LCX[d], j + LCY[d]);
        let nd: number;
        if (la !== L) {
          nd = (d + 1) & 3;
          if (lab(i + RCX[d], j + RCY[d]) === L) saddles++;
        } else if (lab(i + RCX[d], j + RCY[d]) !== L) nd = d;
        else nd = (d + 3) & 3;
        if (nd !== d) verts.push(j * W + i);
        d = nd;
        if (i === i0 && j === j0 && d === d0) break;
      }
      const loops = saddles > 0 ? splitLoops(verts, W) : [verts];
      for (const loop of loops) rings[L].push(loop);
    }
  }
  const out: RingsPart[][] = [];
  for (let z = 0; z < count; z++) {
    const shells: { ring: Float64Array; area: number; holes: Float64Array[] }[] = [];
    const holes: Float64Array[] = [];
    for (const loop of rings[z]) {
      const ring = toRing(loop, W, xmin, ymax, cell);
      const a = ringArea(ring);
      if (a > 0) shells.push({ ring, area: a, holes: [] });
      else if (a < 0) holes.push(ring);
    }
    if (shells.length === 1) shells[0].holes.push(...holes);
    else {
      shells.sort((a, b) => a.area - b.area);
      for (const h of holes) {
        const px = (h[0] + h[2]) / 2,
          py = (h[1] + h[3]) / 2;
        const s = shells.find((s) => pointInRing(s.ring, px, py));
        (s ?? shells[shells.length - 1]).holes.push(h);
      }
    }
    out.push(shells.map((s) => ({ exterior: s.ring, holes: s.holes })));
  }
  return out;
}

/** Splits a closed vertex sequence at repeated vertices into simple loops. */
function splitLoops(verts: number[], W: number): number[][] {
  const loops: number[][] = [];
  const path: number[] = [];
  const pos = new Map<number, number>();
  for (const v of verts) {
    const k = pos.get(v);
    if (k !== undefined) {
      const loop = path.slice(k);
      for (let t = k + 1; t < path.length; t++) pos.delete(path[t]);
      path.length = k + 1;
      loops.push(loop);
    } else {
      pos.set(v, path.length);
      path.push(v);
    }
  }
  loops.push(path);
  return loops.map((l) => dropCollinear(l, W)).filter((l) => l.length >= 3);
}

/** Drops vertices whose neighbours share their row or column (left where a loop was split off). */
function dropCollinear(keys: number[], W: number): number[] {
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
    const ia = a - ja * W,
      ib = b - jb * W,
      ic = c - jc * W;
    if ((ja === jb && jb === jc) || (ia === ib && ib === ic)) continue;
    out.push(b);
  }
  return out;
}

function toRing(keys: number[], W: number, xmin: number, ymax: number, cell: number): Float64Array {
  const n = keys.length;
  const out = new Float64Array(2 * n + 2);
  for (let t = 0; t < n; t++) {
    const j = Math.floor(keys[t] / W),
      i = keys[t] - j * W;
    out[2 * t] = xmin + i * cell;
    out[2 * t + 1] = ymax - j * cell;
  }
  out[2 * n] = out[0];
  out[2 * n + 1] = out[1];
  return out;
}

export { pointInRing };
