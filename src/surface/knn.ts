/**
 * k-nearest-neighbour queries for many query points that come in spatially coherent groups (grid blocks,
 * sample buckets). Samples are sorted into square buckets; each group of queries gathers the samples of
 * the buckets around it once, selects each query's k nearest from that candidate list, and proves the
 * answer: the k-th distance must not exceed the distance from the query to the edge of the gathered
 * region (nothing outside can then be nearer). When the proof fails the region grows by one ring.
 * See docs/surface.md for why this is not a generic kd-tree query per cell.
 */

/** Samples sorted into a uniform bucket grid. Build with {@link buildBuckets}. */
export interface Buckets {
  /** bucket grid origin (south-west corner) and size, metres */
  x0: number;
  y0: number;
  size: number;
  nx: number;
  ny: number;
  /** start of each bucket in the sorted arrays (length nx * ny + 1); bucket index = by * nx + bx */
  start: Int32Array;
  /** sorted sample coordinates relative to (ox, oy), and original indices */
  sx: Float64Array;
  sy: Float64Array;
  si: Int32Array;
  /** origin subtracted from coordinates (keeps distances precise with UTM magnitudes) */
  ox: number;
  oy: number;
}

/**
 * Sorts samples into square buckets of side `size` over the box [x0, x0 + nx*size] x [y0, y0 + ny*size],
 * which must contain every sample. Coordinates are stored relative to (ox, oy).
 * @example const b = buildBuckets(xy, 50, xmin, ymin, 40, 40, xmin, ymax)
 */
export function buildBuckets(
  xy: Float64Array,
  size: number,
  x0: number,
  y0: number,
  nx: number,
  ny: number,
  ox = x0,
  oy = y0,
): Buckets {
  const n = xy.length >> 1;
  const start = new Int32Array(nx * ny + 1);
  const which = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const bx = Math.min(nx - 1, Math.max(0, Math.floor((xy[2 * i] - x0) / size)));
    const by = Math.min(ny - 1, Math.max(0, Math.floor((xy[2 * i + 1] - y0) / size)));
    const b = by * nx + bx;
    which[i] = b;
    start[b + 1]++;
  }
  for (let b = 0; b < nx * ny; b++) start[b + 1] += start[b];
  const fill = start.slice(0, nx * ny);
  const sx = new Float64Array(n),
    sy = new Float64Array(n),
    si = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const k = fill[which[i]]++;
    sx[k] = xy[2 * i] - ox;
    sy[k] = xy[2 * i + 1] - oy;
    si[k] = i;
  }
  return { x0, y0, size, nx, ny, start, sx, sy, si, ox, oy };
}

/**
 * Buckets of about 4 samples each over the box [x0, y0, x1, y1] (at least 1e-6 m wide and high), which must
 * contain every sample.
 * @example const b = fourPerBucket(xy, ringsBbox([xy]))
 */
export function fourPerBucket(xy: Float64Array, [x0, y0, x1, y1]: readonly number[]): Buckets {
  const w = Math.max(x1 - x0, 1e-6),
    h = Math.max(y1 - y0, 1e-6);
  const size = Math.max(Math.sqrt((w * h * 4) / (xy.length >> 1)), 1e-6);
  const nx = Math.max(1, Math.ceil(w / size)),
    ny = Math.max(1, Math.ceil(h / size));
  return buildBuckets(xy, size, x0, y0, nx, ny);
}

/**
 * Gathers candidates for a group of queries and answers each query's k nearest.
 * Reusable per thread of work: holds the scratch arrays.
 */
export class KnnGroup {
  /** candidate coordinates (relative to the buckets' origin) and original indices */
  cx: Float64Array;
  cy: Float64Array;
  ci: Int32Array;
  count = 0;
  /** result of the last {@link nearest}: squared distances ascending and original indices */
  readonly d2: Float64Array;
  readonly idx: Int32Array;
  /** gathered bucket range, inclusive */
  private bxa = 0;
  private bxb = -1;
  private bya = 0;
  private byb = -1;
  /** edges of the gathered region relative to the origin; +-Infinity where it reaches past all buckets */
  private ex0 = 0;
  private ex1 = 0;
  private ey0 = 0;
  private ey1 = 0;
  /** how many ring expansions were needed in total (for tuning and tests) */
  expansions = 0;

  constructor(
    readonly b: Buckets,
    readonly k: number,
    readonly maxD2 = Infinity,
  ) {
    this.cx = new Float64Array(64);
    this.cy = new Float64Array(64);
    this.ci = new Int32Array(64);
    this.d2 = new Float64Array(Math.max(1, k));
    this.idx = new Int32Array(Math.max(1, k));
  }

