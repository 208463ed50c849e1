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
import { classify, classifyVectors, type Classes } from '../zones/classify.js';
import { makeZones, minZoneAreaM2, zonesFromSampleZones } from '../zones/index.js';
import type { Analyte, FieldInputs, Grid, RingsPart, Texture } from '../types.js';
import { m2ToAc, m2ToHa, M2_PER_AC } from '../units/index.js';
import { cellTargets } from './cellTargets.js';

/** Soil analytes the rate engine reads. */
export const BUILD_ANALYTES: readonly Analyte[] = ['no3_n', 'p', 'k', 'so4_s', 'om'];

export interface BuildOptions {
  /** grid cell size, m; default: about 1/200 of the field's longer side, rounded to 1, 2, 5, 10 or 20 m */
  cell?: number;
  /** progress for long steps: step name and share of it done, 0..1 (a new name starts a new step) */
  onProgress?: (step: string, done: number) => void;
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
  field: { name: string; areaM2: number; areaAc: number; areaHa: number; utm: FieldInputs['field']['utm']; parts: RingsPart[]; lonlat: number[][][][] };
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
  if (!p) throw new UserError(`plan product "${product}" is not in the product table; allowed: ${Object.keys(tables.products).join(', ')}. Fix: correct the name or add the product to your tables file.`, { field: 'products', value: product });
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
export function buildPrescription(inputs: FieldInputs, plan: Plan, tables: Tables, opts: BuildOptions = {}): Prescription {
  const { samples, field } = inputs;
  const warnings: Warning[] = [...inputs.warnings];
  const progress = opts.onProgress ?? (() => {});
  for (const p of plan.products) mainNutrient(p.product, tables);

  // samples must touch the field
  let inside = 0;
  const grid = fieldGrid(field, opts.cell ?? defaultCell(field.bbox));
  const cellOf = (x: number, y: number) => {
    const c = Math.floor((x - grid.xmin) / grid.cell), r = Math.floor((grid.ymax - y) / grid.cell);
    return c >= 0 && r >= 0 && c < grid.cols && r < grid.rows ? r * grid.cols + c : -1;
  };
  for (let i = 0; i < samples.ids.length; i++) {
    const c = cellOf(samples.xy[2 * i], samples.xy[2 * i + 1]);
    if (c >= 0 && grid.fraction[c] > 0) inside++;
  }
  if (inside === 0 && !inputs.zones) {
    throw new UserError(`no sample lies inside the field boundary "${field.name}". Fix: check that the samples and the boundary belong to the same field (and the same coordinate system).`);
  }

  // 1. surfaces
  const surfaces: NutrientSurface[] = [];
  const byAnalyte: Partial<Record<Analyte, Float64Array>> = {};
  // analytes at the same sample sites share one neighbour search (src/surface nutrientSurfaces)
  const present = BUILD_ANALYTES.filter((a) => samples.values[a]?.some((v) => Number.isFinite(v)));
  progress('surfaces (cross-validation and interpolation)', 0);
  const surfaceOpts = { method: plan.surface.method, kriging: { log: plan.surface.log, neighbours: plan.surface.kriging_neighbours } };
  const made = nutrientSurfaces(samples, present, grid, inputs.zones, surfaceOpts, (d) => progress('surfaces (cross-validation and interpolation)', d));
  for (const a of BUILD_ANALYTES) {
    const s = made.find((m) => m.analyte === a);
    if (!s) {
      warnings.push({ code: 'build.analyte-missing', message: `no sample has ${a}; it is treated as not tested everywhere.`, field: a });
      continue;
    }
    surfaces.push(s);
    byAnalyte[a] = s.values;
    warnings.push(...s.warnings);
  }
  progress('surfaces (cross-validation and interpolation)', 1);

  // 2. per-cell targets
  const tg = cellTargets(byAnalyte, grid.fraction, plan, tables);

  const minArea = plan.zoning.min_zone_ac === 'auto'
    ? minZoneAreaM2({ swathM: plan.machine.swath_width_ft * 0.3048, speedKmh: plan.machine.speed_mph * 1.609344, changeSeconds: plan.machine.rate_change_s })
    : plan.zoning.min_zone_ac * M2_PER_AC;

  const zoneSets: ZoneSetResult[] = [];
  const sampled = !!inputs.zones && samples.zone.some((z) => z !== null);
  const allProducts = plan.products.map((p) => p.product);

  const meanSoil = (weightOf: (cell: number) => number, cells: Iterable<number>): SoilValues => {
    const soil: SoilValues = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN };
    for (const a of BUILD_ANALYTES) {
      const v = byAnalyte[a];
      if (!v) continue;
      let s = 0, w = 0;
      for (const c of cells) { const x = v[c], wc = weightOf(c); if (x === x && wc > 0) { s += x * wc; w += wc; } }
      (soil as unknown as Record<string, number>)[a] = w > 0 ? s / w : NaN;
    }
    return soil;
  };

