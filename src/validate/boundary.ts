/**
 * Boundary checks in longitude/latitude (before projection) and in metres (after): closed rings,
 * enough points, coordinates that are really degrees, no self-intersection, a positive area.
 * Messages name the file, the feature, the ring and point, and the fix.
 */
import { UserError, type Warning } from '../errors.js';
import type { RawPolygons } from '../io/records.js';
import type { RingsPart } from '../types.js';
import { pointInRing, ringArea, ringPerimeter } from '../geo/area.js';
import { findCrossing } from './crossings.js';

const ringName = (poly: number, ring: number, nPolys: number) =>
  `${nPolys > 1 ? `part ${poly + 1}, ` : ''}${ring === 0 ? 'outer ring' : `hole ${ring}`}`;

/**
 * Checks polygon features read from a file and merges them into one MultiPolygon (lon/lat, rings closed).
 * Consecutive repeated points are dropped.
 * @param what "boundary" or "zone" (for messages)
 * @example const mp = checkPolygonsLonLat(readGeoJsonPolygons(text, 'b.geojson'), 'boundary')
 */
export function checkPolygonsLonLat(
  src: RawPolygons,
  what: string,
): { coordinates: number[][][][]; where: string[]; warnings: Warning[] } {
  const file = src.file;
  const out: number[][][][] = [];
  const where: string[] = [];
  const warnings: Warning[] = [];
  for (const f of src.features) {
    f.coordinates.forEach((poly, pi) => {
      const rings: number[][][] = [];
      poly.forEach((ring, ri) => {
        const at = `${f.where}, ${ringName(pi, ri, f.coordinates.length)}`;
        for (let k = 0; k < ring.length; k++) {
          const [x, y] = ring[k];
          if (!Number.isFinite(x) || !Number.isFinite(y)) {
            throw new UserError(
              `${file} ${at}, point ${k + 1}: coordinate [${x}, ${y}] is not a number. Fix: export the ${what} again.`,
              { file, where: at },
            );
          }
          if (Math.abs(y) > 90 && Math.abs(y) <= 180 && Math.abs(x) <= 90) {
            throw new UserError(
              `${file} ${at}, point ${k + 1}: [${x}, ${y}] has latitude and longitude swapped (GeoJSON is [longitude, latitude]). ` +
                `Fix: export the ${what} again with longitude first, e.g. \`ogr2ogr -f GeoJSON ${what}-fixed.geojson ${file}\` from the original file.`,
              { file, where: at, value: [x, y] },
            );
          }
          if (Math.abs(x) > 180 || Math.abs(y) > 90) {
            throw new UserError(
              `${file} ${at}, point ${k + 1}: [${x}, ${y}] is not a longitude/latitude; it looks like projected metres (e.g. UTM easting, northing). ` +
                `GeoJSON must be WGS 84 degrees. Fix: reproject it, e.g. \`ogr2ogr -s_srs EPSG:326ZZ -t_srs EPSG:4326 ${what}-wgs84.geojson ${file}\` (ZZ = your UTM zone), or give the shapefile with its .prj.`,
              { file, where: at, value: [x, y] },
            );
          }
        }
        const first = ring[0],
          last = ring[ring.length - 1];
        if (ring.length > 0 && (first[0] !== last[0] || first[1] !== last[1])) {
          throw new UserError(
            `${file} ${at}: the ring is not closed (it starts at [${first}] and ends at [${last}]). Fix: repeat the first point at the end, or export the ${what} again from a GIS (GeoJSON rings must be closed, RFC 7946 3.1.6).`,
            { file, where: at },
          );
        }
        const clean: number[][] = [];
        for (const p of ring) {
          const q = clean[clean.length - 1];
          if (!q || q[0] !== p[0] || q[1] !== p[1]) clean.push([p[0], p[1]]);
        }
        if (clean.length < 4) {
          throw new UserError(
            `${file} ${at}: the ring has ${clean.length - 1} distinct point(s); a polygon needs at least 3. Fix: draw the ${what} again.`,
            { file, where: at },
          );
        }
        rings.push(clean);
      });
      out.push(rings);
      where.push(`${f.where}${f.coordinates.length > 1 ? `, part ${pi + 1}` : ''}`);
    });
  }
  if (out.length === 0)
    throw new UserError(`${file} holds no polygon. Fix: give the ${what} as a Polygon or MultiPolygon.`, {
      file,
    });
  // every coordinate very small and the whole thing tiny: degrees given as something else?
  return { coordinates: out, where, warnings };
}

/**
 * Checks a projected boundary: no ring crosses itself or another ring, holes lie inside their outer ring,
 * and the area is positive.
 * @param where one label per part, from checkPolygonsLonLat
 * @example checkPartsMetres(field.parts, checked.where, 'boundary.geojson', 'boundary') // throws UserError or returns
 */
export function checkPartsMetres(parts: RingsPart[], where: string[], file: string, what: string): void {
  const rings: Float64Array[] = [];
  const names: string[] = [];
  parts.forEach((p, i) => {
    rings.push(p.exterior);
    names.push(`${where[i]}, outer ring`);
    p.holes.forEach((h, j) => {
      rings.push(h);
      names.push(`${where[i]}, hole ${j + 1}`);
    });
  });
  rings.forEach((r, k) => {
    if (fanArea(r) < Math.max(1, 1e-4 * ringPerimeter(r) ** 2)) {
      throw new UserError(
        `${file} ${names[k]}: the ring has no area (its points lie on one line, or it is a sliver far thinner than any field). Fix: draw the ${what} again.`,
        { file, where: names[k] },
      );
    }
  });
  const x = findCrossing(rings);
  if (x) {
    const same = x.ringA === x.ringB;
    throw new UserError(
      `${file} ${names[x.ringA]}${same ? '' : ` and ${names[x.ringB]}`}: ${same ? 'the ring crosses itself' : 'the rings cross'} near segment ${x.segA + 1}` +
        `${same ? ` and segment ${x.segB + 1}` : ''} (a bow-tie or overlap). Fix: redraw the ${what} so that no edge crosses another (in QGIS: Vector > Geometry Tools > Check Validity, or \`ogr2ogr -makevalid\`).`,
      { file, where: names[x.ringA] },
    );
  }
  parts.forEach((p, i) => {
    if (Math.abs(ringArea(p.exterior)) < 1) {
      throw new UserError(
        `${file} ${where[i]}: the outer ring has no area (its points lie on a line or on top of each other). Fix: draw the ${what} again.`,
        { file, where: where[i] },
      );
    }
  });
  parts.forEach((p, i) => {
    p.holes.forEach((h, j) => {
      if (!pointInRing(p.exterior, h[0], h[1])) {
        throw new UserError(
          `${file} ${where[i]}, hole ${j + 1}: the hole lies outside its outer ring. Fix: make it a separate part, or remove it.`,
          { file, where: where[i] },
        );
      }
    });
  });
}

/** Sum of |triangle areas| of the fan from the first point: 0 exactly when all points lie on one line. */
function fanArea(r: Float64Array): number {
  const n = r.length >> 1;
  let a = 0;
  for (let i = 1; i + 1 < n; i++) {
    a += Math.abs((r[2 * i] - r[0]) * (r[2 * i + 3] - r[1]) - (r[2 * i + 2] - r[0]) * (r[2 * i + 1] - r[1]));
  }
  return a / 2;
}
