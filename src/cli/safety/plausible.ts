/**
 * Soil values that cannot be right: outside a plausible range for the analyte (a typo, a unit mix-up, 1e300) is
 * refused with the sample's row and the fix; a value far from its neighbours' is named in a warning (and so in
 * the report), since a real hot spot and a mislabelled bag look alike and only the user can tell. Pure.
 */
import type { Warning } from '../../errors.js';
import type { Analyte, Samples } from '../../types.js';
import { sampleNeighbours } from '../../surface/neighbours.js';
import { ANALYTE_NAME } from '../../vocabulary.js';

/**
 * Plausible ranges in tilth's canonical units (common practice, prairie soil tests: values beyond these come
 * from typing or unit errors, not from soils). Olsen P above 200 ppm and modified Kelowna above 300 ppm occur
 * only on heavily manured ground; nitrate-N and sulphate-S in lb/ac 0-24 in; saline soils hold thousands of
 * lb sulphate-S.
 */
export const PLAUSIBLE: Record<Analyte, { min: number; max: number; unit: string }> = {
  no3_n: { min: 0, max: 600, unit: 'lb/ac 0-24 in' },
  p: { min: 0, max: 200, unit: 'ppm (Olsen)' },
  k: { min: 0, max: 2000, unit: 'ppm' },
  so4_s: { min: 0, max: 5000, unit: 'lb/ac 0-24 in' },
  om: { min: 0, max: 80, unit: '%' },
  ph: { min: 2, max: 11, unit: '' },
};
/** Modified Kelowna P reads higher than Olsen: up to 300 ppm. */
export const PLAUSIBLE_P_KELOWNA_MAX = 300;

/**
 * Values outside {@link PLAUSIBLE}, one message each (at most `limit`), naming the sample, its row and the fix.
 * @example implausibleValues(samples) // ['samples.csv rows 12-13, sample "HQ-06": P 1500 ppm (Olsen) is outside 0-200 ...']
 */
export function implausibleValues(s: Samples, limit = 5): string[] {
  const out: string[] = [];
  for (const a of Object.keys(PLAUSIBLE) as Analyte[]) {
    const v = s.values[a];
    if (!v) continue;
    const r = PLAUSIBLE[a];
    const max = a === 'p' && s.pMethod === 'kelowna' ? PLAUSIBLE_P_KELOWNA_MAX : r.max;
    const unit = a === 'p' && s.pMethod === 'kelowna' ? 'ppm (modified Kelowna)' : r.unit;
    for (let i = 0; i < v.length && out.length < limit; i++) {
      const x = v[i]!;
      if (Number.isNaN(x) || (x >= r.min && x <= max)) continue;
      out.push(
        `${s.origin[i] ?? `sample ${i + 1}`}, sample "${s.ids[i]}": ${ANALYTE_NAME[a]} ${x} ${unit} is outside the plausible ${r.min}-${max} (common practice); a typing or unit error? Fix: correct the value, or leave the cell empty if it was not tested.`,
      );
    }
  }
  return out;
}

/** Median of a small array (sorted copy). */
function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Samples compared with their neighbours: at most 5 000 (brute-force neighbours, 25 million distances). */
export const OUTLIER_MAX_SAMPLES = 5_000;
/** Neighbours a sample is compared with: 6. */
export const OUTLIER_NEIGHBOURS = 6;
/** Robust z above which a value is named: 5 (residual from the neighbours' median over 1.4826 x the median absolute residual). */
export const OUTLIER_Z = 5;

/** Also required: a factor of {@link OUTLIER_FACTOR} from the neighbours' median (pH: 1.5 units), so natural hot spots (saline sulphate, a manure strip) pass. */
export const OUTLIER_FACTOR = 3;
const farOff = (a: Analyte, v: number, med: number) =>
  a === 'ph' ? Math.abs(v - med) > 1.5 : v > OUTLIER_FACTOR * med || v * OUTLIER_FACTOR < med;

