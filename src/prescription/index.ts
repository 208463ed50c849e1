/**
 * The main job end to end: samples + boundary + plan -> a prescription.
 *
 * surfaces (IDW chosen by cross-validation, or zone composites) -> per-cell nutrient targets ->
 * rate classes -> cleaned class raster -> zone polygons clipped to the field -> each zone's mean soil
 * values through the rate engine -> product rates per zone and totals. Pure: no files, no console.
 * See docs/method.md for the method and its defaults.
 */
import { soilFlagsById } from '../agronomy/soilFlags.js';
import { UserError, type Warning } from '../errors.js';
import { decide, type Decision } from '../agronomy/decide.js';
import type { SoilValues } from '../agronomy/interpret.js';
import type { Plan } from '../agronomy/plan.js';
import { NUTRIENTS, type Nutrient, type Placement, type Tables } from '../agronomy/tables.js';
import { fieldGrid } from '../surface/grid.js';
import { nutrientSurfaces, type NutrientSurface } from '../surface/nutrientSurface.js';
import type { SurfaceThreads } from '../surface/parallel.js';
import { zonesFromSampleZones } from '../zones/index.js';
import { vertexCount } from '../zones/arcs.js';
import type { Analyte, FieldInputs, Grid, RingsPart, Texture } from '../types.js';
import { m2ToAc, m2ToHa } from '../units/index.js';
import { cellTargets } from './cellTargets.js';
import {
  designZoneSets,
  minZoneArea,
  numberRateClasses,
  type MinZoneArea,
  type ZoneDesign,
} from './zoneDesign.js';

export { mergeCloseClasses } from './zoneDesign.js';

/** Soil analytes the rate engine reads. */
export const BUILD_ANALYTES: readonly Analyte[] = ['no3_n', 'p', 'k', 'so4_s', 'om'];

export interface BuildOptions {
  /** grid cell size, m; default: about 1/200 of the field's longer side, rounded to 1, 2, 5, 10 or 20 m */
  cell?: number;
  /** progress for long steps: step name and share of it done, 0..1 (a new name starts a new step) */
  onProgress?: (step: string, done: number) => void;
  /** worker threads for the surfaces' per-cell work (default none; src/surface/parallel.ts) */
  threads?: SurfaceThreads;
}

/** One zone of one zone set, with its decision. */
export interface PrescriptionZone {
  /** 1-based within its zone set */
  id: number;
  /** 1-based rate class (1 = lowest need); for zone-composite fields, the sampled zone's order */
  rateClass: number;
  /** sampled zone key for zone-composite fields, else null */
  key: string | null;
  parts: RingsPart[];
  lonlat: number[][][][];
  areaM2: number;
  areaAc: number;
  areaHa: number;
  /** area-weighted mean soil values over the zone (canonical units) */
  soil: SoilValues;
  /** sample ids inside the zone */
  samples: string[];
  decision: Decision;
}

/** A set of zones that one pass (or one product) follows. */
export interface ZoneSetResult {
  /** e.g. "shared", "p2o5", "sampled" */
  name: string;
  /** what draws the zones, for people */
  drivenBy: string;
  /** products whose rates this set carries */
  products: string[];
  zones: PrescriptionZone[];
  /** class breaks of the driving target (lb/ac), for legends; null for shared or sampled sets */
  breaks: number[] | null;
  minZoneAreaM2: number;
  /** per cell zone index (0-based into zones), -1 outside; null for sampled sets */
  zoneOfCell: Int32Array | null;
  /** how the zones came about (counts, minimum area and rate differences, pairs, vertices); null for sampled sets */
  design: ZoneDesign | null;
}

/** Product totals for ordering and loading. */
export interface ProductTotal {
  zoneSet: string;
  product: string;
  label: string;
  placement: Placement;
  /** total product, lb and kg */
  totalLb: number;
  totalKg: number;
  /** area-weighted mean, min and max product rate over the field, in the plan's unit */
  meanRate: number;
  minRate: number;
  maxRate: number;
  unit: string;
  /** area that receives this product, ac */
  appliedAc: number;
}

export interface Prescription {
  field: {
    name: string;
    areaM2: number;
    areaAc: number;
    areaHa: number;
    utm: FieldInputs['field']['utm'];
    parts: RingsPart[];
    lonlat: number[][][][];
  };
  plan: Plan;
  grid: Grid;
  surfaces: NutrientSurface[];
  /** per-cell targets, lb/ac (for maps) */
  targets: Record<Nutrient, Float64Array>;
  zoneSets: ZoneSetResult[];
  totals: ProductTotal[];
  /** zones where a target could not be met */
  infeasible: { zoneSet: string; zone: number; nutrient: string | null; reason: string }[];
  warnings: Warning[];
  sampled: boolean;
  /** sample id -> soil flags ("saline; high pH"), flagged samples only (src/agronomy/soilFlags.ts); no rate depends on them */
  soilFlags?: Record<string, string>;
}

