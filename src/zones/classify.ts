/**
 * Rate classes from a driving value per cell: equal interval, quantile, natural breaks (Jenks)
 * and k-means (1-D), plus k-means on standardized vectors for a zone set shared by several products.
 *
 * Input values are a Float64Array per cell (NaN = no value, e.g. outside the field); optional
 * weights (the grid's `fraction`) make quantiles and class means area-weighted, so an edge cell
 * counts only its inside share. Output classes are an Int16Array (-1 = no value), 0 = lowest class.
 */
import { mulberry32 } from '../stats/random.js';
import { jenksUppers, kmeans1d, summarize, type Summary } from './breaks.js';
import { assign4, moments4, validCells4 } from './classify4.js';

/** How the class breaks are chosen. */
export type ClassMethod = 'equal' | 'quantile' | 'jenks' | 'kmeans';

export interface ClassifyOptions {
  /** class method; default 'jenks' */
  method?: ClassMethod;
  /** largest number of classes; default 5 (fewer when the data have fewer distinct values) */
  classes?: number;
  /** representative values are rounded to a multiple of this step (the machine's rate step); default 1; 0 = no rounding */
  step?: number;
  /** per-cell weights, e.g. Grid.fraction; default 1 per cell with a value */
  weights?: ArrayLike<number>;
  /**
   * Jenks and k-means run on a summary of the values: the exact distinct values when there are at most
   * this many, else this many equal-width bins (each bin at its weighted mean). Default 4096.
   */
  summaryBins?: number;
}

/** Classes of a 1-D driving value. */
export interface Classes {
  /** per cell: class index 0..count-1, -1 where the value is NaN */
  classOf: Int16Array;
  /** number of classes actually used */
  count: number;
  /** count + 1 bounds for legends: [min, upper of class 0, ..., max]; class c holds breaks[c] < v <= breaks[c+1] (class 0 includes its min) */
  breaks: number[];
  /** per class: area-weighted mean of its values */
  mean: number[];
  /** per class: mean rounded to `step` */
  value: number[];
  /** per class: summed weight (cells x fraction) */
  weight: number[];
  method: ClassMethod;
}

function roundTo(x: number, step: number): number {
  if (!(step > 0)) return x;
  const r = Math.round(x / step) * step;
  // trim binary noise (0.1 steps)
  return Number.parseFloat(r.toPrecision(12));
}

/**
 * Splits a driving value per cell into at most N classes.
 *
 * - `equal`: N equal-width intervals between the minimum and maximum;
 * - `quantile`: N classes of equal area (weights);
 * - `jenks`: natural breaks, least within-class squared deviation (exact dynamic programme on the
 *   distinct values, or on 4096 weighted bins when there are more; O(N x 4096 log 4096) at worst);
 * - `kmeans`: 1-D k-means, started at quantiles, breaks midway between sorted centres.
 * Empty classes are dropped, so `count` may be below N. Defaults: jenks, 5 classes, step 1.
 *
 * @example
 * const c = classify(rateGrid, { method: 'quantile', classes: 4, step: 5, weights: grid.fraction });
 * c.breaks // [min, b1, b2, b3, max] for the legend; c.value // per-class rate rounded to 5
 */
