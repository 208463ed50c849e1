/**
 * GeoJSON reader (RFC 7946): FeatureCollection, Feature or a bare geometry.
 * Structure only; ranges, rings and topology are judged in src/validate.
 */
import { UserError } from '../errors.js';
import { pointOnFeature } from '@turf/point-on-feature';
import type { RawPolygons, RawRecord, RawTable, RawValue } from './records.js';

type Json = Record<string, unknown>;

/**
 * Parses GeoJSON text; a syntax error (e.g. a truncated file) is a UserError naming the line. An old-style
 * `crs` member is left to the caller (inputs refuse any but WGS 84; `tilth check` honours UTM).
 * @example parseGeoJson('{"type":"Point","coordinates":[-106,52]}', 'a.geojson')
 */
export function parseGeoJson(text: string, file: string): Json {
  const t = text.replace(/^\uFEFF/, '');
  if (t.trim() === '')
    throw new UserError(`${file} is empty. Fix: export the layer again; the file has no content.`, { file });
  let v: unknown;
  try {
    v = JSON.parse(t);
  } catch (e) {
    const m = /position (\d+)/.exec((e as Error).message);
    const pos = m ? Number(m[1]) : t.length;
    const line = t.slice(0, pos).split('\n').length;
    const end =
      pos >= t.trimEnd().length - 1 || /end of (JSON )?input|Unterminated/i.test((e as Error).message);
    throw new UserError(
      `${file} is not valid JSON (${end ? 'it ends too early: the file looks cut off' : `error near line ${line}`}: ${(e as Error).message}). ` +
        'Fix: export the layer again as GeoJSON, or check that the whole file was copied.',
      { file },
    );
  }
  if (typeof v !== 'object' || v === null || Array.isArray(v) || typeof (v as Json).type !== 'string') {
    throw new UserError(
      `${file} is JSON but not GeoJSON (no "type" member at the top). Fix: give a GeoJSON FeatureCollection, Feature or geometry.`,
      { file },
    );
  }
  return v as Json;
}

/** Inputs must be WGS 84 longitude/latitude (RFC 7946): an old-style `crs` member naming another system is a UserError. */
function requireWgs84(obj: Json, file: string): void {
  if (obj.crs === undefined) return;
  const name = JSON.stringify((obj.crs as Json)?.properties ?? obj.crs);
  if (!/4326|4269|4617|CRS84|CRS83|WGS ?84/i.test(name)) {
    throw new UserError(
      `${file} declares the coordinate system ${name}; GeoJSON must be WGS 84 longitude/latitude (RFC 7946). ` +
        'Fix: export it again with longitude/latitude (EPSG:4326), e.g. `ogr2ogr -t_srs EPSG:4326 out.geojson in.geojson`.',
      { file },
    );
  }
}

/** The features of a GeoJSON object, each with its 1-based index for messages. */
function features(
  obj: Json,
  file: string,
): { where: string; props: Record<string, RawValue>; geometry: Json | null }[] {
  const type = obj.type as string;
  if (type === 'FeatureCollection') {
    if (!Array.isArray(obj.features))
      throw new UserError(
        `${file}: the FeatureCollection has no "features" array. Fix: export the layer again.`,
        { file },
      );
    return (obj.features as Json[]).map((f, i) => {
      if (typeof f !== 'object' || f === null || f.type !== 'Feature') {
        throw new UserError(
          `${file} feature ${i + 1} is not a GeoJSON Feature. Fix: export the layer again.`,
          { file, where: `feature ${i + 1}` },
        );
      }
      return {
        where: `feature ${i + 1}`,
        props: cleanProps(f.properties),
        geometry: (f.geometry ?? null) as Json | null,
      };
    });
  }
  if (type === 'Feature')
    return [
      {
        where: 'feature 1',
        props: cleanProps(obj.properties),
        geometry: (obj.geometry ?? null) as Json | null,
      },
    ];
  return [{ where: 'geometry', props: {}, geometry: obj }];
}

function cleanProps(p: unknown): Record<string, RawValue> {
  const out: Record<string, RawValue> = {};
  if (typeof p !== 'object' || p === null) return out;
  for (const [k, v] of Object.entries(p)) {
    out[k] =
      v === undefined || v === null
        ? null
        : typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean'
          ? v
          : JSON.stringify(v);
  }
  return out;
}

function isPos(p: unknown): p is number[] {
  return Array.isArray(p) && p.length >= 2 && typeof p[0] === 'number' && typeof p[1] === 'number';
}

/**
 * Point records (soil samples) from GeoJSON text. Point geometries (a MultiPoint with one point is accepted);
 * or, for zone-composite samples, Polygon/MultiPolygon features, each a zone with its sample's values
 * (`polygons` is then set and each record's position is a point inside its zone).
 * @example readGeoJsonPoints(text, 'samples.geojson').records[0].props.sample_id
 */
