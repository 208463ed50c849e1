/**
 * From a prescription to the report's input (src/report/types.ts): plain data, already computed.
 */
import { designLines } from './zoneDesign.js';
import type { Warning } from '../errors.js';
import { kClass, pClass, pClassTable } from '../agronomy/interpret.js';
import type { Tables } from '../agronomy/tables.js';
import { classify } from '../zones/classify.js';
import type {
  ReportChart,
  ReportInput,
  ReportNutrient,
  ReportTableUsed,
  ReportZoneSet,
} from '../report/types.js';
import type { FieldInputs } from '../types.js';
import { productRate, usedPairs, nutrientName } from './totals.js';
import type { Prescription } from './types.js';
import type { Provenance } from './outputs.js';

const NUTRIENT_INFO: Record<string, Omit<ReportNutrient, 'key'>> = {
  no3_n: { label: 'Nitrate-N 0-24 in', unit: 'lb/ac', decimals: 0 },
  p: { label: 'P 0-6 in', unit: 'ppm', decimals: 1 },
  k: { label: 'K 0-6 in', unit: 'ppm', decimals: 0 },
  so4_s: { label: 'Sulphate-S 0-24 in', unit: 'lb/ac', decimals: 0 },
  om: { label: 'Organic matter', unit: '%', decimals: 1 },
};
const PLACEMENT_NAME: Record<string, string> = {
  seed_row: 'seed row',
  side_band: 'side band',
  mid_row_band: 'mid-row band',
  broadcast: 'broadcast',
};

/**
 * Report rasters are drawn at display resolution: at most this many cells per side (a map is 700 px wide);
 * finer grids are shown coarser by a whole factor (see `coarsen`), and the map's legend says so.
 */
export const REPORT_MAX_SIDE = 500;

/** The whole factor that brings a grid to at most {@link REPORT_MAX_SIDE} cells per side (1 when it fits). */
export function displayFactor(g: { cols: number; rows: number }): number {
  return Math.max(1, Math.ceil(Math.max(g.cols, g.rows) / REPORT_MAX_SIDE));
}

/**
 * A grid coarsened by a whole factor for display: each new cell takes the value of the original cell at its
 * centre (nearest, so class rasters keep their classes). A 1 m grid on a section (2.6 million cells) is shown
 * at 4 m; the prescription itself is unchanged.
 */
export function coarsen(
  g: { xmin: number; ymax: number; cell: number; cols: number; rows: number },
  factor: number,
) {
  if (factor <= 1) return { grid: g, pick: (v: ArrayLike<number>) => v };
  const cols = Math.ceil(g.cols / factor),
    rows = Math.ceil(g.rows / factor);
  const grid = { xmin: g.xmin, ymax: g.ymax, cell: g.cell * factor, cols, rows };
  const idx = new Int32Array(cols * rows);
  for (let r = 0; r < rows; r++) {
    const rr = Math.min(g.rows - 1, r * factor + (factor >> 1));
    for (let c = 0; c < cols; c++)
      idx[r * cols + c] = rr * g.cols + Math.min(g.cols - 1, c * factor + (factor >> 1));
  }
  const pick = (v: ArrayLike<number>): Float64Array => {
    const out = new Float64Array(idx.length);
    for (let i = 0; i < idx.length; i++) out[i] = v[idx[i]];
    return out;
  };
  return { grid, pick };
}

/** The cautions printed in every report. */
export const REPORT_CAUTIONS = [
  'Too much fertilizer with the seed injures or kills seedlings. Seed-row limits here assume the implement, row spacing and seedbed moisture declared in the plan; lower them in dry seedbeds.',
  "Rates are suggestions computed from soil tests and editable default tables, not recommendations. Follow your province's or region's guidelines.",
  'A licensed agronomist or certified crop adviser must check this prescription before it is applied. Wrong rates cost money and can pollute water.',
  'A sulphate-S test that is not low is uncertain: hilltops and slopes can be deficient where the average is not.',
];

