/**
 * The product solver: one small mixed-integer linear program per location (yalps) over product rate
 * per placement. Meets every nutrient target (within the plan's tolerance), keeps the seed row within
 * its limits and each product within its machine min / max / step, at least cost.
 *
 * Machine step: each rate is an integer count of steps (x = step x k, k integer), so every rate the
 * solver returns is already a multiple of the step and every limit holds exactly; no rounding after
 * the fact can push the seed row over its limit. Machine minimum: a 0/1 "used" variable u with
 * min x u <= x <= max x u (a product is either off or at least its minimum).
 * See docs/method.md, "Product solver", for why we do not round an LP answer instead.
 */
import { solve, type Constraint } from 'yalps';
import { kghaToLbac, KG_PER_LB } from '../units/index.js';
import type { Plan } from './plan.js';
import type { SeedRowLimits } from './seedrow.js';
import { NUTRIENTS, PLACEMENTS, type Nutrient, type Placement, type Tables } from './tables.js';

/** One decision variable: a product in a placement. */
export interface ProductOption {
  /** "map@seed_row" */
  key: string;
  product: string;
  label: string;
  placement: Placement;
  /** mass fraction of each nutrient in the product (0-1) */
  frac: Record<Nutrient, number>;
  /** placement efficiency per nutrient (effective = actual x efficiency) */
  eff: Record<Nutrient, number>;
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

/** The product x placement options a plan allows (plan choice ∩ product table ∩ implement). */
export function productOptions(plan: Plan, tables: Tables): ProductOption[] {
  const toLb = (v: number) => (plan.units === 'kg/ha' ? kghaToLbac(v) : v);
  const out: ProductOption[] = [];
  for (const ch of plan.products) {
    const t = tables.products[ch.product];
    if (!t) continue;
    const allowed = (ch.placements ?? t.placements).filter((p) => t.placements.includes(p) && plan.implement.placements.includes(p));
    const price = (ch.price_per_tonne ?? t.price_per_tonne) / LB_PER_TONNE;
    for (const pl of PLACEMENTS) {
      if (!allowed.includes(pl)) continue;
      const e = tables.placement_efficiency[pl];
      out.push({
        key: `${ch.product}@${pl}`,
        product: ch.product,
        label: t.label,
        placement: pl,
        frac: { n: t.n / 100, p2o5: t.p2o5 / 100, k2o: t.k2o / 100, s: t.s / 100 },
        eff: { n: e.n, p2o5: e.p2o5, k2o: e.k2o, s: e.s },
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

export interface SolveResult {
  status: 'optimal' | 'infeasible' | 'error';
  /** lb product/ac per option (same order as the options) */
  rates: Float64Array;
  /** whole steps per option where the option has a step (rate = steps x step in the plan's units) */
  steps: Float64Array;
  /** $ per acre */
  cost: number;
}

/** Small cost added per lb in later placements so ties go to the seed row first, then the band, then broadcast. */
const PLACEMENT_TIE = 1e-7;

/** Seed-row limits as LP constraint rows (shared with the infeasibility diagnosis). */
function seedRowConstraints(limits: SeedRowLimits): [string, Constraint][] {
  return [
    ['sr:n', { max: limits.n }],
    ['sr:p2o5', { max: limits.p2o5 }],
    ['sr:pk', { max: limits.p2o5K2o }],
    ['sr:k2o', { max: limits.k2o }],
  ];
}

function coefficients(o: ProductOption, unit: number): [string, number][] {
  const c: [string, number][] = [['cost', unit * (o.pricePerLb + PLACEMENT_TIE * PLACEMENTS.indexOf(o.placement))]];
  for (const n of NUTRIENTS) if (o.frac[n] > 0) c.push([`t:${n}`, unit * o.frac[n] * o.eff[n]]);
  if (o.placement === 'seed_row') {
    if (o.frac.n > 0) c.push(['sr:n', unit * o.frac.n]);
    if (o.frac.p2o5 > 0) c.push(['sr:p2o5', unit * o.frac.p2o5]);
    if (o.frac.p2o5 + o.frac.k2o > 0) c.push(['sr:pk', unit * (o.frac.p2o5 + o.frac.k2o)]);
    if (o.frac.k2o > 0) c.push(['sr:k2o', unit * o.frac.k2o]);
  }
  return c;
}

/**
 * Penalty, $ per lb of nutrient short of its target. Far above any product's cost per lb of nutrient, so the
 * solver meets each target in full whenever the limits allow and uses the tolerance only when they do not.
 */
const SHORTFALL_PENALTY = 1000;

/**
 * Solves one location. `target[n]` is the effective lb/ac each nutrient should reach (0 = none); the
 * supply may fall short of it by at most `tolerance` (a fraction), and only where the limits force it.
 * With `maximize`, ignores the costs and targets and finds the most of that nutrient the limits allow.
 */
export function solveProducts(options: readonly ProductOption[], target: Record<Nutrient, number>, tolerance: number, limits: SeedRowLimits, maximize?: Nutrient): SolveResult {
  const constraints: [string, Constraint][] = seedRowConstraints(limits);
  const variables: [string, [string, number][]][] = [];
  if (!maximize) {
    for (const n of NUTRIENTS) {
      if (!(target[n] > 0)) continue;
      constraints.push([`t:${n}`, { min: target[n] }], [`short:${n}`, { max: target[n] * tolerance }]);
      variables.push([`s_${n}`, [[`t:${n}`, 1], [`short:${n}`, 1], ['cost', SHORTFALL_PENALTY]]]);
    }
  }
  const integers: string[] = [];
  const binaries: string[] = [];
  options.forEach((o, i) => {
    const unit = o.stepLb > 0 ? o.stepLb : 1;
    const v = `x${i}`;
    const c = coefficients(o, unit);
    if (o.minLb > 0) {
      c.push([`lo${i}`, unit], [`hi${i}`, unit]);
      constraints.push([`lo${i}`, { min: 0 }], [`hi${i}`, { max: 0 }]);
      variables.push([`u${i}`, [[`lo${i}`, -o.minLb], [`hi${i}`, -o.maxLb]]]);
      binaries.push(`u${i}`);
    } else {
      c.push([`hi${i}`, unit]);
      constraints.push([`hi${i}`, { max: o.maxLb }]);
    }
    variables.push([v, c]);
    if (o.stepLb > 0) integers.push(v);
  });
  const sol = solve(
    {
      direction: maximize ? 'maximize' : 'minimize',
      objective: maximize ? `t:${maximize}` : 'cost',
      constraints,
      variables,
      integers,
      binaries,
    },
    { maxIterations: 4000, tolerance: 1e-6 },
  );
  const rates = new Float64Array(options.length);
  const steps = new Float64Array(options.length);
  if (sol.status !== 'optimal' && !(sol.status === 'timedout' && Number.isFinite(sol.result))) {
    return { status: sol.status === 'infeasible' ? 'infeasible' : 'error', rates, steps, cost: NaN };
  }
  let cost = 0;
  for (const [name, value] of sol.variables) {
    if (name[0] !== 'x') continue;
    const i = Number(name.slice(1));
    const o = options[i]!;
    if (o.stepLb > 0) {
      steps[i] = Math.round(value);
      rates[i] = steps[i] * o.stepLb;
    } else rates[i] = value;
    cost += rates[i] * o.pricePerLb;
  }
  return { status: 'optimal', rates, steps, cost };
}
