/**
 * From a prescription to the report's input (src/report/types.ts): plain data, already computed. The rasters
 * are made in reportMaps.ts, the list of tables used in reportTables.ts.
 */
import { designLines } from './zoneDesign.js';
import type { Warning } from '../errors.js';
import { pClassTable } from '../agronomy/interpret.js';
import type { Tables } from '../agronomy/tables.js';
import type { ReportChart, ReportInput, ReportNutrient, ReportZoneSet } from '../report/types.js';
import type { Analyte, FieldInputs } from '../types.js';
import { reportSurfaces, reportView, responseMaps } from './reportMaps.js';
import { tablesUsed } from './reportTables.js';
import { productRate, usedPairs } from './totals.js';
import {
  ANALYTE_SAMPLED,
  ANALYTE_TERMS,
  CAUTION_TEXT,
  NUTRIENT_NAME,
  PLACEMENT_NAME,
} from '../vocabulary.js';
import type { Prescription } from './types.js';
import type { Provenance } from './outputs.js';
import { kgToTonnes } from '../units/index.js';

/** Decimals the report shows each soil test with. */
const DECIMALS: Partial<Record<Analyte, number>> = { no3_n: 0, p: 1, k: 0, so4_s: 0, om: 1 };

/** A soil test's label, unit and decimals in the report: "Nitrate-N 0-24 in", lb/ac (src/vocabulary.ts). */
function nutrientInfo(a: Analyte): Omit<ReportNutrient, 'key'> {
  const label = ANALYTE_SAMPLED[a];
  return {
    label: label[0].toUpperCase() + label.slice(1),
    unit: ANALYTE_TERMS[a].unit,
    decimals: DECIMALS[a]!,
  };
}
/** The cautions printed in every report. */
export const REPORT_CAUTIONS = [
  'Too much fertilizer with the seed injures or kills seedlings. Seed-row limits here assume the implement, row spacing and seedbed moisture declared in the plan; lower them in dry seedbeds.',
  CAUTION_TEXT,
  'A sulphate-S test that is not low is uncertain: hilltops and slopes can be deficient where the average is not.',
];

/**
 * Builds the report input.
 * @param charts extra charts from other stages (variability), complete SVG documents
 */
export function reportInput(
  rx: Prescription,
  inputs: FieldInputs,
  tables: Tables,
  prov: Provenance,
  opts: { tablesEdited?: boolean; charts?: ReportChart[] } = {},
): ReportInput {
  const plan = rx.plan;
  const view = reportView(rx);
  const crop = tables.crops[plan.crop];
  const pMethod = inputs.samples.pMethod;
  const nutrients: ReportNutrient[] = rx.surfaces.map((s) => ({
    key: s.analyte,
    ...nutrientInfo(s.analyte),
    label:
      s.analyte === 'p'
        ? `${pMethod === 'olsen' ? 'Olsen' : 'modified Kelowna'} P 0-6 in`
        : nutrientInfo(s.analyte).label,
  }));
  const kFactor = plan.soil_test.kelowna_factor;
  const pClasses = pClassTable(pMethod, tables, kFactor);
  const warnings: Warning[] = rx.warnings;
  return {
    title: reportTitle(rx, tables, prov),
    units: { area: plan.units === 'kg/ha' ? 'ha' : 'ac' },
    utm: { zone: rx.field.utm.zone, south: rx.field.utm.south, epsg: rx.field.utm.epsg },
    field: { parts: rx.field.parts, areaM2: rx.field.areaM2 },
    nutrients,
    samples: reportSamples(inputs, nutrients),
    surfaces: reportSurfaces(rx, view, pClasses),
    response: responseMaps(rx, view, tables, crop, pClasses, pMethod, kFactor),
    zoneSets: reportZoneSets(rx),
    totals: reportTotals(rx),
    crossValidation: crossValidationRows(rx),
    warnings,
    tablesUsed: tablesUsed(plan, tables, crop, pClasses, pMethod, opts.tablesEdited),
    cautions: REPORT_CAUTIONS,
    charts: opts.charts ?? [],
  };
}

/** Farm, field, crop, target yield, a one-line plan summary, date, version and the inputs' hash. */
function reportTitle(rx: Prescription, tables: Tables, prov: Provenance): ReportInput['title'] {
  const plan = rx.plan;
  const crop = tables.crops[plan.crop];
  return {
    farm: plan.farm,
    field: plan.field || rx.field.name,
    crop: crop?.label ?? plan.crop,
    targetYield: `${plan.target_yield_bu} bu/ac`,
    planSummary: `Zones: ${rx.zoneSets.map((s) => `${s.name} (${s.zones.length}, ${s.drivenBy})`).join('; ')}. Products: ${plan.products.map((p) => `${tables.products[p.product]?.label ?? p.product} (${(p.placements ?? plan.implement.placements).map((x) => PLACEMENT_NAME[x]).join(', ')})`).join('; ')}. Implement: ${plan.implement.opener_spread_in} in spread on ${plan.implement.row_spacing_in} in rows, ${plan.implement.seedbed_moisture} seedbed moisture.`,
    date: prov.created.slice(0, 10),
    version: prov.tilth,
    hash: prov.id,
  };
}

