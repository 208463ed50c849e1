/** Ground area of lon/lat polygons through the UTM projection (see projectField for the method). */
import { arealScale, projector, utmZoneFor, type Projector } from './utm.js';
import { exteriorsBbox, ringArea } from './area.js';

/**
 * Ground area on the WGS 84 ellipsoid, m2, of MultiPolygon coordinates in lon/lat (holes subtracted):
 * planar area in the UTM zone of `p` (default: the zone of the polygons' centre) over the areal scale
 * factor at their centre. Agrees with a geodesic polygon area to better than 1e-5 for a field of a few km.
 *
 * @example groundAreaM2([[[[-106,52],[-105.99,52],[-105.99,52.01],[-106,52]]]]) // ~381 996
 */
export function groundAreaM2(polys: number[][][][], p?: Projector): number {
  const [x0, y0, x1, y1] = exteriorsBbox(polys);
  if (!Number.isFinite(x0)) return 0;
  const cx = (x0 + x1) / 2,
    cy = (y0 + y1) / 2;
  const proj = p ?? projector(utmZoneFor(cx, cy));
  let a = 0;
  for (const poly of polys) {
    poly.forEach((ring, k) => {
      const r = Math.abs(ringArea(proj.forward(ring.flatMap((pt) => [pt[0], pt[1]]))));
      a += k === 0 ? r : -r;
    });
  }
  return a / arealScale(proj, cx, cy);
}
