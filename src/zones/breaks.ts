/**
 * Class breaks on a weighted, sorted summary of a driving value: natural breaks (Jenks) by dynamic programming
 * and 1-D k-means. The summary holds the exact distinct values, or equal-width bins when there are too many.
 */

/** Weighted, sorted summary of the finite values: exact distinct values, or binned. */
export interface Summary {
  v: Float64Array;
  w: Float64Array;
  hi: Float64Array;
  min: number;
  max: number;
}

export function summarize(
  values: ArrayLike<number>,
  weights: ArrayLike<number> | undefined,
  bins: number,
): Summary | null {
  let min = Infinity,
    max = -Infinity;
  const n = values.length;
  for (let i = 0; i < n; i++) {
    const x = values[i];
    if (x === x && (weights === undefined || weights[i] > 0)) {
      if (x < min) min = x;
      if (x > max) max = x;
    }
  }
  if (min === Infinity) return null;
  // try exact distinct values first
  const distinct = new Map<number, number>();
  let exact = true;
  for (let i = 0; i < n && exact; i++) {
    const x = values[i];
    if (x !== x) continue;
    const wi = weights === undefined ? 1 : weights[i];
    if (!(wi > 0)) continue;
    distinct.set(x, (distinct.get(x) ?? 0) + wi);
    if (distinct.size > bins) exact = false;
  }
  if (exact) {
    const keys = [...distinct.keys()].sort((a, b) => a - b);
    const v = Float64Array.from(keys),
      w = Float64Array.from(keys, (k) => distinct.get(k)!);
    return { v, w, hi: v, min, max };
  }
  const sw = new Float64Array(bins),
    sv = new Float64Array(bins),
    bh = new Float64Array(bins).fill(-Infinity);
  const scale = bins / (max - min);
  for (let i = 0; i < n; i++) {
    const x = values[i];
    if (x !== x) continue;
    const wi = weights === undefined ? 1 : weights[i];
    if (!(wi > 0)) continue;
    const b = Math.min(bins - 1, Math.floor((x - min) * scale));
    sw[b] += wi;
    sv[b] += wi * x;
    if (x > bh[b]) bh[b] = x;
  }
  let m = 0;
  for (let b = 0; b < bins; b++) if (sw[b] > 0) m++;
  const v = new Float64Array(m),
    w = new Float64Array(m),
    hi = new Float64Array(m);
  for (let b = 0, j = 0; b < bins; b++)
    if (sw[b] > 0) {
      v[j] = sv[b] / sw[b];
      w[j] = sw[b];
      hi[j] = bh[b];
      j++;
    }
  return { v, w, hi, min, max };
}

/**
 * Upper bounds (k - 1 of them) of natural-breaks classes on a weighted, sorted summary (values `v`,
 * weights `w`, largest raw value of each entry `hi`); O(k m log m).
 * @example jenksUppers([1, 2, 3, 10, 11, 12], [1, 1, 1, 1, 1, 1], [1, 2, 3, 10, 11, 12], 2) // [3]
 */
export function jenksUppers(
  v: ArrayLike<number>,
  w: ArrayLike<number>,
  hi: ArrayLike<number>,
  k: number,
): number[] {
  const m = v.length;
  if (k <= 1 || m <= 1) return [];
  k = Math.min(k, m);
  const W = new Float64Array(m + 1),
    S = new Float64Array(m + 1),
    Q = new Float64Array(m + 1);
  for (let i = 0; i < m; i++) {
    W[i + 1] = W[i] + w[i];
    S[i + 1] = S[i] + w[i] * v[i];
    Q[i + 1] = Q[i] + w[i] * v[i] * v[i];
  }
  // ssd of items a..b-1
  const ssd = (a: number, b: number) => {
    const ww = W[b] - W[a],
      s = S[b] - S[a];
    return Math.max(0, Q[b] - Q[a] - (s * s) / ww);
  };
  let prev = new Float64Array(m + 1);
  for (let j = 1; j <= m; j++) prev[j] = ssd(0, j);
  const back: Int32Array[] = [];
  // Each row of the programme is filled by divide and conquer: the best split point is monotone in j for
  // this cost (sum of squared deviations satisfies the quadrangle inequality), so O(m log m) per class.
  for (let c = 2; c <= k; c++) {
    const cur = new Float64Array(m + 1).fill(Infinity);
    const bk = new Int32Array(m + 1);
    const solve = (jlo: number, jhi: number, ilo: number, ihi: number) => {
      if (jlo > jhi) return;
      const j = (jlo + jhi) >> 1;
      let best = Infinity,
        arg = Math.max(c - 1, ilo);
      for (let i = Math.max(c - 1, ilo); i <= Math.min(j - 1, ihi); i++) {
        const t = prev[i] + ssd(i, j);
        if (t < best) {
          best = t;
          arg = i;
        }
      }
      cur[j] = best;
      bk[j] = arg;
      solve(jlo, j - 1, ilo, arg);
      solve(j + 1, jhi, arg, ihi);
    };
    solve(c, m, c - 1, m - 1);
    back.push(bk);
    prev = cur;
  }
  const uppers: number[] = [];
  let j = m;
  for (let c = k; c >= 2; c--) {
    const i = back[c - 2][j];
    uppers.push(hi[i - 1]);
    j = i;
  }
  return uppers.reverse();
}

/**
 * 1-D weighted k-means (Lloyd) on sorted values, started at weighted quantiles; returns sorted centres.
 * @example kmeans1d([1, 2, 3, 10, 11, 12], [1, 1, 1, 1, 1, 1], 2) // [2, 11]
 */
export function kmeans1d(v: ArrayLike<number>, w: ArrayLike<number>, k: number, maxIter = 100): number[] {
  const m = v.length;
  k = Math.min(k, m);
  let total = 0;
  for (let i = 0; i < m; i++) total += w[i];
  const c: number[] = [];
  let acc = 0,
    q = 0;
  for (let i = 0; i < m && q < k; i++) {
    acc += w[i];
    while (q < k && acc >= ((q + 0.5) / k) * total) {
      c.push(v[i]);
      q++;
    }
  }
  const centres = [...new Set(c)];
  for (let it = 0; it < maxIter; it++) {
    const sw = new Float64Array(centres.length),
      sv = new Float64Array(centres.length);
    let j = 0;
    for (let i = 0; i < m; i++) {
      while (j + 1 < centres.length && Math.abs(v[i] - centres[j + 1]) < Math.abs(v[i] - centres[j])) j++;
      sw[j] += w[i];
      sv[j] += w[i] * v[i];
    }
    let moved = false;
    for (let t = 0; t < centres.length; t++) {
      if (sw[t] > 0) {
        const nc = sv[t] / sw[t];
        if (nc !== centres[t]) {
          moved = true;
          centres[t] = nc;
        }
      }
    }
    centres.sort((a, b) => a - b);
    if (!moved) break;
  }
  return centres;
}
