/**
 * Topology-preserving simplification of shared arcs (Douglas-Peucker with Saalfeld's checks): a run of an
 * arc is replaced by a straight segment only when every dropped vertex lies within the tolerance of it,
 * the new segment touches no other segment, and no vertex of any arc changes side (none lies inside the
 * region between the run and the segment). Each accepted step keeps the partition planar, so the
 * result is one too: no gaps, no overlaps, no crossings. Coordinates are grid nodes (integers), so every
 * test is exact. See docs/zones.md, "Smooth, shared edges".
 */
import type { ZoneArcs } from './arcs.js';

/** Arcs simplified in place of `a.arcs` (fixed arcs and the junctions stay); returns the new node lists. */
export function simplifyArcs(a: ZoneArcs, tol: number): number[][] {
  const W = a.W;
  const arcs = a.arcs.map(corners);
  if (!(tol > 0)) return arcs;
  // flat vertex store: per arc a contiguous id range; next[] links the current vertices
  let total = 0;
  const off = new Int32Array(arcs.length + 1);
  arcs.forEach((r, k) => {
    off[k] = total;
    total += r.length;
  });
  off[arcs.length] = total;
  const X = new Int32Array(total),
    Y = new Int32Array(total),
    next = new Int32Array(total).fill(-1),
    arcOf = new Int32Array(total);
  arcs.forEach((r, k) =>
    r.forEach((key, t) => {
      const v = off[k] + t,
        j = Math.floor(key / W);
      X[v] = key - j * W;
      Y[v] = j;
      arcOf[v] = k;
      if (t + 1 < r.length) next[v] = v + 1;
    }),
  );
  const idx = new SegmentIndex(X, Y, next, Math.max(4, Math.ceil(2 * tol)));
  for (let v = 0; v < total; v++) if (next[v] >= 0) idx.insert(v);
  const tol2 = tol * tol;
  for (let k = 0; k < arcs.length; k++) {
    if (a.fixed[k] || arcs[k].length < 3) continue;
    const v0 = off[k],
      v1 = off[k + 1] - 1;
    const anchors = a.closed[k] ? closedAnchors(X, Y, v0, v1) : [v0, v1];
    if (!anchors) continue;
    for (let q = 0; q + 1 < anchors.length; q++)
      simplifyRun(anchors[q], anchors[q + 1], X, Y, next, idx, tol2);
  }
  return arcs.map((r, k) => {
    const keys: number[] = [];
    for (let v = off[k]; v >= 0; v = next[v]) keys.push(Y[v] * W + X[v]);
    return keys;
  });
}

/** Drops the nodes where an arc runs straight on (keeps both ends). */
function corners(keys: number[]): number[] {
  if (keys.length < 3) return keys;
  const out = [keys[0]];
  for (let t = 1; t + 1 < keys.length; t++) {
    const a = keys[t - 1],
      b = keys[t],
      c = keys[t + 1];
    if (b - a !== c - b) out.push(b);
  }
  out.push(keys[keys.length - 1]);
  return out;
}

/**
 * A closed arc keeps its extreme vertices (west-, east-, north-, southmost) so it cannot collapse;
 * null when they do not span an area (the loop is then left as it is).
 */
function closedAnchors(X: Int32Array, Y: Int32Array, v0: number, v1: number): number[] | null {
  let w = v0,
    e = v0,
    n = v0,
    s = v0;
  for (let v = v0; v < v1; v++) {
    if (X[v] < X[w]) w = v;
    if (X[v] > X[e]) e = v;
    if (Y[v] < Y[n]) n = v;
    if (Y[v] > Y[s]) s = v;
  }
  const set = [...new Set([v0, w, e, n, s, v1])].sort((p, q) => p - q);
  let area2 = 0;
  for (let t = 0; t + 1 < set.length; t++) area2 += X[set[t]] * Y[set[t + 1]] - X[set[t + 1]] * Y[set[t]];
  return set.length >= 4 && area2 !== 0 ? set : null;
}

