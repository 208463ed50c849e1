/**
 * The decision's notes: expected return of P and K, and its warnings: seed-row table notes and the Kelowna
 * factor (before solving); targets left short, phosphate kept out of the seed row, ammonium sulphate with canola
 * seed and N above its target (after).
 */
import type { Warning } from '../errors.js';
import { NUTRIENT_NAME } from '../vocabulary.js';
import { EPS, r1, type Economics, type PlacementResult } from './decision.js';
import { pClassTable, type Interpretation } from './interpret.js';
import type { Plan } from './plan.js';
import type { SeedRowLimits } from './seedrow.js';
import type { ProductOption, ProductSolver, SolveResult } from './solve.js';
import { NUTRIENTS, type CropTable, type Nutrient, type Tables } from './tables.js';
import type { Targets } from './targets.js';

interface EconomicsInput {
  opts: readonly ProductOption[];
  need: Record<Nutrient, number>;
  tol: number;
  lim: SeedRowLimits;
  res: SolveResult;
  it: Interpretation;
  plan: Plan;
  tables: Tables;
  /** the product solver (solveProducts, or a memoSolver) */
  solve: ProductSolver;
}

/** P and K: the chance of a response x the yield gain x the crop price, less what meeting the target costs. */
export function economicsFor(e: EconomicsInput): Economics[] {
  const { opts, need, tol, lim, res, it, plan, tables, solve } = e;
  const out: Economics[] = [];
  for (const n of ['p2o5', 'k2o'] as const) {
    if (!(need[n] > 0)) continue;
    const without = solve(opts, { ...need, [n]: 0 }, tol, lim);
    const extra = without.status === 'optimal' ? Math.max(0, res.cost - without.cost) : NaN;
    const prob = n === 'p2o5' ? it.p.responseProbability : it.k.responseProbability;
    const cls = n === 'p2o5' ? it.p.className : it.k.className;
    const gainPct = cls
      ? ((n === 'p2o5' ? tables.yield_gain_pct.p[cls] : tables.yield_gain_pct.k[cls])?.value ?? NaN)
      : NaN;
    const gainBu = (gainPct / 100) * plan.target_yield_bu;
    const ev = prob * gainBu * plan.crop_price_per_bu;
    let note = `estimate: ${r1(prob * 100)} % chance x ${r1(gainBu)} bu/ac gain (yield_gain_pct table, an estimate) x $${plan.crop_price_per_bu}/bu - $${r1(extra)}/ac it adds to the product cost${plan.crop_price_per_bu === 0 ? ' (crop_price_per_bu is 0 in the plan)' : ''}`;
    if (n === 'p2o5' && ev - extra < 0) {
      const crop = tables.crops[plan.crop]!;
      const removal = crop.removal_per_bu.p2o5.value * plan.target_yield_bu;
      const perPpm = plan.strategy.p.p2o5_per_ppm ?? tables.soil.p2o5_per_ppm.value;
      note += `. The one-year return is negative: applying P here is a soil-balance choice; skipping it draws the soil down by about ${r1(removal)} lb P2O5/ac (about ${r1(removal / perPpm)} ppm Olsen at ${perPpm} lb P2O5/ppm) a year`;
    }
    out.push({
      nutrient: n,
      responseProbability: prob,
      yieldGainBu: gainBu,
      expectedValue: ev,
      cost: extra,
      expectedNet: ev - extra,
      note,
    });
  }
  return out;
}

function shortWarnings(
  tg: Targets,
  effective: Record<Nutrient, number>,
  tol: number,
  warnings: Warning[],
): void {
  for (const n of NUTRIENTS) {
    const t = tg[n].lbac;
    if (!(t > 0)) continue;
    if (effective[n] <= EPS)
      warnings.push({
        code: 'target-rounded-to-zero',
        message: `${NUTRIENT_NAME[n]} target ${r1(t)} lb/ac rounded to 0: no product rate worth metering delivers it within the ${r1(tol * 100)} % tolerance`,
        field: n,
      });
    else if (effective[n] < t - 0.05)
      warnings.push({
        code: 'target-short',
        message: `${NUTRIENT_NAME[n]} target ${r1(t)} lb/ac left short at ${r1(effective[n])} (within the ${r1(tol * 100)} % tolerance) rather than add a product below its minimum rate or a step over`,
        field: n,
      });
  }
}

