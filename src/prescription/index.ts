/**
 * The main job end to end: samples + boundary + plan -> a prescription.
 *
 * surfaces (IDW chosen by cross-validation, or zone composites) -> per-cell nutrient targets ->
 * rate classes -> cleaned class raster -> zone polygons clipped to the field -> each zone's mean soil
 * values through the rate engine -> product rates per zone and totals. Pure: no files, no console.
 * The prescription's shape is in types.ts, the zone sets in zoneSets.ts (designed in zoneDesign.ts), rates and
 * totals in totals.ts. See docs/method.md for the method and its defaults.
 */
import { soilFlagsById } from '../agronomy/soilFlags.js';
import { UserError, type Warning } from '../errors.js';
import type { Plan } from '../agronomy/plan.js';
import type { Tables } from '../agronomy/tables.js';
import { fieldGrid } from '../surface/grid.js';
import { nutrientSurfaces, type NutrientSurface } from '../surface/nutrientSurface.js';
import type { SurfaceThreads } from '../surface/parallel.js';
import type { Analyte, FieldInputs, Grid } from '../types.js';
import { m2ToAc, m2ToHa } from '../units/index.js';
import { cellTargets } from './cellTargets.js';
import { productTotals } from './totals.js';
import { unsampledSplit, withUnsampledZones } from './unsampled.js';
import type { BuildOptions, Prescription, ZoneSetResult } from './types.js';
import { minZoneArea } from './zoneDesign.js';
import {
  BUILD_ANALYTES,
  checkVertexLimit,
  designedZoneSets,
  mainNutrient,
  sampledZoneSet,
} from './zoneSets.js';

export { mergeCloseClasses } from './zoneDesign.js';
export { productRate, usedPairs } from './totals.js';
export type { BuildOptions, Prescription, PrescriptionZone, ProductTotal, ZoneSetResult } from './types.js';

/** A cell size giving about 200 cells across the field's longer side, rounded to 1, 2, 5, 10 or 20 m. */
export function defaultCell(bbox: [number, number, number, number]): number {
  const side = Math.max(bbox[2] - bbox[0], bbox[3] - bbox[1]);
  const want = side / 200;
  for (const c of [1, 2, 5, 10, 20]) if (want <= c) return c;
  return 50;
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
  // boundary parts no sample speaks for get the plan's unsampled_parts rates (./unsampled.ts)
  const split = unsampledSplit(inputs, plan);
  if (split)
    return withUnsampledZones(
      split,
      plan,
      tables,
      (i) => buildPrescription(i, plan, tables, opts),
      productTotals,
    );
  const { samples, field } = inputs;
  const warnings: Warning[] = [...inputs.warnings];
  const progress = opts.onProgress ?? (() => {});
  for (const p of plan.products) mainNutrient(p.product, tables);
  const grid = fieldGrid(field, opts.cell ?? defaultCell(field.bbox));
  const inside = samplesInside(inputs, grid);

  // 1. surfaces
  const { surfaces, byAnalyte } = buildSurfaces(inputs, plan, grid, progress, warnings, opts.threads);
  opts.onSurfaces?.({ inputs, grid, surfaces });

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

  const infeasible = zoneOutcomes(zoneSets, warnings);
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

/** Samples inside the field (in a cell with area in it); none is a user error unless the field is zone-sampled. */
function samplesInside(inputs: FieldInputs, grid: Grid): number {
  const { samples, field } = inputs;
  let inside = 0;
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
  return inside;
}

/** One surface per soil analyte the rate engine reads and the samples hold; a warning for each one missing. */
function buildSurfaces(
  inputs: FieldInputs,
  plan: Plan,
  grid: Grid,
  progress: (step: string, done: number) => void,
  warnings: Warning[],
  threads?: SurfaceThreads,
): { surfaces: NutrientSurface[]; byAnalyte: Partial<Record<Analyte, Float64Array>> } {
  const { samples } = inputs;
  const surfaces: NutrientSurface[] = [];
  const byAnalyte: Partial<Record<Analyte, Float64Array>> = {};
  // analytes at the same sample sites share one neighbour search (src/surface nutrientSurfaces)
  const present = BUILD_ANALYTES.filter((a) => samples.values[a]?.some((v) => Number.isFinite(v)));
  progress('surfaces (cross-validation and interpolation)', 0);
  const surfaceOpts = {
    method: plan.surface.method,
    kriging: { log: plan.surface.log, neighbours: plan.surface.kriging_neighbours },
    threads,
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
  return { surfaces, byAnalyte };
}

/**
 * The zones' infeasible targets, and the rate engine's warnings grouped into `warnings`: one line per kind of
 * warning, naming the zones it concerns.
 */
function zoneOutcomes(zoneSets: ZoneSetResult[], warnings: Warning[]): Prescription['infeasible'] {
  const infeasible: Prescription['infeasible'] = [];
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
  return infeasible;
}

function dedupe(ws: Warning[]): Warning[] {
  const seen = new Set<string>();
  return ws.filter((w) => (seen.has(w.message) ? false : (seen.add(w.message), true)));
}
