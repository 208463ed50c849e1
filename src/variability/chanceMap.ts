/**
 * The chance that a nutrient is below its low threshold, cell by cell, from ordinary kriging's mean and
 * variance (src/surface/probability.ts, Gaussian assumption; docs/surface.md, "Maps of how sure the soil test
 * is"), with the numbers people read off it: the expected share of the field below the threshold and the
 * share where it is likely. Kriging is the surface stage's (src/surface/krigingChoice.ts); when it is refused
 * (too few samples, pure nugget, no sill, zone composites) there is no map and the reason says why.
 */
import type { Analyte, Grid, Samples } from '../types.js';
import { nutrientPoints } from '../surface/prepare.js';
import { krigeGrid, krigingCandidate, type KrigingInfo } from '../surface/krigingChoice.js';
import { chanceBelow, type KrigedCells } from '../surface/probability.js';
import type { FitOptions } from './fit.js';
import { ANALYTE_DEPTH_LABEL } from '../vocabulary.js';
export { chanceClass, chanceClassLabels, chanceColours } from '../draw/chanceClasses.js';

/**
 * The assumption every chance map states, one legend line (docs/surface.md gives the rest: the fitted model's
 * own uncertainty is left out, trends and skew mislead).
 * @example chanceAssumption('none') // "Assumes each cell's value is Gaussian with the kriging mean and variance, given the fitted model."
 */
export function chanceAssumption(transform: 'none' | 'log'): string {
  return transform === 'log'
    ? "Assumes each cell's value is lognormal (kriging of logarithms: mean and variance), given the fitted model."
    : "Assumes each cell's value is Gaussian with the kriging mean and variance, given the fitted model.";
}

const M2_PER_AC = 4046.8564224;

/** A chance-below-threshold map, or the reason there is none. */
export interface ChanceMap {
  analyte: Analyte;
  threshold: number;
  /** the threshold value itself counts as low (the chance is the same for a continuous value) */
  inclusive: boolean;
  unit: string;
  /** P(value < threshold) per cell, 0..1, NaN outside the field; null when there is no map */
  chance: Float32Array | null;
  /** why there is no map (kriging refused ...), or null */
  refused: string | null;
  /** how the mean and variance were made, for people */
  method: string;
  transform: 'none' | 'log';
  /** leave-one-out mean squared standardized error of the kriging (near 1: the variances match the errors) */
  msse: number | null;
  /** expected share of the field below the threshold: the chance averaged over the field's area */
  expectedShare: number | null;
  expectedAc: number | null;
  /** share of the field's area where the chance is at least 50 % and at least 90 % */
  shareLikely: { p50: number; p90: number } | null;
  assumption: string;
}

/** A surface the stage already kriged (NutrientSurface fields), reused instead of kriging again. */
export interface KrigedSurface {
  method: string;
  krigedMean: Float64Array | null;
  variance: Float64Array | null;
  kriging: KrigingInfo | null;
}

/** Options of {@link chanceBelowMap}. */
export interface ChanceMapOptions {
  /** krige natural logarithms (lognormal chances; default false) */
  log?: boolean;
  /** nearest samples per cell (default 16) */
  neighbours?: number;
  /** model fit options (default gstat fit.method 7) */
  fit?: FitOptions;
  /** the nutrient's surface from the surface stage: its kriging (or its model, or its refusal) is used */
  surface?: KrigedSurface;
  /**
   * krige only these cells of `grid` (e.g. the cells a map coarsened for display shows), leaving the others NaN;
   * the field shares are then estimated from them, each weighted by its own fraction (default: every field cell)
   */
  cells?: Int32Array | null;
}

/**
 * The chance below `threshold` in every field cell of `grid`, from ordinary kriging of the samples.
 * @param samples validated, projected samples
 * @param analyte the nutrient
 * @param grid the field grid (values where fraction > 0)
 * @param threshold "low" means below this value (unit: the nutrient's canonical unit)
 * @param opts log false, neighbours 16, fit method 7; `surface` reuses the surface stage's kriging; `cells`
 *   (default all) krige only the listed cells: a 1 m section shown at 6 m takes a 36th of the time
 * @example const m = chanceBelowMap(inputs.samples, 'so4_s', fieldGrid(inputs.field, 10), { value: 20, unit: 'lb S/ac' }); m.refused ?? m.expectedShare
 */
export function chanceBelowMap(
  samples: Pick<Samples, 'xy' | 'values' | 'ids' | 'zone'>,
  analyte: Analyte,
  grid: Grid,
  threshold: { value: number; unit: string; inclusive?: boolean },
  opts: ChanceMapOptions = {},
): ChanceMap {
  const base = {
    analyte,
    threshold: threshold.value,
    inclusive: Boolean(threshold.inclusive),
    unit: threshold.unit,
    assumption: chanceAssumption(opts.log ? 'log' : 'none'),
  };
  const k = krigedCells(samples, analyte, grid, opts);
  if ('refused' in k)
    return {
      ...base,
      chance: null,
      refused: k.refused,
      method: 'ordinary kriging (refused)',
      transform: opts.log ? 'log' : 'none',
      msse: null,
      expectedShare: null,
      expectedAc: null,
      shareLikely: null,
    };
  let chance = chanceBelow(k.cells, threshold.value);
  if (k.at) {
    const all = new Float32Array(grid.fraction.length).fill(NaN);
    k.at.forEach((i, j) => (all[i] = chance[j]));
    chance = all;
  }
  return {
    ...base,
    assumption: chanceAssumption(k.cells.transform),
    chance,
    refused: null,
    method: k.method,
    transform: k.cells.transform,
    msse: k.msse,
    ...summary(chance, grid, Boolean(k.at)),
  };
}

