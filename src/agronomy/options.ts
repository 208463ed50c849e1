/**
 * The decision variables of the product solve: each product the plan allows in each placement the product table
 * and the implement allow, with its analysis, placement efficiencies (N by the relative-efficiency table), price
 * and machine limits in lb/ac.
 */
import { UserError } from '../errors.js';
import { kghaToLbac, KG_PER_LB } from '../units/index.js';
import type { Plan } from './plan.js';
import { PLACEMENTS, type Nutrient, type Placement, type Tables } from './tables.js';

/** One decision variable: a product in a placement. */
export interface ProductOption {
  /** "map@seed_row" */
  key: string;
  product: string;
  label: string;
  placement: Placement;
  /** mass fraction of each nutrient in the product (0-1) */
  frac: Record<Nutrient, number>;
  /** placement efficiency per nutrient (effective = actual x efficiency); N: relative efficiency / the reference's */
  eff: Record<Nutrient, number>;
  /** in the seed row, this product's N counts against the urea-N table (false: within the P2O5-as-MAP limit) */
  nCounts: boolean;
  /** $ per lb of product */
  pricePerLb: number;
  /** machine limits, lb product/ac (step 0 = any rate) */
  minLb: number;
  maxLb: number;
  stepLb: number;
  /** the same limits in the plan's units, for messages and for exact multiples of the step */
  step: number;
  min: number;
  max: number;
}

const LB_PER_TONNE = 1000 / KG_PER_LB;

/**
 * N efficiency of a placement for the plan's N timing: the relative efficiency (spring broadcast = 100) over the
 * reference's (tables `n_relative_efficiency`). The seed row is always at seeding (spring). When the plan sets
 * `strategy.n.efficiency` the target already carries it and this is 1.
 * @example nEfficiency('broadcast', plan, tables) // 0.83 (spring broadcast 100 / spring band 120)
 */
export function nEfficiency(placement: Placement, plan: Plan, tables: Tables): number {
  if (plan.strategy.n.efficiency !== null) return 1;
  const t = tables.n_relative_efficiency;
  const timing = placement === 'seed_row' ? 'spring' : plan.strategy.n.timing;
  const kind = placement === 'seed_row' ? 'seed_row' : placement === 'broadcast' ? 'broadcast' : 'band';
  const cell = t[timing][kind];
  const ref = t[t.reference.timing][t.reference.placement];
  if ('missing' in ref)
    throw new UserError(
      `tables: the reference N efficiency (n_relative_efficiency.${t.reference.timing}.${t.reference.placement}) is missing. Fix: give it a value or choose another reference.`,
      { field: 'n_relative_efficiency.reference' },
    );
  if ('missing' in cell) {
    throw new UserError(
      `N relative efficiency for ${timing} ${kind} is not in the tables: ${cell.source}. Fix: set the plan key strategy.n.efficiency to the efficiency you and your agronomist confirm, add n_relative_efficiency.${timing}.${kind} to your tables file, or keep N products out of that placement.`,
      { field: 'strategy.n.efficiency' },
    );
  }
  return cell.value / ref.value;
}

/**
 * The product x placement options a plan allows (plan choice ∩ product table ∩ implement), with machine
 * limits converted to lb/ac.
 * @example productOptions(plan, tables).map((o) => o.key) // ['map@seed_row', 'map@side_band', 'urea@side_band', ...]
 */
export function productOptions(plan: Plan, tables: Tables): ProductOption[] {
  const toLb = (v: number) => (plan.units === 'kg/ha' ? kghaToLbac(v) : v);
  const out: ProductOption[] = [];
  for (const ch of plan.products) {
    const t = tables.products[ch.product];
    if (!t) continue;
    const allowed = (ch.placements ?? t.placements).filter(
      (p) => t.placements.includes(p) && plan.implement.placements.includes(p),
    );
    const price = (ch.price_per_tonne ?? t.price_per_tonne) / LB_PER_TONNE;
    for (const pl of PLACEMENTS) {
      if (!allowed.includes(pl)) continue;
      const e = tables.placement_efficiency[pl];
      const en = t.n > 0 ? nEfficiency(pl, plan, tables) : 1;
      out.push({
        key: `${ch.product}@${pl}`,
        product: ch.product,
        label: t.label,
        placement: pl,
        frac: { n: t.n / 100, p2o5: t.p2o5 / 100, k2o: t.k2o / 100, s: t.s / 100 },
        eff: { n: en, p2o5: e.p2o5, k2o: e.k2o, s: e.s },
        nCounts: t.seed_row_n === 'counts',
        pricePerLb: price,
        minLb: toLb(ch.min_rate),
        maxLb: toLb(ch.max_rate),
        stepLb: toLb(ch.step),
        step: ch.step,
        min: ch.min_rate,
        max: ch.max_rate,
      });
    }
  }
  return out;
}
