/**
 * Finds a pair of ring edges that cross (proper crossing or collinear overlap): a sweep over edges
 * sorted by their west end, so boundaries of thousands of points stay fast. Edges that only touch at
 * an end point are allowed (adjacent edges always do; rings may touch at a point).
 *
 * Hand-written rather than @turf/kinks because kinks is O(n^2) over the whole polygon and reports
 * shared vertices between rings as kinks; see docs/architecture.md.
 */

export interface Crossing {
  ringA: number;
  segA: number;
  ringB: number;
  segB: number;
}

/**
 * @param rings closed rings x0 y0 ... xn yn (first == last), in metres
 * @returns the first crossing found, or null
 * @example findCrossing([new Float64Array([0,0, 2,2, 2,0, 0,2, 0,0])]) // bow-tie: { ringA: 0, segA: 0, ringB: 0, segB: 2 }
 */
export function findCrossing(rings: ArrayLike<number>[]): Crossing | null {
  const segs: {
    r: number;
    s: number;
    x0: number;
    y0: number;
    x1: number;
    y1: number;
    minx: number;
    maxx: number;
  }[] = [];
  rings.forEach((ring, r) => {
    const n = (ring.length >> 1) - 1;
    for (let s = 0; s < n; s++) {
      const x0 = ring[2 * s],
        y0 = ring[2 * s + 1],
        x1 = ring[2 * s + 2],
        y1 = ring[2 * s + 3];
      segs.push({ r, s, x0, y0, x1, y1, minx: Math.min(x0, x1), maxx: Math.max(x0, x1) });
    }
  });
  segs.sort((a, b) => a.minx - b.minx);
  const nIn = rings.map((ring) => (ring.length >> 1) - 1);
  for (let i = 0; i < segs.length; i++) {
    const a = segs[i];
    for (let j = i + 1; j < segs.length && segs[j].minx <= a.maxx; j++) {
      const b = segs[j];
      if (a.r === b.r) {
        const d = Math.abs(a.s - b.s);
        if (d === 1 || d === nIn[a.r] - 1) {
          // adjacent edges: only a collinear fold-back is a problem
          if (foldsBack(a, b)) return order(a, b);
          continue;
        }
      }
      if (crosses(a, b)) return order(a, b);
    }
  }
  return null;
}

type Seg = { r: number; s: number; x0: number; y0: number; x1: number; y1: number };

function order(a: Seg, b: Seg): Crossing {
  return a.r < b.r || (a.r === b.r && a.s < b.s)
    ? { ringA: a.r, segA: a.s, ringB: b.r, segB: b.s }
    : { ringA: b.r, segA: b.s, ringB: a.r, segB: a.s };
}

function orient(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const v = (bx - ax) * (cy - ay) - (by - ay) * (cx - ax);
  const scale = Math.abs(bx - ax) + Math.abs(by - ay) + Math.abs(cx - ax) + Math.abs(cy - ay);
  return Math.abs(v) <= 1e-12 * scale * scale ? 0 : Math.sign(v);
}

/** Proper crossing, or collinear overlap of positive length. */
function crosses(a: Seg, b: Seg): boolean {
  const d1 = orient(a.x0, a.y0, a.x1, a.y1, b.x0, b.y0);
  const d2 = orient(a.x0, a.y0, a.x1, a.y1, b.x1, b.y1);
  const d3 = orient(b.x0, b.y0, b.x1, b.y1, a.x0, a.y0);
  const d4 = orient(b.x0, b.y0, b.x1, b.y1, a.x1, a.y1);
  if (d1 * d2 < 0 && d3 * d4 < 0) return true;
  if (d1 === 0 && d2 === 0) return overlapLength(a, b) > 0;
  // a T-junction: an end of one edge on the interior of the other
  if (d1 === 0 && interior(a, b.x0, b.y0)) return true;
  if (d2 === 0 && interior(a, b.x1, b.y1)) return true;
  if (d3 === 0 && interior(b, a.x0, a.y0)) return true;
  if (d4 === 0 && interior(b, a.x1, a.y1)) return true;
  return false;
}

/** Point strictly between the ends of a (assumed collinear). */
function interior(a: Seg, x: number, y: number): boolean {
  const t =
    Math.abs(a.x1 - a.x0) >= Math.abs(a.y1 - a.y0) ? (x - a.x0) / (a.x1 - a.x0) : (y - a.y0) / (a.y1 - a.y0);
  return t > 1e-12 && t < 1 - 1e-12;
}

function overlapLength(a: Seg, b: Seg): number {
  const ux = a.x1 - a.x0,
    uy = a.y1 - a.y0;
  const L = Math.hypot(ux, uy);
  if (L === 0) return 0;
  const t = (x: number, y: number) => ((x - a.x0) * ux + (y - a.y0) * uy) / L;
  const b0 = t(b.x0, b.y0),
    b1 = t(b.x1, b.y1);
  return Math.min(L, Math.max(b0, b1)) - Math.max(0, Math.min(b0, b1));
}

function foldsBack(a: Seg, b: Seg): boolean {
  if (orient(a.x0, a.y0, a.x1, a.y1, b.x0, b.y0) !== 0 || orient(a.x0, a.y0, a.x1, a.y1, b.x1, b.y1) !== 0)
    return false;
  return overlapLength(a, b) > 1e-9;
}
