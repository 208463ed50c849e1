/**
 * The borders of a zone raster as shared arcs (a planar partition): every border between two zones is
 * walked once, cut at the nodes where three or more zones meet (or two meet corner to corner), and each
 * zone's rings are lists of arcs. Simplifying an arc once then moves the border for both zones alike, so
 * no gap or overlap can open between them. Nodes are grid corners, keyed `j * W + i` (W = cols + 1).
 */
import type { RingsPart } from '../types.js';
import { pointInRing, ringArea } from '../geo/area.js';
import type { RasterFrame } from './trace.js';

// directions: 0 east, 1 north, 2 west, 3 south (j counts rows downwards); cell ahead-left / ahead-right
const DI = [1, 0, -1, 0],
  DJ = [0, -1, 0, 1];
const LCX = [0, -1, -1, 0],
  LCY = [-1, -1, 0, 0];
const RCX = [0, 0, -1, -1],
  RCY = [0, -1, -1, 0];

/** The arcs of a zone raster and each zone's rings as arcs. */
export interface ZoneArcs {
  /** nodes per grid row (cols + 1); a node key is j * W + i */
  W: number;
  /** per arc: node keys in order; a closed arc (no junction on it) repeats its first node at the end */
  arcs: number[][];
  /** per arc: never moved (it borders the area outside every zone) */
  fixed: boolean[];
  /** per arc: a closed loop with no junction */
  closed: boolean[];
  /** per arc: the zones on its left and right (-1 = outside every zone) */
  left: number[];
  right: number[];
  /** per zone: rings, each a list of arc references (index + 1; negative = walked backwards) */
  rings: number[][][];
}

/**
 * Walks every zone's rings through every grid node (zone on the left, 4-connected like traceZones) and
 * cuts them into shared arcs.
 * @param zone per cell: zone id 0..count-1 or -1
 * @example const a = zoneArcs(merged.zone, merged.count, grid); a.rings[0][0] // [1, -3, 4]
 */
export function zoneArcs(zone: Int32Array, count: number, f: RasterFrame): ZoneArcs {
  const { cols, rows } = f;
  const W = cols + 1,
    V = W * (rows + 1);
  const lab = (c: number, r: number) => (c < 0 || r < 0 || c >= cols || r >= rows ? -1 : zone[r * cols + c]);
  const isJunction = (key: number): boolean => {
    const j = Math.floor(key / W),
      i = key - j * W;
    const a = lab(i - 1, j - 1),
      b = lab(i, j - 1),
      c = lab(i - 1, j),
      d = lab(i, j);
    if (a === d && b === c) return a !== b; // saddle (or no border at all)
    let k = 1;
    if (b !== a) k++;
    if (c !== a && c !== b) k++;
    if (d !== a && d !== b && d !== c) k++;
    return k >= 3;
  };
  const rightOf = (p: number, q: number): number => {
    const j0 = Math.floor(p / W),
      i0 = p - j0 * W,
      j1 = Math.floor(q / W),
      i1 = q - j1 * W;
    if (i1 > i0) return lab(i0, j0);
    if (i1 < i0) return lab(i1, j0 - 1);
    if (j1 < j0) return lab(i0, j1);
    return lab(i0 - 1, j0);
  };
  const out: ZoneArcs = {
    W,
    arcs: [],
    fixed: [],
    closed: [],
    left: [],
    right: [],
    rings: Array.from({ length: count }, () => []),
  };
  const byEdge = new Map<number, number>(),
    byNode = new Map<number, number>();
  const ek = (a: number, b: number) => (a < b ? a * V + b : b * V + a);
  const register = (nodes: number[], closed: boolean, z: number): number => {
    const n = nodes.length;
    const key = closed
      ? Math.min(...nodes)
      : Math.min(ek(nodes[0], nodes[1]), ek(nodes[n - 2], nodes[n - 1]));
    const map = closed ? byNode : byEdge;
    const found = map.get(key);
    if (found !== undefined) return -(found + 1); // the neighbour walked it the other way
    map.set(key, out.arcs.length);
    out.arcs.push(nodes);
    const right = rightOf(nodes[0], nodes[1]);
    out.fixed.push(right < 0);
    out.closed.push(closed);
    out.left.push(z);
    out.right.push(right);
    return out.arcs.length;
  };
  for (const [z, loop] of walkLoops(zone, count, f)) {
    const m = loop.length;
    const js: number[] = [];
    for (let t = 0; t < m; t++) if (isJunction(loop[t])) js.push(t);
    if (js.length === 0) {
      let s = 0;
      for (let t = 1; t < m; t++) if (loop[t] < loop[s]) s = t;
      const nodes = [...loop.slice(s), ...loop.slice(0, s), loop[s]];
      const ref = register(nodes, true, z);
      if (ref < 0) alignClosed(out.arcs[-ref - 1], nodes);
      out.rings[z].push([ref]);
      continue;
    }
    const refs: number[] = [];
    for (let q = 0; q < js.length; q++) {
      const a = js[q],
        b = q + 1 < js.length ? js[q + 1] : js[0] + m;
      const nodes: number[] = [];
      for (let t = a; t <= b; t++) nodes.push(loop[t % m]);
      refs.push(register(nodes, false, z));
    }
    out.rings[z].push(refs);
  }
  return out;
}

