/**
 * Leave-one-out cross-validation of IDW: each sample is predicted from the others, for every candidate
 * power and neighbour count; the table gives RMSE, MAE and bias (mean of predicted - observed) per pair.
 */
import { buildBuckets, KnnGroup } from './knn.js';
import { COINCIDENT_D2 } from './idw.js';

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

/** Weight 1 / d^p from the squared distance, with cheap paths for the default powers. */
function weight(d2: number, p: number): number {
  if (p === 2) return 1 / d2;
  if (p === 1) return 1 / Math.sqrt(d2);
  if (p === 3) return 1 / (d2 * Math.sqrt(d2));
  if (p === 1.5) return 1 / Math.sqrt(d2 * Math.sqrt(d2));
  return 1 / Math.pow(d2, p / 2);
}

/**
 * Leave-one-out cross-validation over powers x neighbour counts. Returns null when fewer than 3 samples.
 * Cost: one k-nearest query per sample for the finite counts (bucketed), and n^2 / 2 distances when
 * "all" is a candidate.
 * @param xy sample positions (metres), duplicates already merged
 * @param z sample values
 * @param opts powers [1, 1.5, 2, 3], neighbours [8, 12, 16, all], radius Infinity, minNeighbours 1
 * @example crossValidate(xy, z).best // { power: 2, neighbours: 12, rmse: ..., ... }
 */
export function crossValidate(xy: Float64Array, z: ArrayLike<number>, opts: CvOptions = {}): CvResult | null {
  const n = xy.length >> 1;
  if (n < 3) return null;
  const powers = opts.powers ?? DEFAULT_POWERS;
  const counts = opts.neighbours ?? DEFAULT_NEIGHBOURS;
  const radius = opts.radius ?? Infinity;
  const minN = Math.max(1, opts.minNeighbours ?? 1);
  const maxD2 = radius * radius;
  const P = powers.length, K = counts.length;
  // accumulators per (power, count): sum e, sum |e|, sum e^2, n
  const se = new Float64Array(P * K), sa = new Float64Array(P * K), sq = new Float64Array(P * K), sn = new Float64Array(P * K);
  const add = (pi: number, ki: number, pred: number, obs: number) => {
    const e = pred - obs, j = pi * K + ki;
    se[j] += e; sa[j] += Math.abs(e); sq[j] += e * e; sn[j]++;
  };

  const finite = counts.map((k, i) => [k, i] as const).filter(([k]) => Number.isFinite(k) && k < n - 1);
  const allIdx = counts.map((k, i) => [k, i] as const).filter(([k]) => !(Number.isFinite(k) && k < n - 1)).map(([, i]) => i);

  if (finite.length) {
    const kmax = Math.max(...finite.map(([k]) => k));
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (let i = 0; i < n; i++) {
      x0 = Math.min(x0, xy[2 * i]); x1 = Math.max(x1, xy[2 * i]);
      y0 = Math.min(y0, xy[2 * i + 1]); y1 = Math.max(y1, xy[2 * i + 1]);
    }
    const w = Math.max(x1 - x0, 1e-6), h = Math.max(y1 - y0, 1e-6);
    const size = Math.max(Math.sqrt((w * h * 4) / n), 1e-6); // about 4 samples per bucket
    const nx = Math.max(1, Math.ceil(w / size)), ny = Math.max(1, Math.ceil(h / size));
    const b = buildBuckets(xy, size, x0, y0, nx, ny);
    const g = new KnnGroup(b, kmax, maxD2);
    const ring = Math.max(1, Math.ceil(Math.sqrt(kmax / 4) / 2 + 0.5));
    for (let by = 0; by < ny; by++) {
      for (let bx = 0; bx < nx; bx++) {
        const bi = by * nx + bx, s = b.start[bi], e = b.start[bi + 1];
        if (s === e) continue;
        g.begin(bx, bx, by, by, ring);
        for (let j = s; j < e; j++) {
          const self = b.si[j];
          const found = g.nearest(b.sx[j], b.sy[j], self, true);
          for (const [k, ki] of finite) {
            const m = Math.min(k, found);
            if (m < minN) continue;
            for (let pi = 0; pi < P; pi++) {
              let pred: number;
              if (g.d2[0] < COINCIDENT_D2) pred = z[g.idx[0]];
              else {
                let num = 0, den = 0;
                for (let t = 0; t < m; t++) {
                  const wt = weight(g.d2[t], powers[pi]);
                  num += wt * z[g.idx[t]]; den += wt;
                }
                pred = num / den;
              }
              add(pi, ki, pred, z[self]);
            }
          }
        }
      }
    }
  }

  if (allIdx.length) {
    // every other sample (within the radius): symmetric weights, each pair once
    const num = new Float64Array(P * n), den = new Float64Array(P * n), cnt = new Int32Array(n), hit = new Int32Array(n).fill(-1);
    const row = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const xi = xy[2 * i], yi = xy[2 * i + 1], zi = z[i];
      // squared distances to the later samples; beyond the radius marked -1
      for (let j = i + 1; j < n; j++) {
        const dx = xy[2 * j] - xi, dy = xy[2 * j + 1] - yi;
        const d2 = dx * dx + dy * dy;
        if (d2 > maxD2) { row[j] = -1; continue; }
        cnt[i]++; cnt[j]++;
        if (d2 < COINCIDENT_D2) { if (hit[i] < 0) hit[i] = j; if (hit[j] < 0) hit[j] = i; row[j] = -1; continue; }
        row[j] = d2;
      }
      for (let pi = 0; pi < P; pi++) {
        const p = powers[pi], o = pi * n;
        let ni = 0, di = 0;
        for (let j = i + 1; j < n; j++) {
          const d2 = row[j];
          if (d2 < 0) continue;
          const wt = p === 2 ? 1 / d2 : p === 1 ? 1 / Math.sqrt(d2) : p === 3 ? 1 / (d2 * Math.sqrt(d2)) : p === 1.5 ? 1 / Math.sqrt(d2 * Math.sqrt(d2)) : 1 / Math.pow(d2, p / 2);
          ni += wt * z[j]; di += wt;
          num[o + j] += wt * zi; den[o + j] += wt;
        }
        num[o + i] += ni; den[o + i] += di;
      }
    }
    for (let i = 0; i < n; i++) {
      if (cnt[i] < minN) continue;
      for (let pi = 0; pi < P; pi++) {
        const pred = hit[i] >= 0 ? z[hit[i]] : num[pi * n + i] / den[pi * n + i];
        for (const ki of allIdx) add(pi, ki, pred, z[i]);
      }
    }
  }

  const table: CvRow[] = [];
  for (let pi = 0; pi < P; pi++) {
    for (let ki = 0; ki < K; ki++) {
      const j = pi * K + ki, m = sn[j];
      table.push({
        power: powers[pi],
        neighbours: counts[ki],
        rmse: m ? Math.sqrt(sq[j] / m) : NaN,
        mae: m ? sa[j] / m : NaN,
        bias: m ? se[j] / m : NaN,
        n: m,
      });
    }
  }
  return { table, best: pickBest(table) };
}

/** The row with the lowest RMSE (the first in table order on ties; rows with no prediction are never chosen). */
export function pickBest(rows: CvRow[]): CvRow {
  let best = rows[0];
  for (const r of rows) if (!(r.rmse >= best.rmse) && !Number.isNaN(r.rmse)) best = r;
  return best;
}
