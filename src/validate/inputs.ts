/**
 * The library's judgement of the inputs: raw tables and polygons (src/io/inputs.ts readInputs) -> validated,
 * projected FieldInputs. Reads nothing: no file system, no parsing of file formats.
 */
import { UserError, type Warning } from '../errors.js';
import { ANALYTES, type FieldInputs, type PMethod, type Samples, type SampleZones } from '../types.js';
import { projectField } from '../geo/field.js';
import { pointInParts } from '../geo/area.js';
import { orient } from '../geo/field.js';
import { parseColumnMap } from '../io/columns.js';
import type { RawInputs } from '../io/inputs.js';
import type { RawPolygons } from '../io/records.js';
import { abbrev, buildSamples } from './samples.js';
import { checkPartsMetres, checkPolygonsLonLat } from './boundary.js';
import { soilFlagWarnings } from '../agronomy/soilFlags.js';

export interface PrepareOptions {
  /** CSV column map "id=Sample ID,lat=Latitude,..." */
  columns?: string;
  /** 0-6 in to 0-24 in factor for nitrate and sulphate; no default */
  depthFactor?: number;
  /** drop samples outside the boundary (default false: keep them and warn) */
  dropOutside?: boolean;
  /** P test method when the samples file does not say */
  pMethod?: PMethod;
  /** fewest point samples for a map (default 3; zone composites need 1 per zone) */
  minSamples?: number;
  /** coordinate system of easting / northing columns in a table, e.g. "EPSG:26913" */
  crs?: string;
}

/**
 * Validates and projects samples, boundary and (optional) sample zones, as read by readInputs.
 * @throws UserError naming file, feature/row, field, value and fix for anything the user must correct
 * @example
 * const raw = await readInputs({ samples: { name: 'samples.geojson', bytes }, boundary: { name: 'boundary.geojson', bytes: b } });
 * const inputs = prepareInputs(raw);
 * inputs.field.areaM2; inputs.samples.values.p;
 */
