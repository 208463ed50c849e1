/**
 * Zone design for grid-sampled fields: which driving values classes are drawn from, the minimum zone area,
 * the judge that merges classes and zones whose rates do not differ by an amount that matters, and the
 * record of why the zone count came out as it did. See docs/zones.md.
 */
import type { Warning } from '../errors.js';
import type { Decision } from '../agronomy/decision.js';
import type { Plan } from '../agronomy/plan.js';
import { NUTRIENTS, TEXTURES, type Nutrient, type Tables } from '../agronomy/tables.js';
import { pointInParts } from '../geo/area.js';
import type { NutrientSurface } from '../surface/nutrientSurface.js';
import { forEachNeighbourBand } from '../surface/neighbours.js';
import { classify, classifyVectors, type Classes } from '../zones/classify.js';
import { makeZones, type ZoneSet } from '../zones/index.js';
import type { Analyte, FieldInputs, Grid, RingsPart } from '../types.js';
import { lengthM, M2_PER_AC, m2ToAc, quantityText, speedMs } from '../units/index.js';
import { NUTRIENT_NAME, PLACEMENT_NAME } from '../vocabulary.js';
import { rateJudge, type ApartReason, type ZoneProfile } from './rateJudge.js';
import {
  responseChanceBasis,
  type ResponseChanceBasis,
  type ResponseNutrient,
} from '../variability/responseChance.js';

/** How a zone set's zones came about. */
export interface ZoneDesign {
  minArea: MinZoneArea;
  /** per "product|placement": the minimum rate difference used (plan units) */
  minDifference: Record<string, number>;
  /** leave-one-out RMSE per analyte carried through the rate engine */
  rmse: Partial<Record<Analyte, number>>;
  counts: ZoneSet['counts'];
  vertices: ZoneSet['vertices'];
  /** neighbouring zones (1-based ids) and the product rate that keeps them apart */
  pairs: { a: number; b: number; why: ApartReason | null }[];
  /** the number of zones and why, for people */
  why: string;
}

/** The minimum zone area and where it comes from (m2). */
export interface MinZoneArea {
  /** swath x distance travelled while the controller changes rate */
  machineM2: number;
  /** the machine settings that area comes from, as the plan gave them: swath, speed, seconds to change rate */
  machine: { swath: string; speed: string; rateChangeS: number };
  /** field area / grid samples inside the field (0 when no sample is inside) */
  perSampleM2: number;
  gridSamples: number;
  /** the one used: the larger of the two, or the plan's min_zone_ac */
  usedM2: number;
  fromPlan: boolean;
}

/**
 * Default minimum zone area: the larger of the machine's (swath x speed x rate-change time) and the area
 * one grid sample stands for (field area / samples inside the field); plan `zoning.min_zone_ac` replaces it.
 * @example minZoneArea(plan, 627000, 62).usedM2 // 10113 m2 (2.5 ac): one sample per 2.5 ac
 */
export function minZoneArea(plan: Plan, fieldAreaM2: number, gridSamples: number): MinZoneArea {
  const machineM2 = lengthM(plan.machine.swath) * speedMs(plan.machine.speed) * plan.machine.rate_change_s;
  const perSampleM2 = gridSamples > 0 ? fieldAreaM2 / gridSamples : 0;
  const fromPlan = plan.zoning.min_zone_ac !== 'auto';
  const usedM2 = fromPlan
    ? (plan.zoning.min_zone_ac as number) * M2_PER_AC
    : Math.max(machineM2, perSampleM2);
  const machine = {
    swath: quantityText(plan.machine.swath, false),
    speed: quantityText(plan.machine.speed, false),
    rateChangeS: plan.machine.rate_change_s,
  };
  return { machineM2, machine, perSampleM2, gridSamples, usedM2, fromPlan };
}

export interface DesignInputs {
  inputs: FieldInputs;
  plan: Plan;
  tables: Tables;
  grid: Grid;
  targets: Record<Nutrient, Float64Array>;
  surfaces: NutrientSurface[];
  /** analytes with a surface, in the rate engine's order, and their per-cell values */
  analytes: Analyte[];
  layers: Float64Array[];
  minArea: MinZoneArea;
  /** the nutrient a product mainly carries */
  mainNutrient: (product: string) => Nutrient;
}

/** One designed zone set, before the prescription wraps it. */
export interface DesignedSet {
  name: string;
  drivenBy: string;
  products: string[];
  breaks: number[] | null;
  zones: ZoneSet<ZoneProfile, ApartReason>;
  /** per zone: indexes of the samples inside its polygons */
  samples: number[][];
  design: ZoneDesign;
}