  /**
   * Starts a group whose queries lie in buckets [bxa..bxb] x [bya..byb]: gathers those buckets plus
   * `ring` more on every side.
   */
  begin(bxa: number, bxb: number, bya: number, byb: number, ring: number): void {
    this.gather(bxa - ring, bxb + ring, bya - ring, byb + ring);
  }

  private gather(bxa: number, bxb: number, bya: number, byb: number): void {
    const b = this.b;
    this.bxa = bxa;
    this.bxb = bxb;
    this.bya = bya;
    this.byb = byb;
    const xa = Math.max(0, bxa),
      xb = Math.min(b.nx - 1, bxb),
      ya = Math.max(0, bya),
      yb = Math.min(b.ny - 1, byb);
    let total = 0;
    for (let by = ya; by <= yb; by++) total += b.start[by * b.nx + xb + 1] - b.start[by * b.nx + xa];
    if (total > this.cx.length) {
      const cap = Math.max(total, this.cx.length * 2);
      this.cx = new Float64Array(cap);
      this.cy = new Float64Array(cap);
      this.ci = new Int32Array(cap);
    }
    let m = 0;
    const { cx, cy, ci } = this;
    for (let by = ya; by <= yb; by++) {
      const s = b.start[by * b.nx + xa],
        e = b.start[by * b.nx + xb + 1];
      for (let j = s; j < e; j++) {
        cx[m] = b.sx[j];
        cy[m] = b.sy[j];
        ci[m] = b.si[j];
        m++;
      }
    }
    this.count = m;
    this.gen++;
    const rx = b.x0 - b.ox,
      ry = b.y0 - b.oy;
    this.ex0 = bxa <= 0 ? -Infinity : rx + bxa * b.size;
    this.ex1 = bxb >= b.nx - 1 ? Infinity : rx + (bxb + 1) * b.size;
    this.ey0 = bya <= 0 ? -Infinity : ry + bya * b.size;
    this.ey1 = byb >= b.ny - 1 ? Infinity : ry + (byb + 1) * b.size;
  }

  /**
   * The k nearest candidates of (qx, qy) (relative to the buckets' origin) within maxD2, excluding
   * original index `skip`; fills d2/idx (ascending when `sorted`) and returns how many were found.
   * Equal distances are broken by the lower original index (input order), so the answer is unique.
   * Grows the gathered region until the answer is proven.
   *
   * Consecutive queries are usually close: the previous query's k-th distance plus the step between the
   * two bounds this query's k-th distance (triangle inequality), so candidates beyond that bound are
   * dropped without a heap or insertion; if too few remain, the pass is redone without the bound.
   */
  nearest(
    qx: number,
    qy: number,
    skip = -1,
    sorted = false,
    outD2: Float64Array = this.d2,
    outIdx: Int32Array = this.idx,
    at = 0,
  ): number {
    const k = this.k,
      maxD2 = this.maxD2,
      d2 = this.d2,
      idx = this.idx;
    let bound = maxD2;
    if (this.prevK2 >= 0) {
      const step = Math.sqrt((qx - this.px) * (qx - this.px) + (qy - this.py) * (qy - this.py));
      const b = Math.sqrt(this.prevK2) + step;
      bound = b * b * (1 + 1e-12) + 1e-12;
      if (bound > maxD2) bound = maxD2;
    }
    this.px = qx;
    this.py = qy;
    if (sorted) return this.nearestSorted(qx, qy, skip, bound, outD2, outIdx, at);
    for (;;) {
      const c = this.within(qx, qy, bound, skip);
      const { sd, si2 } = this;
      if (c < k && bound < maxD2) {
        bound = maxD2;
        continue;
      }
      let found: number;
      let kth: number;
      if (c <= k) {
        found = c;
        kth = 0;
        for (let t = 0; t < c; t++) {
          d2[t] = sd[t];
          idx[t] = si2[t];
          if (sd[t] > kth) kth = sd[t];
        }
        if (sorted) sortPairs(d2, idx, found);
      } else {
        // the k smallest (by distance, then index) moved to the front; position k - 1 holds the k-th
        selectK(sd, si2, c, k);
        found = k;
        kth = sd[k - 1];
        for (let t = 0; t < k; t++) {
          d2[t] = sd[t];
          idx[t] = si2[t];
        }
        if (sorted) sortPairs(d2, idx, found);
      }
      if (this.proven(qx, qy, found === k ? kth : -1)) return found;
    }
  }

