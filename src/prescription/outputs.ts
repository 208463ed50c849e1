/**
 * Writers of a prescription as text: GeoJSON per zone set, zones.csv, summary.json and the printed
 * summary. Pure: they return strings; the CLI writes them.
 */
import { csvCell } from '../io/csv-escape.js';
import type { Feature, FeatureCollection, MultiPolygon, Polygon } from 'geojson';
import type { Placement } from '../agronomy/tables.js';
import { NUTRIENTS } from '../agronomy/tables.js';
import { productRate, usedPairs } from './totals.js';
import { NUTRIENT_NAME, PLACEMENT_TAG } from '../vocabulary.js';
import type { Prescription, ZoneSetResult } from './types.js';
import { apartText, designLines, type ZoneDesign } from './zoneDesign.js';
import { kgToTonnes, m2ToAc } from '../units/index.js';

const unitTag = (u: string) => (u === 'kg/ha' ? 'kgha' : 'lbac');
const round = (v: number, d: number) => (Number.isFinite(v) ? Number(v.toFixed(d)) : null);

/** Column name of a product rate: `<product>_<placement>_<unit>`, e.g. `map_seed_lbac`. */
export function rateColumn(product: string, placement: Placement, unit: string): string {
  return `${product.toLowerCase().replace(/[^a-z0-9]+/g, '_')}_${PLACEMENT_TAG[placement]}_${unitTag(unit)}`;
}

/** File name of a zone set's GeoJSON: `prescription.geojson` when there is one set, else `prescription-<set>.geojson`. */
export function geojsonName(rx: Prescription, set: ZoneSetResult): string {
  return rx.zoneSets.length === 1 ? 'prescription.geojson' : `prescription-${set.name}.geojson`;
}

/** The flat attribute record of one zone (numbers in the plan's units). */
export function zoneAttributes(
  rx: Prescription,
  set: ZoneSetResult,
  zi: number,
): Record<string, string | number | null> {
  const z = set.zones[zi];
  const u = rx.plan.units;
  const d = z.decision;
  const a: Record<string, string | number | null> = {
    zone_set: set.name,
    zone_id: z.id,
    rate_class: z.rateClass,
    sample_zone: z.key,
    area_ac: round(z.areaAc, 3),
    area_ha: round(z.areaHa, 4),
    soil_no3_n: round(z.soil.no3_n, 1),
    soil_p_ppm: round(z.soil.p, 1),
    soil_k_ppm: round(z.soil.k, 0),
    soil_so4_s: round(z.soil.so4_s, 1),
    soil_om_pct: round(z.soil.om, 2),
    texture: d.texture,
    p_class: d.interpretation.p.className,
    p_response_pct: round(d.interpretation.p.responseProbability * 100, 0),
    k_response_pct: round(d.interpretation.k.responseProbability * 100, 0),
    s_status: d.interpretation.s.status,
  };
  // nutrient targets carry no unit ending, so that only product-rate columns end in the rate unit
  a.target_unit = u;
  for (const n of NUTRIENTS) a[`target_${n}`] = round(d.nutrients[n].target.value, 1);
  for (const pair of usedPairs(set))
    a[rateColumn(pair.product, pair.placement, u)] = round(
      productRate(d, pair.product, pair.placement).value,
      1,
    );
  a.cost_per_ac = round(d.costPerAc, 2);
  a.binding_limit = d.binding.join('; ');
  a.status = d.status;
  // saline / high-pH / free-lime samples in the zone (src/agronomy/soilFlags.ts); a column only when the field has any
  if (rx.soilFlags && Object.keys(rx.soilFlags).length) {
    a.soil_flags = [...new Set(z.samples.flatMap((id) => rx.soilFlags![id]?.split('; ') ?? []))].join('; ');
  }
  return a;
}

/**
 * One zone set as an RFC 7946 FeatureCollection (right-hand winding, 7 decimals, about 1 cm).
 * @example JSON.parse(prescriptionGeojson(rx, rx.zoneSets[0])).features.length
 */
export function prescriptionGeojson(rx: Prescription, set: ZoneSetResult): string {
  const fc: FeatureCollection<Polygon | MultiPolygon> = {
    type: 'FeatureCollection',
    features: set.zones.map((z, zi): Feature<Polygon | MultiPolygon> => {
      const coords = z.lonlat.map((poly) =>
        poly.map((ring) => ring.map(([x, y]) => [round(x, 7)!, round(y, 7)!])),
      );
      return {
        type: 'Feature',
        properties: zoneAttributes(rx, set, zi),
        geometry:
          coords.length === 1
            ? { type: 'Polygon', coordinates: coords[0] }
            : { type: 'MultiPolygon', coordinates: coords },
      };
    }),
  };
  return JSON.stringify(fc) + '\n';
}

