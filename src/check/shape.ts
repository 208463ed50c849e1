/** Planar measures of polygons in metres used by the checks: area, convex hull, its diameter and width. */
import { ringArea, ringPerimeter } from '../geo/area.js';

/** polyclip-ts style polygon: rings of [x, y] points. */
export type Poly = [number, number][][];

/** A ring of [x, y] points as the flat array the geometry kernel (src/geo/area.ts) takes. */
const flat = (r: readonly [number, number][]): Float64Array => {
  const out = new Float64Array(2 * r.length);
  r.forEach((p, i) => {
    out[2 * i] = p[0];
    out[2 * i + 1] = p[1];
  });
  return out;
};

/** Area of polygons: |exterior| minus |holes|, summed. */
export function polysArea(polys: readonly Poly[]): number {
  let a = 0;
  for (const p of polys)
    p.forEach((r, k) => (a += k === 0 ? Math.abs(ringArea(flat(r))) : -Math.abs(ringArea(flat(r)))));
  return a;
}

/** Area-weighted centre of a polygon's exterior ring (falls back to the first point for a degenerate ring). */
export function ringCentroid(r: readonly [number, number][]): [number, number] {
  let a = 0,
    cx = 0,
    cy = 0;
  const [ox, oy] = r[0];
  for (let i = 0; i < r.length; i++) {
    const x0 = r[i][0] - ox,
      y0 = r[i][1] - oy,
      x1 = r[(i + 1) % r.length][0] - ox,
      y1 = r[(i + 1) % r.length][1] - oy;
    const c = x0 * y1 - x1 * y0;
    a += c;
    cx += (x0 + x1) * c;
    cy += (y0 + y1) * c;
  }
  if (a === 0) return [ox, oy];
  return [ox + cx / (3 * a), oy + cy / (3 * a)];
}

/** Convex hull (Andrew's monotone chain), counter-clockwise, no repeated end point. */
export function convexHull(pts: readonly [number, number][]): [number, number][] {
  const p = [...pts].sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  if (p.length < 3) return p;
  const cross = (o: number[], a: number[], b: number[]) =>
    (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
  const lower: [number, number][] = [],
    upper: [number, number][] = [];
  for (const q of p) {
    while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], q) <= 0) lower.pop();
    lower.push(q);
  }
  for (let i = p.length - 1; i >= 0; i--) {
    const q = p[i];
    while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], q) <= 0) upper.pop();
    upper.push(q);
  }
  return lower.slice(0, -1).concat(upper.slice(0, -1));
}

/**
 * Longest and narrowest extent of a point set's convex hull, metres: the diameter (largest distance
 * between two points) and the width (smallest distance between two parallel lines enclosing it).
 * O(h^2) over the hull's h points, plenty for zone polygons.
 *
 * @example hullExtent([[0,0],[10,0],[10,2],[0,2]]) // { diameter: 10.198..., width: 2 }
 */
export function hullExtent(pts: readonly [number, number][]): { diameter: number; width: number } {
  const h = convexHull(pts);
  let diameter = 0;
  for (let i = 0; i < h.length; i++)
    for (let j = i + 1; j < h.length; j++)
      diameter = Math.max(diameter, Math.hypot(h[i][0] - h[j][0], h[i][1] - h[j][1]));
  if (h.length < 3) return { diameter, width: 0 };
  let width = Infinity;
  for (let i = 0; i < h.length; i++) {
    const [ax, ay] = h[i],
      [bx, by] = h[(i + 1) % h.length];
    const len = Math.hypot(bx - ax, by - ay);
    if (len === 0) continue;
    let far = 0;
    for (const [x, y] of h) far = Math.max(far, Math.abs((bx - ax) * (y - ay) - (by - ay) * (x - ax)) / len);
    width = Math.min(width, far);
  }
  return { diameter, width };
}

/**
 * Area of the pieces that matter: each piece of `polys` with at least `minArea` and a mean width
 * (2 x area / perimeter) of at least `minWidth`. Long hair-thin slivers along a boundary, left by rounding
 * coordinates (7 decimals of a degree is about 1 cm), are not gaps or overlaps a controller could act on.
 */
export function significantArea(
  polys: readonly Poly[],
  minArea: number,
  minWidth: number,
  scale = 1,
): number {
  let a = 0;
  for (const p of polys) {
    const pa = polysArea([p]) / scale;
    if (pa >= minArea && (2 * pa) / Math.max(ringPerimeter(flat(p[0])), 1e-12) >= minWidth) a += pa;
  }
  return a;
}