/**
 * Zone sets of a grid-sampled field. `shared`: classes by k-means on the standardized targets that vary;
 * `per_product`: one set per nutrient a plan product mainly carries, classes of that target by
 * `zoning.method`. In both, neighbouring classes and then zones are merged unless some product rate differs
 * by an amount that matters (rateJudge), zones under the minimum area are merged first, and edges are
 * simplified to `zoning.simplify_cells`.
 * @example const sets = designZoneSets({ inputs, plan, tables, grid, targets, surfaces, analytes, layers, minArea, mainNutrient });
 */
export function designZoneSets(d: DesignInputs): { sets: DesignedSet[]; warnings: Warning[] } {
  const warnings: Warning[] = [];
  const rmse: Partial<Record<Analyte, number>> = {};
  for (const s of d.surfaces) if (s.cv) rmse[s.analyte] = s.cv.best.rmse;
  const textures = textureLayers(d.inputs, d.grid);
  const basis = zoningBasis(d);
  warnings.push(...basis.warnings);
  const sets = setSpecs(d, basis).map((spec) => designSet(d, spec, rmse, textures, warnings));
  if (d.minArea.fromPlan && d.minArea.usedM2 < d.minArea.perSampleM2) {
    warnings.push({
      code: 'zones-min-area-below-sample',
      message: `zoning.min_zone_ac ${m2ToAc(d.minArea.usedM2).toFixed(2)} ac is below the area one grid sample stands for (${m2ToAc(d.minArea.perSampleM2).toFixed(2)} ac = field area / ${d.minArea.gridSamples} samples): smaller zones rest on one sample or none. Fix: use min_zone_ac: auto unless you have reason to trust the map at that scale.`,
    });
  }
  return { sets, warnings };
}

/** What one zone set is drawn from: class ids (shared, k-means) or one target to classify (per product). */
interface SetSpec {
  name: string;
  drivenBy: string;
  products: string[];
  input: Float64Array | { classOf: Int16Array };
  /** drawn from the expected response chance (zoning.basis): no target breaks for the legend */
  chance?: boolean;
}

function setSpecs(d: DesignInputs, basis: ResponseChanceBasis): SetSpec[] {
  const { plan, grid } = d;
  // zoning.basis response_chance: P2O5 and K2O classes from the expected chance of a response (src/variability)
  const tg = { ...d.targets };
  for (const [n, l] of Object.entries(basis.layers)) tg[n as Nutrient] = l.values;
  const what = (n: Nutrient) => basis.layers[n as ResponseNutrient]?.label ?? `${NUTRIENT_NAME[n]} target`;
  const allProducts = plan.products.map((p) => p.product);
  const specs: SetSpec[] = [];
  if (plan.zoning.zone_sets === 'shared') {
    const varying = NUTRIENTS.filter((n) => varies(tg[n], grid.fraction));
    const classOf =
      varying.length > 0
        ? classifyVectors(
            varying.map((n) => tg[n]),
            { classes: plan.zoning.classes, weights: grid.fraction },
          ).classOf
        : new Int16Array(grid.cols * grid.rows).map((_, i) => (grid.fraction[i] > 0 ? 0 : -1));
    specs.push({
      name: 'shared',
      drivenBy: `k-means on the standardized ${varying.map(what).join(', ') || 'targets (all uniform)'}`,
      products: allProducts,
      input: { classOf },
    });
  } else {
    const byNutrient = new Map<Nutrient, string[]>();
    for (const p of allProducts)
      byNutrient.set(d.mainNutrient(p), [...(byNutrient.get(d.mainNutrient(p)) ?? []), p]);
    for (const [n, prods] of byNutrient)
      specs.push({
        name: n,
        drivenBy: `${what(n)} (${plan.zoning.method}, up to ${plan.zoning.classes} classes)`,
        products: prods,
        input: tg[n],
        chance: n in basis.layers,
      });
  }
  return specs;
}

