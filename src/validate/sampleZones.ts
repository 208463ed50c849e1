/**
 * Zone-composite samples: the zone polygons (from --zones, or the samples' own polygons) and each sample's zone
 * key, checked against them. A step of prepareInputs (src/validate/inputs.ts). Pure.
 */
import { UserError, type Warning } from '../errors.js';
import { pointInParts } from '../geo/area.js';
import { orient } from '../geo/field.js';
import type { RawPolygons, RawTable } from '../io/records.js';
import type { Samples, SampleZones } from '../types.js';
import { checkPartsMetres, checkPolygonsLonLat } from './boundary.js';
import { abbrev } from './samples.js';

type Forward = (a: ArrayLike<number>) => Float64Array;
type ZonedSamples = Omit<Samples, 'xy'>;

/**
 * The sample zones of a field, and each sample's zone key filled in (`s.zone`, changed in place): from the
 * samples' own polygons, from the zones file (a sample without a key takes the zone it lies in), or none.
 * @param polygons for each sample, its polygon (samples given as zone polygons), else undefined
 * @example sampleZones({ table, s, xy, polygons: undefined, zonesSrc, forward, warnings })
 */
export function sampleZones(a: {
  table: RawTable;
  s: ZonedSamples;
  xy: Float64Array;
  polygons: number[][][][][] | undefined;
  zonesSrc: RawPolygons | undefined;
  forward: Forward;
  warnings: Warning[];
}): SampleZones | null {
  const { table, s, zonesSrc } = a;
  if (a.polygons && zonesSrc) {
    throw new UserError(
      `${table.file}: the samples are zone polygons and --zones also gives zones. Fix: give the zones once: either drop --zones, or give the samples as points keyed to the zones.`,
      { file: table.file },
    );
  }
  if (a.polygons) return zonesOfPolygonSamples(table.file, s, a.polygons, a.forward);
  if (zonesSrc) {
    const zones = zonesOf(zonesSrc, a.forward);
    keyToZones(table.file, s, a.xy, zones, a.warnings);
    return zones;
  }
  if (s.zone.some((z) => z !== null)) {
    a.warnings.push({
      code: 'zones-missing',
      file: table.file,
      message: `${table.file}: samples carry zone keys but no zone polygons were given; they are treated as point samples. Give the zones with --zones.`,
    });
  }
  return null;
}

/** Zone-composite samples drawn as their zones: each sample's polygon is its zone, keyed by its zone value or id. */
function zonesOfPolygonSamples(
  file: string,
  s: ZonedSamples,
  polys: number[][][][][],
  forward: Forward,
): SampleZones {
  const keys = s.ids.map((id, i) => s.zone[i] ?? id);
  if (new Set(keys).size !== keys.length) {
    throw new UserError(
      `${file}: two sample polygons have the same zone key. Fix: give each zone polygon its own zone key.`,
      { file },
    );
  }
  const zoneFeatures: RawPolygons = {
    file,
    features: keys.map((k, i) => ({
      where: `sample "${s.ids[i]}"`,
      props: { zone: k },
      coordinates: polys[i],
    })),
  };
  const zones = zonesOf(zoneFeatures, forward);
  keys.forEach((k, i) => {
    s.zone[i] = k;
  });
  return zones;
}

/** Each sample's zone key must name a zone; a sample without one takes the zone it lies in. */
function keyToZones(
  file: string,
  s: ZonedSamples,
  xy: Float64Array,
  zones: SampleZones,
  warnings: Warning[],
): void {
  const zset = new Set(zones.keys);
  for (let i = 0; i < s.ids.length; i++) {
    const z = s.zone[i];
    if (z === null) {
      const k = zones.parts.findIndex((parts) => pointInParts(parts, xy[2 * i], xy[2 * i + 1]));
      if (k < 0) {
        throw new UserError(
          `${file} sample "${s.ids[i]}": it has no zone key and lies in none of the zones. Fix: add a zone column to the samples, or correct its position.`,
          { file, where: s.ids[i] },
        );
      }
      s.zone[i] = zones.keys[k];
    } else if (!zset.has(z)) {
      throw new UserError(
        `${file} sample "${s.ids[i]}": zone "${z}" is not among the zones in the zones file (${abbrev(zones.keys)}). Fix: correct the zone key so that it matches a zone polygon.`,
        { file, where: s.ids[i], field: 'zone', value: z },
      );
    }
  }
  const sampled = new Set(s.zone);
  const unsampled = zones.keys.filter((k) => !sampled.has(k));
  if (unsampled.length)
    warnings.push({ code: 'zone-without-sample', message: `zones ${abbrev(unsampled)} have no sample.` });
}

/** The zone polygons of a zones file, grouped by key (a key on several features makes one zone of several parts). */
function zonesOf(raw: RawPolygons, forward: Forward): SampleZones {
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