/** The values of one analyte that the neighbour test flags: sample indices and their neighbours' medians. */
export interface OutlierFinding {
  analyte: Analyte;
  index: number[];
  neighbourMedian: number[];
}

/** What to do with flagged values: keep them in the maps (the default) or leave them out of interpolation. */
export type OutlierMode = 'keep' | 'drop';

/**
 * The nearest others of each sample (at most {@link OUTLIER_NEIGHBOURS}), by Math.hypot, ties to the lower index:
 * sample i's are idx[i * OUTLIER_NEIGHBOURS + t] for t < count[i], nearest first.
 */
function nearestOthers(xy: Float64Array, n: number): { idx: Int32Array; count: Int32Array } {
  // a few more than needed from the shared bucketed search (linear, not every pair), then ordered as a sort of
  // every distance would order them (insertion into scratch arrays: a few thousand samples, no garbage)
  const near = sampleNeighbours(xy, OUTLIER_NEIGHBOURS + 4);
  const K = OUTLIER_NEIGHBOURS;
  const idx = new Int32Array(n * K),
    count = new Int32Array(n);
  const dd = new Float64Array(near.k),
    jj = new Int32Array(near.k);
  for (let i = 0; i < n; i++) {
    let m = 0;
    for (let t = 0; t < near.found[i]!; t++) {
      const j = near.idx[i * near.k + t]!;
      const d = Math.hypot(xy[2 * i]! - xy[2 * j]!, xy[2 * i + 1]! - xy[2 * j + 1]!);
      let p = m++;
      while (p > 0 && (dd[p - 1]! > d || (dd[p - 1] === d && jj[p - 1]! > j))) {
        dd[p] = dd[p - 1]!;
        jj[p] = jj[p - 1]!;
        p--;
      }
      dd[p] = d;
      jj[p] = j;
    }
    count[i] = Math.min(m, K);
    for (let t = 0; t < count[i]!; t++) idx[i * K + t] = jj[t]!;
  }
  return { idx, count };
}

/**
 * A robust neighbour test: each value's residual from the median of its {@link OUTLIER_NEIGHBOURS} nearest
 * samples, scaled by 1.4826 x the median absolute residual of the field (the MAD, a standard deviation for
 * normal data; Iglewicz & Hoaglin 1993 use 3.5 on the modified z, tilth flags only beyond {@link OUTLIER_Z}).
 * @returns one finding per analyte with flagged values (none for fewer than 8 or more than 5 000 samples)
 * @example findNeighbourOutliers(samples).map((f) => f.analyte) // ['p']
 */
export function findNeighbourOutliers(s: Samples): OutlierFinding[] {
  const n = s.ids.length;
  if (n < OUTLIER_NEIGHBOURS + 2 || n > OUTLIER_MAX_SAMPLES) return [];
  const nb = nearestOthers(s.xy, n);
  const K = OUTLIER_NEIGHBOURS;
  const around = new Float64Array(K);
  const found: OutlierFinding[] = [];
  for (const a of ['no3_n', 'p', 'k', 'so4_s', 'om', 'ph'] as Analyte[]) {
    const v = s.values[a];
    if (!v) continue;
    const res = new Float64Array(n).fill(NaN);
    for (let i = 0; i < n; i++) {
      if (Number.isNaN(v[i]!)) continue;
      // the neighbours' values (NaN left out) in ascending order, for their median
      let m = 0;
      for (let t = 0; t < nb.count[i]!; t++) {
        const x = v[nb.idx[i * K + t]!]!;
        if (Number.isNaN(x)) continue;
        let p = m++;
        while (p > 0 && around[p - 1]! > x) {
          around[p] = around[p - 1]!;
          p--;
        }
        around[p] = x;
      }
      if (m < 3) continue;
      const h = m >> 1;
      res[i] = v[i]! - (m % 2 ? around[h]! : (around[h - 1]! + around[h]!) / 2);
    }
    const abs = [...res].filter((x) => !Number.isNaN(x)).map(Math.abs);
    if (abs.length < OUTLIER_NEIGHBOURS) continue;
    const scale = 1.4826 * median(abs);
    if (!(scale > 0)) continue;
    const f: OutlierFinding = { analyte: a, index: [], neighbourMedian: [] };
    for (let i = 0; i < n; i++)
      if (Math.abs(res[i]!) / scale > OUTLIER_Z && farOff(a, v[i]!, v[i]! - res[i]!)) {
        f.index.push(i);
        f.neighbourMedian.push(v[i]! - res[i]!);
      }
    if (f.index.length) found.push(f);
  }
  return found;
}

