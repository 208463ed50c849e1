/**
 * One call per nutrient: choose IDW power and neighbour count by cross-validation (or take the user's),
 * interpolate on the field grid, or paint zone values for zone-composite samples.
 */
import { UserError, type Warning } from '../errors.js';
import type { Analyte, Grid, SampleZones, Samples } from '../types.js';
import type { CvResult } from './crossValidate.js';
import { idwSurfaces } from './idw.js';
import { chooseIdw, fmt, kName, type IdwChoice, type IdwChoiceOptions } from './idwChoice.js';
import { SurfacePool, type SurfaceThreads } from './parallel.js';
import { nutrientPoints, type NutrientPoints } from './prepare.js';
import { zoneSurface } from './zoneSurface.js';

export { kName } from './idwChoice.js';
import { krigeGrid, krigingCandidate, type KrigingChoiceOptions, type KrigingInfo } from './krigingChoice.js';
import { ANALYTE_LABEL } from '../vocabulary.js';

const NAMES: Record<string, Analyte> = {
  no3_n: 'no3_n',
  n: 'no3_n',
  nitrate: 'no3_n',
  'no3-n': 'no3_n',
  no3: 'no3_n',
  p: 'p',
  phosphorus: 'p',
  k: 'k',
  potassium: 'k',
  so4_s: 'so4_s',
  s: 'so4_s',
  sulphate: 'so4_s',
  sulfate: 'so4_s',
  'so4-s': 'so4_s',
  so4: 'so4_s',
  om: 'om',
  ph: 'ph',
};

/**
 * The analyte for a name as people type it (case-insensitive): no3_n | n | nitrate, p, k,
 * so4_s | s | sulphate | sulfate, om, ph.
 * @throws UserError naming the accepted names
 * @example analyteFromName('Sulfate') // 'so4_s'
 */
export function analyteFromName(name: string): Analyte {
  const a = NAMES[name.trim().toLowerCase()];
  if (!a)
    throw new UserError(
      `nutrient "${name}" is not known. Fix: use one of no3_n (or n, nitrate), p, k, so4_s (or s, sulphate, sulfate), om, ph.`,
      { field: 'nutrient', value: name },
    );
  return a;
}

/** Options for {@link nutrientSurface}. */
export interface NutrientSurfaceOptions extends IdwChoiceOptions {
  /** 'idw' (default), 'kriging' (ordinary kriging; a UserError with the reason when the semivariogram cannot
   * carry it), or 'auto': the lowest leave-one-out RMSE of the IDW candidates and kriging */
  method?: SurfaceMethod;
  /** kriging: neighbours 16, log false, model fitted by the variability stage */
  kriging?: KrigingChoiceOptions;
  /** worker threads for the IDW maps' per-cell work (default none: this thread; parallel.ts) */
  threads?: SurfaceThreads;
}

/** How a surface is interpolated: see {@link NutrientSurfaceOptions.method}. */
export type SurfaceMethod = 'auto' | 'idw' | 'kriging';
export const SURFACE_METHODS: readonly SurfaceMethod[] = ['auto', 'idw', 'kriging'];

/** A nutrient's surface on the field grid. */
export interface NutrientSurface {
  analyte: Analyte;
  grid: Grid;
  /** row-major north-up values where grid.fraction > 0, NaN elsewhere (on a SharedArrayBuffer when made by threads) */
  values: Float64Array;
  method: 'idw' | 'kriging' | 'zones' | 'single-sample';
  /** power used (idw); NaN otherwise */
  power: number;
  /** neighbour count used (idw, kriging); NaN otherwise */
  neighbours: number;
  /** how they were chosen, for people */
  choice: string;
  /** leave-one-out table: the IDW rows, then the kriging row when kriging was a candidate; `best` is the row used */
  cv: CvResult | null;
  /** kriging's model, cross-validation or the reason it was refused; null when it was not considered */
  kriging: KrigingInfo | null;
  /** kriging only: mean and variance per cell on the kriged scale (natural logarithms when kriging.transform is 'log') */
  krigedMean: Float64Array | null;
  variance: Float64Array | null;
  /** samples used after skipping and merging */
  samplesUsed: number;
  min: number;
  max: number;
  warnings: Warning[];
}

