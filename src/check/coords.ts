/**
 * Coordinates a check can compute with: every polygon ring an array of at least [x, y] finite numbers within
 * any coordinate system's range. A feature that fails is reported by the geometry check and kept out of the
 * others, so no bad number reaches the projection or the overlay (a stack trace instead of an answer).
 */
import type { Feature } from 'geojson';

/** Largest absolute coordinate accepted, in any unit: 1e8 is beyond every projected system on Earth (its circumference is 4e7 m). */
export const MAX_ABS_COORD = 1e8;

/** A value as a person reads it: numbers as numbers (NaN, Infinity), others as JSON, short. */
function show(v: unknown): string {
  return typeof v === 'number' ? String(v) : (JSON.stringify(v) ?? String(v)).slice(0, 30);
}

function positionProblem(p: unknown): string {
  if (!Array.isArray(p) || p.length < 2) return `position ${show(p)} is not [x, y]`;
  for (const v of p.slice(0, 2)) {
    if (typeof v !== 'number' || !Number.isFinite(v))
      return `coordinate [${p.slice(0, 2).map(show).join(', ')}] is not a pair of finite numbers`;
    if (Math.abs(v) > MAX_ABS_COORD)
      return `coordinate ${v} is beyond any coordinate system's range (|value| <= ${MAX_ABS_COORD})`;
  }
  return '';
}

/**
 * Why a Polygon or MultiPolygon's coordinates cannot be used, or '' when they can (other geometry types: '').
 * @example polygonCoordsProblem({ type: 'Polygon', coordinates: [[[0, 0], [1, null]]] }) // 'ring 1, point 2: coordinate ...'
 */
function polygonCoordsProblem(g: unknown): string {
  const geom = g as { type?: unknown; coordinates?: unknown } | null;
  if (!geom || (geom.type !== 'Polygon' && geom.type !== 'MultiPolygon')) return '';
  const polys = geom.type === 'Polygon' ? [geom.coordinates] : geom.coordinates;
  if (!Array.isArray(polys)) return 'coordinates are not an array';
  for (let pi = 0; pi < polys.length; pi++) {
    const rings = polys[pi];
    const part = polys.length > 1 ? `part ${pi + 1}, ` : '';
    if (!Array.isArray(rings) || rings.length === 0) return `${part}no rings`;
    for (let ri = 0; ri < rings.length; ri++) {
      const ring = rings[ri];
      if (!Array.isArray(ring)) return `${part}ring ${ri + 1} is not a list of positions`;
      for (let k = 0; k < ring.length; k++) {
        const why = positionProblem(ring[k]);
        if (why) return `${part}ring ${ri + 1}, point ${k + 1}: ${why}`;
      }
    }
  }
  return '';
}

/**
 * Features with unusable coordinates get a null geometry (so later checks skip them) and their reason.
 * @returns the features (copies only where changed) and a reason per feature ('' when fine)
 * @example const { features, problems } = usableFeatures(layer.features)
 */
export function usableFeatures(features: readonly Feature[]): { features: Feature[]; problems: string[] } {
  const problems = features.map((f) =>
    f && typeof f === 'object' ? polygonCoordsProblem(f.geometry) : 'not a GeoJSON feature',
  );
  return {
    features: features.map((f, i) =>
      problems[i]
        ? {
            type: 'Feature',
            properties: (f && typeof f === 'object' ? f.properties : null) ?? null,
            geometry: null as never,
          }
        : f,
    ),
    problems,
  };
}
