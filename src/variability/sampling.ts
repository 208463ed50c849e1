/**
 * Sampling advice: is the sample spacing fine enough to map the pattern the semivariogram shows?
 *
 * Rule (common practice): samples should lie closer together than half the (effective) range of spatial
 * dependence, so that neighbouring samples are still related. The spacing of n samples over an area A is taken as
 * that of a square grid with the same density, sqrt(A / n); the median nearest-neighbour distance is reported
 * beside it for irregular layouts.
 */
import { M2_PER_AC, m2ToAc } from '../units/index.js';
import type { DependenceClass } from './dependence.js';
import { sampleNeighbours } from '../surface/neighbours.js';

export interface SamplingInput {
  /** field area, m2 */
  areaM2: number;
  /** sample positions x0 y0 x1 y1 ... metres (samples with a value) */
  xy: ArrayLike<number>;
  /** effective range of the best fit, metres; NaN when there is no usable fit */
  effectiveRange: number;
  dependence: DependenceClass | null;
  /** smallest mean lag distance of the semivariogram, metres (what the data can resolve at best) */
  firstLag: number;
  /** true when the semivariogram keeps rising to the cutoff (no sill within the field) */
  noSill: boolean;
}

export type SamplingVerdict = 'adequate' | 'too-sparse' | 'no-structure' | 'trend';

export interface SamplingAdvice {
  n: number;
  acresPerSample: number;
  /** grid-equivalent spacing sqrt(area / n), metres */
  spacing: number;
  /** median distance from a sample to its nearest neighbour, metres */
  medianNearest: number;
  /** half the effective range, metres (NaN without a fit) */
  halfRange: number;
  verdict: SamplingVerdict;
  /** spacing, acres per sample and sample count that would resolve the pattern (null when not applicable) */
  needed: { spacing: number; acresPerSample: number; samples: number } | null;
  text: string;
}

/**
 * Median nearest-neighbour distance of points x0 y0 x1 y1 ...: the few nearest of each point come from the
 * shared bucketed search (src/surface/neighbours.ts, linear in the number of points), and the distance is
 * Math.hypot of the original coordinates, the smallest of those few (as a brute-force scan would find it).
 * @example medianNearest([0, 0, 3, 4, 10, 0]) // 5
 */
export function medianNearest(xy: ArrayLike<number>): number {
  const n = xy.length / 2;
  if (n < 2) return NaN;
  const nb = sampleNeighbours(xy instanceof Float64Array ? xy : Float64Array.from(xy), 4);
  const d: number[] = [];
  for (let i = 0; i < n; i++) {
    let best = Infinity;
    for (let t = 0; t < nb.found[i]; t++) {
      const j = nb.idx[i * nb.k + t];
      const e = Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]);
      if (e < best) best = e;
    }
    d.push(best);
  }
  d.sort((a, b) => a - b);
  return n % 2 ? d[(n - 1) / 2] : (d[n / 2 - 1] + d[n / 2]) / 2;
}

const fmt = (x: number, digits = 0) => x.toFixed(digits);

/**
 * Judges the sampling density against the fitted range.
 * @example samplingAdvice({ areaM2: 647497, xy, effectiveRange: 300, dependence: 'strong', firstLag: 60, noSill: false })
 * // verdict 'too-sparse' when sqrt(area / n) > 150 m
 */
export function samplingAdvice(s: SamplingInput): SamplingAdvice {
  const n = s.xy.length / 2;
  const acresPerSample = m2ToAc(s.areaM2) / n;
  const spacing = Math.sqrt(s.areaM2 / n);
  const nearest = medianNearest(s.xy);
  const halfRange = s.effectiveRange / 2;
  const base = `${n} samples over ${fmt(m2ToAc(s.areaM2), 1)} ac: ${fmt(acresPerSample, 1)} ac per sample, a grid-equivalent spacing of ${fmt(spacing)} m (median nearest neighbour ${fmt(nearest)} m).`;
  const resolve = (target: number) => {
    const acres = m2ToAc(target * target);
    return { spacing: target, acresPerSample: acres, samples: Math.ceil(s.areaM2 / (target * target)) };
  };
  if (s.noSill) {
    return {
      n,
      acresPerSample,
      spacing,
      medianNearest: nearest,
      halfRange,
      verdict: 'trend',
      needed: null,
      text: `${base} The semivariogram keeps rising to the largest distance examined: the nutrient changes steadily across the field (a trend) rather than in patches, so the field-scale pattern is resolved; map it, and consider whether landscape position explains it.`,
    };
  }
  if (!Number.isFinite(halfRange) || s.dependence === 'weak') {
    // 1 ac grids find boundaries that 4-5 ac grids miss: [published] Franzen, NDSU SF-1176-2 (1999)
    const target = Math.sqrt(M2_PER_AC); // a 1 ac grid cell
    return {
      n,
      acresPerSample,
      spacing,
      medianNearest: nearest,
      halfRange,
      verdict: 'no-structure',
      needed: acresPerSample > 1 ? resolve(target) : null,
      text: `${base} The samples show little or no spatial structure at this spacing (${s.dependence === 'weak' ? 'nugget over 75 % of the sill' : 'no model could be fitted'}): either the field is uniform at this scale, or the pattern is finer than ${fmt(Math.max(spacing, s.firstLag))} m. A map from these samples is little better than the field mean.${acresPerSample > 1 ? ' To find out, sample about 1 per acre (' + Math.ceil(m2ToAc(s.areaM2)) + ' samples; NDSU SF-1176-2: 1 ac grids find fertility boundaries that 4-5 ac grids miss).' : ''}`,
    };
  }
  if (spacing <= halfRange) {
    return {
      n,
      acresPerSample,
      spacing,
      medianNearest: nearest,
      halfRange,
      verdict: 'adequate',
      needed: null,
      text: `${base} That is within half the effective range (${fmt(halfRange)} m of ${fmt(s.effectiveRange)} m; common practice), so the sampling is dense enough to map the pattern.`,
    };
  }
  const need = resolve(halfRange);
  return {
    n,
    acresPerSample,
    spacing,
    medianNearest: nearest,
    halfRange,
    verdict: 'too-sparse',
    needed: need,
    text: `${base} That is wider than half the effective range (${fmt(halfRange)} m of ${fmt(s.effectiveRange)} m; common practice), so patches smaller than the spacing can be missed. To resolve the pattern, sample every ${fmt(halfRange)} m or closer: about ${fmt(need.acresPerSample, 1)} ac per sample, ${need.samples} samples for this field.`,
  };
}