/** The samples' positions and the values of the nutrients mapped (censored flags alongside). */
function reportSamples(inputs: FieldInputs, nutrients: ReportNutrient[]): ReportInput['samples'] {
  return {
    ids: inputs.samples.ids,
    xy: inputs.samples.xy,
    values: Object.fromEntries(
      nutrients.map((n) => [n.key, inputs.samples.values[n.key as keyof typeof inputs.samples.values]]),
    ),
    censored: Object.fromEntries(
      nutrients.map((n) => [n.key, inputs.samples.censored[n.key as keyof typeof inputs.samples.censored]]),
    ),
  };
}

/** Each zone set's zones with soil means, targets, rates, the binding limit; and how the set was designed. */
function reportZoneSets(rx: Prescription): ReportZoneSet[] {
  const plan = rx.plan;
  return rx.zoneSets.map((set) => ({
    name: set.name,
    products: usedPairs(set)
      .map((p) => p.product)
      .filter((p, i, a) => a.indexOf(p) === i),
    targetUnit: plan.units,
    zones: set.zones.map((z) => ({
      id: String(z.id),
      parts: z.parts,
      areaM2: z.areaM2,
      class: set.name === 'sampled' || z.rateClass < 1 ? null : z.rateClass - 1, // 0: unsampled parts (unsampled.ts)
      soilMeans: { no3_n: z.soil.no3_n, p: z.soil.p, k: z.soil.k, so4_s: z.soil.so4_s, om: z.soil.om },
      targets: Object.fromEntries(
        (['n', 'p2o5', 'k2o', 's'] as const).map((n) => [
          NUTRIENT_NAME[n],
          z.decision.nutrients[n].target.value,
        ]),
      ),
      rates: usedPairs(set).map((p) => ({
        product: p.product,
        placement: PLACEMENT_NAME[p.placement],
        rate: productRate(z.decision, p.product, p.placement).value,
        unit: plan.units,
      })),
      bindingLimit:
        z.decision.status === 'ok'
          ? z.decision.binding[0]?.startsWith('none')
            ? null
            : z.decision.binding.join('; ')
          : null,
      notes: z.decision.status === 'ok' ? undefined : z.decision.infeasible.map((f) => f.reason),
    })),
    ...(set.design
      ? {
          minDifference: Object.entries(set.design.minDifference).map(([k, value]) => {
            const [product, placement] = k.split('|');
            return {
              product,
              placement: PLACEMENT_NAME[placement as keyof typeof PLACEMENT_NAME] ?? placement,
              value,
            };
          }),
          design: designLines(set.design, plan.units).map((l) => l.trim()),
        }
      : {}),
  }));
}

/** Product totals in the plan's units, with the amount to order in tonnes. */
function reportTotals(rx: Prescription): ReportInput['totals'] {
  const plan = rx.plan;
  return rx.totals.map((t) => ({
    product: t.product,
    placement: PLACEMENT_NAME[t.placement],
    total: plan.units === 'kg/ha' ? t.totalKg : t.totalLb,
    totalUnit: plan.units === 'kg/ha' ? 'kg' : 'lb',
    packaging: `${kgToTonnes(t.totalKg).toFixed(2)} t${rx.zoneSets.length > 1 ? ` (zone set ${t.zoneSet})` : ''}`,
    meanRate: t.meanRate,
    minRate: t.minRate,
    maxRate: t.maxRate,
    rateUnit: t.unit,
  }));
}

/** Every cross-validation row of every surface, the chosen one marked. */
function crossValidationRows(rx: Prescription): ReportInput['crossValidation'] {
  return rx.surfaces.flatMap((s) =>
    (s.cv?.table ?? []).map((r) => ({
      nutrient: s.analyte,
      method:
        r.method === 'kriging'
          ? `ordinary kriging, ${r.neighbours} neighbours (${s.kriging?.modelText ?? ''}; MSSE ${Number.isFinite(r.msse ?? NaN) ? (r.msse as number).toFixed(2) : 'n/a'})`
          : `IDW power ${r.power}, ${Number.isFinite(r.neighbours) ? r.neighbours : 'all'} neighbours`,
      rmse: r.rmse,
      meanError: r.bias,
      mae: r.mae,
      chosen: r === s.cv!.best,
    })),
  );
}
