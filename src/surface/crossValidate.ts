/**
 * Leave-one-out cross-validation of IDW: each sample is predicted from the others, for every candidate
 * power and neighbour count; the table gives RMSE, MAE and bias (mean of predicted - observed) per pair.
 */
import { sampleNeighbours, type SampleNeighbours } from './neighbours.js';
import { COINCIDENT_D2, idwWeight as weight } from './idw.js';

/** One row of the cross-validation table. */
export interface CvRow {
  /** 'kriging' for the ordinary-kriging row the surface stage adds; IDW otherwise (absent = IDW) */
  method?: 'idw' | 'kriging';
  /** IDW power (NaN for kriging) */
  power: number;
  /** neighbour count; Infinity = all samples */
  neighbours: number;
  rmse: number;
  mae: number;
  /** mean of (predicted - observed) */
  bias: number;
  /** kriging only: mean standardized squared error, mean(e^2 / kriging variance); near 1 when the variances fit */
  msse?: number;
  /** samples predicted (a sample with no neighbour within the radius is not) */
  n: number;
}

/** Result of {@link crossValidate}. */
export interface CvResult {
  table: CvRow[];
  /** the row with the lowest RMSE (first in table order on ties) */
  best: CvRow;
}

/** Options for {@link crossValidate}. */
export interface CvOptions {
  /** candidate powers (default 1, 1.5, 2, 3) */
  powers?: number[];
  /** candidate neighbour counts, Infinity = all (default 8, 12, 16, all) */
  neighbours?: number[];
  /** search radius, metres (default Infinity) */
  radius?: number;
  /** a sample with fewer neighbours than this is not predicted (default 1) */
  minNeighbours?: number;
}

export const DEFAULT_POWERS = [1, 1.5, 2, 3];
export const DEFAULT_NEIGHBOURS = [8, 12, 16, Infinity];

/**
 * Leave-one-out cross-validation over powers x neighbour counts. Returns null when fewer than 3 samples.
 * Cost: one k-nearest query per sample for the finite counts (bucketed), and n^2 / 2 distances when
 * "all" is a candidate. For several analytes at the same sites use {@link crossValidateMany} (one search).
 * @param xy sample positions (metres), duplicates already merged
 * @param z sample values
 * @param opts powers [1, 1.5, 2, 3], neighbours [8, 12, 16, all], radius Infinity, minNeighbours 1
 * @example crossValidate(xy, z).best // { power: 2, neighbours: 12, rmse: ..., ... }
 */
export function crossValidate(xy: Float64Array, z: ArrayLike<number>, opts: CvOptions = {}): CvResult | null {
  return crossValidateMany(xy, [z], opts)[0];
}

/** Sums of errors per (power, count) cell of the table, for one analyte. */
class Acc {
  se: Float64Array;
  sa: Float64Array;
  sq: Float64Array;
  sn: Float64Array;
  constructor(
    readonly P: number,
    readonly K: number,
  ) {
    this.se = new Float64Array(P * K);
    this.sa = new Float64Array(P * K);
    this.sq = new Float64Array(P * K);
    this.sn = new Float64Array(P * K);
  }
  add(pi: number, ki: number, pred: number, obs: number): void {
    const e = pred - obs,
      j = pi * this.K + ki;
    this.se[j] += e;
    this.sa[j] += Math.abs(e);
    this.sq[j] += e * e;
    this.sn[j]++;
  }
}

/**
 * Leave-one-out cross-validation of several value sets at the same sample sites (e.g. every analyte of one
 * sample set): one leave-one-out neighbour search (the largest finite count) and one pass over sample pairs
 * for "all" serve every set; each set's table is identical to its own {@link crossValidate}.
 * @param zs one value array per set, each aligned with xy
 * @param opts as {@link crossValidate}
 * @example const [pCv, kCv] = crossValidateMany(xy, [pVals, kVals])
 */
export function crossValidateMany(
  xy: Float64Array,
  zs: ArrayLike<number>[],
  opts: CvOptions = {},
): (CvResult | null)[] {
  const n = xy.length >> 1;
  if (n < 3) return zs.map(() => null);
  const powers = opts.powers ?? DEFAULT_POWERS;
  const counts = opts.neighbours ?? DEFAULT_NEIGHBOURS;
  const radius = opts.radius ?? Infinity;
  const minN = Math.max(1, opts.minNeighbours ?? 1);
  const accs = zs.map(() => new Acc(powers.length, counts.length));
  const finite = counts.map((k, i) => [k, i] as const).filter(([k]) => Number.isFinite(k) && k < n - 1);
  const allIdx = counts
    .map((k, i) => [k, i] as const)
    .filter(([k]) => !(Number.isFinite(k) && k < n - 1))
    .map(([, i]) => i);
  if (finite.length) {
    const nb = sampleNeighbours(xy, Math.max(...finite.map(([k]) => k)), radius);
    zs.forEach((z, a) => finiteCounts(nb, z, powers, finite, minN, accs[a]));
  }
  if (allIdx.length) allOthers(xy, zs, powers, radius * radius, minN, allIdx, accs);
  return accs.map((acc) => {
    const table: CvRow[] = [];
    for (let pi = 0; pi < powers.length; pi++) {
      for (let ki = 0; ki < counts.length; ki++) {
        const j = pi * counts.length + ki,
          m = acc.sn[j];
        table.push({
          power: powers[pi],
          neighbours: counts[ki],
          rmse: m ? Math.sqrt(acc.sq[j] / m) : NaN,
          mae: m ? acc.sa[j] / m : NaN,
          bias: m ? acc.se[j] / m : NaN,
          n: m,
        });
      }
    }
    return { table, best: pickBest(table) };
  });
}