/** Douglas-Peucker between two current vertices of one arc, each shortcut checked before it is taken. */
function simplifyRun(
  first: number,
  last: number,
  X: Int32Array,
  Y: Int32Array,
  next: Int32Array,
  idx: SegmentIndex,
  tol2: number,
): void {
  const stack = [first, last];
  while (stack.length) {
    const j = stack.pop()!,
      i = stack.pop()!;
    if (next[i] === j) continue;
    let far = -1,
      fd = -1;
    for (let v = next[i]; v !== j; v = next[v]) {
      const d = segDist2(X[v], Y[v], X[i], Y[i], X[j], Y[j]);
      if (d > fd) {
        fd = d;
        far = v;
      }
    }
    if (fd <= tol2 && (X[i] !== X[j] || Y[i] !== Y[j]) && idx.shortcutOk(i, j)) {
      for (let v = i; v !== j;) {
        const nv = next[v];
        if (v !== i) next[v] = -1;
        v = nv;
      }
      next[i] = j;
      idx.insert(i);
      continue;
    }
    stack.push(far, j, i, far);
  }
}

function segDist2(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax,
    dy = by - ay,
    L = dx * dx + dy * dy;
  let t = L > 0 ? ((px - ax) * dx + (py - ay) * dy) / L : 0;
  t = t < 0 ? 0 : t > 1 ? 1 : t;
  const ex = ax + t * dx - px,
    ey = ay + t * dy - py;
  return ex * ex + ey * ey;
}

const orient = (ax: number, ay: number, bx: number, by: number, cx: number, cy: number) =>
  Math.sign((bx - ax) * (cy - ay) - (by - ay) * (cx - ax));

/** Whether c lies on the closed segment ab, given that the three are collinear. */
const within = (ax: number, ay: number, bx: number, by: number, cx: number, cy: number) =>
  Math.min(ax, bx) <= cx && cx <= Math.max(ax, bx) && Math.min(ay, by) <= cy && cy <= Math.max(ay, by);

/**
 * Segments in square buckets (each segment is registered in the buckets of points along it, spaced half a
 * bucket apart; queries look one bucket around), removed lazily: an entry is live while its start vertex
 * still links to the same end vertex.
 */
class SegmentIndex {
  private buckets: (number[] | undefined)[];
  private stamp: Int32Array;
  private query = 0;
  private nx: number;
  constructor(
    private X: Int32Array,
    private Y: Int32Array,
    private next: Int32Array,
    private B: number,
  ) {
    let mx = 0,
      my = 0;
    for (let v = 0; v < X.length; v++) {
      if (X[v] > mx) mx = X[v];
      if (Y[v] > my) my = Y[v];
    }
    // one bucket of margin on every side, so neighbours of any bucket exist
    this.nx = Math.floor(mx / B) + 3;
    const n = this.nx * (Math.floor(my / B) + 3);
    this.buckets = new Array(n);
    this.stamp = new Int32Array(n);
  }

  /** Calls each(bucket index) for the buckets of points spaced half a bucket along v-w (ends included). */
  private samples(v: number, w: number, each: (k: number) => void): void {
    const { X, Y, B, nx } = this;
    const n = Math.max(1, Math.ceil(Math.hypot(X[w] - X[v], Y[w] - Y[v]) / (B / 2)));
    let last = -1;
    for (let s = 0; s <= n; s++) {
      const x = X[v] + ((X[w] - X[v]) * s) / n,
        y = Y[v] + ((Y[w] - Y[v]) * s) / n;
      const k = (Math.floor(y / B) + 1) * nx + Math.floor(x / B) + 1;
      if (k !== last) each(k);
      last = k;
    }
  }

  insert(v: number): void {
    const w = this.next[v];
    this.samples(v, w, (k) => {
      const b = this.buckets[k];
      if (b) b.push(v, w);
      else this.buckets[k] = [v, w];
    });
  }

