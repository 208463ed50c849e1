/**
 * When two neighbouring zones deserve a boundary: some product rate (as the rate engine gives it, already
 * rounded to the machine step) differs by at least the plan's minimum rate difference, and by more than the
 * soil maps' own error moves that rate. See docs/zones.md, "Zones worth a boundary".
 */
import { decide } from '../agronomy/decide.js';
import { memoSolver, type ProductSolver } from '../agronomy/solve.js';
import type { Decision } from '../agronomy/decision.js';
import type { SoilValues } from '../agronomy/interpret.js';
import type { Plan } from '../agronomy/plan.js';
import { TEXTURES, type Placement, type Tables } from '../agronomy/tables.js';
import type { Analyte, PMethod } from '../types.js';
import type { RegionJudge } from '../zones/regions.js';

/** A zone (or class) as the rate engine sees it. */
export interface ZoneProfile {
  soil: SoilValues;
  /** the full decision (economics notes included), made on first read */
  readonly decision: Decision;
  /** product rate in the plan's unit per "product|placement" (absent = 0) */
  rates: Map<string, number>;
  /** lowest and highest rate when each soil value moves by its surface's leave-one-out RMSE (one at a time) */
  lo: Map<string, number>;
  hi: Map<string, number>;
}

/** The product whose rate keeps two neighbouring zones apart. */
export interface ApartReason {
  product: string;
  placement: Placement;
  /** the two zones' rates (plan units), their difference and the minimum difference */
  a: number;
  b: number;
  diff: number;
  min: number;
  /** the range the soil maps' error moves the firmer zone's rate over (its own rate when no error moves it) */
  range: [number, number];
}

export interface RateJudgeOptions {
  plan: Plan;
  tables: Tables;
  /** products whose rates count (the zone set's) */
  products: string[];
  /** per-cell layers: one per analyte (in `analytes` order), then one share layer per texture when `textures` */
  layers: ArrayLike<number>[];
  analytes: Analyte[];
  textures: boolean;
  /** leave-one-out RMSE per analyte (canonical units); missing = no error carried */
  rmse: Partial<Record<Analyte, number>>;
  pMethod: PMethod | null;
}

/** A rate judge with the minimum differences it settled on (fixed at its first `prepare`). */
export type RateJudge = RegionJudge<ZoneProfile, ApartReason> & { minDifference: Map<string, number> };

const key = (product: string, placement: Placement) => `${product}|${placement}`;

/**
 * The judge that makeZones merges classes and zones with. Minimum difference per product and placement:
 * plan `zoning.min_rate_difference` (a number, or per product), or auto = the larger of the product's step
 * and `min_rate_difference_pct` (default 10 %) of its area-weighted field mean rate.
 * @example const j = rateJudge({ plan, tables, products: ['urea'], analytes: ['no3_n'], textures: false, rmse: { no3_n: 6.8 }, pMethod: 'olsen' });
 */
export function rateJudge(o: RateJudgeOptions): RateJudge {
  const minDifference = new Map<string, number>();
  // zones and their error-moved soil values ask the same product problems again and again
  const solve = memoSolver();
  const judge: RateJudge = {
    layers: o.layers,
    minDifference,
    profile: (means) => zoneProfile(means, o, solve),
    prepare(profiles, areas) {
      if (minDifference.size > 0) return;
      const total = areas.reduce((s, a) => s + a, 0);
      const keys = new Set(profiles.flatMap((p) => [...p.rates.keys()]));
      for (const k of keys) {
        const product = k.split('|')[0];
        const mean =
          total > 0 ? profiles.reduce((s, p, i) => s + (p.rates.get(k) ?? 0) * areas[i], 0) / total : 0;
        minDifference.set(k, minRateDifference(o.plan, product, mean));
      }
    },
    compare: (a, b) => compareProfiles(a, b, minDifference, o.plan),
  };
  return judge;
}

/** Mean layer values -> soil values: analytes in order, then the texture with the largest share. */
function soilOf(means: Float64Array, o: RateJudgeOptions): SoilValues {
  const soil: SoilValues = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN, pMethod: o.pMethod };
  o.analytes.forEach((a, l) => {
    (soil as unknown as Record<string, number>)[a] = means[l];
  });
  if (o.textures) {
    let best = -1,
      bw = 0;
    TEXTURES.forEach((_, t) => {
      const w = means[o.analytes.length + t];
      if (w > bw) {
        bw = w;
        best = t;
      }
    });
    soil.texture = best >= 0 ? TEXTURES[best] : null;
  }
  return soil;
}