/**
 * Builds one nutrient's surface on a field grid. Zone-composite samples (zones given and samples keyed)
 * paint each zone with its value; otherwise IDW with power and neighbours chosen by leave-one-out
 * cross-validation ('auto') or as given. For several nutrients use {@link nutrientSurfaces} (one search).
 *
 * @param samples validated, projected samples (canonical units)
 * @param analyte which nutrient
 * @param grid the field grid (fieldGrid); values are computed where fraction > 0
 * @param zones zone polygons for zone-composite samples, else null
 * @param opts power 'auto', neighbours 'auto', powers [1, 1.5, 2, 3], neighbourChoices [8, 12, 16, all]
 * @throws UserError when no sample has a value for the nutrient
 * @example const s = nutrientSurface(inputs.samples, 'p', fieldGrid(inputs.field, 5), inputs.zones); s.cv?.table
 */
export function nutrientSurface(
  samples: SurfaceSamples,
  analyte: Analyte,
  grid: Grid,
  zones: SampleZones | null = null,
  opts: NutrientSurfaceOptions = {},
): NutrientSurface {
  return nutrientSurfaces(samples, [analyte], grid, zones, opts)[0];
}

type SurfaceSamples = Pick<Samples, 'xy' | 'values' | 'ids' | 'zone'>;

/**
 * Every listed nutrient's surface, each identical to its own {@link nutrientSurface}, but nutrients
 * measured at the same sample sites share one leave-one-out neighbour search (and one pass over sample
 * pairs for "all") in IDW cross-validation and one k-nearest search per cell (the largest k chosen) for
 * the IDW maps (docs/surface.md, "One neighbour search").
 *
 * @param analytes nutrients, in the order of the result
 * @param opts as {@link nutrientSurface}, applied to every nutrient
 * @param onProgress share of the work done, 0..1 (optional)
 * @throws UserError when no sample has a value for one of the nutrients
 * @example const [p, k] = nutrientSurfaces(inputs.samples, ['p', 'k'], grid, null)
 */
export function nutrientSurfaces(
  samples: SurfaceSamples,
  analytes: readonly Analyte[],
  grid: Grid,
  zones: SampleZones | null = null,
  opts: NutrientSurfaceOptions = {},
  onProgress: (done: number) => void = () => {},
): NutrientSurface[] {
  const out: NutrientSurface[] = new Array(analytes.length);
  const groups: Pending[][] = [];
  analytes.forEach((a, slot) => {
    const r = prepare(samples, a, grid, zones, slot);
    if ('values' in r) {
      out[slot] = r;
      return;
    }
    const g = groups.find((q) => sameSites(q[0].pts.xy, r.pts.xy));
    if (g) g.push(r);
    else groups.push([r]);
  });
  let done = analytes.length - groups.reduce((s, g) => s + g.length, 0);
  // workers start now, so they load while cross-validation runs here
  const pool =
    groups.length && opts.method !== 'kriging' ? SurfacePool.start(opts.threads, searched(grid)) : null;
  try {
    for (const g of groups) {
      interpolate(g, grid, opts, out, pool, () => onProgress((done + g.length / 2) / analytes.length));
      done += g.length;
      onProgress(done / analytes.length);
    }
  } finally {
    pool?.close();
  }
  return out;
}

function searched(grid: Grid): number {
  let m = 0;
  for (let i = 0; i < grid.fraction.length; i++) if (grid.fraction[i] > 0) m++;
  return m;
}

/** A nutrient waiting for interpolation: its points and the result fields known so far. */
interface Pending {
  slot: number;
  label: string;
  pts: NutrientPoints;
  base: Omit<NutrientSurface, 'values' | 'method' | 'power' | 'neighbours' | 'choice'>;
}

