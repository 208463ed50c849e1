/**
 * Zones of a zone-composite field: the sampled zone polygons clipped to the boundary, overlaps and gaps reported.
 */
import * as polyclip from 'polyclip-ts';
import type { Field, RingsPart, SampleZones, Warning } from '../types.js';
import { orient, partsArea } from '../geo/area.js';
import { projector as makeProjector, type Projector } from '../geo/utm.js';
import { M2_PER_AC } from '../units/index.js';
import { clipParts, robust } from './clip.js';
import { toLonLat } from './polygons.js';

/** A zone of a zone-composite field: the sampled zone polygon clipped to the boundary. */
export interface SampledZone {
  id: number;
  /** the samples' zone key */
  key: string;
  parts: RingsPart[];
  lonlat: number[][][][];
  areaM2: number;
}

/**
 * Zones of a zone-composite field: each sampled zone polygon clipped to the field boundary. Where
 * sampled zones overlap, the overlap goes to the zone listed first (with a warning); field area that
 * no sampled zone covers is reported in a warning (it gets no rate).
 * @example const { zones, warnings } = zonesFromSampleZones(inputs.zones!, inputs.field);
 */
export function zonesFromSampleZones(
  sz: SampleZones,
  field: Field,
  opts: { projector?: Projector } = {},
): { zones: SampledZone[]; warnings: Warning[] } {
  const [ox, oy] = [field.bbox[0], field.bbox[3]];
  const planarField = partsArea(field.parts);
  const scale = planarField > 0 ? field.areaM2 / planarField : 1;
  const proj = opts.projector ?? makeProjector(field.utm);
  const warnings: Warning[] = [];
  const zones: SampledZone[] = [];
  const taken: RingsPart[][] = [];
  for (let k = 0; k < sz.keys.length; k++) {
    let parts = clipParts(sz.parts[k], field.parts, ox, oy);
    if (taken.length > 0 && parts.length > 0) {
      const before = partsArea(parts);
      parts = differenceParts(parts, taken.flat(), ox, oy);
      const lost = before - partsArea(parts);
      if (lost > 1e-6 * Math.max(1, before)) {
        warnings.push({
          code: 'zones-sampled-overlap',
          where: sz.keys[k],
          message: `Sampled zone "${sz.keys[k]}" overlaps an earlier zone by ${((lost * scale) / M2_PER_AC).toFixed(2)} ac; the overlap stays with the earlier zone. Fix: correct the zone polygons so they do not overlap.`,
        });
      }
    }
    if (parts.length === 0) {
      warnings.push({
        code: 'zones-sampled-outside',
        where: sz.keys[k],
        message: `Sampled zone "${sz.keys[k]}" lies outside the field boundary; it is left out. Fix: check that the zone file belongs to this field.`,
      });
      continue;
    }
    taken.push(parts);
    zones.push({
      id: zones.length,
      key: sz.keys[k],
      parts,
      lonlat: toLonLat(parts, proj),
      areaM2: partsArea(parts) * scale,
    });
  }
  const covered = zones.reduce((s, z) => s + z.areaM2, 0);
  if (field.areaM2 - covered > 1e-4 * field.areaM2) {
    warnings.push({
      code: 'zones-sampled-gap',
      message: `The sampled zones cover ${(covered / M2_PER_AC).toFixed(2)} of the field's ${(field.areaM2 / M2_PER_AC).toFixed(2)} ac; the rest gets no rate. Fix: extend the zone polygons to the boundary.`,
    });
  }
  return { zones, warnings };
}

function differenceParts(a: RingsPart[], b: RingsPart[], ox: number, oy: number): RingsPart[] {
  const g = (ps: RingsPart[]) =>
    ps.map((p) =>
      [p.exterior, ...p.holes].map((r) => {
        const out: [number, number][] = [];
        for (let i = 0; i + 1 < r.length; i += 2) out.push([r[i] - ox, r[i + 1] - oy]);
        return out;
      }),
    );
  const res = robust(
    () => polyclip.difference(g(a) as polyclip.Geom, g(b) as polyclip.Geom) as [number, number][][][],
  );
  return res
    .map((poly) => {
      const rings = poly.map((r) => Float64Array.from(r.flatMap(([x, y]) => [x + ox, y + oy])));
      return { exterior: rings[0], holes: rings.slice(1) };
    })
    .map((p) => ({ exterior: orient(p.exterior, true), holes: p.holes.map((h) => orient(h, false)) }));
}