  /**
   * {@link nearest} with the answer in ascending (distance, index) order: each candidate within the bound is
   * inserted into the sorted list of the k best so far, whose k-th then tightens the bound (no separate
   * selection and sort). The same answer as selecting and sorting: the k smallest pairs, ties to the lower index.
   */
  private nearestSorted(
    qx: number,
    qy: number,
    skip: number,
    bound: number,
    d2: Float64Array,
    idx: Int32Array,
    o: number,
  ): number {
    const k = this.k,
      maxD2 = this.maxD2,
      last = o + k - 1;
    for (;;) {
      this.rowDy(qy);
      const { cx, ci, rdy } = this;
      const m = this.count;
      let f = 0,
        lim = bound;
      for (let j = 0; j < m; j++) {
        const dx = cx[j] - qx;
        const dd = dx * dx + rdy[j];
        if (dd > lim) continue;
        const id = ci[j];
        if (id === skip) continue;
        let p: number;
        if (f === k) {
          // dd <= the k-th: it enters unless it ties the k-th with a higher index
          if (dd === d2[last] && id > idx[last]) continue;
          p = last;
        } else p = o + f++;
        while (p > o && (d2[p - 1] > dd || (d2[p - 1] === dd && idx[p - 1] > id))) {
          d2[p] = d2[p - 1];
          idx[p] = idx[p - 1];
          p--;
        }
        d2[p] = dd;
        idx[p] = id;
        if (f === k) lim = d2[last];
      }
      if (f < k && bound < maxD2) {
        bound = maxD2;
        continue;
      }
      if (this.proven(qx, qy, f === k ? d2[last] : -1)) return f;
    }
  }

  /**
   * The proof of a query's answer: every point outside the gathered region is at least `edge` away, so the answer
   * stands when its k-th squared distance (`kth2`; -1 when fewer than k were found, which must then hold for the
   * whole search radius) is below edge^2. True: the k-th is kept as the next query's bound. False: the region has
   * grown by one ring of buckets, and the query must be answered again.
   */
  private proven(qx: number, qy: number, kth2: number): boolean {
    const ex = Math.min(qx - this.ex0, this.ex1 - qx),
      ey = Math.min(qy - this.ey0, this.ey1 - qy);
    const edge = ex < ey ? ex : ey;
    const need2 = kth2 >= 0 ? kth2 : this.maxD2;
    if (edge === Infinity || need2 < edge * edge) {
      this.prevK2 = kth2;
      return true;
    }
    this.expansions++;
    this.gather(this.bxa - 1, this.bxb + 1, this.bya - 1, this.byb + 1);
    return false;
  }

  /** Squared y distances of the gathered candidates to the row y = qy (kept while the row and the candidates stay). */
  private rowDy(qy: number): void {
    if (qy === this.rowQy && this.rowGen === this.gen) return;
    if (this.rdy.length < this.cx.length) this.rdy = new Float64Array(this.cx.length);
    const cy = this.cy,
      rdy = this.rdy,
      m = this.count;
    for (let j = 0; j < m; j++) {
      const dy = cy[j] - qy;
      rdy[j] = dy * dy;
    }
    this.rowQy = qy;
    this.rowGen = this.gen;
  }

  /**
   * Gathered candidates within squared distance `bound` of (qx, qy), less original index `skip`, into
   * sd / si2 (unordered); returns how many. Squared y distances are shared by every query on one row
   * (grid cells): computed once per row.
   */
  private within(qx: number, qy: number, bound: number, skip: number): number {
    if (this.sd.length < this.count) {
      this.sd = new Float64Array(this.cx.length);
      this.si2 = new Int32Array(this.cx.length);
    }
    const { cx, ci, sd, si2 } = this;
    const m = this.count;
    this.rowDy(qy);
    const rdy = this.rdy;
    let c = 0;
    for (let j = 0; j < m; j++) {
      const dx = cx[j] - qx;
      const dd = dx * dx + rdy[j];
      if (dd <= bound) {
        sd[c] = dd;
        si2[c] = ci[j];
        c++;
      }
    }
    if (skip >= 0)
      for (let t = 0; t < c; t++)
        if (si2[t] === skip) {
          c--;
          sd[t] = sd[c];
          si2[t] = si2[c];
          break;
        }
    return c;
  }