function sameSites(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/** The nutrient's points; zone-composite and one-sample surfaces finished here, the others left pending. */
function prepare(
  samples: SurfaceSamples,
  analyte: Analyte,
  grid: Grid,
  zones: SampleZones | null,
  slot: number,
): NutrientSurface | Pending {
  const label = ANALYTE_LABEL[analyte];
  const pts = nutrientPoints(samples.xy, samples.values[analyte], samples.ids, label, samples.zone);
  const warnings = [...pts.warnings];
  const n = pts.z.length;
  if (n === 0) {
    throw new UserError(
      `no sample has a value for ${label}. Fix: choose a nutrient the lab tested, or add its values to the samples file.`,
      { field: analyte },
    );
  }
  let min = Infinity,
    max = -Infinity;
  for (const v of pts.z) {
    min = Math.min(min, v);
    max = Math.max(max, v);
  }
  if (n > 1 && min === max) {
    warnings.push({
      code: 'surface-flat',
      message: `${label}: all ${n} samples have the value ${min}; the map is flat.`,
      field: label,
    });
  }
  const base = {
    analyte,
    grid,
    cv: null as CvResult | null,
    samplesUsed: n,
    min,
    max,
    warnings,
    kriging: null,
    krigedMean: null,
    variance: null,
  };
  if (zones !== null && pts.zone.some((z) => z !== null)) {
    const r = zoneValues(pts, zones, grid, label);
    warnings.push(...r.warnings);
    return {
      ...base,
      values: r.values,
      method: 'zones',
      power: NaN,
      neighbours: NaN,
      choice: 'zone-composite samples: each zone takes its sample value',
    };
  }
  if (n === 1) {
    const values = new Float64Array(grid.cols * grid.rows).fill(NaN);
    for (let i = 0; i < values.length; i++) if (grid.fraction[i] > 0) values[i] = pts.z[0];
    warnings.push({
      code: 'surface-one-sample',
      message: `${label}: only one sample (${pts.ids[0]}) has a value; the whole field takes it.`,
      field: label,
    });
    return {
      ...base,
      values,
      method: 'single-sample',
      power: NaN,
      neighbours: NaN,
      choice: 'one sample: uniform value',
    };
  }
  return { slot, label, pts, base };
}

/**
 * Nutrients at the same sites: IDW cross-validation shared, kriging considered per nutrient, then the IDW
 * maps from one shared search per cell.
 */
function interpolate(
  group: Pending[],
  grid: Grid,
  opts: NutrientSurfaceOptions,
  out: NutrientSurface[],
  pool: SurfacePool | null,
  halfway: () => void,
): void {
  const { xy } = group[0].pts;
  const method = opts.method ?? 'idw';
  const idws = method === 'kriging' ? group.map(() => null) : chooseIdw(group, opts);
  const idwLeft: { p: Pending; idw: IdwChoice; kriging: KrigingInfo | null }[] = [];
  group.forEach((p, i) => {
    const r = krigeOrNot(p, idws[i], method, grid, opts);
    if ('values' in r) out[p.slot] = r;
    else idwLeft.push({ p, idw: r.idw, kriging: r.kriging });
  });
  halfway();
  if (!idwLeft.length) return;
  const values = idwSurfaces(
    xy,
    idwLeft.map(({ p, idw }) => ({ z: p.pts.z, power: idw.power, neighbours: idw.neighbours })),
    grid,
    { radius: opts.radius, minNeighbours: opts.minNeighbours, pool },
  );
  idwLeft.forEach(({ p, idw, kriging }, i) => {
    const v = values[i],
      label = p.label;
    let empty = 0;
    for (let c = 0; c < v.length; c++) if (grid.fraction[c] > 0 && Number.isNaN(v[c])) empty++;
    if (empty) {
      p.base.warnings.push({
        code: 'surface-cells-empty',
        message: `${label}: ${empty} field cell${empty > 1 ? 's have' : ' has'} fewer than ${opts.minNeighbours ?? 1} sample${(opts.minNeighbours ?? 1) > 1 ? 's' : ''} within the ${opts.radius} m search radius and no value. Fix: use a larger radius (--radius) or fewer minimum neighbours.`,
        field: label,
      });
    }
    out[p.slot] = {
      ...p.base,
      cv: idw.cv,
      kriging,
      values: v,
      method: 'idw',
      power: idw.power,
      neighbours: idw.neighbours,
      choice: idw.choice,
    };
  });
}

/**
 * Kriging as asked or as a candidate against the nutrient's best IDW: the kriged surface when it wins,
 * else the IDW choice (its table and sentence extended by kriging's row or refusal) left to interpolate.
 */
function krigeOrNot(
  p: Pending,
  idw: IdwChoice | null,
  method: SurfaceMethod,
  grid: Grid,
  opts: NutrientSurfaceOptions,
): NutrientSurface | { idw: IdwChoice; kriging: KrigingInfo | null } {
  const { label, pts, base } = p,
    warnings = base.warnings;
  const kriging = method === 'idw' ? null : krigingCandidate(pts.xy, pts.z, opts.kriging);
  if (kriging?.refused && method === 'kriging') {
    throw new UserError(
      `${label}: ordinary kriging is refused: ${kriging.refused}. Fix: use --method idw (or auto, which falls back to IDW), or add samples.`,
      { field: base.analyte },
    );
  }
  const useKriging =
    kriging !== null &&
    kriging.cv !== null &&
    (idw === null || !idw.cv || kriging.cv.rmse < idw.cv.best.rmse);
  if (useKriging) {
    const g = krigeGrid(pts.xy, pts.z, grid, kriging);
    if (g.singular)
      warnings.push({
        code: 'surface-kriging-singular',
        message: `${label}: ${g.singular} cells have no value: their neighbours' covariance matrix is singular under the ${kriging.modelText} model.`,
        field: label,
      });
    const table = [...(idw?.cv?.table ?? []), kriging.cv!];
    const choice = idw
      ? `ordinary kriging chosen by leave-one-out cross-validation: RMSE ${fmt(kriging.cv!.rmse)} against ${fmt(idw.cv!.best.rmse)} for the best IDW (power ${idw.power}, ${kName(idw.neighbours)} neighbours); ${kriging.modelText}, ${kriging.neighbours} neighbours`
      : `ordinary kriging as asked (leave-one-out RMSE ${fmt(kriging.cv!.rmse)}, MSSE ${fmt(kriging.cv!.msse ?? NaN)}); ${kriging.modelText}, ${kriging.neighbours} neighbours`;
    return {
      ...base,
      values: g.values,
      krigedMean: g.mean,
      variance: g.variance,
      kriging,
      cv: { table, best: kriging.cv! },
      method: 'kriging',
      power: NaN,
      neighbours: kriging.neighbours,
      choice,
    };
  }
  let { cv, choice } = idw!;
  if (kriging) {
    if (kriging.cv && cv) {
      cv = { table: [...cv.table, kriging.cv], best: cv.best };
      choice = `IDW chosen by leave-one-out cross-validation over IDW and ordinary kriging: RMSE ${fmt(cv.best.rmse)} against ${fmt(kriging.cv.rmse)} for kriging (${kriging.modelText}); ${choice}`;
    } else if (kriging.refused) {
      choice = `IDW (ordinary kriging was not a candidate: ${kriging.refused}); ${choice}`;
      warnings.push({
        code: 'surface-kriging-refused',
        message: `${label}: ordinary kriging was not used: ${kriging.refused}.`,
        field: label,
      });
    }
  }
  return { idw: { ...idw!, cv, choice }, kriging };
}

/** Zone-composite samples: each zone painted with its (averaged) sample value. */
function zoneValues(
  pts: NutrientPoints,
  zones: SampleZones,
  grid: Grid,
  label: string,
): { values: Float64Array; warnings: Warning[] } {
  const warnings: Warning[] = [];
  const byKey = new Map<string, number[]>();
  pts.zone.forEach((k, i) => {
    if (k !== null) {
      const a = byKey.get(k);
      if (a) a.push(pts.z[i]);
      else byKey.set(k, [pts.z[i]]);
    }
  });
  for (const [k, vs] of byKey) {
    if (!zones.keys.includes(k))
      warnings.push({
        code: 'surface-zone-unknown',
        message: `${label}: samples keyed to zone "${k}" match no zone polygon and are not used.`,
        where: k,
        field: label,
      });
    if (vs.length > 1)
      warnings.push({
        code: 'surface-zone-several',
        message: `${label}: zone "${k}" has ${vs.length} samples (${vs.join(', ')}); their average is used.`,
        where: k,
        field: label,
      });
  }
  const zs = zones.keys.map((key, i) => {
    const vs = byKey.get(key);
    return { key, parts: zones.parts[i], value: vs ? vs.reduce((a, b) => a + b, 0) / vs.length : NaN };
  });
  const r = zoneSurface(grid, zs, label);
  return { values: r.values, warnings: [...warnings, ...r.warnings] };
}
