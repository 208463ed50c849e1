/** Planar ring and polygon measures on flat coordinate arrays (x0 y0 x1 y1 ..., closed rings). */
import type { RingsPart } from '../types.js';

/**
 * Signed shoelace area of a ring: positive when counter-clockwise (x east, y north).
 * Works whether or not the ring repeats its first point.
 * @example ringArea(new Float64Array([0,0, 1,0, 1,1, 0,1, 0,0])) // 1
 */
export function ringArea(ring: ArrayLike<number>): number {
  const n = ring.length >> 1;
  if (n < 3) return 0;
  // shift to the first vertex to keep precision with large UTM coordinates
  const ox = ring[0],
    oy = ring[1];
  let s = 0;
  for (let i = 0; i < n; i++) {
    const j = (i + 1) % n;
    s += (ring[2 * i] - ox) * (ring[2 * j + 1] - oy) - (ring[2 * j] - ox) * (ring[2 * i + 1] - oy);
  }
  return s / 2;
}

/**
 * Length of a ring (x0 y0 x1 y1 ...), closed or not: the closing edge is counted once either way.
 * @example ringPerimeter(new Float64Array([0,0, 1,0, 1,1, 0,1, 0,0])) // 4
 */
export function ringPerimeter(ring: ArrayLike<number>): number {
  const n = ring.length >> 1;
  let l = 0;
  for (let i = 1; i < n; i++)
    l += Math.hypot(ring[2 * i] - ring[2 * i - 2], ring[2 * i + 1] - ring[2 * i - 1]);
  if (n > 2 && (ring[0] !== ring[2 * n - 2] || ring[1] !== ring[2 * n - 1]))
    l += Math.hypot(ring[0] - ring[2 * n - 2], ring[1] - ring[2 * n - 1]);
  return l;
}

/** Area of a part: |exterior| minus |holes|. */
export function partArea(part: RingsPart): number {
  let a = Math.abs(ringArea(part.exterior));
  for (const h of part.holes) a -= Math.abs(ringArea(h));
  return a;
}

/** Planar area of all parts, m2 (no projection correction). */
export function partsArea(parts: RingsPart[]): number {
  let a = 0;
  for (const p of parts) a += partArea(p);
  return a;
}

/** Bounding box of flat rings (x0 y0 x1 y1 ...): [xmin, ymin, xmax, ymax]. */
export function ringsBbox(rings: Iterable<ArrayLike<number>>): [number, number, number, number] {
  let x0 = Infinity,
    y0 = Infinity,
    x1 = -Infinity,
    y1 = -Infinity;
  for (const r of rings) {
    for (let i = 0; i + 1 < r.length; i += 2) {
      if (r[i] < x0) x0 = r[i];
      if (r[i] > x1) x1 = r[i];
      if (r[i + 1] < y0) y0 = r[i + 1];
      if (r[i + 1] > y1) y1 = r[i + 1];
    }
  }
  return [x0, y0, x1, y1];
}

/**
 * Bounding box of polygons' exterior rings as [x, y] points (GeoJSON coordinates): [xmin, ymin, xmax, ymax];
 * Infinity and -Infinity when there is no point.
 * @example exteriorsBbox([[[[0, 0], [4, 0], [4, 3], [0, 0]]]]) // [0, 0, 4, 3]
 */
export function exteriorsBbox(
  polys: Iterable<readonly (readonly (readonly number[])[])[]>,
): [number, number, number, number] {
  let x0 = Infinity,
    y0 = Infinity,
    x1 = -Infinity,
    y1 = -Infinity;
  for (const p of polys)
    for (const pt of p[0] ?? []) {
      x0 = Math.min(x0, pt[0]);
      x1 = Math.max(x1, pt[0]);
      y0 = Math.min(y0, pt[1]);
      y1 = Math.max(y1, pt[1]);
    }
  return [x0, y0, x1, y1];
}

/** Bounding box of parts (their exterior rings): [xmin, ymin, xmax, ymax]. */
export function partsBbox(parts: RingsPart[]): [number, number, number, number] {
  return ringsBbox(parts.map((p) => p.exterior));
}

/**
 * Even-odd point in ring test (a closed ring x0 y0 ... xn yn). A point exactly on an edge may fall either way.
 * @example pointInRing(zone.parts[0].exterior, x, y)
 */
export function pointInRing(r: ArrayLike<number>, x: number, y: number): boolean {
  let inside = false;
  const n = r.length >> 1;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    const xi = r[2 * i],
      yi = r[2 * i + 1],
      xj = r[2 * j],
      yj = r[2 * j + 1];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

/**
 * Point in polygon with holes (even-odd over all rings of the part list).
 * A point exactly on an edge may fall either way.
 */
export function pointInParts(parts: RingsPart[], x: number, y: number): boolean {
  let inside = false;
  for (const p of parts) {
    for (const r of [p.exterior, ...p.holes]) if (pointInRing(r, x, y)) inside = !inside;
  }
  return inside;
}

/** Returns the ring oriented counter-clockwise (ccw = true) or clockwise (a new array only when reversed; a zero-area ring as is). */
export function orient(ring: Float64Array, ccw: boolean): Float64Array {
  const a = ringArea(ring);
  if (a > 0 === ccw || a === 0) return ring;
  const n = ring.length >> 1;
  const out = new Float64Array(ring.length);
  for (let i = 0; i < n; i++) {
    out[2 * i] = ring[2 * (n - 1 - i)];
    out[2 * i + 1] = ring[2 * (n - 1 - i) + 1];
  }
  return out;
}