/** Every zone of every set as CSV, one row per zone (same attributes as the GeoJSON). */
export function zonesCsv(rx: Prescription): string {
  const rows = rx.zoneSets.flatMap((set) =>
    set.zones.map((z, zi) => {
      const a = zoneAttributes(rx, set, zi);
      if (set.design) {
        a.kept_apart_from = set.design.pairs
          .filter((p) => p.a === z.id || p.b === z.id)
          .map(
            (p) =>
              `zone ${p.a === z.id ? p.b : p.a}: ${apartText(p.why && p.a !== z.id ? { ...p.why, a: p.why.b, b: p.why.a } : p.why, rx.plan.units)}`,
          )
          .join('; ');
      }
      return a;
    }),
  );
  const cols: string[] = [];
  for (const r of rows) for (const k of Object.keys(r)) if (!cols.includes(k)) cols.push(k);
  return (
    [cols.join(','), ...rows.map((r) => cols.map((c) => csvCell(r[c] ?? '')).join(','))].join('\n') + '\n'
  );
}

/** Provenance of a build: tilth version, input hashes, date. */
export interface Provenance {
  tilth: string;
  created: string;
  inputs: Record<string, string>;
  /** short hash of all inputs and the plan, printed on the report */
  id: string;
}

/** The machine-readable summary (summary.json). */
export function summaryObject(rx: Prescription, prov: Provenance): unknown {
  return {
    provenance: prov,
    field: {
      name: rx.field.name,
      area_ac: round(rx.field.areaAc, 2),
      area_ha: round(rx.field.areaHa, 3),
      utm_epsg: rx.field.utm.epsg,
    },
    crop: rx.plan.crop,
    target_yield_bu: rx.plan.target_yield_bu,
    units: rx.plan.units,
    grid: { cell_m: rx.grid.cell, cols: rx.grid.cols, rows: rx.grid.rows },
    surfaces: rx.surfaces.map((s) => ({
      analyte: s.analyte,
      method: s.method,
      power: Number.isFinite(s.power) ? s.power : null,
      neighbours: Number.isFinite(s.neighbours) ? s.neighbours : s.method === 'idw' ? 'all' : null,
      choice: s.choice,
      cv:
        s.cv?.table.map((r) => ({
          method: r.method ?? 'idw',
          power: Number.isFinite(r.power) ? r.power : null,
          ...(r.method === 'kriging' ? { msse: round(r.msse ?? NaN, 4), model: s.kriging?.modelText } : {}),
          chosen: r === s.cv!.best,
          neighbours: Number.isFinite(r.neighbours) ? r.neighbours : 'all',
          rmse: round(r.rmse, 4),
          mae: round(r.mae, 4),
          bias: round(r.bias, 4),
          n: r.n,
        })) ?? null,
    })),
    zone_sets: rx.zoneSets.map((s) => ({
      name: s.name,
      driven_by: s.drivenBy,
      products: s.products,
      zones: s.zones.length,
      min_zone_ac: round(m2ToAc(s.minZoneAreaM2), 3),
      file: geojsonName(rx, s),
      breaks_lbac: s.breaks?.map((b) => round(b, 2)) ?? null,
      design: s.design ? designObject(s.design) : null,
    })),
    totals: rx.totals.map((t) => ({
      zone_set: t.zoneSet,
      product: t.product,
      label: t.label,
      placement: t.placement,
      total_lb: round(t.totalLb, 0),
      total_kg: round(t.totalKg, 0),
      total_tonnes: round(kgToTonnes(t.totalKg), 3),
      mean_rate: round(t.meanRate, 1),
      min_rate: round(t.minRate, 1),
      max_rate: round(t.maxRate, 1),
      unit: t.unit,
      applied_ac: round(t.appliedAc, 2),
    })),
    infeasible: rx.infeasible,
    warnings: rx.warnings.map((w) => ({ code: w.code, message: w.message })),
  };
}

const pad = (s: string, n: number) => (s.length >= n ? s : s + ' '.repeat(n - s.length));
const lpad = (s: string, n: number) => (s.length >= n ? s : ' '.repeat(n - s.length) + s);

