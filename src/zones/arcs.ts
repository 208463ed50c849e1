/**
 * The borders of a zone raster as shared arcs (a planar partition): every border between two zones is
 * walked once, cut at the nodes where three or more zones meet (or two meet corner to corner), and each
 * zone's rings are lists of arcs. Simplifying an arc once then moves the border for both zones alike, so
 * no gap or overlap can open between them. Nodes are grid corners, keyed `j * W + i` (W = cols + 1).
 */
import type { RingsPart } from '../types.js';
import { keptVertices, keysToRing, ringsToParts, walkRings, type RasterFrame } from './trace.js';

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
  const W = f.cols + 1;
  const out: ZoneArcs = {
    W,
    arcs: [],
    fixed: [],
    closed: [],
    left: [],
    right: [],
    rings: Array.from({ length: count }, () => []),
  };
  const nodes = nodeTests(zone, f);
  const register = arcRegister(out, W * (f.rows + 1), nodes.rightOf);
  for (const [z, loop] of walkRings(zone, count, f, false)) {
    const js: number[] = [];
    for (let t = 0; t < loop.length; t++) if (nodes.isJunction(loop[t])) js.push(t);
    out.rings[z].push(js.length === 0 ? closedRing(out, loop, z, register) : cutRing(loop, js, z, register));
  }
  return out;
}

/** Adds an arc walked by zone z (or finds it, walked the other way by the neighbour); returns its reference. */
type Register = (nodes: number[], closed: boolean, z: number) => number;

/** What the zones around a grid node (key j * W + i) are: whether it is a junction, the zone right of an edge. */
function nodeTests(zone: Int32Array, f: RasterFrame) {
  const { cols, rows } = f;
  const W = cols + 1;
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
  return { isJunction, rightOf };
}

/**
 * The arc store of `out`: an open arc is found again by its end edges, a closed arc by its smallest node, so the
 * neighbour that walks a border the other way gets the same arc (a negative reference).
 */
function arcRegister(out: ZoneArcs, V: number, rightOf: (p: number, q: number) => number): Register {
  const byEdge = new Map<number, number>(),
    byNode = new Map<number, number>();
  const ek = (a: number, b: number) => (a < b ? a * V + b : b * V + a);
  return (nodes, closed, z) => {
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
}

/** A ring with no junction: one closed arc, started at its smallest node. */
function closedRing(out: ZoneArcs, loop: number[], z: number, register: Register): number[] {
  let s = 0;
  for (let t = 1; t < loop.length; t++) if (loop[t] < loop[s]) s = t;
  const nodes = [...loop.slice(s), ...loop.slice(0, s), loop[s]];
  const ref = register(nodes, true, z);
  if (ref < 0) alignClosed(out.arcs[-ref - 1], nodes);
  return [ref];
}

/** A ring cut at its junctions (positions `js` in the loop) into arcs, as arc references. */
function cutRing(loop: number[], js: number[], z: number, register: Register): number[] {
  const m = loop.length;
  const refs: number[] = [];
  for (let q = 0; q < js.length; q++) {
    const a = js[q],
      b = q + 1 < js.length ? js[q + 1] : js[0] + m;
    const nodes: number[] = [];
    for (let t = a; t <= b; t++) nodes.push(loop[t % m]);
    refs.push(register(nodes, false, z));
  }
  return refs;
}

/** A closed arc met from the other side must start at the same node: checked, for safety. */
function alignClosed(stored: number[], mine: number[]): void {
  if (stored[0] !== mine[0]) throw new Error('zoneArcs: a closed border was walked from two different nodes');
}

/**
 * Each zone's polygons from its rings of (possibly simplified) arcs: nodes where a ring runs straight on are
 * dropped (except where another ring of the zone touches it), counter-clockwise rings are exteriors and
 * clockwise rings holes, each hole going to the exterior that contains it. Coordinates in metres.
 * @param arcs node keys per arc (`a.arcs`, or simplifyArcs(a, tol))
 * @example const parts = arcsToParts(a, simplifyArcs(a, 1), grid); parts[0][0].exterior
 */
export function arcsToParts(a: ZoneArcs, arcs: number[][], f: RasterFrame): RingsPart[][] {
  return a.rings.map((rings) => {
    const touch = touchNodes(rings, arcs);
    return ringsToParts(rings.map((refs) => keysToRing(ringKeys(refs, arcs, a.W, touch), a.W, f)));
  });
}

/**
 * Nodes where two rings of one zone touch (a hole touching its exterior, two parts touching at a corner): arc
 * ends that start arcs in more than one of the zone's rings; null for a zone of one ring. Such a node stays a
 * vertex of every ring through it even where smoothing made a ring run straight on there, so the rings touch
 * at a shared vertex: a touch at a point inside another ring's edge turns, once the coordinates are rounded
 * and clipped, into a crossing (GEOS: self-intersection).
 */
function touchNodes(rings: number[][], arcs: number[][]): Set<number> | null {
  if (rings.length < 2) return null;
  const ringOf = new Map<number, number>();
  const out = new Set<number>();
  rings.forEach((refs, r) => {
    for (const ref of refs) {
      const arc = arcs[Math.abs(ref) - 1];
      const node = ref > 0 ? arc[0] : arc[arc.length - 1];
      const seen = ringOf.get(node);
      if (seen === undefined) ringOf.set(node, r);
      else if (seen !== r) out.add(node);
    }
  });
  return out;
}

/** A ring's vertex keys from its arcs (closed, first not repeated), without nodes where it runs straight on. */
function ringKeys(refs: number[], arcs: number[][], W: number, keep: Set<number> | null): number[] {
  const keys: number[] = [];
  for (const ref of refs) {
    const arc = arcs[Math.abs(ref) - 1];
    const n = arc.length;
    for (let t = 0; t + 1 < n; t++) keys.push(ref > 0 ? arc[t] : arc[n - 1 - t]);
  }
  return straightDropped(keys, W, keep);
}

/**
 * Vertices the zones' rings would have (closing vertices not counted), without building them.
 * @example ringsVertexCount(a, simplifyArcs(a, 0)) // the staircase's corners
 */
export function ringsVertexCount(a: ZoneArcs, arcs: number[][]): number {
  let n = 0;
  for (const rings of a.rings) {
    const touch = touchNodes(rings, arcs);
    for (const refs of rings) n += ringKeys(refs, arcs, a.W, touch).length;
  }
  return n;
}

/** Vertices of a node ring (closed, no repeat) where the ring does not run straight on, and the nodes in `keep`. */
function straightDropped(keys: number[], W: number, keep: Set<number> | null): number[] {
  return keptVertices(keys, W, (ax, ja, bx, jb, cx, jc, b) => {
    const cross = (bx - ax) * (jc - jb) - (jb - ja) * (cx - bx);
    const dot = (bx - ax) * (cx - bx) + (jb - ja) * (jc - jb);
    return cross === 0 && dot > 0 && !keep?.has(b);
  });
}

/** Vertex count of polygon parts (closing vertices not counted). */
export function vertexCount(parts: RingsPart[]): number {
  let n = 0;
  for (const p of parts) for (const r of [p.exterior, ...p.holes]) n += Math.max(0, r.length / 2 - 1);
  return n;
}
