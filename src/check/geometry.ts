/** Check `geometry`: every zone is a valid polygon (turf kinks and booleanValid). */
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { booleanValid } from '@turf/boolean-valid';
import { kinks } from '@turf/kinks';
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