export function classify(values: ArrayLike<number>, opts: ClassifyOptions = {}): Classes {
  const method = opts.method ?? 'jenks';
  const k = Math.max(1, Math.floor(opts.classes ?? 5));
  const step = opts.step ?? 1;
  const weights = opts.weights;
  const n = values.length;
  const classOf = new Int16Array(n).fill(-1);
  const s = summarize(values, weights, opts.summaryBins ?? 4096);
  if (!s) return { classOf, count: 0, breaks: [], mean: [], value: [], weight: [], method };
  let uppers = classUppers(method, s, k);
  uppers = [...new Set(uppers.filter((u) => u >= s.min && u < s.max))].sort((a, b) => a - b);
  const bounds = [...uppers, Infinity];
  const raw = new Int16Array(n).fill(-1);
  const cw = new Float64Array(bounds.length),
    cv = new Float64Array(bounds.length);
  for (let i = 0; i < n; i++) {
    const x = values[i];
    if (x !== x) continue;
    const wi = weights === undefined ? 1 : weights[i];
    if (weights !== undefined && !(wi > 0)) continue;
    let lo = 0,
      hi = bounds.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (x <= bounds[mid]) hi = mid;
      else lo = mid + 1;
    }
    raw[i] = lo;
    cw[lo] += wi;
    cv[lo] += wi * x;
  }
  // drop empty classes
  const remap = new Int16Array(bounds.length).fill(-1);
  const breaks = [s.min],
    mean: number[] = [],
    value: number[] = [],
    weight: number[] = [];
  for (let c = 0; c < bounds.length; c++) {
    if (cw[c] > 0) {
      remap[c] = mean.length;
      mean.push(cv[c] / cw[c]);
      value.push(roundTo(cv[c] / cw[c], step));
      weight.push(cw[c]);
      breaks.push(c === bounds.length - 1 ? s.max : bounds[c]);
    } else if (mean.length > 0 && c < bounds.length - 1) {
      breaks[breaks.length - 1] = bounds[c];
    }
  }
  for (let i = 0; i < n; i++) if (raw[i] >= 0) classOf[i] = remap[raw[i]];
  return { classOf, count: mean.length, breaks, mean, value, weight, method };
}

/** Upper class bounds (unsorted, possibly repeated or outside the range) by the chosen method. */
function classUppers(method: ClassMethod, s: Summary, k: number): number[] {
  const uppers: number[] = [];
  if (method === 'equal') {
    for (let c = 1; c < k; c++) uppers.push(s.min + ((s.max - s.min) * c) / k);
  } else if (method === 'quantile') {
    let total = 0;
    for (let i = 0; i < s.w.length; i++) total += s.w[i];
    let acc = 0,
      q = 1;
    for (let i = 0; i < s.v.length && q < k; i++) {
      acc += s.w[i];
      while (q < k && acc >= (q / k) * total - 1e-12 * total) {
        uppers.push(s.hi[i]);
        q++;
      }
    }
  } else if (method === 'jenks') {
    return jenksUppers(s.v, s.w, s.hi, k);
  } else if (method === 'kmeans') {
    const cs = kmeans1d(s.v, s.w, k);
    for (let i = 0; i + 1 < cs.length; i++) uppers.push((cs[i] + cs[i + 1]) / 2);
  } else {
    throw new RangeError(`unknown class method "${String(method)}" (use equal, quantile, jenks or kmeans)`);
  }
  return uppers;
}

/** Classes of several driving values at once (one zone set for a multi-product pass). */
export interface VectorClasses {
  classOf: Int16Array;
  count: number;
  /** per class, per input dimension: area-weighted mean in the input's units */
  mean: number[][];
  /** the same rounded to each dimension's step */
  value: number[][];
  weight: number[];
}

/**
 * k-means on standardized vectors: each dimension (e.g. the N, P2O5 and S targets of one pass) is
 * centred and divided by its area-weighted standard deviation, so no nutrient dominates by its units.
 * Centres are fitted on a seeded sample of at most `sample` cells (default 20000; k-means++ start),
 * then every cell takes its nearest centre. A cell with NaN in any dimension gets -1. Classes are
 * numbered by ascending sum of standardized centre coordinates (class 0 = lowest overall need).
 *
 * @example
 * const vc = classifyVectors([nTarget, pTarget], { classes: 4, steps: [5, 5], weights: grid.fraction });
 * vc.value[2] // [N rate, P2O5 rate] of class 2
 */
