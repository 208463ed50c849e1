/**
 * Which limits a solved location reached (seed-row limits, machine minimum and maximum), and, when the targets
 * cannot be met, which nutrient could not and why. Wording for the decision's `binding` and `infeasible` lists.
 */
import { lbacToKgha, type RateUnit } from '../units/index.js';
import { NUTRIENT_NAME, PLACEMENT_NAME } from '../vocabulary.js';
import { EPS, r1, zero } from './decision.js';
import type { Plan } from './plan.js';
import type { SeedRowLimits } from './seedrow.js';
import { solveProducts, type ProductOption, type ProductSolver, type SolveResult } from './solve.js';
import { NUTRIENTS, type Nutrient, type Tables } from './tables.js';

/** Nutrients placed with the seed, lb/ac; `nCounted` is the N that counts against the urea-N limit. */
export function seedRowTotals(opts: readonly ProductOption[], rates: Float64Array) {
  const t = { ...zero(), nCounted: 0 };
  opts.forEach((o, i) => {
    if (o.placement !== 'seed_row') return;
    for (const n of NUTRIENTS) t[n] += rates[i]! * o.frac[n];
    if (o.nCounts) t.nCounted += rates[i]! * o.frac.n;
  });
  return t;
}

/** The limits at their bound in a solved location, e.g. "seed-row P2O5 limit 22.5 lb/ac (as MAP)". */
export function bindingLimits(
  opts: readonly ProductOption[],
  res: SolveResult,
  lim: SeedRowLimits,
  unit: RateUnit,
): string[] {
  const out: string[] = [];
  const hasSeedRow = opts.some((o) => o.placement === 'seed_row');
  if (hasSeedRow) {
    const sr = seedRowTotals(opts, res.rates);
    const u =
      unit === 'kg/ha' ? (v: number) => `${r1(lbacToKgha(v))} kg/ha` : (v: number) => `${r1(v)} lb/ac`;
    if (
      sr.nCounted >= lim.n - EPS &&
      opts.some((o) => o.placement === 'seed_row' && o.nCounts && o.frac.n > 0)
    )
      out.push(`seed-row urea-type N limit ${u(lim.n)} (${lim.texture} soil, SBU ${r1(lim.sbu)} %)`);
    if (Number.isFinite(lim.nK2o) && sr.n + sr.k2o >= lim.nK2o - EPS)
      out.push(`seed-row N + K2O limit ${u(lim.nK2o)}`);
    const pStep = Math.max(
      0,
      ...opts.filter((o) => o.placement === 'seed_row' && o.frac.p2o5 > 0).map((o) => o.stepLb * o.frac.p2o5),
    );
    if (sr.p2o5 >= lim.p2o5 - EPS && opts.some((o) => o.placement === 'seed_row' && o.frac.p2o5 > 0))
      out.push(`seed-row P2O5 limit ${u(lim.p2o5)} (as MAP)`);
    else if (sr.p2o5 > EPS && sr.p2o5 + pStep > Math.min(lim.p2o5, lim.p2o5K2o) + EPS)
      out.push(`seed-row P2O5 limit ${u(lim.p2o5)} (as MAP; ${u(sr.p2o5)} in whole machine steps)`);
    else if (
      sr.p2o5 + sr.k2o >= lim.p2o5K2o - EPS &&
      opts.some((o) => o.placement === 'seed_row' && o.frac.p2o5 + o.frac.k2o > 0)
    )
      out.push(`seed-row P2O5 + K2O limit ${u(lim.p2o5K2o)}`);
    if (
      sr.k2o >= lim.k2o - EPS &&
      sr.k2o > EPS &&
      opts.some((o) => o.placement === 'seed_row' && o.frac.k2o > 0)
    )
      out.push(`seed-row K2O limit ${u(lim.k2o)}`);
  }
  opts.forEach((o, i) => {
    if (res.rates[i]! > 0 && res.rates[i]! >= o.maxLb - EPS)
      out.push(`machine maximum for ${o.label} in the ${PLACEMENT_NAME[o.placement]} (${o.max} ${unit})`);
    if (o.minLb > 0 && res.rates[i]! > 0 && res.rates[i]! <= o.minLb + EPS)
      out.push(`machine minimum for ${o.label} in the ${PLACEMENT_NAME[o.placement]} (${o.min} ${unit})`);
  });
  return out;
}

/** Why the targets cannot be met: per nutrient that no allowed product delivers within the limits. */
export function diagnose(
  opts: readonly ProductOption[],
  need: Record<Nutrient, number>,
  tol: number,
  lim: SeedRowLimits,
  plan: Plan,
  tables: Tables,
  solve: ProductSolver = solveProducts,
): { nutrient: Nutrient | null; reason: string }[] {
  const out: { nutrient: Nutrient | null; reason: string }[] = [];
  for (const n of NUTRIENTS) {
    if (!(need[n] > 0)) continue;
    const carriers = opts.filter((o) => o.frac[n] > 0);
    const name = NUTRIENT_NAME[n];
    if (carriers.length === 0) {
      const inPlan = plan.products
        .filter((c) => (tables.products[c.product]?.[n] ?? 0) > 0)
        .map((c) => c.product);
      out.push({
        nutrient: n,
        reason: inPlan.length
          ? `no product that carries ${name} (${inPlan.join(', ')}) is allowed in any of the implement's placements (${plan.implement.placements.join(', ')}). Fix: allow one of those products in a placement the implement has.`
          : `no product in the plan carries ${name}. Fix: add one (e.g. ${Object.entries(tables.products)
              .filter(([, t]) => t[n] > 0)
              .map(([k]) => k)
              .join(', ')}).`,
      });
      continue;
    }
    const best = solve(opts, zero(), 0, lim, n);
    let most = 0;
    opts.forEach((o, i) => (most += best.rates[i]! * o.frac[n] * o.eff[n]));
    if (most < need[n] * (1 - tol) - EPS) {
      const places = [...new Set(carriers.map((o) => o.placement))];
      const why = bindingLimits(opts, best, lim, plan.units);
      out.push({
        nutrient: n,
        reason:
          `at most ${r1(most)} lb ${name}/ac can be delivered, short of the target ${r1(need[n])} less the ${r1(tol * 100)} % tolerance: products carrying ${name} are allowed only in ${places.map((p) => PLACEMENT_NAME[p]).join(', ')}` +
          (why.length ? `, where ${why.join(' and ')} bind${why.length > 1 ? '' : 's'}` : '') +
          (places.length === 1 && places[0] === 'seed_row'
            ? `. No product that carries ${name} is allowed outside the seed row. Fix: allow a band or broadcast placement for one of them.`
            : '. Fix: raise the machine maximum or allow another placement.'),
      });
    }
  }
  if (out.length === 0)
    out.push({
      nutrient: null,
      reason:
        'each target can be met alone, but not all together within the seed-row and machine limits. Fix: allow more placements or products, or lower a target.',
    });
  return out;
}
