/**
 * Which way true north points on a UTM map: the meridian convergence at the map's centre.
 * Measured numerically with the project's UTM projector (proj4js): project the centre and a point 0.01°
 * further north, and take the bearing of that step on the grid.
 */
import { projector } from '../geo/utm.js';
import { utmZone } from '../geo/crs.js';

/**
 * Clockwise angle in degrees from grid north (the UTM y axis) to true north at a point, as drawn on a north-up
 * map: positive (true north leans right) west of the central meridian in the northern hemisphere, where the
 * meridians converge eastward toward the pole; negative east of it.
 * @example trueNorthOnGrid({ zone: 13, south: false, epsg: 32613 }, 431600, 5742000) // about 0.78
 */
export function trueNorthOnGrid(
  utm: { zone: number; south: boolean; epsg: number },
  x: number,
  y: number,
): number {
  const p = projector(utmZone(utm.zone, utm.south));
  const [lon, lat] = p.toLonLat(x, y);
  const step = lat > 89.9 ? -0.01 : 0.01;
  const [x2, y2] = p.toMetres(lon, lat + step);
  const dx = (x2 - x) * Math.sign(step),
    dy = (y2 - y) * Math.sign(step);
  return (Math.atan2(dx, dy) * 180) / Math.PI;
}

/**
 * The angle of `trueNorthOnGrid` at the centre of a bounding box [xmin, ymin, xmax, ymax]; 0 (grid north)
 * without a UTM zone or with an empty box.
 * @example trueNorthAtBox(field.utm, field.bbox)
 */
export function trueNorthAtBox(
  utm: { zone: number; south: boolean; epsg: number } | undefined,
  bbox: readonly [number, number, number, number],
): number {
  if (!utm || !bbox.every(Number.isFinite)) return 0;
  return trueNorthOnGrid(utm, (bbox[0] + bbox[2]) / 2, (bbox[1] + bbox[3]) / 2);
}
