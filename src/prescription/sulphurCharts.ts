/**
 * The variability charts as report entries (src/report's `ReportChart`: title, complete SVG, caption), so the
 * build's report shows the same pictures `tilth variability --out` writes.
 */
import type { ReportChanceMap, ReportChart } from '../report/types.js';
import type { ReportView } from './reportMaps.js';
import type { Field, Grid, Samples } from '../types.js';
import { chanceBelowMap, chanceSentence, type KrigedSurface } from '../variability/chanceMap.js';
import { analyzeVariability, type VariabilityReport } from '../variability/index.js';
import { sampleMapSvg } from '../variability/sampleMap.js';
import { semivariogramSvg } from '../variability/semivariogramChart.js';

/**
 * The semivariogram and low-spot map of one study, with captions that carry the findings.
 * @example input.charts.push(...variabilityReportCharts(analyzeVariability(samples, field), samples, field))
 */
export function variabilityReportCharts(
  r: VariabilityReport,
  samples: Samples,
  field: Field,
  surface?: Parameters<typeof sampleMapSvg>[0]['surface'],
): ReportChart[] {
  const best = r.best;
  const dep = r.dependence;
  const svCaption =
    best && dep
      ? `Best fit ${best.kind}: nugget ${best.nugget.toPrecision(3)}, sill ${best.sill.toPrecision(3)}, effective range ${best.effectiveRange.toFixed(0)} m; spatial dependence ${dep.class} (nugget/sill ${(100 * dep.ratio).toFixed(0)} %, Cambardella et al. 1994). ${r.sampling.text}`
      : `No semivariogram model could be fitted. ${r.sampling.text}`;
  const lowIds = r.low.map((l) => l.id).join(', ');
  const mapCaption = r.threshold
    ? `${r.low.length} of ${r.stats.n} samples ${r.threshold.inclusive ? 'at or below' : 'below'} ${r.threshold.value} ${r.unit}${lowIds ? `: ${lowIds}` : ''}.${r.sulphur ? ` ${r.sulphur.compositeText} ${r.sulphur.notLowIsUncertain} ${r.sulphur.floorText}` : ''}`
    : `Samples coloured by ${r.label}; no threshold for this nutrient.`;
  return [
    {
      title: `Semivariogram of ${r.label}`,
      svg: semivariogramSvg({
        semivariogram: r.semivariogram,
        fits: r.fits,
        best: r.best,
        label: r.label,
        unit: r.unit,
        transform: r.transform,
      }),
      caption: svCaption,
    },
    {
      title: `${r.label}: low spots`,
      svg: sampleMapSvg({
        parts: field.parts,
        utm: field.utm,
        xy: samples.xy,
        values: samples.values[r.nutrient],
        ids: samples.ids,
        label: r.label,
        unit: r.unit,
        threshold: r.threshold?.value ?? null,
        thresholdInclusive: r.threshold?.inclusive,
        surface,
      }),
      caption: mapCaption,
    },
  ];
}

/** The crop entries of the rate engine's tables the sulphur study reads (src/agronomy/tables.ts). */
export interface CropSulphurEntries {
  s_low_below_lb: { value: number; source: string };
  s_floor_lb: { value: number; source: string };
}

/**
 * The sulphate-S study a build's report shows: threshold and floor from the plan's crop in the tables (no floor
 * when the plan's S strategy is 'none'), the build's S surface for the share of area; null when no sample has S.
 * @example const c = buildSulphurCharts(inputs.samples, inputs.field, tables.crops[plan.crop], plan.strategy.s.method, sSurface)
 */
export function buildSulphurCharts(
  samples: Samples,
  field: Field,
  crop: CropSulphurEntries | undefined,
  sMethod: string,
  surface?: { grid: Grid; values: ArrayLike<number>; note?: string; zones?: boolean },
): ReportChart[] {
  if (!Array.from(samples.values.so4_s).some(Number.isFinite)) return [];
  const r = analyzeVariability(
    samples,
    field,
    {
      nutrient: 'so4_s',
      threshold: crop
        ? {
            value: crop.s_low_below_lb.value,
            unit: 'lb S/ac 0-24 in',
            source: `tables: ${crop.s_low_below_lb.source}`,
          }
        : undefined,
      sFloor: sMethod === 'none' ? 0 : crop?.s_floor_lb.value,
      sFloorSource:
        sMethod === 'none'
          ? "the plan's S strategy is none"
          : crop
            ? `tables: ${crop.s_floor_lb.source}`
            : undefined,
    },
    surface
      ? {
          values: surface.values,
          fraction: surface.grid.fraction,
          cell: surface.grid.cell,
          note: surface.note,
        }
      : undefined,
  );
  return variabilityReportCharts(
    r,
    samples,
    field,
    surface
      ? {
          grid: surface.grid,
          values: surface.values,
          label: surface.zones ? 'zone sample value' : 'interpolated (IDW)',
        }
      : undefined,
  );
}

/**
 * The sulphate-S chance map a build's report shows beside the S surface: the chance below the crop's low level
 * (`s_low_below_lb`, 20 lb S/ac for canola without a crop entry) from the build's kriging when its S surface is
 * kriged, else from ordinary kriging with the plan's settings; with the reason when kriging is refused. Null when
 * no sample has S.
 * @example ri.chance = [buildSulphurChance(inputs.samples, rx.grid, tables.crops[plan.crop], sSurface, { log: false, neighbours: 16 }, view)!]
 */
export function buildSulphurChance(
  samples: Samples,
  grid: Grid,
  crop: CropSulphurEntries | undefined,
  surface: KrigedSurface | undefined,
  settings: { log: boolean; neighbours: number },
  view: ReportView,
): ReportChanceMap | null {
  if (!Array.from(samples.values.so4_s).some(Number.isFinite)) return null;
  const t = { value: crop?.s_low_below_lb.value ?? 20, unit: 'lb S/ac' };
  // kriged only at the cells the map shows (a 36th of a 1 m section's cells at 6 m)
  const m = chanceBelowMap(samples, 'so4_s', grid, t, { ...settings, surface, cells: view.cells });
  const base = {
    nutrient: 'so4_s',
    threshold: t.value,
    unit: t.unit,
    method: m.method,
    assumption: m.assumption,
  };
  if (!m.chance) return { ...base, refused: m.refused ?? 'no kriging' };
  const g = view.grid;
  const msse =
    m.msse !== null && Number.isFinite(m.msse)
      ? ` Leave-one-out MSSE ${m.msse.toFixed(2)} (near 1: variances fit the errors).`
      : '';
  const notes =
    view.factor > 1
      ? [
          `Shown at ${view.grid.cell} m cells for display: each takes the chance of the ${grid.cell} m cell at its centre (nearest)${view.cells && !(surface?.method === 'kriging' && surface.krigedMean) ? ', kriged at those cells only; the field shares below are estimated from them' : ''}.`,
        ]
      : undefined;
  return {
    ...base,
    raster: {
      grid: { xmin: g.xmin, ymax: g.ymax, cell: g.cell, cols: g.cols, rows: g.rows },
      values: view.pick(m.chance),
      notes,
    },
    summary: `${chanceSentence(m)}${msse}${surface && surface.method !== 'kriging' ? ' The S surface map before this one is not kriged: between samples they can differ.' : ''}`,
  };
}
