/**
 * Which parts of a boundary the samples say something about: a part farther than a set distance from every
 * sample (another field in the file, or a part left unsampled) gets no rates from them. Pure.
 */
import { ringsBbox } from '../geo/area.js';
import type { RingsPart } from '../types.js';

/**
 * A boundary part farther than this from every sample gets no rates from the samples: 1 000 m (common practice:
 * grid samples are 1-5 ac apart, 60-140 m, so a part a kilometre from any sample was not sampled).
 */
export const MAX_UNSAMPLED_DISTANCE_M = 1_000;

/**
 * Boundary parts (1-based) farther than `maxM` from every sample, measured from the part's bounding box (a
 * sample within `maxM` of the box counts as near: the test never calls a sampled part unsampled).
 * @param xy sample positions in metres, x0 y0 x1 y1 ...
 * @example farParts(field.parts, samples.xy) // [2] when part 2 is another field 800 km away
 */
export function farParts(
  parts: readonly RingsPart[],
  xy: Float64Array,
  maxM = MAX_UNSAMPLED_DISTANCE_M,
): number[] {
  const far: number[] = [];
  parts.forEach((p, k) => {
    const [x0, y0, x1, y1] = ringsBbox([p.exterior]);
    let near = false;
    for (let i = 0; i < xy.length && !near; i += 2) {
      const dx = Math.max(x0 - xy[i]!, 0, xy[i]! - x1),
        dy = Math.max(y0 - xy[i + 1]!, 0, xy[i + 1]! - y1);
      near = Math.hypot(dx, dy) <= maxM;
    }
    if (!near) far.push(k + 1);
  });
  return far;
}
