/**
 * From a validated lon/lat boundary (MultiPolygon coordinates) to a Field in metres.
 */
import type { Field, RingsPart } from '../types.js';
import { arealScale, projector, utmZoneFor, type Projector } from './utm.js';
import { exteriorsBbox, orient, partsArea, partsBbox } from './area.js';

/**
 * Projects a boundary to the UTM zone of its centre, orients rings (exterior CCW, holes CW)
 * and computes the ground area on the WGS 84 ellipsoid (planar UTM area over the areal
 * scale factor at the field's centre; a field of a few km has < 1e-6 relative error from this).
 *
 * @param lonlat MultiPolygon coordinates, rings closed; validated beforehand (src/validate)
 * @param name field name for messages and outputs
 * @example const f = projectField(mp, 'Home quarter'); m2ToAc(f.areaM2) // acres
 */
export function projectField(lonlat: number[][][][], name = 'field'): Field & { projector: Projector } {
  const [lx0, ly0, lx1, ly1] = exteriorsBbox(lonlat);
  const clon = (lx0 + lx1) / 2,
    clat = (ly0 + ly1) / 2;
  const utm = utmZoneFor(clon, clat);
  const p = projector(utm);
  const parts: RingsPart[] = lonlat.map((poly) => {
    const rings = poly.map((ring) => p.forward(ring.flat()));
    return {
      exterior: orient(rings[0], true),
      holes: rings.slice(1).map((h) => orient(h, false)),
    };
  });
  const areaM2 = partsArea(parts) / arealScale(p, clon, clat);
  return { name, lonlat, parts, utm, areaM2, bbox: partsBbox(parts), projector: p };
}

export { orient };