/** A cell size giving about 200 cells across the field's longer side, rounded to 1, 2, 5, 10 or 20 m. */
export function defaultCell(bbox: [number, number, number, number]): number {
  const side = Math.max(bbox[2] - bbox[0], bbox[3] - bbox[1]);
  const want = side / 200;
  for (const c of [1, 2, 5, 10, 20]) if (want <= c) return c;
  return 50;
}

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

/**
 * Builds the prescription.
 *
 * Zone sets (plan.zoning.zone_sets): `shared` = one set for the whole pass, classes by k-means on the
 * standardized N, P2O5, K2O and S targets of the cells; `per_product` = one set per nutrient that a plan
 * product mainly carries, classes of that nutrient's target by plan.zoning.method. A zone-composite field
 * (inputs.zones) uses the sampled zones themselves. Each zone's rates come from its area-weighted mean
 * soil values run through the rate engine (not a mean of cell rates), so every zone rate is one whole,
 * seed-row-checked decision.
 *
 * @example const rx = buildPrescription(inputs, parsePlan(yaml), defaultTables()); rx.zoneSets[0].zones.length
 */
export function buildPrescription(
  inputs: FieldInputs,
  plan: Plan,
  tables: Tables,
  opts: BuildOptions = {},
): Prescription {
  const { samples, field } = inputs;
  const warnings: Warning[] = [...inputs.warnings];
  const progress = opts.onProgress ?? (() => {});
  for (const p of plan.products) mainNutrient(p.product, tables);

  // samples must touch the field
  let inside = 0;
  const grid = fieldGrid(field, opts.cell ?? defaultCell(field.bbox));
  const cellOf = (x: number, y: number) => {
    const c = Math.floor((x - grid.xmin) / grid.cell),
      r = Math.floor((grid.ymax - y) / grid.cell);
    return c >= 0 && r >= 0 && c < grid.cols && r < grid.rows ? r * grid.cols + c : -1;
  };
  for (let i = 0; i < samples.ids.length; i++) {
    const c = cellOf(samples.xy[2 * i], samples.xy[2 * i + 1]);
    if (c >= 0 && grid.fraction[c] > 0) inside++;
  }
  if (inside === 0 && !inputs.zones) {
    throw new UserError(
      `no sample lies inside the field boundary "${field.name}". Fix: check that the samples and the boundary belong to the same field (and the same coordinate system).`,
    );
  }

  // 1. surfaces
  const surfaces: NutrientSurface[] = [];
  const byAnalyte: Partial<Record<Analyte, Float64Array>> = {};
  // analytes at the same sample sites share one neighbour search (src/surface nutrientSurfaces)
  const present = BUILD_ANALYTES.filter((a) => samples.values[a]?.some((v) => Number.isFinite(v)));
  progress('surfaces (cross-validation and interpolation)', 0);
  const surfaceOpts = {
    method: plan.surface.method,
    kriging: { log: plan.surface.log, neighbours: plan.surface.kriging_neighbours },
    threads: opts.threads,
  };
  const made = nutrientSurfaces(samples, present, grid, inputs.zones, surfaceOpts, (d) =>
    progress('surfaces (cross-validation and interpolation)', d),
  );
  for (const a of BUILD_ANALYTES) {
    const s = made.find((m) => m.analyte === a);
    if (!s) {
      warnings.push({
        code: 'build.analyte-missing',
        message: `no sample has ${a}; it is treated as not tested everywhere.`,
        field: a,
      });
      continue;
    }
    surfaces.push(s);
    byAnalyte[a] = s.values;
    warnings.push(...s.warnings);
  }
  progress('surfaces (cross-validation and interpolation)', 1);

  // 2. per-cell targets
  const tg = cellTargets(byAnalyte, grid.fraction, plan, tables);

  const minArea = minZoneArea(plan, field.areaM2, inside);

  const zoneSets: ZoneSetResult[] = [];
  const sampled = !!inputs.zones && samples.zone.some((z) => z !== null);

  if (sampled) {
    progress('zones (sampled polygons)', 0);
    zoneSets.push(sampledZoneSet(inputs, plan, tables, warnings));
  } else {
    // 3. classes and zones, merged until neighbouring zones differ by rates that matter (zoneDesign.ts)
    progress('zones (classes, merging, edges, rates per zone)', 0);
    zoneSets.push(
      ...designedZoneSets(inputs, plan, tables, grid, tg, surfaces, byAnalyte, minArea, warnings),
    );
  }
  progress('zones (classes, merging, edges, rates per zone)', 1);
  checkVertexLimit(zoneSets, plan.output.max_vertices);

  const infeasible: Prescription['infeasible'] = [];
  // the rate engine's warnings, grouped: one line per kind of warning, naming the zones it concerns
  const groups = new Map<string, { first: Warning; messages: Set<string>; where: Map<string, number[]> }>();
  for (const set of zoneSets)
    for (const z of set.zones) {
      for (const w of z.decision.warnings) {
        let g = groups.get(w.code);
        if (!g) groups.set(w.code, (g = { first: w, messages: new Set(), where: new Map() }));
        g.messages.add(w.message);
        g.where.set(set.name, [...(g.where.get(set.name) ?? []), z.id]);
      }
      if (z.decision.status !== 'ok')
        for (const f of z.decision.infeasible)
          infeasible.push({ zoneSet: set.name, zone: z.id, nutrient: f.nutrient, reason: f.reason });
    }
  for (const [code, g] of groups) {
    const where = [...g.where]
      .map(
        ([set, ids]) =>
          `${zoneSets.length > 1 ? `set ${set} ` : ''}zone${ids.length > 1 ? 's' : ''} ${ids.join(', ')}`,
      )
      .join('; ');
    const msg =
      g.messages.size === 1 ? g.first.message : `${g.first.message} (values differ by zone; see zones.csv)`;
    warnings.push({ ...g.first, code, where, message: `${where}: ${msg}` });
  }
  return {
    field: {
      name: field.name,
      areaM2: field.areaM2,
      areaAc: m2ToAc(field.areaM2),
      areaHa: m2ToHa(field.areaM2),
      utm: field.utm,
      parts: field.parts,
      lonlat: field.lonlat,
    },
    plan,
    grid,
    surfaces,
    targets: tg,
    zoneSets,
    totals: productTotals(zoneSets, plan),
    infeasible,
    warnings: dedupe(warnings),
    sampled,
    soilFlags: soilFlagsById(inputs.samples),
  };
}