  /**
   * Live segments near the segment i-j, each bucket once. Buckets are at least twice the tolerance wide and
   * points along a segment at most a quarter bucket from a registered sample, so every segment within the
   * tolerance of i-j is registered in a bucket next to one of i-j's samples.
   */
  private near(i: number, j: number, each: (v: number, w: number) => boolean): boolean {
    const q = ++this.query,
      nx = this.nx;
    let ok = true;
    this.samples(i, j, (k0) => {
      for (let dy = -1; dy <= 1 && ok; dy++)
        for (let dx = -1; dx <= 1 && ok; dx++) {
          const k = k0 + dy * nx + dx;
          if (this.stamp[k] === q) continue;
          this.stamp[k] = q;
          const b = this.buckets[k];
          if (!b) continue;
          let live = 0;
          for (let t = 0; t < b.length && ok; t += 2) {
            const v = b[t],
              w = b[t + 1];
            if (this.next[v] !== w) continue;
            b[live++] = v;
            b[live++] = w;
            if (!each(v, w)) ok = false;
          }
          if (ok) b.length = live;
        }
    });
    return ok;
  }

  /** The shortcut i-j of the run i..j may replace it: no touching, no vertex changes side. */
  shortcutOk(i: number, j: number): boolean {
    const { X, Y } = this;
    // an arc's vertex ids are consecutive, so the run's current vertices are exactly those with ids in [i, j]
    return this.near(i, j, (v, w) => {
      if (v >= i && v < j) return true;
      if (this.touches(i, j, v, w)) return false;
      for (const p of [v, w]) {
        if ((p >= i && p <= j) || (X[p] === X[i] && Y[p] === Y[i]) || (X[p] === X[j] && Y[p] === Y[j]))
          continue;
        if (this.insideRun(i, j, X[p], Y[p])) return false;
      }
      return true;
    });
  }

  /** Segment v-w meets i-j anywhere other than at one shared end with no overlap. */
  private touches(i: number, j: number, v: number, w: number): boolean {
    const { X, Y } = this;
    const ax = X[i],
      ay = Y[i],
      bx = X[j],
      by = Y[j],
      cx = X[v],
      cy = Y[v],
      dx = X[w],
      dy = Y[w];
    const o1 = orient(ax, ay, bx, by, cx, cy),
      o2 = orient(ax, ay, bx, by, dx, dy);
    const o3 = orient(cx, cy, dx, dy, ax, ay),
      o4 = orient(cx, cy, dx, dy, bx, by);
    const shareA = (cx === ax && cy === ay) || (dx === ax && dy === ay);
    const shareB = (cx === bx && cy === by) || (dx === bx && dy === by);
    if (shareA && shareB) return true; // the same segment
    if (shareA || shareB) {
      if (o1 !== 0 || o2 !== 0) return false; // meets only at the shared end
      // collinear with a shared end: they overlap unless they point away from each other
      const [sx, sy, ox, oy] = shareA ? [ax, ay, bx, by] : [bx, by, ax, ay];
      const [fx, fy] = cx === sx && cy === sy ? [dx, dy] : [cx, cy];
      return (fx - sx) * (ox - sx) + (fy - sy) * (oy - sy) > 0;
    }
    if (o1 !== o2 && o3 !== o4 && o1 !== 0 && o2 !== 0 && o3 !== 0 && o4 !== 0) return true;
    if (o1 === 0 && within(ax, ay, bx, by, cx, cy)) return true;
    if (o2 === 0 && within(ax, ay, bx, by, dx, dy)) return true;
    if (o3 === 0 && within(cx, cy, dx, dy, ax, ay)) return true;
    if (o4 === 0 && within(cx, cy, dx, dy, bx, by)) return true;
    return false;
  }

  /** Even-odd: (px, py) inside the polygon run i..j closed by the segment j-i. */
  private insideRun(i: number, j: number, px: number, py: number): boolean {
    const { X, Y, next } = this;
    let inside = false;
    let a = i;
    for (;;) {
      const b = a === j ? i : next[a];
      const ax = X[a],
        ay = Y[a],
        bx = X[b],
        by = Y[b];
      if (ay > py !== by > py) {
        const cr = (bx - ax) * (py - ay) - (px - ax) * (by - ay);
        if (by > ay ? cr > 0 : cr < 0) inside = !inside;
      }
      if (a === j) break;
      a = b;
    }
    return inside;
  }
}
