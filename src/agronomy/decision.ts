/**
 * The decision's shape (what `decide` returns for one location) and the small helpers its steps share:
 * rates held in lb/ac with kg/ha alongside, nutrient records, rounding for messages.
 */
import type { Warning } from '../errors.js';
import type { Texture } from '../types.js';
import { lbacToKgha, type RateUnit } from '../units/index.js';
import type { Interpretation } from './interpret.js';
import type { SeedRowLimits } from './seedrow.js';
import type { Nutrient, Placement } from './tables.js';

/** A rate held in lb/ac, with kg/ha and the plan's unit alongside. */
export interface Rate {
  lbac: number;
  kgha: number;
  /** in the plan's `units` */
  value: number;
  unit: RateUnit;
}

export interface ProductRate {
  product: string;
  label: string;
  /** product rate */
  rate: Rate;
  /** nutrients this product delivers here, lb/ac (actual, before placement efficiency) */
  nutrients: Record<Nutrient, number>;
  costPerAc: number;
}

export interface PlacementResult {
  placement: Placement;
  products: ProductRate[];
  /** total nutrients in this placement, lb/ac */
  nutrients: Record<Nutrient, number>;
}

export interface NutrientResult {
  target: Rate;
  strategy: string;
  detail: string;
  /** actual nutrient applied in all placements */
  supplied: Rate;
  /** supplied x placement efficiency: what is compared with the target */
  effective: number;
}

export interface Economics {
  nutrient: 'p2o5' | 'k2o';
  responseProbability: number;
  /** expected yield gain if the crop responds, bu/ac (an estimate from the yield_gain_pct table) */
  yieldGainBu: number;
  /** probability x gain x crop price, $/ac */
  expectedValue: number;
  /** what meeting this nutrient's target adds to the cost, $/ac (re-solved without it) */
  cost: number;
  /** expected value - cost, $/ac */
  expectedNet: number;
  note: string;
}

export interface Decision {
  status: 'ok' | 'infeasible';
  crop: string;
  targetYieldBu: number;
  texture: Texture;
  interpretation: Interpretation;
  /** per nutrient, lb/ac inside, with kg/ha */
  nutrients: Record<Nutrient, NutrientResult>;
  /** applied: nutrients with the seed, lb/ac; `nCounted` is the N that counts against the urea-N limit `n` (MAP's N within the P limit does not) */
  seedRow: SeedRowLimits & { applied: { n: number; nCounted: number; p2o5: number; k2o: number; s: number } };
  /** only placements that carry product */
  placements: PlacementResult[];
  costPerAc: number;
  /** limits at their bound, e.g. "seed-row P2O5 + K2O limit 20 lb/ac" */
  binding: string[];
  /** for status "infeasible": which nutrient and why */
  infeasible: { nutrient: Nutrient | null; reason: string }[];
  economics: Economics[];
  warnings: Warning[];
}

/** lb/ac below which a rate or a slack counts as zero. */
export const EPS = 1e-6;
/** One decimal, for messages. */
export const r1 = (v: number) => Math.round(v * 10) / 10;

/** A rate held in lb/ac, with kg/ha and the plan's unit. @example rate(100, 'kg/ha').value // 112.085 */
export function rate(lbac: number, unit: RateUnit): Rate {
  const kgha = lbacToKgha(lbac);
  return { lbac, kgha, value: unit === 'kg/ha' ? kgha : lbac, unit };
}

/** A nutrient record of zeros. */
export function zero(): Record<Nutrient, number> {
  return { n: 0, p2o5: 0, k2o: 0, s: 0 };
}