/** The zone set of a zone-composite field: the sampled polygons, each with its composite's soil values. */
function sampledZoneSet(inputs: FieldInputs, plan: Plan, tables: Tables, warnings: Warning[]): ZoneSetResult {
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
function designedZoneSets(
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

/** Rate of one product in one placement of a decision, in the plan's unit (0 when not applied). */
export function productRate(
  d: Decision,
  product: string,
  placement: Placement,
): { value: number; lbac: number } {
  for (const p of d.placements)
    if (p.placement === placement)
      for (const q of p.products)
        if (q.product === product) return { value: q.rate.value, lbac: q.rate.lbac };
  return { value: 0, lbac: 0 };
}

/** The (product, placement) pairs that any zone of the set uses, in plan order. */
export function usedPairs(set: ZoneSetResult): { product: string; placement: Placement; label: string }[] {
  const seen = new Map<string, { product: string; placement: Placement; label: string }>();
  for (const z of set.zones)
    for (const p of z.decision.placements)
      for (const q of p.products) {
        if (!set.products.includes(q.product)) continue;
        const k = `${q.product}|${p.placement}`;
        if (!seen.has(k)) seen.set(k, { product: q.product, placement: p.placement, label: q.label });
      }
  const order = (x: { product: string; placement: Placement }) =>
    set.products.indexOf(x.product) * 10 +
    ['seed_row', 'side_band', 'mid_row_band', 'broadcast'].indexOf(x.placement);
  return [...seen.values()].sort((a, b) => order(a) - order(b));
}

function productTotals(sets: ZoneSetResult[], plan: Plan): ProductTotal[] {
  const out: ProductTotal[] = [];
  for (const set of sets) {
    const fieldAc = set.zones.reduce((s, z) => s + z.areaAc, 0);
    for (const pair of usedPairs(set)) {
      let lb = 0,
        mean = 0,
        min = Infinity,
        max = -Infinity,
        applied = 0;
      for (const z of set.zones) {
        const r = productRate(z.decision, pair.product, pair.placement);
        lb += r.lbac * z.areaAc;
        mean += r.value * z.areaAc;
        min = Math.min(min, r.value);
        max = Math.max(max, r.value);
        if (r.lbac > 0) applied += z.areaAc;
      }
      out.push({
        zoneSet: set.name,
        product: pair.product,
        label: pair.label,
        placement: pair.placement,
        totalLb: lb,
        totalKg: lb * 0.45359237,
        meanRate: fieldAc > 0 ? mean / fieldAc : 0,
        minRate: min,
        maxRate: max,
        unit: plan.units,
        appliedAc: applied,
      });
    }
  }
  return out;
}

/** Fails with a UserError when a zone set's polygons need more vertices than plan output.max_vertices. */
function checkVertexLimit(sets: ZoneSetResult[], max: number | null): void {
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

export function nutrientName(n: Nutrient): string {
  return { n: 'N', p2o5: 'P2O5', k2o: 'K2O', s: 'S' }[n];
}

function dedupe(ws: Warning[]): Warning[] {
  const seen = new Set<string>();
  return ws.filter((w) => (seen.has(w.message) ? false : (seen.add(w.message), true)));
}