/** The printed summary: zone sets, product totals per placement, area-weighted rates. */
export function summaryText(rx: Prescription): string {
  const u = rx.plan.units;
  const lines: string[] = [];
  lines.push(
    `field      ${rx.field.name}: ${rx.field.areaAc.toFixed(1)} ac (${rx.field.areaHa.toFixed(2)} ha), UTM zone ${rx.field.utm.zone}${rx.field.utm.south ? 'S' : 'N'}`,
  );
  lines.push(`crop       ${rx.plan.crop}, target ${rx.plan.target_yield_bu} bu/ac; rates in ${u}`);
  lines.push(`grid       ${rx.grid.cell} m cells (${rx.grid.cols} x ${rx.grid.rows})`);
  for (const s of rx.surfaces) lines.push(`surface    ${pad(s.analyte, 6)} ${s.choice}`);
  for (const s of rx.zoneSets)
    lines.push(
      `zones      ${s.name}: ${s.zones.length} zone${s.zones.length === 1 ? '' : 's'}, driven by ${s.drivenBy}; products ${s.products.join(', ')}`,
    );
  lines.push('');
  lines.push(
    `${pad('product', 22)} ${pad('placement', 13)} ${lpad('total lb', 9)} ${lpad('total t', 8)} ${lpad('mean', 7)} ${lpad('min', 6)} ${lpad('max', 6)}  ${u}`,
  );
  for (const t of rx.totals) {
    lines.push(
      `${pad(t.label.slice(0, 22), 22)} ${pad(t.placement, 13)} ${lpad(t.totalLb.toFixed(0), 9)} ${lpad(kgToTonnes(t.totalKg).toFixed(2), 8)} ${lpad(t.meanRate.toFixed(1), 7)} ${lpad(t.minRate.toFixed(0), 6)} ${lpad(t.maxRate.toFixed(0), 6)}`,
    );
  }
  if (rx.totals.length === 0) lines.push('(no product is applied anywhere)');
  lines.push('');
  for (const set of rx.zoneSets) {
    lines.push(`zone set ${set.name}:`);
    lines.push(
      `  ${lpad('zone', 4)} ${lpad('class', 5)} ${lpad('ac', 7)}  ${NUTRIENTS.map((n) => lpad(NUTRIENT_NAME[n], 6)).join(' ')}  rates (${u})  binding limit`,
    );
    for (const z of set.zones) {
      const rates = usedPairs(set)
        .map(
          (p) =>
            `${p.product}@${PLACEMENT_TAG[p.placement]} ${productRate(z.decision, p.product, p.placement).value.toFixed(0)}`,
        )
        .join(', ');
      lines.push(
        `  ${lpad(String(z.id), 4)} ${lpad(String(z.rateClass), 5)} ${lpad(z.areaAc.toFixed(2), 7)}  ${NUTRIENTS.map((n) => lpad(z.decision.nutrients[n].target.value.toFixed(0), 6)).join(' ')}  ${rates || '-'}  ${z.decision.status === 'ok' ? z.decision.binding.join('; ') : 'INFEASIBLE: ' + z.decision.infeasible.map((f) => f.reason).join('; ')}`,
      );
    }
    if (set.design) lines.push(...designLines(set.design, u));
  }
  return lines.join('\n') + '\n';
}

/**
 * A zone set as the shapefile layout's input (src/prescription/shapefiles.ts): per zone `zone_id` and
 * `rates` [{ product, placement, rate, unit }], geometry in lon/lat. Zones with no product still appear
 * (all rates 0), so the files cover the whole field.
 */
export function shapefileFeatures(
  rx: Prescription,
  set: ZoneSetResult,
): FeatureCollection<Polygon | MultiPolygon> {
  const pairs = usedPairs(set);
  return {
    type: 'FeatureCollection',
    features: set.zones.map((z) => ({
      type: 'Feature',
      properties: {
        zone_id: z.id,
        rates: pairs.map((p) => ({
          product: p.product,
          placement: p.placement,
          rate: round(productRate(z.decision, p.product, p.placement).value, 1) ?? 0,
          unit: rx.plan.units,
        })),
      },
      geometry:
        z.lonlat.length === 1
          ? { type: 'Polygon', coordinates: z.lonlat[0] }
          : { type: 'MultiPolygon', coordinates: z.lonlat },
    })),
  };
}

/** The zone design as plain JSON (areas in acres and m2, pairs with their reason). */
function designObject(d: ZoneDesign): unknown {
  const m = d.minArea;
  return {
    why: d.why,
    counts: {
      classes_drawn: d.counts.classes,
      classes_kept: d.counts.classesMerged,
      zones_after_cleaning: d.counts.zonesCleaned,
      zones: d.counts.zones,
    },
    min_zone_area: {
      used_ac: round(m2ToAc(m.usedM2), 3),
      machine_ac: round(m2ToAc(m.machineM2), 3),
      machine: { swath: m.machine.swath, speed: m.machine.speed, rate_change_s: m.machine.rateChangeS },
      per_sample_ac: round(m2ToAc(m.perSampleM2), 3),
      grid_samples: m.gridSamples,
      from_plan: m.fromPlan,
    },
    min_rate_difference: Object.fromEntries(
      Object.entries(d.minDifference).map(([k, v]) => [k, round(v, 2)]),
    ),
    rmse_carried: Object.fromEntries(Object.entries(d.rmse).map(([k, v]) => [k, round(v!, 4)])),
    vertices: d.vertices,
    pairs: d.pairs.map((p) => ({
      zones: [p.a, p.b],
      product: p.why?.product ?? null,
      placement: p.why?.placement ?? null,
      rates: p.why ? [p.why.a, p.why.b] : null,
      difference: p.why ? round(p.why.diff, 1) : null,
      min_difference: p.why ? round(p.why.min, 1) : null,
      error_range: p.why?.range ?? null,
    })),
  };
}