/** Say why a P need got no phosphate with the seed although the plan allows it there. */
function noSeedPWarning(
  opts: readonly ProductOption[],
  lim: SeedRowLimits,
  need: Record<Nutrient, number>,
  placements: readonly PlacementResult[],
  warnings: Warning[],
): void {
  const seedP = opts.filter((o) => o.placement === 'seed_row' && o.frac.p2o5 > 0);
  if (
    !(need.p2o5 > 0) ||
    seedP.length === 0 ||
    placements.some((p) => p.placement === 'seed_row' && p.nutrients.p2o5 > EPS)
  )
    return;
  const room = Math.min(lim.p2o5, lim.p2o5K2o);
  const least = Math.min(...seedP.map((o) => Math.max(o.minLb, o.stepLb) * o.frac.p2o5));
  const why =
    room < least - EPS
      ? `the seed-row P2O5 limit ${r1(room)} lb/ac (${lim.pSource.split(';').slice(-1)[0]!.trim()}) is below the ${r1(least)} lb P2O5 that ${seedP[0]!.label} carries at its minimum rate; lower that product's min_rate for the seed row (a separate product entry) if your meter can, or check the drill settings`
      : 'the potash need could not be met outside the seed row within the machine limits';
  warnings.push({ code: 'no-seed-p', message: `no phosphate with the seed: ${why}`, field: 'seed_row' });
}

/** Warnings known before solving: seed-row table notes, and the factor that scales P classes for Kelowna. */
export function inputWarnings(
  lim: SeedRowLimits,
  it: Interpretation,
  tables: Tables,
  warnings: Warning[],
): void {
  for (const note of lim.notes)
    warnings.push({
      code: note.startsWith('seed-row N ') ? 'seed-row-override-high' : 'seed-row-table-missing',
      message: note,
      field: 'seed_row',
    });
  if (it.p.kelownaFactor !== null) {
    const b = pClassTable('kelowna', tables, it.p.kelownaFactor)
      .filter((c) => c.below_ppm !== null)
      .map((c) => `${c.name} < ${c.below_ppm}`)
      .join(', ');
    warnings.push({
      code: 'kelowna-factor',
      message: `P classes for modified Kelowna: Olsen bounds x ${it.p.kelownaFactor} (plan key soil_test.kelowna_factor), published Kelowna bounds kept: ${b} ppm`,
      field: 'p',
    });
  }
}

interface Outcome {
  feasible: boolean;
  crop: CropTable;
  opts: readonly ProductOption[];
  lim: SeedRowLimits;
  tg: Targets;
  need: Record<Nutrient, number>;
  tol: number;
  placements: readonly PlacementResult[];
  supplied: Record<Nutrient, number>;
  effective: Record<Nutrient, number>;
}

/** Warnings about the solved rates, in this order: short targets, no seed-row P, AS with canola seed, N above target. */
export function outcomeWarnings(o: Outcome, warnings: Warning[]): void {
  const { feasible, crop, opts, lim, tg, need, tol, placements, supplied, effective } = o;
  if (feasible) shortWarnings(tg, effective, tol, warnings);
  if (feasible) noSeedPWarning(opts, lim, need, placements, warnings);
  if (
    crop.seed_row_group === 'canola' &&
    placements.some(
      (p) => p.placement === 'seed_row' && p.products.some((q) => q.product === 'ammonium_sulphate'),
    )
  ) {
    warnings.push({
      code: 'as-with-canola-seed',
      message:
        'ammonium sulphate with canola seed further thins stands ([published] Canola Watch 2020); consider moving it out of the seed row',
      field: 'products',
    });
  }
  if (feasible && supplied.n > tg.n.lbac + 1) {
    warnings.push({
      code: 'n-above-target',
      message: `N applied (${r1(supplied.n)} lb/ac) is above the N target (${r1(tg.n.lbac)}): it comes with the P or S products`,
      field: 'n',
    });
  }
}