/** One zone set: classes (merged when close), zones made and merged by the rate judge, and their record. */
function designSet(
  d: DesignInputs,
  spec: SetSpec,
  rmse: Partial<Record<Analyte, number>>,
  textures: Uint8Array[] | null,
  warnings: Warning[],
): DesignedSet {
  const { plan, grid } = d;
  let input = spec.input,
    breaks: number[] | null = null;
  if (input instanceof Float64Array) {
    const c = mergeCloseClasses(
      classify(input, {
        method: plan.zoning.method,
        classes: plan.zoning.classes,
        weights: grid.fraction,
        step: 0,
      }),
      plan.zoning.min_class_difference_pct,
    );
    input = { classOf: c.classOf };
    breaks = spec.chance ? null : c.breaks;
  }
  const judge = rateJudge({
    plan,
    tables: d.tables,
    products: spec.products,
    layers: [...d.layers, ...(textures ?? [])],
    analytes: d.analytes,
    textures: !!textures,
    rmse,
    pMethod: d.inputs.samples.pMethod,
  });
  const zs = makeZones(grid, input, d.inputs.field, {
    majorityIterations: plan.zoning.smoothing_passes,
    minAreaM2: d.minArea.usedM2,
    judge,
    simplifyCells: plan.zoning.simplify_cells,
  });
  warnings.push(...zs.warnings);
  const minDifference = Object.fromEntries(judge.minDifference);
  const pairs = zs.pairs.map((p) => ({ a: p.a + 1, b: p.b + 1, why: orientWhy(p.why, zs.profiles![p.a]) }));
  const design: ZoneDesign = {
    minArea: d.minArea,
    minDifference,
    rmse,
    counts: zs.counts,
    vertices: zs.vertices,
    pairs,
    why: whyText(zs.counts, d.minArea),
  };
  return {
    name: spec.name,
    drivenBy: spec.drivenBy,
    products: spec.products,
    breaks,
    zones: zs,
    samples: samplesInZones(d.inputs, zs),
    design,
  };
}

/** The expected response chance layers when the plan asks to zone on them (zoning.basis), else none. */
function zoningBasis(d: DesignInputs): ResponseChanceBasis {
  const crop = d.tables.crops[d.plan.crop];
  if (d.plan.zoning.basis !== 'response_chance' || !crop) return { layers: {}, warnings: [] };
  const drivers =
    d.plan.zoning.zone_sets === 'shared' ? NUTRIENTS : d.plan.products.map((p) => d.mainNutrient(p.product));
  return responseChanceBasis(
    {
      samples: d.inputs.samples,
      grid: d.grid,
      surfaces: d.surfaces,
      crop,
      tables: d.tables,
      log: d.plan.surface.log,
      neighbours: d.plan.surface.kriging_neighbours,
      kelownaFactor: d.plan.soil_test.kelowna_factor,
    },
    drivers,
  );
}

function whyText(c: ZoneSet['counts'], m: MinZoneArea): string {
  const n = (k: number, one: string, many: string) => `${k} ${k === 1 ? one : many}`;
  return (
    `${n(c.zones, 'zone', 'zones')} at ${n(c.rateClasses, 'rate', 'distinct rates')}: ${n(c.classes, 'class', 'classes')} drawn, ${c.classesMerged} kept after merging classes whose rates do not differ by an amount that matters; ` +
    `cleaning (majority filter, zones under ${m2ToAc(m.usedM2).toFixed(2)} ac merged into a neighbour) gave ${n(c.zonesCleaned, 'zone', 'zones')}, ${c.zonesMerged} after merging neighbours the same way; ` +
    `zones anywhere in the field whose rates do not differ by such an amount then share one rate (${n(c.rateClasses, 'rate class', 'rate classes')}). ` +
    "Every pair of neighbouring zones left differs in some product by at least the minimum difference and by more than the soil maps' error moves that rate."
  );
}

/** Per texture, 1 where the cell's nearest textured sample has it (NaN when no sample has a texture). */
function textureLayers(inputs: FieldInputs, grid: Grid): Uint8Array[] | null {
  const s = inputs.samples;
  const idx = s.texture.map((t, j) => (t ? j : -1)).filter((j) => j >= 0);
  if (idx.length === 0) return null;
  const out = TEXTURES.map(() => new Uint8Array(grid.cols * grid.rows)); // 0 or 1 per cell: one byte, not eight
  // blocks of b x b cells take the texture nearest their centre (exact at b = 1; about 40 000 blocks at most),
  // found by the shared k-nearest search (src/surface/neighbours.ts) on the grid of blocks
  const b = Math.max(1, Math.floor(Math.sqrt((grid.cols * grid.rows) / 40000)));
  const pts = new Float64Array(2 * idx.length);
  idx.forEach((j, t) => {
    pts[2 * t] = s.xy[2 * j];
    pts[2 * t + 1] = s.xy[2 * j + 1];
  });
  const blocks = {
    xmin: grid.xmin,
    ymax: grid.ymax,
    cell: grid.cell * b,
    cols: Math.ceil(grid.cols / b),
    rows: Math.ceil(grid.rows / b),
  };
  forEachNeighbourBand(pts, blocks, 1, {}, (band) => {
    for (let t = 0; t < band.count; t++) {
      const R = Math.floor(band.cells[t] / blocks.cols),
        C = band.cells[t] % blocks.cols;
      const layer = out[TEXTURES.indexOf(s.texture[idx[band.idx[t]]]!)];
      for (let r = R * b; r < Math.min(grid.rows, R * b + b); r++)
        for (let c = C * b; c < Math.min(grid.cols, C * b + b); c++) layer[r * grid.cols + c] = 1;
    }
  });
  return out;
}