export function classifyVectors(
  dims: ArrayLike<number>[],
  opts: {
    classes?: number;
    steps?: number[];
    weights?: ArrayLike<number>;
    sample?: number;
    seed?: number;
    maxIter?: number;
  } = {},
): VectorClasses {
  const d = dims.length;
  if (d === 0) throw new RangeError('classifyVectors needs at least one dimension');
  const n = dims[0].length;
  const k = Math.max(1, Math.floor(opts.classes ?? 5));
  const weights = opts.weights;
  const valid = validCells(dims, weights);
  const classOf = new Int16Array(n).fill(-1);
  if (valid.length === 0) return { classOf, count: 0, mean: [], value: [], weight: [] };
  const { mu, sd } = standardization(dims, valid, weights);
  const z: Standardized = (i, j) => (dims[j][i] - mu[j]) / sd[j];
  const rnd = mulberry32(opts.seed ?? 1);
  const m = Math.min(valid.length, opts.sample ?? 20000);
  const sample: number[] = [];
  if (m === valid.length) sample.push(...valid);
  else for (let t = 0; t < m; t++) sample.push(valid[Math.floor(rnd() * valid.length)]);
  const zs = sampleVectors(sample, z, d);
  const cent = kmeansPlusPlus(zs, d, k, rnd);
  lloyd(zs, d, cent, opts.maxIter ?? 50);
  return vectorClasses(dims, valid, weights, cent, mu, sd, classOf, opts.steps);
}

/** The cells with a weight and a value in every dimension, as one flat array (millions of cells). */
function validCells(dims: ArrayLike<number>[], weights: ArrayLike<number> | undefined): Int32Array {
  if (dims.length === 4) return validCells4(dims, weights);
  return validCellsAny(dims, weights);
}

/** {@link validCells} for any number of dimensions. */
function validCellsAny(dims: ArrayLike<number>[], weights: ArrayLike<number> | undefined): Int32Array {
  const d = dims.length,
    n = dims[0].length;
  const ok = new Uint8Array(n);
  let nValid = 0;
  for (let i = 0; i < n; i++) {
    if (weights !== undefined && !(weights[i] > 0)) continue;
    let all = 1;
    for (let j = 0; j < d; j++) {
      const x = dims[j][i];
      if (x !== x) {
        all = 0;
        break;
      }
    }
    ok[i] = all;
    nValid += all;
  }
  const valid = new Int32Array(nValid);
  for (let i = 0, t = 0; i < n; i++) if (ok[i] === 1) valid[t++] = i;
  return valid;
}

type Standardized = (i: number, j: number) => number;

/** Weighted mean and standard deviation (1 where it is 0) of each dimension over the valid cells. */
function standardization(
  dims: ArrayLike<number>[],
  valid: Int32Array,
  weights: ArrayLike<number> | undefined,
): { mu: Float64Array; sd: Float64Array } {
  const d = dims.length;
  const mu = new Float64Array(d),
    sd = new Float64Array(d);
  // one dimension at a time: each sum still adds the cells in order, so the figures are those of a
  // cell-by-cell loop, while each loop reads one array
  let tw = 0;
  for (let t = 0; t < valid.length; t++) tw += weights ? weights[valid[t]] : 1;
  // sd holds the sums of squared deviations until the end
  if (d === 4) moments4(dims, valid, weights, tw, mu, sd);
  else
    for (let j = 0; j < d; j++) {
      const col = dims[j];
      let s = 0;
      for (let t = 0; t < valid.length; t++) {
        const i = valid[t];
        s += (weights ? weights[i] : 1) * col[i];
      }
      mu[j] = s / tw;
      const m = mu[j];
      let q = 0;
      for (let t = 0; t < valid.length; t++) {
        const i = valid[t];
        q += (weights ? weights[i] : 1) * (col[i] - m) ** 2;
      }
      sd[j] = q;
    }
  for (let j = 0; j < d; j++) {
    sd[j] = Math.sqrt(sd[j] / tw);
    if (!(sd[j] > 0)) sd[j] = 1;
  }
  return { mu, sd };
}