/** The counted products' rates of a decision, by "product|placement". */
function ratesOf(d: Decision, products: string[]): Map<string, number> {
  const m = new Map<string, number>();
  for (const p of d.placements)
    for (const q of p.products)
      if (products.includes(q.product)) m.set(key(q.product, p.placement), q.rate.value);
  return m;
}

/** A zone's decision, and its rates' range when each soil value moves by its leave-one-out RMSE. */
function zoneProfile(means: Float64Array, o: RateJudgeOptions, solve: ProductSolver): ZoneProfile {
  const soil = soilOf(means, o);
  // Merging judges many zones that never reach the output: their rates need no economics notes (two more
  // solves each), so the full decision is made only when a caller reads it.
  const rates = ratesOf(decide(soil, o.plan, o.tables, { solve, economics: false }), o.products);
  let decision: Decision | undefined;
  const lo = new Map(rates),
    hi = new Map(rates);
  for (const a of o.analytes) {
    const e = o.rmse[a],
      v = (soil as unknown as Record<string, number>)[a];
    if (!(e! > 0) || !Number.isFinite(v)) continue;
    for (const moved of [v - e!, v + e!]) {
      const r = ratesOf(
        decide({ ...soil, [a]: Math.max(0, moved) }, o.plan, o.tables, { solve, economics: false }),
        o.products,
      );
      for (const k of new Set([...rates.keys(), ...r.keys()])) {
        const x = r.get(k) ?? 0;
        lo.set(k, Math.min(lo.get(k) ?? 0, x));
        hi.set(k, Math.max(hi.get(k) ?? 0, x));
      }
    }
  }
  return {
    soil,
    get decision() {
      return (decision ??= decide(soil, o.plan, o.tables, { solve }));
    },
    rates,
    lo,
    hi,
  };
}

/** Two zones stay apart when a rate differs by the minimum and lies outside the other's error range. */
function compareProfiles(a: ZoneProfile, b: ZoneProfile, minDifference: Map<string, number>, plan: Plan) {
  let why: ApartReason | null = null,
    score = 0,
    best = -1;
  for (const k of new Set([...a.rates.keys(), ...b.rates.keys()])) {
    const ra = a.rates.get(k) ?? 0,
      rb = b.rates.get(k) ?? 0,
      diff = Math.abs(ra - rb);
    const min = minDifference.get(k) ?? minRateDifference(plan, k.split('|')[0], 0);
    const ratio = min > 0 ? diff / min : diff > 0 ? Infinity : 0;
    score = Math.max(score, ratio);
    const outA = rb < (a.lo.get(k) ?? 0) || rb > (a.hi.get(k) ?? 0),
      outB = ra < (b.lo.get(k) ?? 0) || ra > (b.hi.get(k) ?? 0);
    if (diff > 0 && diff >= min && (outA || outB) && ratio > best) {
      best = ratio;
      const firm = outA ? a : b;
      const [product, placement] = k.split('|') as [string, Placement];
      why = {
        product,
        placement,
        a: ra,
        b: rb,
        diff,
        min,
        range: [firm.lo.get(k) ?? 0, firm.hi.get(k) ?? 0],
      };
    }
  }
  return { apart: why !== null, score, why };
}

/**
 * The minimum rate difference for a product: plan `zoning.min_rate_difference` when it is a number (or
 * names the product), else the larger of the product's step and `min_rate_difference_pct` of `fieldMean`.
 * @example minRateDifference(plan, 'urea', 210) // max(1, 21) = 21 with the defaults
 */
export function minRateDifference(plan: Plan, product: string, fieldMean: number): number {
  const set = plan.zoning.min_rate_difference;
  if (typeof set === 'number') return set;
  if (typeof set === 'object' && set[product] !== undefined) return set[product];
  const step = plan.products.find((p) => p.product === product)?.step ?? 0;
  return Math.max(step, (plan.zoning.min_rate_difference_pct / 100) * Math.abs(fieldMean));
}