  if (sampled) {
    progress('zones (sampled polygons)', 0);
    const { zones: sz, warnings: zw } = zonesFromSampleZones(inputs.zones!, field);
    warnings.push(...zw);
    const zonesOut: PrescriptionZone[] = sz.map((z, i) => {
      const idx = samples.zone.map((k, j) => (k === z.key ? j : -1)).filter((j) => j >= 0);
      const soil: SoilValues = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN };
      for (const a of BUILD_ANALYTES) {
        const vs = idx.map((j) => samples.values[a][j]).filter((v) => Number.isFinite(v));
        (soil as unknown as Record<string, number>)[a] = vs.length ? vs.reduce((s, v) => s + v, 0) / vs.length : NaN;
      }
      soil.texture = majorityTexture(idx.map((j) => samples.texture[j]));
      soil.pMethod = samples.pMethod;
      if (idx.length === 0) warnings.push({ code: 'build.zone-unsampled', where: z.key, message: `sampled zone "${z.key}" has no sample; its soil values are unknown and its rates follow the "not tested" rules. Fix: add its composite sample.` });
      return zoneRecord(i + 1, i + 1, z.key, z.parts, z.lonlat, z.areaM2, soil, idx.map((j) => samples.ids[j]), plan, tables);
    });
    zoneSets.push({ name: 'sampled', drivenBy: 'the sampled zone polygons (zone-composite samples)', products: allProducts, zones: zonesOut, breaks: null, minZoneAreaM2: 0, zoneOfCell: null });
  } else {
    // 3. classes and zones
    const specs: { name: string; drivenBy: string; products: string[]; input: Float64Array | { classOf: Int16Array } }[] = [];
    if (plan.zoning.zone_sets === 'shared') {
      const dims = NUTRIENTS.filter((n) => varies(tg[n], grid.fraction)).map((n) => tg[n]);
      const vc = dims.length > 0
        ? classifyVectors(dims, { classes: plan.zoning.classes, weights: grid.fraction })
        : { classOf: new Int16Array(grid.cols * grid.rows).map((_, i) => (grid.fraction[i] > 0 ? 0 : -1)) };
      specs.push({ name: 'shared', drivenBy: `k-means on the standardized ${NUTRIENTS.filter((n) => varies(tg[n], grid.fraction)).map(nutrientName).join(', ') || 'targets (all uniform)'} targets`, products: allProducts, input: { classOf: vc.classOf } });
    } else {
      const byNutrient = new Map<Nutrient, string[]>();
      for (const p of allProducts) {
        const n = mainNutrient(p, tables);
        byNutrient.set(n, [...(byNutrient.get(n) ?? []), p]);
      }
      for (const [n, prods] of byNutrient) specs.push({ name: n, drivenBy: `${nutrientName(n)} target (${plan.zoning.method}, up to ${plan.zoning.classes} classes)`, products: prods, input: tg[n] });
    }
    specs.forEach((spec, si) => {
      progress('zones (classes, cleaning, tracing, rates per zone)', si / specs.length);
      let input = spec.input;
      let breaks: number[] | null = null;
      if (input instanceof Float64Array) {
        const c = classify(input, { method: plan.zoning.method, classes: plan.zoning.classes, weights: grid.fraction, step: 0 });
        const merged = mergeCloseClasses(c, plan.zoning.min_class_difference_pct);
        input = { classOf: merged.classOf };
        breaks = merged.breaks;
      }
      const zs = makeZones(grid, input, field, {
        method: plan.zoning.method,
        classes: plan.zoning.classes,
        majorityIterations: plan.zoning.smoothing_passes,
        minAreaM2: minArea,
        step: 0,
      });
      warnings.push(...zs.warnings);
      // cells and samples per zone
      const cells: number[][] = zs.zones.map(() => []);
      for (let i = 0; i < zs.zoneOfCell.length; i++) { const z = zs.zoneOfCell[i]; if (z >= 0) cells[z].push(i); }
      const sampleIdx: number[][] = zs.zones.map(() => []);
      for (let j = 0; j < samples.ids.length; j++) {
        const c = cellOf(samples.xy[2 * j], samples.xy[2 * j + 1]);
        const z = c >= 0 ? zs.zoneOfCell[c] : -1;
        if (z >= 0) sampleIdx[z].push(j);
      }
      const zonesOut = zs.zones.map((z, zi) => {
        const soil = meanSoil((c) => grid.fraction[c], cells[zi]);
        soil.texture = majorityTexture(sampleIdx[zi].map((j) => samples.texture[j])) ?? nearestTexture(inputs, cells[zi], grid);
        soil.pMethod = samples.pMethod;
        return zoneRecord(zi + 1, z.cls + 1, null, z.parts, z.lonlat, z.areaM2, soil, sampleIdx[zi].map((j) => samples.ids[j]), plan, tables);
      });
      zoneSets.push({ name: spec.name, drivenBy: spec.drivenBy, products: spec.products, zones: zonesOut, breaks, minZoneAreaM2: zs.minAreaM2, zoneOfCell: zs.zoneOfCell });
    });
  }
  progress('zones (classes, cleaning, tracing, rates per zone)', 1);

  const infeasible: Prescription['infeasible'] = [];
  // the rate engine's warnings, grouped: one line per kind of warning, naming the zones it concerns
  const groups = new Map<string, { first: Warning; messages: Set<string>; where: Map<string, number[]> }>();
  for (const set of zoneSets) for (const z of set.zones) {
    for (const w of z.decision.warnings) {
      let g = groups.get(w.code);
      if (!g) groups.set(w.code, (g = { first: w, messages: new Set(), where: new Map() }));
      g.messages.add(w.message);
      g.where.set(set.name, [...(g.where.get(set.name) ?? []), z.id]);
    }
    if (z.decision.status !== 'ok') for (const f of z.decision.infeasible) infeasible.push({ zoneSet: set.name, zone: z.id, nutrient: f.nutrient, reason: f.reason });
  }
  for (const [code, g] of groups) {
    const where = [...g.where].map(([set, ids]) => `${zoneSets.length > 1 ? `set ${set} ` : ''}zone${ids.length > 1 ? 's' : ''} ${ids.join(', ')}`).join('; ');
    const msg = g.messages.size === 1 ? g.first.message : `${g.first.message} (values differ by zone; see zones.csv)`;
    warnings.push({ ...g.first, code, where, message: `${where}: ${msg}` });
  }
  return {
    field: { name: field.name, areaM2: field.areaM2, areaAc: m2ToAc(field.areaM2), areaHa: m2ToHa(field.areaM2), utm: field.utm, parts: field.parts, lonlat: field.lonlat },
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

function zoneRecord(id: number, rateClass: number, key: string | null, parts: RingsPart[], lonlat: number[][][][], areaM2: number, soil: SoilValues, ids: string[], plan: Plan, tables: Tables): PrescriptionZone {
  return { id, rateClass, key, parts, lonlat, areaM2, areaAc: m2ToAc(areaM2), areaHa: m2ToHa(areaM2), soil, samples: ids, decision: decide(soil, plan, tables) };
}

/**
 * Merges neighbouring 1-D classes whose area-weighted mean values differ by less than `pct` % of the overall
 * mean: a rate step that small is not worth a zone boundary (tilth default 5 %, no published source; set
 * plan key zoning.min_class_difference_pct, 0 = keep every class). Returns the remapped classes (0 = lowest)
 * and the legend breaks [min, upper of each class..., max].
 * @example mergeCloseClasses(classify(v, { classes: 5 }), 5).classOf
 */
export function mergeCloseClasses(c: Classes, pct: number): { classOf: Int16Array; breaks: number[]; count: number } {
  if (c.count <= 1 || !(pct > 0)) return { classOf: c.classOf, breaks: c.breaks, count: c.count };
  let tw = 0, tm = 0;
  for (let k = 0; k < c.count; k++) { tw += c.weight[k]; tm += c.weight[k] * c.mean[k]; }
  const thr = (Math.abs(tm / tw) * pct) / 100;
  const group = new Int16Array(c.count);
  const breaks = [c.breaks[0]];
  let g = 0, gw = c.weight[0], gm = c.weight[0] * c.mean[0];
  for (let k = 1; k < c.count; k++) {
    if (c.mean[k] - gm / gw < thr) { gw += c.weight[k]; gm += c.weight[k] * c.mean[k]; }
    else { breaks.push(c.breaks[k]); g++; gw = c.weight[k]; gm = c.weight[k] * c.mean[k]; }
    group[k] = g;
  }
  breaks.push(c.breaks[c.count]);
  const classOf = c.classOf.map((v) => (v >= 0 ? group[v] : v));
  return { classOf, breaks, count: g + 1 };
}

/** Rate of one product in one placement of a decision, in the plan's unit (0 when not applied). */
export function productRate(d: Decision, product: string, placement: Placement): { value: number; lbac: number } {
  for (const p of d.placements) if (p.placement === placement) for (const q of p.products) if (q.product === product) return { value: q.rate.value, lbac: q.rate.lbac };
  return { value: 0, lbac: 0 };
}

/** The (product, placement) pairs that any zone of the set uses, in plan order. */
export function usedPairs(set: ZoneSetResult): { product: string; placement: Placement; label: string }[] {
  const seen = new Map<string, { product: string; placement: Placement; label: string }>();
  for (const z of set.zones) for (const p of z.decision.placements) for (const q of p.products) {
    if (!set.products.includes(q.product)) continue;
    const k = `${q.product}|${p.placement}`;
    if (!seen.has(k)) seen.set(k, { product: q.product, placement: p.placement, label: q.label });
  }
  const order = (x: { product: string; placement: Placement }) => set.products.indexOf(x.product) * 10 + ['seed_row', 'side_band', 'mid_row_band', 'broadcast'].indexOf(x.placement);
  return [...seen.values()].sort((a, b) => order(a) - order(b));
}

function productTotals(sets: ZoneSetResult[], plan: Plan): ProductTotal[] {
  const out: ProductTotal[] = [];
  for (const set of sets) {
    const fieldAc = set.zones.reduce((s, z) => s + z.areaAc, 0);
    for (const pair of usedPairs(set)) {
      let lb = 0, mean = 0, min = Infinity, max = -Infinity, applied = 0;
      for (const z of set.zones) {
        const r = productRate(z.decision, pair.product, pair.placement);
        lb += r.lbac * z.areaAc;
        mean += r.value * z.areaAc;
        min = Math.min(min, r.value);
        max = Math.max(max, r.value);
        if (r.lbac > 0) applied += z.areaAc;
      }
      out.push({ zoneSet: set.name, product: pair.product, label: pair.label, placement: pair.placement, totalLb: lb, totalKg: lb * 0.45359237, meanRate: fieldAc > 0 ? mean / fieldAc : 0, minRate: min, maxRate: max, unit: plan.units, appliedAc: applied });
    }
  }
  return out;
}

function varies(v: Float64Array, w: ArrayLike<number>): boolean {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < v.length; i++) if (w[i] > 0 && v[i] === v[i]) { if (v[i] < lo) lo = v[i]; if (v[i] > hi) hi = v[i]; }
  return hi - lo > 1e-9;
}

