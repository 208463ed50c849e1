/**
 * decide: one location's soil values + plan + tables -> the full decision (interpretation, targets,
 * seed-row limits, products per placement, binding limits, expected return, warnings).
 * Pure and cheap: the zone stage calls it per zone; property tests call it thousands of times.
 */
import { UserError, type Warning } from '../errors.js';
import type { Texture } from '../types.js';
import { lbacToKgha, type RateUnit } from '../units/index.js';
import { interpret, pClassTable, type Interpretation, type SoilValues } from './interpret.js';
import type { Plan } from './plan.js';
import { seedRowLimits, type SeedRowLimits } from './seedrow.js';
import { productOptions, solveProducts, type ProductOption, type SolveResult } from './solve.js';
import { NUTRIENTS, PLACEMENTS, type Nutrient, type Placement, type Tables } from './tables.js';
import { targets as computeTargets, type Targets } from './targets.js';

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

const NUTRIENT_NAME: Record<Nutrient, string> = { n: 'N', p2o5: 'P2O5', k2o: 'K2O', s: 'S' };
const EPS = 1e-6;
const r1 = (v: number) => Math.round(v * 10) / 10;

function rate(lbac: number, unit: RateUnit): Rate {
  const kgha = lbacToKgha(lbac);
  return { lbac, kgha, value: unit === 'kg/ha' ? kgha : lbac, unit };
}

function zero(): Record<Nutrient, number> {
  return { n: 0, p2o5: 0, k2o: 0, s: 0 };
}

function seedRowTotals(opts: readonly ProductOption[], rates: Float64Array) {
  const t = { ...zero(), nCounted: 0 };
  opts.forEach((o, i) => {
    if (o.placement !== 'seed_row') return;
    for (const n of NUTRIENTS) t[n] += rates[i]! * o.frac[n];
    if (o.nCounts) t.nCounted += rates[i]! * o.frac.n;
  });
  return t;
}

function bindingLimits(
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
      out.push(`machine maximum for ${o.label} in the ${o.placement.replace(/_/g, ' ')} (${o.max} ${unit})`);
    if (o.minLb > 0 && res.rates[i]! > 0 && res.rates[i]! <= o.minLb + EPS)
      out.push(`machine minimum for ${o.label} in the ${o.placement.replace(/_/g, ' ')} (${o.min} ${unit})`);
  });
  return out;
}

function diagnose(
  opts: readonly ProductOption[],
  need: Record<Nutrient, number>,
  tol: number,
  lim: SeedRowLimits,
  plan: Plan,
  tables: Tables,
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
    const best = solveProducts(opts, zero(), 0, lim, n);
    let most = 0;
    opts.forEach((o, i) => (most += best.rates[i]! * o.frac[n] * o.eff[n]));
    if (most < need[n] * (1 - tol) - EPS) {
      const places = [...new Set(carriers.map((o) => o.placement))];
      const why = bindingLimits(opts, best, lim, plan.units);
      out.push({
        nutrient: n,
        reason:
          `at most ${r1(most)} lb ${name}/ac can be delivered, short of the target ${r1(need[n])} less the ${r1(tol * 100)} % tolerance: products carrying ${name} are allowed only in ${places.map((p) => p.replace(/_/g, ' ')).join(', ')}` +
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

interface EconomicsInput {
  opts: readonly ProductOption[];
  need: Record<Nutrient, number>;
  tol: number;
  lim: SeedRowLimits;
  res: SolveResult;
  it: Interpretation;
  plan: Plan;
  tables: Tables;
}

function economicsFor(e: EconomicsInput): Economics[] {
  const { opts, need, tol, lim, res, it, plan, tables } = e;
  const out: Economics[] = [];
  for (const n of ['p2o5', 'k2o'] as const) {
    if (!(need[n] > 0)) continue;
    const without = solveProducts(opts, { ...need, [n]: 0 }, tol, lim);
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

/**
 * Decides rates for one location.
 * @param soil soil values in canonical units (NaN = not tested)
 * @param plan a validated plan (`parsePlan`)
 * @param tables the tables in force (`loadTables`)
 * @returns the decision; `status: 'infeasible'` when the targets cannot be met within the limits, with reasons
 * @throws UserError when the plan names an unknown crop, or a seed-row or N-efficiency table value is missing and the plan says `ask`
 * @example
 * const d = decide({ no3_n: 25, p: 8, k: 140, so4_s: 12, om: 4 }, parsePlan(text, 'plan.yaml'), defaultTables());
 * d.placements[0].products[0].rate.lbac
 */
export function decide(soil: SoilValues, plan: Plan, tables: Tables): Decision {
  const crop = tables.crops[plan.crop];
  if (!crop)
    throw new UserError(
      `plan key "crop" is "${plan.crop}"; allowed: ${Object.keys(tables.crops).join(', ')}.`,
      { field: 'crop', value: plan.crop },
    );
  const warnings: Warning[] = [];
  const texture: Texture = soil.texture ?? plan.implement.default_texture;
  const it = interpret(soil, crop, plan, tables);
  const lim = seedRowLimits(crop, plan.crop, texture, plan, tables);
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
  let opts = productOptions(plan, tables);
  const tg: Targets = computeTargets(it, crop, plan, tables, warnings, starterP2o5(opts, lim));
  const tol = plan.strategy.tolerance_pct / 100;
  const need = zero();
  for (const n of NUTRIENTS) need[n] = tg[n].lbac;
  opts = potashAlone(opts, lim, need);
  const res = solveProducts(opts, need, tol, lim);

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
  const economics = feasible ? economicsFor({ opts, need, tol, lim, res, it, plan, tables }) : [];
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
    infeasible: feasible
      ? []
      : res.status === 'error'
        ? [
            {
              nutrient: null,
              reason: `the solver stopped without an answer (${res.solver}); this is a bug, please report it with the plan and soil values`,
            },
          ]
        : diagnose(opts, need, tol, lim, plan, tables),
    economics,
    warnings,
  };
}
