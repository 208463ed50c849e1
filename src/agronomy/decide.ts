/**
 * decide: one location's soil values + plan + tables -> the full decision (interpretation, targets,
 * seed-row limits, products per placement, binding limits, expected return, warnings).
 * Pure and cheap: the zone stage calls it per zone; property tests call it thousands of times.
 * The decision's shape is in decision.ts, the limits it reached in binding.ts, its notes in decisionNotes.ts.
 */
import { UserError, type Warning } from '../errors.js';
import type { Texture } from '../types.js';
import type { RateUnit } from '../units/index.js';
import { bindingLimits, diagnose, seedRowTotals } from './binding.js';
import { EPS, rate, zero, type Decision, type NutrientResult, type PlacementResult } from './decision.js';
import { economicsFor, inputWarnings, outcomeWarnings } from './decisionNotes.js';
import { interpret, type SoilValues } from './interpret.js';
import type { Plan } from './plan.js';
import { seedRowLimits, type SeedRowLimits } from './seedrow.js';
import {
  productOptions,
  solveProducts,
  type ProductOption,
  type ProductSolver,
  type SolveResult,
} from './solve.js';
import {
  NUTRIENTS,
  PLACEMENTS,
  type CropTable,
  type Nutrient,
  type Placement,
  type Tables,
} from './tables.js';
import { targets as computeTargets, type Targets } from './targets.js';

/** lb P2O5 the seed row takes as a starter: the most a seed-row phosphate product delivers in whole steps within the limits. */
function starterP2o5(opts: readonly ProductOption[], lim: SeedRowLimits): number {
  let best = 0;
  for (const o of opts) {
    if (o.placement !== 'seed_row' || !(o.frac.p2o5 > 0)) continue;
    let lb = Math.min(lim.p2o5, lim.p2o5K2o) / o.frac.p2o5;
    if (o.nCounts && o.frac.n > 0) lb = Math.min(lb, lim.n / o.frac.n);
    if (o.frac.n > 0 && Number.isFinite(lim.nK2o)) lb = Math.min(lb, lim.nK2o / o.frac.n);
    lb = Math.min(lb, o.maxLb);
    if (o.stepLb > 0) lb = Math.floor(lb / o.stepLb + 1e-9) * o.stepLb;
    if (lb < o.minLb - 1e-9) lb = 0;
    best = Math.max(best, lb * o.frac.p2o5);
  }
  return best;
}

/**
 * Canola and peas: potash with the seed only when nothing else goes there. With a P need and a seed-row phosphate
 * option, phosphate has the row (potash limit 0); otherwise, with a K need, the row holds potash alone.
 */
function potashAlone(
  opts: ProductOption[],
  lim: SeedRowLimits,
  need: Record<Nutrient, number>,
): ProductOption[] {
  if (!lim.kAlone) return opts;
  const seedP = opts.some((o) => o.placement === 'seed_row' && o.frac.p2o5 > 0);
  if ((need.p2o5 > 0 && seedP) || !(need.k2o > 0)) {
    lim.k2o = 0;
    lim.kSource +=
      '; phosphate has the seed row, and potash goes with the seed only when nothing else is there';
    return opts;
  }
  lim.kSource += '; potash alone in the seed row';
  return opts.filter(
    (o) => o.placement !== 'seed_row' || (o.frac.k2o > 0 && o.frac.n + o.frac.p2o5 + o.frac.s === 0),
  );
}

function collectPlacements(opts: readonly ProductOption[], res: SolveResult, unit: RateUnit) {
  const supplied = zero();
  const effective = zero();
  const byPlacement = new Map<Placement, PlacementResult>();
  opts.forEach((o, i) => {
    const lb = res.rates[i]!;
    if (!(lb > EPS)) return;
    const nut = zero();
    for (const n of NUTRIENTS) {
      nut[n] = lb * o.frac[n];
      supplied[n] += nut[n];
      effective[n] += nut[n] * o.eff[n];
    }
    let pr = byPlacement.get(o.placement);
    if (!pr) byPlacement.set(o.placement, (pr = { placement: o.placement, products: [], nutrients: zero() }));
    for (const n of NUTRIENTS) pr.nutrients[n] += nut[n];
    const r = rate(lb, unit);
    if (o.stepLb > 0) r.value = res.steps[i]! * o.step; // an exact multiple of the machine step
    pr.products.push({
      product: o.product,
      label: o.label,
      rate: r,
      nutrients: nut,
      costPerAc: lb * o.pricePerLb,
    });
  });
  return {
    supplied,
    effective,
    placements: PLACEMENTS.filter((p) => byPlacement.has(p)).map((p) => byPlacement.get(p)!),
  };
}