/** Indexes of the samples that lie in each zone's polygons (a sample outside every zone is in none). */
function samplesInZones(inputs: FieldInputs, zs: ZoneSet<ZoneProfile, ApartReason>): number[][] {
  const out: number[][] = zs.zones.map(() => []);
  const xy = inputs.samples.xy;
  // a point outside a zone's box (by more than any rounding of the crossing test, 1 mm) is outside the zone:
  // skip the zone's rings (thousands of vertices on a large field) for it
  const box = zs.zones.map((zone) => ringsBox(zone.parts, 1e-3));
  for (let j = 0; j < inputs.samples.ids.length; j++) {
    const x = xy[2 * j],
      y = xy[2 * j + 1];
    const z = zs.zones.findIndex(
      (zone, k) =>
        x >= box[k][0] &&
        x <= box[k][2] &&
        y >= box[k][1] &&
        y <= box[k][3] &&
        pointInParts(zone.parts, x, y),
    );
    if (z >= 0) out[z].push(j);
  }
  return out;
}

/** [xmin, ymin, xmax, ymax] of the parts' exteriors, widened by `pad` on every side. */
function ringsBox(parts: RingsPart[], pad: number): [number, number, number, number] {
  let x0 = Infinity,
    y0 = Infinity,
    x1 = -Infinity,
    y1 = -Infinity;
  for (const p of parts)
    for (let i = 0; i < p.exterior.length; i += 2) {
      const x = p.exterior[i],
        y = p.exterior[i + 1];
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      if (y > y1) y1 = y;
    }
  return [x0 - pad, y0 - pad, x1 + pad, y1 + pad];
}

/** A pair's reason with `a` the rate of the pair's first zone. */
function orientWhy(w: ApartReason | null, first: ZoneProfile): ApartReason | null {
  if (!w || (first.rates.get(`${w.product}|${w.placement}`) ?? 0) === w.a) return w;
  return { ...w, a: w.b, b: w.a };
}

/** Whether the values in the field (weight > 0, not NaN) span more than 1e-9; stops at the first such pair. */
function varies(v: Float64Array, w: ArrayLike<number>): boolean {
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i < v.length; i++) {
    const x = v[i];
    if (w[i] > 0 && x === x) {
      if (x < lo) lo = x;
      if (x > hi) hi = x;
      if (hi - lo > 1e-9) return true;
    }
  }
  return false;
}

/**
 * Merges neighbouring 1-D classes whose area-weighted mean values differ by less than `pct` % of the overall
 * mean: a rate step that small is not worth a zone boundary (tilth default 5 %, no published source; set
 * plan key zoning.min_class_difference_pct, 0 = keep every class). Returns the remapped classes (0 = lowest)
 * and the legend breaks [min, upper of each class..., max].
 * @example mergeCloseClasses(classify(v, { classes: 5 }), 5).classOf
 */
export function mergeCloseClasses(
  c: Classes,
  pct: number,
): { classOf: Int16Array; breaks: number[]; count: number } {
  if (c.count <= 1 || !(pct > 0)) return { classOf: c.classOf, breaks: c.breaks, count: c.count };
  let tw = 0,
    tm = 0;
  for (let k = 0; k < c.count; k++) {
    tw += c.weight[k];
    tm += c.weight[k] * c.mean[k];
  }
  const thr = (Math.abs(tm / tw) * pct) / 100;
  const group = new Int16Array(c.count);
  const breaks = [c.breaks[0]];
  let g = 0,
    gw = c.weight[0],
    gm = c.weight[0] * c.mean[0];
  for (let k = 1; k < c.count; k++) {
    if (c.mean[k] - gm / gw < thr) {
      gw += c.weight[k];
      gm += c.weight[k] * c.mean[k];
    } else {
      breaks.push(c.breaks[k]);
      g++;
      gw = c.weight[k];
      gm = c.weight[k] * c.mean[k];
    }
    group[k] = g;
  }
  breaks.push(c.breaks[c.count]);
  const classOf = c.classOf.map((v) => (v >= 0 ? group[v] : v));
  return { classOf, breaks, count: g + 1 };
}