/** A closed arc met from the other side must start at the same node: checked, for safety. */
function alignClosed(stored: number[], mine: number[]): void {
  if (stored[0] !== mine[0]) throw new Error('zoneArcs: a closed border was walked from two different nodes');
}

/**
 * Every ring of every zone through every node (zone on the left), split where it comes back to a node
 * (two cells of the zone touching at a corner), as [zone, node keys] with the first node not repeated.
 */
function walkLoops(zone: Int32Array, count: number, f: RasterFrame): [number, number[]][] {
  const { cols, rows } = f;
  const W = cols + 1;
  const visited = new Uint8Array(W * (rows + 1));
  const lab = (c: number, r: number) => (c < 0 || r < 0 || c >= cols || r >= rows ? -1 : zone[r * cols + c]);
  const out: [number, number[]][] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const L = zone[r * cols + c];
      if (L < 0 || L >= count || lab(c, r - 1) === L || visited[r * W + c + 1]) continue;
      const i0 = c + 1,
        j0 = r,
        d0 = 2;
      let i = i0,
        j = j0,
        d = d0,
        saddles = 0;
      const nodes: number[] = [];
      for (;;) {
        if (d === 2) visited[j * W + i] = 1;
        i += DI[d];
        j += DJ[d];
        nodes.push(j * W + i);
        const la = lab(i + LCX[d], j + LCY[d]);
        if (la !== L) {
          if (lab(i + RCX[d], j + RCY[d]) === L) saddles++;
          d = (d + 1) & 3;
        } else if (lab(i + RCX[d], j + RCY[d]) === L) d = (d + 3) & 3;
        if (i === i0 && j === j0 && d === d0) break;
      }
      for (const loop of saddles > 0 ? splitAtRepeats(nodes) : [nodes]) out.push([L, loop]);
    }
  }
  return out;
}

/** Splits a closed node sequence where it comes back to a node, into simple loops. */
function splitAtRepeats(nodes: number[]): number[][] {
  const loops: number[][] = [];
  const path: number[] = [];
  const pos = new Map<number, number>();
  for (const v of nodes) {
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
  return loops.filter((l) => l.length >= 4);
}

/**
 * Each zone's polygons from its rings of (possibly simplified) arcs: nodes where a ring runs straight on are
 * dropped, counter-clockwise rings are exteriors and clockwise rings holes, each hole going to the
 * exterior that contains it. Coordinates in metres.
 * @param arcs node keys per arc (`a.arcs`, or simplifyArcs(a, tol))
 * @example const parts = arcsToParts(a, simplifyArcs(a, 1), grid); parts[0][0].exterior
 */
export function arcsToParts(a: ZoneArcs, arcs: number[][], f: RasterFrame): RingsPart[][] {
  const { W } = a;
  return a.rings.map((rings) => {
    const shells: { ring: Float64Array; area: number; holes: Float64Array[] }[] = [];
    const holes: Float64Array[] = [];
    for (const refs of rings) {
      const ring = keysToRing(ringKeys(refs, arcs, W), W, f);
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
  });
}

/** A ring's vertex keys from its arcs (closed, first not repeated), without nodes where it runs straight on. */
function ringKeys(refs: number[], arcs: number[][], W: number): number[] {
  const keys: number[] = [];
  for (const ref of refs) {
    const arc = arcs[Math.abs(ref) - 1];
    const n = arc.length;
    for (let t = 0; t + 1 < n; t++) keys.push(ref > 0 ? arc[t] : arc[n - 1 - t]);
  }
  return straightDropped(keys, W);
}

/**
 * Vertices the zones' rings would have (closing vertices not counted), without building them.
 * @example ringsVertexCount(a, simplifyArcs(a, 0)) // the staircase's corners
 */
export function ringsVertexCount(a: ZoneArcs, arcs: number[][]): number {
  let n = 0;
  for (const rings of a.rings) for (const refs of rings) n += ringKeys(refs, arcs, a.W).length;
  return n;
}

/** Vertices of a node ring (closed, no repeat) where the ring does not run straight on. */
function straightDropped(keys: number[], W: number): number[] {
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
    const ax = a - ja * W,
      bx = b - jb * W,
      cx = c - jc * W;
    const cross = (bx - ax) * (jc - jb) - (jb - ja) * (cx - bx);
    const dot = (bx - ax) * (cx - bx) + (jb - ja) * (jc - jb);
    if (cross === 0 && dot > 0) continue;
    out.push(b);
  }
  return out;
}

function keysToRing(keys: number[], W: number, f: RasterFrame): Float64Array {
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

/** Vertex count of polygon parts (closing vertices not counted). */
export function vertexCount(parts: RingsPart[]): number {
  let n = 0;
  for (const p of parts) for (const r of [p.exterior, ...p.holes]) n += Math.max(0, r.length / 2 - 1);
  return n;
}