/**
 * Decides rates for one location.
 * @param soil soil values in canonical units (NaN = not tested)
 * @param plan a validated plan (`parsePlan`)
 * @param tables the tables in force (`loadTables`)
 * @param how `solve`: the product solver (default {@link solveProducts}; a {@link memoSolver} when many locations
 *   share their problems); `economics: false` leaves `economics` empty (default true: it costs two more solves
 *   when P and K are both needed, and only notes read it, never the rates)
 * @returns the decision; `status: 'infeasible'` when the targets cannot be met within the limits, with reasons
 * @throws UserError when the plan names an unknown crop, or a seed-row or N-efficiency table value is missing and the plan says `ask`
 * @example
 * const d = decide({ no3_n: 25, p: 8, k: 140, so4_s: 12, om: 4 }, parsePlan(text, 'plan.yaml'), defaultTables());
 * d.placements[0].products[0].rate.lbac
 */
export function decide(
  soil: SoilValues,
  plan: Plan,
  tables: Tables,
  how: { solve?: ProductSolver; economics?: boolean } = {},
): Decision {
  const solve = how.solve ?? solveProducts;
  const crop = cropOf(plan, tables);
  const warnings: Warning[] = [];
  const texture: Texture = soil.texture ?? plan.implement.default_texture;
  const it = interpret(soil, crop, plan, tables);
  const lim = seedRowLimits(crop, plan.crop, texture, plan, tables);
  inputWarnings(lim, it, tables, warnings);
  let opts = productOptions(plan, tables);
  const tg: Targets = computeTargets(it, crop, plan, tables, warnings, starterP2o5(opts, lim));
  const tol = plan.strategy.tolerance_pct / 100;
  const need = zero();
  for (const n of NUTRIENTS) need[n] = tg[n].lbac;
  opts = potashAlone(opts, lim, need);
  const res = solve(opts, need, tol, lim);

  const unit = plan.units;
  const feasible = res.status === 'optimal';
  const { supplied, effective, placements } = feasible
    ? collectPlacements(opts, res, unit)
    : { supplied: zero(), effective: zero(), placements: [] };
  const nutrients = {} as Record<Nutrient, NutrientResult>;
  for (const n of NUTRIENTS)
    nutrients[n] = {
      target: rate(tg[n].lbac, unit),
      strategy: tg[n].strategy,
      detail: tg[n].detail,
      supplied: rate(supplied[n], unit),
      effective: effective[n],
    };
  const binding = feasible ? bindingLimits(opts, res, lim, unit) : [];
  if (feasible && binding.length === 0)
    binding.push('none: every target met at least cost without reaching a limit');
  const economics =
    feasible && how.economics !== false
      ? economicsFor({ opts, need, tol, lim, res, it, plan, tables, solve })
      : [];
  outcomeWarnings({ feasible, crop, opts, lim, tg, need, tol, placements, supplied, effective }, warnings);
  return {
    status: feasible ? 'ok' : 'infeasible',
    crop: plan.crop,
    targetYieldBu: plan.target_yield_bu,
    texture,
    interpretation: it,
    nutrients,
    seedRow: { ...lim, applied: feasible ? seedRowTotals(opts, res.rates) : { ...zero(), nCounted: 0 } },
    placements,
    costPerAc: feasible ? res.cost : NaN,
    binding,
    infeasible: feasible ? [] : infeasibleReasons(res, opts, need, tol, lim, plan, tables, solve),
    economics,
    warnings,
  };
}

function cropOf(plan: Plan, tables: Tables): CropTable {
  const crop = tables.crops[plan.crop];
  if (!crop)
    throw new UserError(
      `plan key "crop" is "${plan.crop}"; allowed: ${Object.keys(tables.crops).join(', ')}.`,
      { field: 'crop', value: plan.crop },
    );
  return crop;
}

function infeasibleReasons(
  res: SolveResult,
  opts: readonly ProductOption[],
  need: Record<Nutrient, number>,
  tol: number,
  lim: SeedRowLimits,
  plan: Plan,
  tables: Tables,
  solve: ProductSolver,
): Decision['infeasible'] {
  if (res.status === 'error')
    return [
      {
        nutrient: null,
        reason: `the solver stopped without an answer (${res.solver}); this is a bug, please report it with the plan and soil values`,
      },
    ];
  return diagnose(opts, need, tol, lim, plan, tables, solve);
}