/** k-means++ start: the first centre at random, each next one drawn with probability by squared distance. */
function kmeansPlusPlus(zs: Float64Array, d: number, k: number, rnd: () => number): Float64Array[] {
  const m = zs.length / d;
  const row = (s: number) => zs.slice(s * d, s * d + d);
  const cent: Float64Array[] = [row(Math.floor(rnd() * m))];
  const dist = new Float64Array(m).fill(Infinity);
  while (cent.length < k) {
    const c = cent[cent.length - 1];
    let sum = 0;
    for (let s = 0; s < m; s++) {
      let dd = 0;
      for (let j = 0; j < d; j++) dd += (zs[s * d + j] - c[j]) ** 2;
      if (dd < dist[s]) dist[s] = dd;
      sum += dist[s];
    }
    if (!(sum > 0)) break;
    let r = rnd() * sum,
      pick = m - 1;
    for (let s = 0; s < m; s++) {
      r -= dist[s];
      if (r <= 0) {
        pick = s;
        break;
      }
    }
    cent.push(row(pick));
  }
  return cent;
}

/** Lloyd iterations on the sample, moving `cent` in place until the centres move less than 1e-9 in all. */
function lloyd(zs: Float64Array, d: number, cent: Float64Array[], maxIter: number): void {
  const m = zs.length / d;
  const acc = cent.map(() => new Float64Array(d + 1));
  // cell targets come from a table of lab-precision values, so the sample holds few distinct vectors: each
  // distinct vector's nearest centre is found once per pass and every sample takes its vector's; the centres'
  // sums still add the samples in order (the same figures as finding each sample's centre on its own)
  const { of, first } = distinctVectors(zs, d);
  const u = first.length;
  const near = new Int32Array(u);
  for (let it = 0; it < maxIter; it++) {
    for (const a of acc) a.fill(0);
    for (let v = 0; v < u; v++) {
      const o = first[v] * d;
      let best = Infinity,
        arg = 0;
      for (let c = 0; c < cent.length; c++) {
        let dd = 0;
        for (let j = 0; j < d; j++) dd += (zs[o + j] - cent[c][j]) ** 2;
        if (dd < best) {
          best = dd;
          arg = c;
        }
      }
      near[v] = arg;
    }
    for (let s = 0; s < m; s++) {
      const o = s * d;
      const a = acc[near[of[s]]];
      for (let j = 0; j < d; j++) a[j] += zs[o + j];
      a[d] += 1;
    }
    let moved = 0;
    for (let c = 0; c < cent.length; c++) {
      if (acc[c][d] === 0) continue;
      for (let j = 0; j < d; j++) {
        const v = acc[c][j] / acc[c][d];
        moved += Math.abs(v - cent[c][j]);
        cent[c][j] = v;
      }
    }
    if (moved < 1e-9) break;
  }
}

/**
 * The distinct vectors of rows of `d` values: per row the number of its vector (`of`), and per vector the
 * first row holding it (`first`). Vectors are equal when every value is (0 and -0 alike: they are as far
 * from every centre).
 */
function distinctVectors(zs: Float64Array, d: number): { of: Int32Array; first: number[] } {
  const m = zs.length / d;
  const of = new Int32Array(m);
  const first: number[] = [];
  const seen = new Map<string, number>();
  for (let s = 0; s < m; s++) {
    let key = '';
    for (let j = 0; j < d; j++) key += (j ? ',' : '') + zs[s * d + j];
    let v = seen.get(key);
    if (v === undefined) {
      v = first.length;
      first.push(s);
      seen.set(key, v);
    }
    of[s] = v;
  }
  return { of, first };
}