/** Sample ids named in full in a message about dropped values; the rest are counted. */
const NAMED_DROPPED = 50;

/**
 * The neighbour test's warnings (code `neighbour-outlier`), one per analyte with flagged values, saying whether
 * the values were kept (the default) or dropped from interpolation, why, and how to choose the other.
 * @param mode what was done with them (default keep)
 * @param why where that choice came from, for the message (default: "the default" for keep, "--outliers drop")
 * @example neighbourOutliers(samples, 'samples.csv') // [{ code: 'neighbour-outlier', message: '... kept (the default; ...' }]
 */
export function neighbourOutliers(
  s: Samples,
  file: string,
  mode: OutlierMode = 'keep',
  why = mode === 'keep' ? 'the default' : '--outliers drop',
  found: OutlierFinding[] = findNeighbourOutliers(s),
): Warning[] {
  return found.map((f) => {
    const k = f.index.length;
    const show = mode === 'drop' ? NAMED_DROPPED : 5;
    const named = f.index.map(
      (i, t) =>
        `"${s.ids[i]}" (${s.values[f.analyte][i]}, neighbours' median ${Math.round(f.neighbourMedian[t]! * 100) / 100})`,
    );
    const list = `${named.slice(0, show).join(', ')}${k > show ? ` and ${k - show} more` : ''}`;
    const test = `differ${k > 1 ? '' : 's'} from ${k > 1 ? 'their' : 'its'} ${OUTLIER_NEIGHBOURS} nearest samples by more than ${OUTLIER_Z} robust standard deviations (neighbour outlier test)`;
    const ids = f.index.map((i) => s.ids[i]);
    const tail =
      mode === 'drop'
        ? `; dropped from the maps (${why}): the value${k > 1 ? 's are' : ' is'} left out of interpolation, the sample${k > 1 ? 's' : ''} kept for other nutrients. Dropped: ${ids.slice(0, NAMED_DROPPED).join(', ')}${k > NAMED_DROPPED ? ` and ${k - NAMED_DROPPED} more` : ''}. Check the lab report and the bag labels.`
        : `; ${k > 1 ? 'they are' : 'it is'} kept (${why}; --outliers drop or plan key soil_test.outliers: drop leaves flagged values out of the maps). Check the lab report and the bag labels; if ${k > 1 ? 'one is' : 'it is'} wrong, correct or remove it.`;
    return {
      code: 'neighbour-outlier',
      file,
      field: f.analyte,
      where: named.join('; '),
      message: `${file}: ${ANALYTE_NAME[f.analyte]} of sample${k > 1 ? 's' : ''} ${list} ${test}${tail}`,
    };
  });
}

/**
 * Leaves flagged values out: each becomes "not tested" (NaN, not censored) for its analyte only; the sample and
 * its other values stay. Changes `s` in place.
 * @example dropOutlierValues(samples, findNeighbourOutliers(samples))
 */
export function dropOutlierValues(s: Samples, found: readonly OutlierFinding[]): void {
  for (const f of found)
    for (const i of f.index) {
      s.values[f.analyte][i] = NaN;
      if (s.censored[f.analyte]) s.censored[f.analyte][i] = 0;
    }
}