export function prepareInputs(raw: RawInputs, opts: PrepareOptions = {}): FieldInputs {
  const warnings: Warning[] = [];
  const zonesSrc = raw.zones;
  // boundary
  const rawB = raw.boundary;
  const b = checkPolygonsLonLat(rawB, 'boundary');
  warnings.push(...b.warnings);
  const name = String(
    rawB.features[0].props.name ??
      rawB.file
        .split(/[\\/]/)
        .pop()!
        .replace(/\.[^.]+$/, ''),
  );
  const projected = projectField(b.coordinates, name);
  const { projector: proj, ...field } = projected;
  checkPartsMetres(field.parts, b.where, rawB.file, 'boundary');

  // samples
  const table = raw.samples;
  const built = buildSamples(table, {
    map: parseColumnMap(opts.columns),
    depthFactor: opts.depthFactor,
    pMethod: opts.pMethod,
  });
  warnings.push(...built.warnings);
  let s = built.samples;
  for (let i = 0; i < s.ids.length; i++) {
    const lon = s.lonlat[2 * i],
      lat = s.lonlat[2 * i + 1];
    // every reader's positions pass here: a non-number (NaN, infinity, a damaged .shp) is refused before projection
    if (!Number.isFinite(lon) || !Number.isFinite(lat)) {
      throw new UserError(
        `${table.file} sample "${s.ids[i]}" (${s.origin[i].replace(table.file + ' ', '')}): position [${lon}, ${lat}] is not a pair of finite numbers. Fix: give the sample's position in decimal degrees, or export the file again.`,
        { file: table.file, where: s.ids[i], value: [lon, lat] },
      );
    }
    if (Math.abs(lat) > 90 && Math.abs(lat) <= 180 && Math.abs(lon) <= 90) {
      throw new UserError(
        `${table.file} sample "${s.ids[i]}" (${s.origin[i].replace(table.file + ' ', '')}): latitude ${lat} and longitude ${lon} look swapped. ` +
          'Fix: swap the latitude and longitude columns (or name them with --columns "lat=...,lon=...").',
        { file: table.file, where: s.ids[i], value: [lon, lat] },
      );
    }
    if (Math.abs(lon) > 180 || Math.abs(lat) > 90) {
      throw new UserError(
        `${table.file} sample "${s.ids[i]}" (${s.origin[i].replace(table.file + ' ', '')}): position [${lon}, ${lat}] is not a longitude/latitude; it looks like projected metres. ` +
          'Fix: give sample positions in WGS 84 decimal degrees (or a shapefile with its .prj).',
        { file: table.file, where: s.ids[i], value: [lon, lat] },
      );
    }
    if (lat > -1e-9 && lat < 1e-9 && lon > -1e-9 && lon < 1e-9) {
      throw new UserError(
        `${table.file} sample "${s.ids[i]}": position 0, 0 (a missing GPS fix?). Fix: give the sample's position or remove it.`,
        { file: table.file, where: s.ids[i] },
      );
    }
  }
  let xy = proj.forward(s.lonlat);
  /** for each sample now in s, its index in built.samples (changes when --drop-outside drops some) */
  let kept = s.ids.map((_, i) => i);

  // far away from the field: a swapped lat/lon or the wrong file
  const [x0, y0, x1, y1] = field.bbox;
  const diag = Math.hypot(x1 - x0, y1 - y0);
  const far: string[] = [];
  const outside: number[] = [];
  for (let i = 0; i < s.ids.length; i++) {
    const x = xy[2 * i],
      y = xy[2 * i + 1];
    if (!pointInParts(field.parts, x, y)) outside.push(i);
    const dx = Math.max(x0 - x, 0, x - x1),
      dy = Math.max(y0 - y, 0, y - y1);
    if (Math.hypot(dx, dy) > Math.max(5000, 2 * diag) || !Number.isFinite(x)) far.push(s.ids[i]);
  }
  if (far.length === s.ids.length) {
    throw new UserError(
      `${table.file}: every sample lies far from the boundary in ${rawB.file} (more than 5 km). Fix: check that the files belong to the same field, and that latitude and longitude are not swapped.`,
      { file: table.file },
    );
  }
  if (outside.length) {
    const outIds = outside.map((i) => s.ids[i]);
    if (opts.dropOutside) {
      warnings.push({
        code: 'dropped-outside',
        file: table.file,
        message: `${table.file}: ${outIds.length} sample(s) outside the boundary were dropped (--drop-outside): ${abbrev(outIds, 20)}.`,
      });
      const keep = s.ids.map((_, i) => i).filter((i) => !outside.includes(i));
      s = subset(s, keep);
      xy = subsetXY(xy, keep);
      kept = keep;
    } else {
      warnings.push({
        code: 'outside-boundary',
        file: table.file,
        where: outIds.join(','),
        message: `${table.file}: ${outIds.length} sample(s) lie outside the boundary (${abbrev(outIds, 20)}); they are kept${far.length ? ` (${abbrev(far)} more than 5 km away)` : ''}. Use --drop-outside to leave them out.`,
      });
    }
  }

  // duplicate locations (different ids within 0.5 m): a warning; where they share a point, the surface
  // stage averages their values (src/surface/prepare.ts), as a lab would for a re-tested site
  const order = s.ids.map((_, i) => i).sort((a, c) => xy[2 * a] - xy[2 * c]);
  // memory stays linear however many samples share a point: five pairs are named, the rest counted, and the
  // comparisons stop at a budget (a file of thousands of samples at one point is reported, not exhausted)
  const pairs: string[] = [];
  let nPairs = 0,
    compared = 0;
  const COMPARE_BUDGET = 20_000_000;
  for (let a = 0; a < order.length && compared < COMPARE_BUDGET; a++) {
    for (
      let c = a + 1;
      c < order.length && xy[2 * order[c]] - xy[2 * order[a]] < 0.5 && compared < COMPARE_BUDGET;
      c++, compared++
    ) {
      const i = order[a],
        j = order[c];
      if (Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]) >= 0.5) continue;
      if (++nPairs <= 5)
        pairs.push(`"${s.ids[i]}" and "${s.ids[j]}" (${s.lonlat[2 * i + 1]}, ${s.lonlat[2 * i]})`);
    }
  }
  if (nPairs) {
    const more =
      compared >= COMPARE_BUDGET ? ' and many more' : nPairs > 5 ? ` and ${nPairs - 5} more pairs` : '';
    warnings.push({
      code: 'same-place',
      file: table.file,
      where: pairs.join('; '),
      message: `${table.file}: samples ${pairs.join(', ')}${more} are within 0.5 m of each other; at one point their values are averaged in the maps. Fix: if they are different sites, correct the coordinates of one of them.`,
    });
  }

  // zones
  let zones: SampleZones | null = null;
  if (table.polygons && zonesSrc) {
    throw new UserError(
      `${table.file}: the samples are zone polygons and --zones also gives zones. Fix: give the zones once: either drop --zones, or give the samples as points keyed to the zones.`,
      { file: table.file },
    );
  }
  if (table.polygons) {
    // zone-composite samples drawn as their zones: each sample's polygon is its zone, keyed by its zone value or id
    const polys = kept.map((i) => table.polygons![built.firstRecord[i]]);
    const keys = s.ids.map((id, i) => s.zone[i] ?? id);
    if (new Set(keys).size !== keys.length) {
      throw new UserError(
        `${table.file}: two sample polygons have the same zone key. Fix: give each zone polygon its own zone key.`,
        { file: table.file },
      );
    }
    const zoneFeatures: RawPolygons = {
      file: table.file,
      features: keys.map((k, i) => ({
        where: `sample "${s.ids[i]}"`,
        props: { zone: k },
        coordinates: polys[i],
      })),
    };
    zones = zonesOf(zoneFeatures, proj.forward);
    keys.forEach((k, i) => {
      s.zone[i] = k;
    });
  } else if (zonesSrc) {
    zones = zonesOf(zonesSrc, proj.forward);
    const zset = new Set(zones.keys);
    for (let i = 0; i < s.ids.length; i++) {
      const z = s.zone[i];
      if (z === null) {
        const k = zones.parts.findIndex((parts) => pointInParts(parts, xy[2 * i], xy[2 * i + 1]));
        if (k < 0) {
          throw new UserError(
            `${table.file} sample "${s.ids[i]}": it has no zone key and lies in none of the zones. Fix: add a zone column to the samples, or correct its position.`,
            { file: table.file, where: s.ids[i] },
          );
        }
        s.zone[i] = zones.keys[k];
      } else if (!zset.has(z)) {
        throw new UserError(
          `${table.file} sample "${s.ids[i]}": zone "${z}" is not among the zones in the zones file (${abbrev(zones.keys)}). Fix: correct the zone key so that it matches a zone polygon.`,
          { file: table.file, where: s.ids[i], field: 'zone', value: z },
        );
      }
    }
    const sampled = new Set(s.zone);
    const unsampled = zones.keys.filter((k) => !sampled.has(k));
    if (unsampled.length)
      warnings.push({ code: 'zone-without-sample', message: `zones ${abbrev(unsampled)} have no sample.` });
  } else if (s.zone.some((z) => z !== null)) {
    warnings.push({
      code: 'zones-missing',
      file: table.file,
      message: `${table.file}: samples carry zone keys but no zone polygons were given; they are treated as point samples. Give the zones with --zones.`,
    });
  }

  // enough samples
  const composite = zones !== null;
  const min = opts.minSamples ?? 3;
  if (!composite && s.ids.length < min) {
    throw new UserError(
      `${table.file}: ${s.ids.length} sample(s) in the field; a map needs at least ${min} point samples (more than 20 for a useful one). ` +
        'Fix: give all the samples of the field, or treat the field as zone composites with --zones.',
      { file: table.file },
    );
  }
  if (!composite) {
    for (const a of ANALYTES) {
      const k = s.values[a].reduce((m, v) => m + (Number.isNaN(v) ? 0 : 1), 0);
      if (k > 0 && k < min)
        warnings.push({
          code: 'few-values',
          field: a,
          message: `only ${k} sample(s) have ${a}; too few to map it.`,
        });
    }
    const acres = field.areaM2 / 4046.8564224;
    if (s.ids.length < 10)
      warnings.push({
        code: 'few-samples',
        message: `only ${s.ids.length} samples for ${acres.toFixed(0)} ac: a map from so few is rough; check it against what you know of the field.`,
      });
  }

  warnings.push(...soilFlagWarnings(s, table.file));
  const samples: Samples = { ...s, xy };
  return { samples, field, zones, warnings, reading: built.reading };
}