/**
 * Kriging mean and variance of a nutrient on the grid: the surface's own when it is kriged, else kriged here with
 * the surface stage's model (or its refusal), else with a model fitted here; or why there is none.
 * @example const k = krigedCells(samples, 'p', grid, { surface }); 'refused' in k ? k.refused : k.cells.variance
 */
export function krigedCells(
  samples: Pick<Samples, 'xy' | 'values' | 'ids' | 'zone'>,
  analyte: Analyte,
  grid: Grid,
  opts: ChanceMapOptions,
): { cells: KrigedCells; method: string; msse: number | null; at?: Int32Array } | { refused: string } {
  const s = opts.surface;
  const described = (info: KrigingInfo) =>
    `ordinary kriging, ${info.modelText}, ${info.neighbours} neighbours`;
  if (s?.method === 'kriging' && s.krigedMean && s.variance && s.kriging)
    return {
      cells: { mean: s.krigedMean, variance: s.variance, transform: s.kriging.transform },
      method: `${described(s.kriging)} (the surface's own)`,
      msse: s.kriging.cv?.msse ?? null,
    };
  if (s?.method === 'zones' || samples.zone.some((z) => z !== null))
    return { refused: 'zone-composite samples each stand for a whole zone; kriging needs point samples' };
  const label = ANALYTE_DEPTH_LABEL[analyte];
  const pts = nutrientPoints(samples.xy, samples.values[analyte], samples.ids, label);
  const info =
    s?.kriging && (s.kriging.model || s.kriging.refused)
      ? s.kriging
      : krigingCandidate(pts.xy, pts.z, { log: opts.log, neighbours: opts.neighbours, fit: opts.fit });
  if (!info.model || info.refused)
    return { refused: `ordinary kriging is refused: ${info.refused ?? 'no model'}` };
  if (opts.cells) {
    // only the listed field cells; the arrays follow `at`
    const at = Int32Array.from(new Set(opts.cells.filter((i) => grid.fraction[i] > 0))).sort();
    const g = krigeGrid(pts.xy, pts.z, grid, info, at);
    return {
      cells: { mean: g.mean, variance: g.variance, transform: info.transform },
      method: described(info),
      msse: info.cv?.msse ?? null,
      at,
    };
  }
  const g = krigeGrid(pts.xy, pts.z, grid, info);
  return {
    cells: { mean: g.mean, variance: g.variance, transform: info.transform },
    method: described(info),
    msse: info.cv?.msse ?? null,
  };
}

/**
 * Expected share below (area-weighted mean chance) and the shares at least 50 % and 90 % likely; `sampled`:
 * the chance is known at some cells only, so the acres are the share times the whole field's area.
 */
function summary(
  chance: Float32Array,
  grid: Grid,
  sampled = false,
): Pick<ChanceMap, 'expectedShare' | 'expectedAc' | 'shareLikely'> {
  let w = 0,
    e = 0,
    p50 = 0,
    p90 = 0;
  for (let i = 0; i < chance.length; i++) {
    const f = grid.fraction[i];
    if (!(f > 0) || !Number.isFinite(chance[i])) continue;
    w += f;
    e += f * chance[i];
    if (chance[i] >= 0.5) p50 += f;
    if (chance[i] >= 0.9) p90 += f;
  }
  if (!(w > 0)) return { expectedShare: null, expectedAc: null, shareLikely: null };
  let area = e; // the expected number of whole cells below
  if (sampled) {
    let all = 0;
    for (let i = 0; i < grid.fraction.length; i++) if (grid.fraction[i] > 0) all += grid.fraction[i];
    area = (e / w) * all;
  }
  return {
    expectedShare: e / w,
    expectedAc: (area * grid.cell * grid.cell) / M2_PER_AC,
    shareLikely: { p50: p50 / w, p90: p90 / w },
  };
}

/** A chance map without its grid, for JSON and text: what it says and how it was made. */
export type ChanceSummary = Omit<ChanceMap, 'chance'>;

/**
 * The map's summary (everything but the per-cell grid).
 * @example report.chance = chanceSummary(chanceBelowMap(samples, 'so4_s', grid, threshold))
 */
export function chanceSummary(m: ChanceMap): ChanceSummary {
  const rest: Partial<ChanceMap> = { ...m };
  delete rest.chance;
  return rest as ChanceSummary;
}

/**
 * What the map says for the field as a whole, in one sentence (empty without a map).
 * @example chanceSentence(m) // 'Expected 51 % of the field below 20 lb S/ac (78.5 ac); at least 50 % likely on 57 % of it, at least 90 % likely on 11 %.'
 */
export function chanceSentence(m: ChanceSummary): string {
  if (m.expectedShare === null || !m.shareLikely) return '';
  const pct = (x: number) => `${Math.round(100 * x)} %`;
  return `Expected ${pct(m.expectedShare)} of the field ${m.inclusive ? 'at or below' : 'below'} ${m.threshold} ${m.unit} (${(m.expectedAc ?? 0).toFixed(1)} ac); at least 50 % likely on ${pct(m.shareLikely.p50)} of it, at least 90 % likely on ${pct(m.shareLikely.p90)}.`;
}