export function readGeoJsonPoints(text: string, file: string): RawTable {
  const obj = parseGeoJson(text, file);
  requireWgs84(obj, file);
  const fs = features(obj, file);
  const columns: string[] = [];
  const seen = new Set<string>();
  const isPoly = (g: Json | null) => g !== null && (g.type === 'Polygon' || g.type === 'MultiPolygon');
  const polys = fs.length > 0 && fs.every((f) => isPoly(f.geometry));
  if (!polys && fs.some((f) => isPoly(f.geometry))) {
    const f = fs.find((x) => isPoly(x.geometry))!;
    throw new UserError(
      `${file} ${f.where}: samples mix points and polygons. Fix: give either one point per sample, or one zone polygon per composite sample (or the zones in their own file with --zones).`,
      { file, where: f.where },
    );
  }
  const polygons: number[][][][][] = [];
  const records: RawRecord[] = fs.map((f) => {
    for (const k of Object.keys(f.props))
      if (!seen.has(k)) {
        seen.add(k);
        columns.push(k);
      }
    const g = f.geometry;
    let c: unknown = null;
    if (polys) {
      const mp = polygonsOf(g, file, f.where, 'sample zone');
      polygons.push(mp);
      try {
        c = pointOnFeature({
          type: 'Feature',
          properties: {},
          geometry: { type: 'MultiPolygon', coordinates: mp },
        }).geometry.coordinates;
      } catch {
        c = mp[0]?.[0]?.[0] ?? null;
      }
    } else if (g && g.type === 'Point') c = g.coordinates;
    else if (g && g.type === 'MultiPoint' && Array.isArray(g.coordinates) && g.coordinates.length === 1)
      c = g.coordinates[0];
    else {
      throw new UserError(
        `${file} ${f.where}: a soil sample must be a Point (or a zone Polygon for a composite), not ${g ? String(g.type) : 'a feature without geometry'}. ` +
          'Fix: give each sample as one point where it was taken.',
        { file, where: f.where },
      );
    }
    if (!isPos(c))
      throw new UserError(
        `${file} ${f.where}: the sample has no valid [longitude, latitude] coordinates. Fix: export the layer again.`,
        { file, where: f.where },
      );
    return { where: f.where, lon: c[0], lat: c[1], props: f.props };
  });
  return polys ? { file, columns, records, polygons } : { file, columns, records };
}

/**
 * Polygon features (boundaries, zones) from GeoJSON text: each Polygon or MultiPolygon becomes
 * MultiPolygon coordinates; a GeometryCollection of polygons is merged. Other geometries are a UserError.
 * @example readGeoJsonPolygons(text, 'boundary.geojson').features[0].coordinates
 */
export function readGeoJsonPolygons(text: string, file: string, what = 'boundary'): RawPolygons {
  const obj = parseGeoJson(text, file);
  requireWgs84(obj, file);
  const out: RawPolygons = { file, features: [] };
  for (const f of features(obj, file)) {
    const coords = polygonsOf(f.geometry, file, f.where, what);
    out.features.push({ where: f.where, props: f.props, coordinates: coords });
  }
  if (out.features.length === 0)
    throw new UserError(`${file} holds no features. Fix: give the ${what} as a Polygon or MultiPolygon.`, {
      file,
    });
  return out;
}

function polygonsOf(g: Json | null, file: string, where: string, what: string): number[][][][] {
  const bad = (why: string) =>
    new UserError(
      `${file} ${where}: ${why}. Fix: give the ${what} as a Polygon or MultiPolygon (rings of [longitude, latitude]).`,
      { file, where },
    );
  if (!g) throw bad('the feature has no geometry');
  const ringsOk = (poly: unknown): poly is number[][][] =>
    Array.isArray(poly) && poly.length > 0 && poly.every((r) => Array.isArray(r) && r.every(isPos));
  if (g.type === 'Polygon') {
    if (!ringsOk(g.coordinates)) throw bad('the Polygon coordinates are not rings of positions');
    return [g.coordinates.map((r) => r.map((p) => [p[0], p[1]]))];
  }
  if (g.type === 'MultiPolygon') {
    if (!Array.isArray(g.coordinates) || !g.coordinates.every(ringsOk))
      throw bad('the MultiPolygon coordinates are not polygons of rings');
    return (g.coordinates as number[][][][]).map((poly) => poly.map((r) => r.map((p) => [p[0], p[1]])));
  }
  if (g.type === 'GeometryCollection' && Array.isArray(g.geometries)) {
    return (g.geometries as Json[]).flatMap((x) => polygonsOf(x, file, where, what));
  }
  throw bad(`it is a ${String(g.type)}`);
}