function mark(source: string): string {
  if (source.startsWith('[published]')) return 'published';
  if (source.startsWith('common practice')) return 'common practice';
  if (source.startsWith('from memory')) return 'from memory';
  if (source.startsWith('missing')) return 'missing';
  return 'user';
}

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
  const grid = rx.grid;
  const factor = displayFactor(grid);
  const view = coarsen(
    { xmin: grid.xmin, ymax: grid.ymax, cell: grid.cell, cols: grid.cols, rows: grid.rows },
    factor,
  );
  const g = view.grid;
  const note =
    factor > 1
      ? [
          `Shown at ${g.cell} m cells for display: each takes the value of the ${grid.cell} m cell at its centre (nearest); the prescription uses ${grid.cell} m cells.`,
        ]
      : undefined;
  const crop = tables.crops[plan.crop];
  const pMethod = inputs.samples.pMethod;

  const nutrients: ReportNutrient[] = rx.surfaces.map((s) => ({
    key: s.analyte,
    ...NUTRIENT_INFO[s.analyte],
    label:
      s.analyte === 'p'
        ? `${pMethod === 'olsen' ? 'Olsen' : 'modified Kelowna'} P 0-6 in`
        : NUTRIENT_INFO[s.analyte].label,
  }));
  const kFactor = plan.soil_test.kelowna_factor;
  const pClasses = pClassTable(pMethod, tables, kFactor);

  const shownFraction = view.pick(grid.fraction);
  const surfaces = rx.surfaces.map((s) => {
    let breaks: number[];
    if (s.analyte === 'p') breaks = pClasses.map((c) => c.below_ppm).filter((b): b is number => b !== null);
    else {
      // quantiles of the cells shown (all cells when the grid is shown at full resolution)
      const c = classify(view.pick(s.values), {
        method: 'quantile',
        classes: 5,
        weights: shownFraction,
        step: 0,
      });
      breaks = c.breaks.slice(1, -1);
    }
    return {
      nutrient: s.analyte,
      raster: { grid: g, values: view.pick(s.values), notes: note },
      breaks,
      method:
        s.method === 'idw'
          ? `IDW power ${s.power}, ${Number.isFinite(s.neighbours) ? s.neighbours : 'all'} neighbours`
          : s.method === 'zones'
            ? 'zone composites'
            : 'one sample',
    };
  });

  const response: ReportInput['response'] = [];
  const pS = rx.surfaces.find((s) => s.analyte === 'p');
  if (pS) {
    // classes only for the cells the map shows (the same cells `coarsen` picks)
    const shown = view.pick(pS.values);
    const vals = new Float64Array(shown.length).fill(NaN);
    // classes in order of increasing chance: reverse the table (lowest test = highest chance)
    const order = pClasses
      .map((_, i) => i)
      .sort((a, b) => pClasses[a].response_probability - pClasses[b].response_probability);
    const rank = new Map(order.map((ci, r) => [pClasses[ci].name, r]));
    for (let i = 0; i < vals.length; i++) {
      const c = pClass(shown[i], pMethod, tables, kFactor);
      if (c) vals[i] = rank.get(c.name)!;
    }
    response.push({
      nutrient: 'p',
      classes: order.map((ci) => ({
        label: `${pClasses[ci].name}: about ${Math.round(pClasses[ci].response_probability * 100)} % chance${pMethod === 'kelowna' ? ` (Kelowna factor ${kFactor})` : ''}`,
      })),
      raster: { grid: g, values: vals, notes: note },
      source: pClasses[0].source,
    });
  }
  const kS = rx.surfaces.find((s) => s.analyte === 'k');
  if (kS && crop) {
    const kClasses = tables.k_classes[crop.k_class_group] ?? [];
    const order = kClasses
      .map((_, i) => i)
      .sort((a, b) => kClasses[a]!.response_probability - kClasses[b]!.response_probability);
    const rank = new Map(order.map((ci, r) => [kClasses[ci]!.name, r]));
    const shown = view.pick(kS.values);
    const vals = new Float64Array(shown.length).fill(NaN);
    for (let i = 0; i < vals.length; i++) {
      const c = kClass(shown[i], crop, tables);
      if (c) vals[i] = rank.get(c.name)!;
    }
    response.push({
      nutrient: 'k',
      classes: order.map((ci) => ({
        label: `${kClasses[ci]!.name}: about ${Math.round(kClasses[ci]!.response_probability * 100)} % chance, ${kClasses[ci]!.k2o_lb} lb K2O`,
      })),
      raster: { grid: g, values: vals, notes: note },
      source: kClasses[0]?.source ?? crop.k_critical_ppm.source,
    });
  }

  const zoneSets: ReportZoneSet[] = rx.zoneSets.map((set) => ({
    name: set.name,
    products: usedPairs(set)
      .map((p) => p.product)
      .filter((p, i, a) => a.indexOf(p) === i),
    targetUnit: plan.units,
    zones: set.zones.map((z) => ({
      id: String(z.id),
      parts: z.parts,
      areaM2: z.areaM2,
      class: set.name === 'sampled' ? null : z.rateClass - 1,
      soilMeans: { no3_n: z.soil.no3_n, p: z.soil.p, k: z.soil.k, so4_s: z.soil.so4_s, om: z.soil.om },
      targets: Object.fromEntries(
        (['n', 'p2o5', 'k2o', 's'] as const).map((n) => [
          nutrientName(n),
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

  const totals = rx.totals.map((t) => ({
    product: t.product,
    placement: PLACEMENT_NAME[t.placement],
    total: plan.units === 'kg/ha' ? t.totalKg : t.totalLb,
    totalUnit: plan.units === 'kg/ha' ? 'kg' : 'lb',
    packaging: `${(t.totalKg / 1000).toFixed(2)} t${rx.zoneSets.length > 1 ? ` (zone set ${t.zoneSet})` : ''}`,
    meanRate: t.meanRate,
    minRate: t.minRate,
    maxRate: t.maxRate,
    rateUnit: t.unit,
  }));

  const crossValidation = rx.surfaces.flatMap((s) =>
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

  const tablesUsed: ReportTableUsed[] = [];
  const add = (name: string, source: string) =>
    tablesUsed.push({ name, source, mark: mark(source), edited: opts.tablesEdited });
  if (crop) {
    add(`${crop.label}: N need ${crop.n_per_bu.value} lb N/bu`, crop.n_per_bu.source);
    add(
      `${crop.label}: P2O5 removal ${crop.removal_per_bu.p2o5.value} lb/bu`,
      crop.removal_per_bu.p2o5.source,
    );
    add(`${crop.label}: K critical level ${crop.k_critical_ppm.value} ppm`, crop.k_critical_ppm.source);
    add(`${crop.label}: S floor ${crop.s_floor_lb.value} lb S/ac`, crop.s_floor_lb.source);
    const gP = crop.seed_row_p2o5[plan.seed_row.p_guideline];
    add(
      `${crop.label}: seed-row P2O5 as MAP ${gP.value} lb/ac at ${gP.spread_in} in on ${gP.rows_in} in rows (P2O5 + K2O within it; lowered for wider rows)`,
      gP.source,
    );
    add(
      `${crop.label}: seed-row K2O at most ${crop.seed_row_k2o_max.value} lb/ac${crop.seed_row_k2o_alone.value ? ', alone, only when the plan opts in' : ''}`,
      crop.seed_row_k2o_max.source,
    );
    if (crop.seed_row_n_k2o_max.value !== null)
      add(
        `${crop.label}: seed-row N + K2O at most ${crop.seed_row_n_k2o_max.value} lb/ac`,
        crop.seed_row_n_k2o_max.source,
      );
    for (const c of tables.k_classes[crop.k_class_group] ?? [])
      add(
        `${crop.label}: K class ${c.name}${c.below_ppm === null ? '' : ` (below ${c.below_ppm} ppm)`}: ${c.k2o_lb} lb K2O, ${Math.round(c.response_probability * 100)} % chance`,
        c.source,
      );
    add(`minimum useful K2O rate ${tables.k_min_useful_lb.value} lb/ac`, tables.k_min_useful_lb.source);
    const sr = tables.seed_row_n[crop.seed_row_group];
    if (sr)
      for (const t of ['light', 'medium', 'heavy'] as const)
        add(`seed-row N, ${crop.seed_row_group}, ${t} soil`, sr[t].source);
  }
  for (const c of pClasses)
    add(
      `P class ${c.name} (${pMethod}${c.below_ppm === null ? '' : `, below ${c.below_ppm} ppm`}): ${tables.p_class_rates[c.name]?.rule.replace(/_/g, ' ') ?? ''}`,
      `${c.source}; rate: ${tables.p_class_rates[c.name]?.source ?? ''}`,
    );
  const nEff = tables.n_relative_efficiency;
  for (const tm of ['spring', 'fall'] as const)
    for (const pl of ['seed_row', 'band', 'broadcast'] as const) {
      const cell = nEff[tm][pl];
      add(
        `N relative efficiency, ${tm} ${pl.replace('_', ' ')}: ${'missing' in cell ? 'missing' : cell.value} (spring broadcast = 100; reference ${nEff.reference.timing} ${nEff.reference.placement})`,
        cell.source,
      );
    }
  if (plan.soil_test.nitrate_sampled === 'fall')
    add(
      `fall nitrate sample used as read${plan.credits.fall_sample_mineralization ? ` + ${tables.soil.spring_mineralization_lb.value} lb N/ac spring mineralization` : ''}`,
      tables.soil.spring_mineralization_lb.source,
    );
  for (const p of plan.products) {
    const pr = tables.products[p.product];
    if (pr) add(`product ${pr.label}`, pr.source);
  }

  const warnings: Warning[] = rx.warnings;
  return {
    title: {
      farm: plan.farm,
      field: plan.field || rx.field.name,
      crop: crop?.label ?? plan.crop,
      targetYield: `${plan.target_yield_bu} bu/ac`,
      planSummary: `Zones: ${rx.zoneSets.map((s) => `${s.name} (${s.zones.length}, ${s.drivenBy})`).join('; ')}. Products: ${plan.products.map((p) => `${tables.products[p.product]?.label ?? p.product} (${(p.placements ?? plan.implement.placements).map((x) => PLACEMENT_NAME[x]).join(', ')})`).join('; ')}. Implement: ${plan.implement.opener_spread_in} in spread on ${plan.implement.row_spacing_in} in rows, ${plan.implement.seedbed_moisture} seedbed moisture.`,
      date: prov.created.slice(0, 10),
      version: prov.tilth,
      hash: prov.id,
    },
    units: { area: plan.units === 'kg/ha' ? 'ha' : 'ac' },
    utm: { zone: rx.field.utm.zone, south: rx.field.utm.south, epsg: rx.field.utm.epsg },
    field: { parts: rx.field.parts, areaM2: rx.field.areaM2 },
    nutrients,
    samples: {
      ids: inputs.samples.ids,
      xy: inputs.samples.xy,
      values: Object.fromEntries(
        nutrients.map((n) => [n.key, inputs.samples.values[n.key as keyof typeof inputs.samples.values]]),
      ),
      censored: Object.fromEntries(
        nutrients.map((n) => [n.key, inputs.samples.censored[n.key as keyof typeof inputs.samples.censored]]),
      ),
    },
    surfaces,
    response,
    zoneSets,
    totals,
    crossValidation,
    warnings,
    tablesUsed,
    cautions: REPORT_CAUTIONS,
    charts: opts.charts ?? [],
  };
}