function zonesOf(raw: RawPolygons, forward: (a: ArrayLike<number>) => Float64Array): SampleZones {
  const keyProp = ['zone', 'zone_id', 'zoneid', 'key', 'id', 'name'];
  const keys: string[] = [];
  const lonlat: number[][][][][] = [];
  for (const f of raw.features) {
    const propName = Object.keys(f.props).find((p) => keyProp.includes(p.toLowerCase()));
    const key = propName && f.props[propName] !== null ? String(f.props[propName]).trim() : '';
    if (!key) {
      throw new UserError(
        `${raw.file} ${f.where}: the zone has no key. Fix: give each zone polygon a "zone" property that the samples' zone column refers to.`,
        { file: raw.file, where: f.where },
      );
    }
    const checked = checkPolygonsLonLat({ file: raw.file, features: [f] }, 'zone');
    const k = keys.indexOf(key);
    if (k >= 0) lonlat[k].push(...checked.coordinates);
    else {
      keys.push(key);
      lonlat.push(checked.coordinates);
    }
  }
  const parts = lonlat.map((mp) =>
    mp.map((poly) => {
      const rings = poly.map((r) => forward(r.flat()));
      return { exterior: orient(rings[0], true), holes: rings.slice(1).map((h) => orient(h, false)) };
    }),
  );
  parts.forEach((p, i) =>
    checkPartsMetres(
      p,
      p.map((_, j) => `zone "${keys[i]}"${p.length > 1 ? ` part ${j + 1}` : ''}`),
      raw.file,
      'zone',
    ),
  );
  return { keys, lonlat, parts };
}

