/**
 * UTM zone choice and projection between WGS 84 lon/lat and UTM metres (proj4js).
 * NAD83 and NAD83(CSRS) inputs are treated as WGS 84 (1-2 m apart): see docs/architecture.md.
 */
import proj4 from 'proj4';
import type { UtmZone } from '../types.js';
import { utmZone } from './crs.js';

/**
 * The UTM zone that holds a point: zone = floor((lon + 180) / 6) + 1, south when lat < 0.
 * Norway/Svalbard exceptions are ignored (no prairie field is there).
 * @example utmZoneFor(-106.6, 52.1) // { zone: 13, south: false, epsg: 32613, ... }
 */
export function utmZoneFor(lon: number, lat: number): UtmZone {
  if (!Number.isFinite(lon) || !Number.isFinite(lat) || lon < -180 || lon > 180 || lat < -90 || lat > 90) {
    throw new RangeError(`not a longitude/latitude: ${lon}, ${lat}`);
  }
  return utmZone(Math.min(60, Math.floor((lon + 180) / 6) + 1), lat < 0);
}

/** Forward and inverse projection for one UTM zone on flat arrays (x0 y0 x1 y1 ...). */
export interface Projector {
  utm: UtmZone;
  /** lon/lat pairs to metres; returns a new array */
  forward(lonlat: ArrayLike<number>): Float64Array;
  /** metres to lon/lat pairs; returns a new array */
  inverse(xy: ArrayLike<number>): Float64Array;
  /** one point */
  toMetres(lon: number, lat: number): [number, number];
  toLonLat(x: number, y: number): [number, number];
}

/**
 * A projector for the given zone.
 * @example const p = projector(utmZoneFor(-106.6, 52.1)); p.toMetres(-106.6, 52.1)
 */
export function projector(utm: UtmZone): Projector {
  const conv = proj4('EPSG:4326', utm.proj4);
  const toMetres = (lon: number, lat: number): [number, number] =>
    conv.forward([lon, lat]) as [number, number];
  const toLonLat = (x: number, y: number): [number, number] => conv.inverse([x, y]) as [number, number];
  const map = (a: ArrayLike<number>, f: (u: number, v: number) => [number, number]) => {
    const out = new Float64Array(a.length);
    for (let i = 0; i + 1 < a.length; i += 2) {
      const [u, v] = f(a[i], a[i + 1]);
      out[i] = u;
      out[i + 1] = v;
    }
    return out;
  };
  return {
    utm,
    toMetres,
    toLonLat,
    forward: (a) => map(a, toMetres),
    inverse: (a) => map(a, toLonLat),
  };
}

const A = 6378137,
  F = 1 / 298.257223563,
  E2 = F * (2 - F);

/**
 * Areal scale factor of the projection at a point (k^2 for a conformal projection such as UTM),
 * measured numerically: projected length of a short east-west step over its length on the ellipsoid.
 * Planar area / arealScale = ground area on the ellipsoid.
 */
export function arealScale(p: Projector, lon: number, lat: number): number {
  const dLon = 1e-4;
  const [x0, y0] = p.toMetres(lon - dLon / 2, lat);
  const [x1, y1] = p.toMetres(lon + dLon / 2, lat);
  const phi = (lat * Math.PI) / 180;
  const n = A / Math.sqrt(1 - E2 * Math.sin(phi) ** 2);
  const ground = n * Math.cos(phi) * ((dLon * Math.PI) / 180);
  const k = Math.hypot(x1 - x0, y1 - y0) / ground;
  return k * k;
}
