/** Some of the samples, in the order given: every per-sample array cut alike. Pure. */
import { ANALYTES, type Samples } from '../types.js';

/**
 * The samples at indices `keep` (in that order), every per-sample array cut alike; `xy` too when present.
 * @example subset(samples, [0, 2]).ids // the first and third ids
 */
export function subset<T extends Omit<Samples, 'xy'> & { xy?: Float64Array }>(s: T, keep: number[]): T {
  const values = {} as Samples['values'];
  const censored = {} as Samples['censored'];
  for (const a of ANALYTES) {
    values[a] = Float64Array.from(keep, (i) => s.values[a][i]);
    censored[a] = Int8Array.from(keep, (i) => s.censored[a][i]);
  }
  return {
    ...s,
    ids: keep.map((i) => s.ids[i]),
    lonlat: subsetXY(s.lonlat, keep),
    ...(s.xy ? { xy: subsetXY(s.xy, keep) } : {}),
    values,
    censored,
    texture: keep.map((i) => s.texture[i]),
    ...(s.extra
      ? {
          extra: Object.fromEntries(
            Object.entries(s.extra).map(([k, v]) => [k, Float64Array.from(keep, (i) => v[i])]),
          ),
        }
      : {}),
    ...(s.limeRating ? { limeRating: keep.map((i) => s.limeRating![i]) } : {}),
    zone: keep.map((i) => s.zone[i]),
    origin: keep.map((i) => s.origin[i]),
  };
}

/**
 * The pairs (x, y) at indices `keep` of a flat x0 y0 x1 y1 ... array.
 * @example subsetXY(Float64Array.of(0, 0, 5, 5, 9, 9), [2]) // Float64Array [9, 9]
 */
export function subsetXY(a: Float64Array, keep: number[]): Float64Array {
  const out = new Float64Array(2 * keep.length);
  keep.forEach((i, k) => {
    out[2 * k] = a[2 * i];
    out[2 * k + 1] = a[2 * i + 1];
  });
  return out;
}