function subset<T extends Omit<Samples, 'xy'>>(s: T, keep: number[]): T {
  const values = {} as Samples['values'];
  const censored = {} as Samples['censored'];
  for (const a of ANALYTES) {
    values[a] = Float64Array.from(keep, (i) => s.values[a][i]);
    censored[a] = Int8Array.from(keep, (i) => s.censored[a][i]);
  }
  return {
    ...s,
    ids: keep.map((i) => s.ids[i]),
    lonlat: subsetXY(s.lonlat, keep),
    values,
    censored,
    texture: keep.map((i) => s.texture[i]),
    ...(s.extra
      ? {
          extra: Object.fromEntries(
            Object.entries(s.extra).map(([k, v]) => [k, Float64Array.from(keep, (i) => v[i])]),
          ),
        }
      : {}),
    ...(s.limeRating ? { limeRating: keep.map((i) => s.limeRating![i]) } : {}),
    zone: keep.map((i) => s.zone[i]),
    origin: keep.map((i) => s.origin[i]),
  };
}

function subsetXY(a: Float64Array, keep: number[]): Float64Array {
  const out = new Float64Array(2 * keep.length);
  keep.forEach((i, k) => {
    out[2 * k] = a[2 * i];
    out[2 * k + 1] = a[2 * i + 1];
  });
  return out;
}
