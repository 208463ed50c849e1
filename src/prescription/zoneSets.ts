/**
 * The zone sets of a prescription, each zone with its decision: the sampled polygons of a zone-composite field,
 * or the designed zone sets of a grid-sampled field (zoneDesign.ts).
 */
import { UserError, type Warning } from '../errors.js';
import { decide } from '../agronomy/decide.js';
import type { SoilValues } from '../agronomy/interpret.js';
import type { Plan } from '../agronomy/plan.js';
import { NUTRIENTS, type Nutrient, type Tables } from '../agronomy/tables.js';
import type { NutrientSurface } from '../surface/nutrientSurface.js';
import { zonesFromSampleZones } from '../zones/index.js';
import { vertexCount } from '../zones/arcs.js';
import type { Analyte, FieldInputs, Grid, RingsPart, Texture } from '../types.js';
import { m2ToAc, m2ToHa } from '../units/index.js';
import type { PrescriptionZone, ZoneSetResult } from './types.js';
import { designZoneSets, numberRateClasses, type MinZoneArea } from './zoneDesign.js';

/** Soil analytes the rate engine reads. */
export const BUILD_ANALYTES: readonly Analyte[] = ['no3_n', 'p', 'k', 'so4_s', 'om'];

/** The nutrient a product mainly carries (largest share of its analysis). */
export function mainNutrient(product: string, tables: Tables): Nutrient {
  const p = tables.products[product];
  if (!p)
    throw new UserError(
      `plan product "${product}" is not in the product table; allowed: ${Object.keys(tables.products).join(', ')}. Fix: correct the name or add the product to your tables file.`,
      { field: 'products', value: product },
    );
  let best: Nutrient = 'n';
  for (const n of NUTRIENTS) if (p[n] > p[best]) best = n;
  return best;
}

/** The zone set of a zone-composite field: the sampled polygons, each with its composite's soil values. */
export function sampledZoneSet(
  inputs: FieldInputs,
  plan: Plan,
  tables: Tables,
  warnings: Warning[],
): ZoneSetResult {
  const { samples, field } = inputs;
  const { zones: sz, warnings: zw } = zonesFromSampleZones(inputs.zones!, field);
  warnings.push(...zw);
  const zonesOut: PrescriptionZone[] = sz.map((z, i) => {
    const idx = samples.zone.map((k, j) => (k === z.key ? j : -1)).filter((j) => j >= 0);
    const soil: SoilValues = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN };
    for (const a of BUILD_ANALYTES) {
      const vs = idx.map((j) => samples.values[a][j]).filter((v) => Number.isFinite(v));
      (soil as unknown as Record<string, number>)[a] = vs.length
        ? vs.reduce((s, v) => s + v, 0) / vs.length
        : NaN;
    }
    soil.texture = majorityTexture(idx.map((j) => samples.texture[j]));
    soil.pMethod = samples.pMethod;
    if (idx.length === 0)
      warnings.push({
        code: 'build.zone-unsampled',
        where: z.key,
        message: `sampled zone "${z.key}" has no sample; its soil values are unknown and its rates follow the "not tested" rules. Fix: add its composite sample.`,
      });
    return zoneRecord(
      i + 1,
      i + 1,
      z.key,
      z.parts,
      z.lonlat,
      z.areaM2,
      soil,
      idx.map((j) => samples.ids[j]),
      plan,
      tables,
    );
  });
  return {
    name: 'sampled',
    drivenBy: 'the sampled zone polygons (zone-composite samples)',
    products: plan.products.map((p) => p.product),
    zones: zonesOut,
    breaks: null,
    minZoneAreaM2: 0,
    zoneOfCell: null,
    design: null,
  };
}

/** Zone sets of a grid-sampled field (zoneDesign.ts), each zone with its rate class's decision. */
export function designedZoneSets(
  inputs: FieldInputs,
  plan: Plan,
  tables: Tables,
  grid: Grid,
  tg: Record<Nutrient, Float64Array>,
  surfaces: NutrientSurface[],
  byAnalyte: Partial<Record<Analyte, Float64Array>>,
  minArea: MinZoneArea,
  warnings: Warning[],
): ZoneSetResult[] {
  const analytes = BUILD_ANALYTES.filter((a) => byAnalyte[a]);
  const designed = designZoneSets({
    inputs,
    plan,
    tables,
    grid,
    targets: tg,
    surfaces,
    analytes,
    layers: analytes.map((a) => byAnalyte[a]!),
    minArea,
    mainNutrient: (p) => mainNutrient(p, tables),
  });
  warnings.push(...designed.warnings);
  return designed.sets.map((set) => {
    const profiles = set.zones.profiles!;
    const zonesOut = set.zones.zones.map((z, zi): PrescriptionZone => ({
      id: zi + 1,
      rateClass: 0,
      key: null,
      parts: z.parts,
      lonlat: z.lonlat,
      areaM2: z.areaM2,
      areaAc: m2ToAc(z.areaM2),
      areaHa: m2ToHa(z.areaM2),
      soil: profiles[zi].soil,
      samples: set.samples[zi].map((j) => inputs.samples.ids[j]),
      decision: profiles[zi].decision,
    }));
    numberRateClasses(zonesOut, set.products);
    return {
      name: set.name,
      drivenBy: set.drivenBy,
      products: set.products,
      zones: zonesOut,
      breaks: set.breaks,
      minZoneAreaM2: minArea.usedM2,
      zoneOfCell: set.zones.zoneOfCell,
      design: set.design,
    };
  });
}

function zoneRecord(
  id: number,
  rateClass: number,
  key: string | null,
  parts: RingsPart[],
  lonlat: number[][][][],
  areaM2: number,
  soil: SoilValues,
  ids: string[],
  plan: Plan,
  tables: Tables,
): PrescriptionZone {
  return {
    id,
    rateClass,
    key,
    parts,
    lonlat,
    areaM2,
    areaAc: m2ToAc(areaM2),
    areaHa: m2ToHa(areaM2),
    soil,
    samples: ids,
    decision: decide(soil, plan, tables),
  };
}

/** Fails with a UserError when a zone set's polygons need more vertices than plan output.max_vertices. */
export function checkVertexLimit(sets: ZoneSetResult[], max: number | null): void {
  if (max === null) return;
  for (const set of sets) {
    const n = set.zones.reduce((s, z) => s + vertexCount(z.parts), 0);
    if (n > max) {
      throw new UserError(
        `zone set "${set.name}" needs ${n} polygon vertices, more than plan key output.max_vertices (${max}). Fix: raise zoning.simplify_cells (smoother edges) or zoning.min_zone_ac (fewer zones), or raise output.max_vertices if your controller takes larger files.`,
        { field: 'output.max_vertices', value: max },
      );
    }
  }
}

function majorityTexture(ts: (Texture | null)[]): Texture | null {
  const count = new Map<Texture, number>();
  for (const t of ts) if (t) count.set(t, (count.get(t) ?? 0) + 1);
  let best: Texture | null = null,
    bc = 0;
  for (const [t, c] of count)
    if (c > bc) {
      best = t;
      bc = c;
    }
  return best;
}
