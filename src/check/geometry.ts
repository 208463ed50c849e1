/** Check `geometry`: every zone is a valid polygon (turf kinks and booleanValid). */
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { booleanValid } from '@turf/boolean-valid';
import { kinks } from '@turf/kinks';
import { pointInRing } from '../geo/area.js';
import { lineWriter, list, type CheckContext } from './context.js';
import type { CheckLine } from './types.js';

/**
 * The `geometry` line, and per zone whether it is a valid polygon.
 * @example
 * checkGeometry(ctx) // a bow-tie zone 4: { valid: [true, true, true, false], lines: [{ check: 'geometry',
 * // status: 'fail', message: '1 of 4 zones invalid: zone 4: edges cross themselves (1 crossing, ...)', zones: ['zone 4'] }] }
 */
export function checkGeometry(ctx: CheckContext): { lines: CheckLine[]; valid: boolean[] } {
  const { lines, add } = lineWriter();
  const bad: string[] = [],
    why: string[] = [];
  const valid = ctx.feats.map((f, i) => {
    const g = f.geometry;
    let reason = ctx.problems[i] ?? '';
    if (reason) {
      /* coordinates unusable */
    } else if (!g) reason = 'no geometry';
    else if (g.type !== 'Polygon' && g.type !== 'MultiPolygon') reason = `a ${g.type}, not a polygon`;
    else if (
      (g.type === 'Polygon' ? [g.coordinates] : g.coordinates).some((p) => p.some((r) => r.length < 4))
    )
      reason = 'a ring with fewer than 4 points';
    else {
      try {
        const k = kinks(f as Feature<Polygon | MultiPolygon>);
        if (k.features.length) {
          const c = k.features[0].geometry.coordinates;
          reason = `edges cross themselves (${k.features.length} crossing${k.features.length > 1 ? 's' : ''}, first near lat ${c[1].toFixed(6)}, lon ${c[0].toFixed(6)})`;
        } else if (!booleanValid(f))
          reason = 'not a valid polygon (a hole outside its ring, touching rings or overlapping parts)';
        else {
          const h = holeOutside(g.type === 'Polygon' ? [g.coordinates] : g.coordinates);
          if (h) reason = `hole ${h.hole} of part ${h.part} lies outside its ring`;
        }
      } catch (e) {
        reason = `unreadable geometry (${(e as Error).message})`;
      }
    }
    if (reason) {
      bad.push(ctx.names[i]);
      why.push(`${ctx.names[i]}: ${reason}`);
    }
    return !reason;
  });
  if (!ctx.feats.length) add('geometry', 'fail', 'the file holds no zones');
  else if (bad.length)
    add('geometry', 'fail', `${bad.length} of ${ctx.feats.length} zones invalid: ${list(why, 6)}`, bad);
  else add('geometry', 'pass', `${ctx.feats.length} zones, all valid polygons`);

  return { lines, valid };
}

/**
 * The first hole with a vertex outside its polygon's exterior ring (a vertex on the ring is allowed: OGC lets a
 * hole touch its ring at a point), 1-based; null when every hole is inside. turf's booleanValid does not test it.
 * @example holeOutside([[[[0, 0], [4, 0], [4, 4], [0, 4], [0, 0]], [[5, 1], [6, 1], [6, 2], [5, 1]]]]) // { part: 1, hole: 1 }
 */
export function holeOutside(polys: number[][][][]): { part: number; hole: number } | null {
  for (let p = 0; p < polys.length; p++) {
    const ext = Float64Array.from(polys[p][0].flat());
    for (let h = 1; h < polys[p].length; h++)
      if (polys[p][h].some(([x, y]) => !pointInRing(ext, x, y) && !onRing(ext, x, y)))
        return { part: p + 1, hole: h };
  }
  return null;
}

/** Whether (x, y) lies on an edge of the flat ring (within 1e-12 of the ring's size). */
function onRing(r: Float64Array, x: number, y: number): boolean {
  const eps = 1e-12 * (Math.abs(x) + Math.abs(y) + 1);
  for (let i = 0; i + 3 < r.length; i += 2) {
    const ax = r[i],
      ay = r[i + 1],
      bx = r[i + 2],
      by = r[i + 3];
    const cross = (bx - ax) * (y - ay) - (by - ay) * (x - ax);
    if (Math.abs(cross) > eps * Math.hypot(bx - ax, by - ay)) continue;
    if ((x - ax) * (x - bx) <= eps && (y - ay) * (y - by) <= eps) return true;
  }
  return false;
}