/**
 * Rate classes of zones: zones with the same product rates share a class, numbered 1.. by ascending cost per
 * acre (1 = least product). Sets `rateClass` in place.
 * @example numberRateClasses(zones, ['urea']); zones.map((z) => z.rateClass)
 */
export function numberRateClasses(
  zones: { rateClass: number; decision: Decision }[],
  products: string[],
): void {
  const sig = (d: Decision) =>
    d.placements
      .flatMap((p) =>
        p.products
          .filter((q) => products.includes(q.product))
          .map((q) => `${q.product}|${p.placement}|${q.rate.value}`),
      )
      .sort()
      .join(';');
  const order = [...new Map(zones.map((z) => [sig(z.decision), z.decision.costPerAc])).entries()]
    .sort((a, b) => a[1] - b[1] || (a[0] < b[0] ? -1 : 1))
    .map(([k]) => k);
  for (const z of zones) z.rateClass = order.indexOf(sig(z.decision)) + 1;
}

/**
 * What keeps two neighbouring zones apart, for people.
 * @example apartText({ product: 'urea', placement: 'side_band', a: 206, b: 250, diff: 44, min: 21, range: [191, 221] }, 'lb/ac')
 * // 'urea side band 206 vs 250 lb/ac: differs by 44 (minimum 21), outside 191-221 where the soil maps' error moves it'
 */
export function apartText(w: ApartReason | null, unit: string): string {
  if (!w)
    return 'no product rate differs by an amount that matters (kept: the zones are separate parts of the field or were not merged)';
  const f = (v: number) => (Number.isInteger(v) ? String(v) : v.toFixed(1));
  const range =
    w.range[0] === w.range[1]
      ? `the soil maps' error does not move the firmer rate (${f(w.range[0])})`
      : `outside ${f(w.range[0])}-${f(w.range[1])} where the soil maps' error moves it`;
  return `${w.product} ${PLACEMENT_NAME[w.placement] ?? w.placement} ${f(w.a)} vs ${f(w.b)} ${unit}: differs by ${f(w.diff)} (minimum ${f(w.min)}), ${range}`;
}

/**
 * The zone design as lines for the printed summary.
 * @example designLines(set.design, 'lb/ac').join('\n')
 */
export function designLines(d: ZoneDesign, unit: string): string[] {
  const ac = (m2: number) => `${m2ToAc(m2).toFixed(2)} ac`;
  const m = d.minArea;
  const lines = [`  why: ${d.why}`];
  lines.push(
    m.fromPlan
      ? `  minimum zone area ${ac(m.usedM2)} from plan key zoning.min_zone_ac (machine ${ac(m.machineM2)} at ${m.machine.swath} x ${m.machine.speed} x ${m.machine.rateChangeS} s, one grid sample's area ${ac(m.perSampleM2)})`
      : `  minimum zone area ${ac(m.usedM2)}: the larger of the machine's ${ac(m.machineM2)} (swath x distance travelled during a rate change: ${m.machine.swath} x ${m.machine.speed} x ${m.machine.rateChangeS} s) and one grid sample's area ${ac(m.perSampleM2)} (field / ${m.gridSamples} samples)`,
  );
  lines.push(
    `  minimum rate differences (${unit}): ${
      Object.entries(d.minDifference)
        .map(([k, v]) => `${k.replace('|', ' ')} ${v.toFixed(1)}`)
        .join(', ') || '-'
    }`,
  );
  lines.push(
    `  soil-map errors carried through the rates (leave-one-out RMSE): ${
      Object.entries(d.rmse)
        .map(([a, v]) => `${a} ${v!.toPrecision(3)}`)
        .join(', ') || 'none'
    }`,
  );
  lines.push(
    `  edges: ${d.vertices.traced} vertices as a cell staircase, ${d.vertices.simplified} after smoothing shared edges; ${d.vertices.clipped} written (clipped to the exact boundary)`,
  );
  for (const p of d.pairs) lines.push(`  zones ${p.a} and ${p.b}: ${apartText(p.why, unit)}`);
  return lines;
}