function majorityTexture(ts: (Texture | null)[]): Texture | null {
  const count = new Map<Texture, number>();
  for (const t of ts) if (t) count.set(t, (count.get(t) ?? 0) + 1);
  let best: Texture | null = null, bc = 0;
  for (const [t, c] of count) if (c > bc) { best = t; bc = c; }
  return best;
}

/** Texture of the sample nearest the zone's first cell, when no sample lies inside the zone. */
function nearestTexture(inputs: FieldInputs, cells: number[], grid: Grid): Texture | null {
  if (cells.length === 0) return null;
  const c = cells[Math.floor(cells.length / 2)];
  const x = grid.xmin + ((c % grid.cols) + 0.5) * grid.cell, y = grid.ymax - (Math.floor(c / grid.cols) + 0.5) * grid.cell;
  let best = -1, bd = Infinity;
  const s = inputs.samples;
  for (let j = 0; j < s.ids.length; j++) {
    if (!s.texture[j]) continue;
    const d = (s.xy[2 * j] - x) ** 2 + (s.xy[2 * j + 1] - y) ** 2;
    if (d < bd) { bd = d; best = j; }
  }
  return best >= 0 ? s.texture[best] : null;
}

export function nutrientName(n: Nutrient): string {
  return { n: 'N', p2o5: 'P2O5', k2o: 'K2O', s: 'S' }[n];
}

function dedupe(ws: Warning[]): Warning[] {
  const seen = new Set<string>();
  return ws.filter((w) => (seen.has(w.message) ? false : (seen.add(w.message), true)));
}