  /**
   * Drops gathered candidates that cannot be among the k nearest of any query in the rectangle
   * [x0, x1] x [y0, y1] (relative coordinates): the k-th smallest farthest-corner distance bounds every
   * such query's k-th distance, so a candidate whose nearest distance to the rectangle exceeds it (or the
   * search radius) is never chosen. Answers are unchanged; only work is saved.
   * With `nearFirst` the candidates left are also put in order of distance from the rectangle's centre, so that a
   * sorted query ({@link nearest} with `sorted`) meets the near ones first: most then go to the end of its list,
   * and its bound tightens early. The same answers (the k smallest pairs do not depend on the order met); unsorted
   * queries return their neighbours in the order met, so they keep the gathering order.
   */
  prune(x0: number, y0: number, x1: number, y1: number, nearFirst = false): void {
    const m = this.count,
      k = this.k;
    if (m <= k) return;
    if (this.sd.length < this.cx.length) {
      this.sd = new Float64Array(this.cx.length);
      this.si2 = new Int32Array(this.cx.length);
    }
    const { cx, cy, ci, sd, si2 } = this;
    for (let j = 0; j < m; j++) {
      const dx = Math.max(cx[j] - x0, x1 - cx[j]),
        dy = Math.max(cy[j] - y0, y1 - cy[j]);
      sd[j] = dx * dx + dy * dy;
      si2[j] = j;
    }
    selectK(sd, si2, m, k);
    const limit = Math.min(sd[k - 1], this.maxD2);
    let w = 0;
    for (let j = 0; j < m; j++) {
      const x = cx[j],
        y = cy[j];
      const dx = x < x0 ? x0 - x : x > x1 ? x - x1 : 0;
      const dy = y < y0 ? y0 - y : y > y1 ? y - y1 : 0;
      if (dx * dx + dy * dy <= limit) {
        cx[w] = x;
        cy[w] = y;
        ci[w] = ci[j];
        w++;
      }
    }
    this.count = w;
    this.gen++;
    if (nearFirst) this.nearFirst((x0 + x1) / 2, (y0 + y1) / 2);
  }

  /** Puts the gathered candidates in ascending order of squared distance from (px, py) (insertion sort: a few dozen). */
  private nearFirst(px: number, py: number): void {
    const { cx, cy, ci, sd } = this;
    const m = this.count;
    for (let j = 0; j < m; j++) {
      const dx = cx[j] - px,
        dy = cy[j] - py;
      sd[j] = dx * dx + dy * dy;
    }
    for (let i = 1; i < m; i++) {
      const d = sd[i],
        x = cx[i],
        y = cy[i],
        id = ci[i];
      let p = i;
      while (p > 0 && sd[p - 1] > d) {
        sd[p] = sd[p - 1];
        cx[p] = cx[p - 1];
        cy[p] = cy[p - 1];
        ci[p] = ci[p - 1];
        p--;
      }
      sd[p] = d;
      cx[p] = x;
      cy[p] = y;
      ci[p] = id;
    }
  }

  /** Forget the previous query (its bound no longer helps, e.g. at the start of a far-away group). */
  reset(): void {
    this.prevK2 = -1;
  }

  private prevK2 = -1;
  private gen = 0;
  private rowGen = -1;
  private rowQy = NaN;
  private rdy = new Float64Array(64);
  private px = 0;
  private py = 0;
  private sd = new Float64Array(64);
  private si2 = new Int32Array(64);
}

/**
 * Partial selection (Hoare's nth-element): afterwards the k smallest pairs by (distance, index) are in
 * [0, k) and position k - 1 holds the k-th smallest. Keys are unique because indices are.
 */
function selectK(sd: Float64Array, si: Int32Array, c: number, k: number): void {
  let lo = 0,
    hi = c - 1;
  const target = k - 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    const pd = sd[mid],
      pi = si[mid];
    let i = lo,
      j = hi;
    while (i <= j) {
      while (sd[i] < pd || (sd[i] === pd && si[i] < pi)) i++;
      while (sd[j] > pd || (sd[j] === pd && si[j] > pi)) j--;
      if (i <= j) {
        const td = sd[i];
        sd[i] = sd[j];
        sd[j] = td;
        const ti = si[i];
        si[i] = si[j];
        si[j] = ti;
        i++;
        j--;
      }
    }
    if (target <= j) hi = j;
    else if (target >= i) lo = i;
    else break;
  }
}

/** Sorts the first n pairs by distance (insertion sort; n is small). */
function sortPairs(d2: Float64Array, idx: Int32Array, n: number): void {
  for (let i = 1; i < n; i++) {
    const d = d2[i],
      j0 = idx[i];
    let p = i;
    while (p > 0 && (d2[p - 1] > d || (d2[p - 1] === d && idx[p - 1] > j0))) {
      d2[p] = d2[p - 1];
      idx[p] = idx[p - 1];
      p--;
    }
    d2[p] = d;
    idx[p] = j0;
  }
}