/** The sample cells' standardized vectors, row by row (cell s's dimension j at s * d + j). */
function sampleVectors(sample: number[], z: Standardized, d: number): Float64Array {
  const zs = new Float64Array(sample.length * d);
  for (let s = 0; s < sample.length; s++) for (let j = 0; j < d; j++) zs[s * d + j] = z(sample[s], j);
  return zs;
}

/**
 * Every valid cell to its nearest centre, classes numbered by ascending sum of standardized centre coordinates,
 * empty classes dropped; per class the area-weighted mean of each dimension and its value rounded to the step.
 * Each cell is standardized once ((value - mu) / sd per dimension) and compared with a flat array of centres.
 */
function vectorClasses(
  dims: ArrayLike<number>[],
  valid: Int32Array,
  weights: ArrayLike<number> | undefined,
  cent: Float64Array[],
  mu: Float64Array,
  sd: Float64Array,
  classOf: Int16Array,
  steps: number[] | undefined,
): VectorClasses {
  const d = dims.length,
    kc = cent.length;
  const order = cent.map((c, idx) => ({ idx, s: c.reduce((a, b) => a + b, 0) })).sort((a, b) => a.s - b.s);
  const rank = new Int16Array(kc);
  order.forEach((o, r) => (rank[o.idx] = r));
  const cf = new Float64Array(kc * d);
  cent.forEach((c, ci) => cf.set(c, ci * d));
  const sw = new Float64Array(kc),
    smf = new Float64Array(kc * d);
  if (d === 4) assign4(dims, valid, weights, cf, kc, rank, mu, sd, classOf, sw, smf);
  else assignAny(dims, valid, weights, cf, kc, rank, mu, sd, classOf, sw, smf);
  const sm = cent.map((_, c) => smf.subarray(c * d, c * d + d));
  // drop empty classes
  const remap = new Int16Array(cent.length).fill(-1);
  const mean: number[][] = [],
    value: number[][] = [],
    weight: number[] = [];
  for (let c = 0; c < cent.length; c++) {
    if (!(sw[c] > 0)) continue;
    remap[c] = mean.length;
    const mc = Array.from(sm[c], (x) => x / sw[c]);
    mean.push(mc);
    value.push(mc.map((x, j) => roundTo(x, steps?.[j] ?? 1)));
    weight.push(sw[c]);
  }
  for (let t = 0; t < valid.length; t++) classOf[valid[t]] = remap[classOf[valid[t]]];
  return { classOf, count: mean.length, mean, value, weight };
}

/**
 * {@link assign4} for any number of dimensions: each valid cell's nearest centre, as its rank, into `classOf`, and
 * per class the weight and weighted value sums in cell order.
 */
function assignAny(
  ...[dims, valid, weights, cf, kc, rank, mu, sd, classOf, sw, smf]: Parameters<typeof assign4>
): void {
  const d = dims.length;
  const zi = new Float64Array(d);
  // neighbouring cells mostly carry the same targets (they come from a table of lab-precision values):
  // a cell whose values equal the previous valid cell's takes its class without the distances
  const prev = new Float64Array(d).fill(NaN);
  let arg = 0;
  for (let t = 0; t < valid.length; t++) {
    const i = valid[t];
    let same = true;
    for (let j = 0; j < d; j++) {
      const x = dims[j][i];
      if (x !== prev[j]) {
        same = false;
        prev[j] = x;
      }
    }
    if (!same) {
      for (let j = 0; j < d; j++) zi[j] = (prev[j] - mu[j]) / sd[j];
      let best = Infinity;
      arg = 0;
      for (let c = 0; c < kc; c++) {
        let dd = 0;
        for (let j = 0; j < d; j++) dd += (zi[j] - cf[c * d + j]) ** 2;
        if (dd < best) {
          best = dd;
          arg = c;
        }
      }
    }
    const c = rank[arg];
    classOf[i] = c;
    const wi = weights ? weights[i] : 1;
    sw[c] += wi;
    for (let j = 0; j < d; j++) smf[c * d + j] += wi * dims[j][i];
  }
}