/** Finite neighbour counts from the shared leave-one-out lists (nearest first), samples in search order. */
function finiteCounts(
  nb: SampleNeighbours,
  z: ArrayLike<number>,
  powers: number[],
  finite: (readonly [number, number])[],
  minN: number,
  acc: Acc,
): void {
  const K = nb.k;
  for (let t = 0; t < nb.order.length; t++) {
    const self = nb.order[t],
      found = nb.found[self],
      o = self * K;
    for (const [k, ki] of finite) {
      const m = Math.min(k, found);
      if (m < minN) continue;
      for (let pi = 0; pi < powers.length; pi++) {
        let pred: number;
        if (nb.d2[o] < COINCIDENT_D2) pred = z[nb.idx[o]];
        else {
          let num = 0,
            den = 0;
          for (let t2 = 0; t2 < m; t2++) {
            const wt = weight(nb.d2[o + t2], powers[pi]);
            num += wt * z[nb.idx[o + t2]];
            den += wt;
          }
          pred = num / den;
        }
        acc.add(pi, ki, pred, z[self]);
      }
    }
  }
}

/**
 * "All other samples" (within the radius) for every value set: symmetric weights, each pair once; the
 * distances and each power's weight are computed once per pair and shared by the sets.
 */
function allOthers(
  xy: Float64Array,
  zs: ArrayLike<number>[],
  powers: number[],
  maxD2: number,
  minN: number,
  allIdx: number[],
  accs: Acc[],
): void {
  const n = xy.length >> 1,
    P = powers.length,
    A = zs.length;
  const num = zs.map(() => new Float64Array(P * n)),
    den = new Float64Array(P * n);
  const cnt = new Int32Array(n),
    hit = new Int32Array(n).fill(-1);
  const row = new Float64Array(n),
    wrow = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const xi = xy[2 * i],
      yi = xy[2 * i + 1];
    // squared distances to the later samples; beyond the radius or coincident marked -1
    for (let j = i + 1; j < n; j++) {
      const dx = xy[2 * j] - xi,
        dy = xy[2 * j + 1] - yi;
      const d2 = dx * dx + dy * dy;
      if (d2 > maxD2) {
        row[j] = -1;
        continue;
      }
      cnt[i]++;
      cnt[j]++;
      if (d2 < COINCIDENT_D2) {
        if (hit[i] < 0) hit[i] = j;
        if (hit[j] < 0) hit[j] = i;
        row[j] = -1;
        continue;
      }
      row[j] = d2;
    }
    for (let pi = 0; pi < P; pi++) {
      const p = powers[pi],
        o = pi * n;
      let di = 0;
      for (let j = i + 1; j < n; j++) {
        const d2 = row[j];
        if (d2 < 0) {
          wrow[j] = 0;
          continue;
        }
        const wt = weight(d2, p);
        wrow[j] = wt;
        di += wt;
        den[o + j] += wt;
      }
      den[o + i] += di;
      for (let a = 0; a < A; a++) sumSide(row, wrow, zs[a], num[a], o, i, n);
    }
  }
  for (let a = 0; a < A; a++) {
    const z = zs[a];
    for (let i = 0; i < n; i++) {
      if (cnt[i] < minN) continue;
      for (let pi = 0; pi < P; pi++) {
        const pred = hit[i] >= 0 ? z[hit[i]] : num[a][pi * n + i] / den[pi * n + i];
        for (const ki of allIdx) accs[a].add(pi, ki, pred, z[i]);
      }
    }
  }
}

/** Sample i's weighted sum over the later samples, and i's share added to each of them. */
function sumSide(
  row: Float64Array,
  wrow: Float64Array,
  z: ArrayLike<number>,
  num: Float64Array,
  o: number,
  i: number,
  n: number,
): void {
  const zi = z[i];
  let ni = 0;
  for (let j = i + 1; j < n; j++) {
    if (row[j] < 0) continue;
    const wt = wrow[j];
    ni += wt * z[j];
    num[o + j] += wt * zi;
  }
  num[o + i] += ni;
}

/** The row with the lowest RMSE (the first in table order on ties; rows with no prediction are never chosen). */
export function pickBest(rows: CvRow[]): CvRow {
  let best = rows[0];
  for (const r of rows) if (!(r.rmse >= best.rmse) && !Number.isNaN(r.rmse)) best = r;
  return best;
}
