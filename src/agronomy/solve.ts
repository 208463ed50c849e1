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
import type { ProductOption } from './options.js';
import type { SeedRowLimits } from './seedrow.js';
import { NUTRIENTS, PLACEMENTS, type Nutrient } from './tables.js';

export { nEfficiency, productOptions, type ProductOption } from './options.js';

export interface SolveResult {
  status: 'optimal' | 'infeasible' | 'error';
  /** lb product/ac per option (same order as the options) */
  rates: Float64Array;
  /** whole steps per option where the option has a step (rate = steps x step in the plan's units) */
  steps: Float64Array;
  /** $ per acre */
  cost: number;
  /** the solver's own status (yalps): optimal, infeasible, timedout, cycled, unbounded */
  solver: string;
  /** lb of nutrient short of the targets, summed over nutrients (within the tolerance) */
  shortfall: number;
}

function shortfallOf(
  options: readonly ProductOption[],
  rates: Float64Array,
  target: Record<Nutrient, number>,
): number {
  let short = 0;
  for (const n of NUTRIENTS) {
    if (!(target[n] > 0)) continue;
    let eff = 0;
    options.forEach((o, i) => (eff += rates[i]! * o.frac[n] * o.eff[n]));
    short += Math.max(0, target[n] - eff);
  }
  return short;
}

/** Small cost added per lb in later placements so ties go to the seed row first, then the band, then broadcast. */
const PLACEMENT_TIE = 1e-7;

/** Seed-row limits as LP constraint rows (shared with the infeasibility diagnosis). */
function seedRowConstraints(limits: SeedRowLimits): [string, Constraint][] {
  const c: [string, Constraint][] = [
    ['sr:n', { max: limits.n }],
    ['sr:p2o5', { max: limits.p2o5 }],
    ['sr:pk', { max: limits.p2o5K2o }],
    ['sr:k2o', { max: limits.k2o }],
  ];
  if (Number.isFinite(limits.nK2o)) c.push(['sr:nk', { max: limits.nK2o }]);
  return c;
}

function coefficients(o: ProductOption, unit: number): [string, number][] {
  const c: [string, number][] = [
    ['cost', unit * (o.pricePerLb + PLACEMENT_TIE * PLACEMENTS.indexOf(o.placement))],
  ];
  for (const n of NUTRIENTS) if (o.frac[n] > 0) c.push([`t:${n}`, unit * o.frac[n] * o.eff[n]]);
  if (o.placement === 'seed_row') {
    if (o.frac.n > 0 && o.nCounts) c.push(['sr:n', unit * o.frac.n]);
    if (o.frac.n + o.frac.k2o > 0) c.push(['sr:nk', unit * (o.frac.n + o.frac.k2o)]);
    if (o.frac.p2o5 > 0) c.push(['sr:p2o5', unit * o.frac.p2o5], ['prio', -unit * o.frac.p2o5]);
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
 * Credit, $ per lb of seed-row P2O5 up to the P target: phosphate fills the seed row before potash (common
 * practice), whatever the prices. Above any product's cost per lb of nutrient, far below the shortfall penalty.
 */
const SEED_P_PRIORITY = 20;

interface Problem {
  options: readonly ProductOption[];
  target: Record<Nutrient, number>;
  tolerance: number;
  limits: SeedRowLimits;
  maximize: Nutrient | undefined;
}

function baseModel(pb: Problem): {
  constraints: [string, Constraint][];
  variables: [string, [string, number][]][];
} {
  const constraints: [string, Constraint][] = seedRowConstraints(pb.limits);
  const variables: [string, [string, number][]][] = [];
  if (!pb.maximize) {
    for (const n of NUTRIENTS) {
      if (!(pb.target[n] > 0)) continue;
      constraints.push(
        [`t:${n}`, { min: pb.target[n] }],
        [`short:${n}`, { max: pb.target[n] * pb.tolerance }],
      );
      variables.push([
        `s_${n}`,
        [
          [`t:${n}`, 1],
          [`short:${n}`, 1],
          ['cost', SHORTFALL_PENALTY],
        ],
      ]);
    }
    if (pb.target.p2o5 > 0) {
      // seedP <= target and seedP <= seed-row P2O5 ('prio' row: seedP - seed-row P2O5 <= 0)
      constraints.push(['prio', { max: 0 }], ['prioCap', { max: pb.target.p2o5 }]);
      variables.push([
        'seedP',
        [
          ['prio', 1],
          ['prioCap', 1],
          ['cost', -SEED_P_PRIORITY],
        ],
      ]);
    }
  }
  return { constraints, variables };
}

/** The continuous LP (rates in lb/ac) with some rates fixed; returns the rates (and, as `obj`, the objective) or null when infeasible. */
function solveLp(
  pb: Problem,
  fixed: readonly (number | undefined)[],
): (Float64Array & { obj?: number }) | null {
  const { constraints, variables } = baseModel(pb);
  pb.options.forEach((o, i) => {
    const c = coefficients(o, 1);
    c.push([`b${i}`, 1]);
    constraints.push([`b${i}`, fixed[i] === undefined ? { max: o.maxLb } : { equal: fixed[i]! }]);
    variables.push([`x${i}`, c]);
  });
  const sol = solve({
    direction: pb.maximize ? 'maximize' : 'minimize',
    objective: pb.maximize ? `t:${pb.maximize}` : 'cost',
    constraints,
    variables,
  });
  if (sol.status !== 'optimal') return null;
  const x: Float64Array & { obj?: number } = new Float64Array(pb.options.length);
  for (const [name, v] of sol.variables) if (name[0] === 'x') x[Number(name.slice(1))] = v;
  fixed.forEach((f, i) => f !== undefined && (x[i] = f));
  x.obj = sol.result;
  return x;
}

const ON_STEP = 1e-7;

/** True when a rate needs no rounding: zero, or at least the minimum and a whole number of steps. */
function settled(o: ProductOption, v: number): boolean {
  if (v <= 1e-9) return true;
  if (o.minLb > 0 && v < o.minLb - 1e-9) return false;
  return !(o.stepLb > 0) || Math.abs(v / o.stepLb - Math.round(v / o.stepLb)) < ON_STEP;
}

/** Rounded rates to try for one option, in order: up a step (at least the minimum), down a step, off. */
function candidates(o: ProductOption, v: number): number[] {
  const st = o.stepLb;
  const snapUp = (x: number) => (st > 0 ? Math.ceil(x / st - ON_STEP) * st : x);
  const lowest = o.minLb > 0 ? snapUp(o.minLb) : 0;
  const up = Math.max(snapUp(v), lowest);
  const down = st > 0 ? Math.floor(v / st + ON_STEP) * st : v;
  const out: number[] = [];
  for (const c of [up, down, 0]) {
    if (c > o.maxLb + 1e-9 || (c > 0 && c < lowest - 1e-9)) continue;
    if (!out.some((d) => Math.abs(d - c) < 1e-12)) out.push(c);
  }
  return out;
}

/**
 * Exact branch and bound (yalps) over whole steps and on/off minimums: the fallback when the rounding
 * dive finds no answer. Capped at a few thousand iterations.
 */
function solveMip(pb: Problem, maxIterations = 4000): { x: Float64Array; status: string } {
  const { constraints, variables } = baseModel(pb);
  const integers: string[] = [];
  const binaries: string[] = [];
  pb.options.forEach((o, i) => {
    const unit = o.stepLb > 0 ? o.stepLb : 1;
    const c = coefficients(o, unit);
    if (o.minLb > 0) {
      c.push([`lo${i}`, unit], [`hi${i}`, unit]);
      constraints.push([`lo${i}`, { min: 0 }], [`hi${i}`, { max: 0 }]);
      variables.push([
        `u${i}`,
        [
          [`lo${i}`, -o.minLb],
          [`hi${i}`, -o.maxLb],
        ],
      ]);
      binaries.push(`u${i}`);
    } else {
      c.push([`hi${i}`, unit]);
      constraints.push([`hi${i}`, { max: o.maxLb }]);
    }
    variables.push([`x${i}`, c]);
    if (o.stepLb > 0) integers.push(`x${i}`);
  });
  const sol = solve(
    {
      direction: pb.maximize ? 'maximize' : 'minimize',
      objective: pb.maximize ? `t:${pb.maximize}` : 'cost',
      constraints,
      variables,
      integers,
      binaries,
    },
    { maxIterations },
  );
  const x = new Float64Array(pb.options.length);
  if (sol.status !== 'optimal' && !(sol.status === 'timedout' && Number.isFinite(sol.result)))
    return { x, status: sol.status };
  for (const [name, v] of sol.variables) {
    if (name[0] !== 'x') continue;
    const i = Number(name.slice(1));
    const o = pb.options[i]!;
    x[i] = o.stepLb > 0 ? v * o.stepLb : v;
  }
  return { x, status: 'optimal' };
}

/**
 * Solves one location. `target[n]` is the effective lb/ac each nutrient should reach (0 = none); the
 * supply may fall short of it by at most `tolerance` (a fraction), and only where the limits force it.
 * With `maximize`, ignores the costs and targets and finds the most of that nutrient the limits allow.
 *
 * Method: the continuous LP first (if it has no answer, nothing has). Then rounding dives: take the first
 * rate that is not a whole number of machine steps or is below the machine minimum; fix it up a step (or to
 * the minimum), down a step, or off, and re-solve the LP with it fixed, so every other rate re-adjusts and
 * every limit is checked again by the solver; repeat until every rate is settled. Three dives differ in
 * which rounding they keep (the best LP objective; the first that fits, in the order up / down / off; the
 * nearest); the best finished dive wins. Each dive fixes each option at most once (at most 3 x options small
 * LPs). A rate left at (about) its machine minimum is then tried switched off, with a fresh dive (at most
 * four such tries). Should every dive dead-end, an exact branch and bound (yalps integers and binaries) takes over.
 * @example solveProducts(productOptions(plan, tables), { n: 100, p2o5: 30, k2o: 0, s: 15 }, 0.05, limits).rates
 */
export function solveProducts(
  options: readonly ProductOption[],
  target: Record<Nutrient, number>,
  tolerance: number,
  limits: SeedRowLimits,
  maximize?: Nutrient,
): SolveResult {
  const pb: Problem = { options, target, tolerance, limits, maximize };
  const x0 = solveLp(pb, new Array(options.length).fill(undefined));
  if (!x0) return unsolved(options.length, 'infeasible');
  let x: Float64Array | null = null;
  let bestScore = Infinity;
  for (const policy of DIVE_POLICIES) {
    const y = dive(pb, x0, policy);
    if (!y) continue;
    const sc = score(pb, y);
    if (sc < bestScore - 1e-12) {
      bestScore = sc;
      x = y;
    }
  }
  if (x) x = dropTrickles(pb, x);
  if (x) return answerOf(pb, x, 'optimal (LP and rounding dive)');
  const m = solveMip(pb);
  return m.status === 'optimal'
    ? answerOf(pb, m.x, 'optimal (branch and bound)')
    : unsolved(options.length, m.status);
}

/** The signature of {@link solveProducts}: what decide calls to solve one location's products. */
export type ProductSolver = typeof solveProducts;

/** JSON that keeps Infinity, -Infinity and NaN apart from null (a memo key must not join two problems). */
function keyOf(value: unknown): string {
  return JSON.stringify(value, (_k, v: unknown) =>
    typeof v === 'number' && !Number.isFinite(v) ? `#${v}` : v,
  );
}

/**
 * {@link solveProducts} with a memory: a problem asked before (the same options, targets, tolerance, limits and
 * objective, compared in full) gets the same answer object back without solving again. Exact: the answers are
 * the solver's own. The zone stage's rate judge asks the same problem many times (zones whose soil values
 * differ only where no target depends on them, and the targets each soil value's error moves to); on the
 * benchmark section about 900 decisions need about 240 different solves. Treat the answers as read-only.
 * @example const solve = memoSolver(); decide(soil, plan, tables, { solve }); decide(soil, plan, tables, { solve }) // the second call solves nothing
 */
export function memoSolver(): ProductSolver {
  const memo = new Map<string, SolveResult>();
  return (options, target, tolerance, limits, maximize) => {
    const key = keyOf([options, target, tolerance, limits, maximize ?? null]);
    let r = memo.get(key);
    if (!r) {
      r = solveProducts(options, target, tolerance, limits, maximize);
      memo.set(key, r);
    }
    return r;
  };
}

/** A settled answer: rates in whole machine steps (below 1e-9 lb/ac: 0) and their cost. */
function answerOf(pb: Problem, x: ArrayLike<number>, solver: string): SolveResult {
  const rates = new Float64Array(pb.options.length);
  const steps = new Float64Array(pb.options.length);
  let cost = 0;
  pb.options.forEach((o, i) => {
    let v = x[i]! <= 1e-9 ? 0 : x[i]!;
    if (o.stepLb > 0) {
      steps[i] = Math.round(v / o.stepLb);
      v = steps[i]! * o.stepLb;
    }
    rates[i] = v;
    cost += v * o.pricePerLb;
  });
  const shortfall = pb.maximize ? 0 : shortfallOf(pb.options, rates, pb.target);
  return { status: 'optimal', rates, steps, cost, solver, shortfall };
}

/** No answer: the solver's status ('infeasible', or an error), no rates. */
function unsolved(n: number, status: string): SolveResult {
  return {
    status: status === 'infeasible' ? 'infeasible' : 'error',
    rates: new Float64Array(n),
    steps: new Float64Array(n),
    cost: NaN,
    solver: status,
    shortfall: NaN,
  };
}

/** Product cost less the seed-row phosphate credit: what a trickle product is judged on (shortfall aside). */
function costAndPriority(pb: Problem, x: Float64Array): number {
  let c = 0;
  let seedP = 0;
  pb.options.forEach((o, i) => {
    c += x[i]! * o.pricePerLb;
    if (o.placement === 'seed_row') seedP += x[i]! * o.frac.p2o5;
  });
  return c - SEED_P_PRIORITY * Math.min(seedP, Math.max(0, pb.target.p2o5));
}

/**
 * A rate left at (about) its machine minimum usually means a small remainder was pushed up to it: try each such
 * option switched off (a fresh dive with it fixed at 0) and keep the answer when it scores better, or when it
 * costs less (phosphate's seed-row credit counted) and still meets every target within the plan's tolerance (the LP never lets a shortfall pass it):
 * the tolerance is used before a trickle of product is added (the decision then says the target was left short).
 * Options switched off stay off. At most six tries.
 */
function dropTrickles(pb: Problem, x: Float64Array): Float64Array {
  if (pb.maximize) return x;
  const { options } = pb;
  const fixed: (number | undefined)[] = new Array(options.length).fill(undefined);
  const atMin = options
    .map((_, i) => i)
    .filter(
      (i) => options[i]!.minLb > 0 && x[i]! > 1e-9 && x[i]! <= options[i]!.minLb + options[i]!.stepLb + 1e-9,
    )
    .slice(0, 6);
  for (const i of atMin) {
    if (!(x[i]! > 1e-9)) continue;
    fixed[i] = 0;
    const start = solveLp(pb, fixed);
    const y = start && dive(pb, start, 'best', fixed);
    if (y && (score(pb, y) < score(pb, x) - 1e-12 || costAndPriority(pb, y) < costAndPriority(pb, x) - 1e-9))
      x = y;
    else fixed[i] = undefined;
  }
  return x;
}

type DivePolicy = 'best' | 'first' | 'nearest';
/** The dives tried: keep the best LP objective at each fix; the first of up / down / off that fits; the nearest. */
const DIVE_POLICIES: readonly DivePolicy[] = ['best', 'first', 'nearest'];

/** What the dive minimizes, for comparing finished dives: cost + shortfall penalty, or minus the nutrient maximized. */
function score(pb: Problem, x: Float64Array): number {
  if (pb.maximize) {
    let t = 0;
    pb.options.forEach((o, i) => (t += x[i]! * o.frac[pb.maximize!] * o.eff[pb.maximize!]));
    return -t;
  }
  let c = 0;
  let seedP = 0;
  pb.options.forEach((o, i) => {
    c += x[i]! * (o.pricePerLb + PLACEMENT_TIE * PLACEMENTS.indexOf(o.placement));
    if (o.placement === 'seed_row') seedP += x[i]! * o.frac.p2o5;
  });
  return (
    c +
    SHORTFALL_PENALTY * shortfallOf(pb.options, x, pb.target) -
    SEED_P_PRIORITY * Math.min(seedP, Math.max(0, pb.target.p2o5))
  );
}

/** One rounding dive from the LP answer x0; null if it dead-ends. */
function dive(
  pb: Problem,
  x0: Float64Array,
  policy: DivePolicy,
  preset?: readonly (number | undefined)[],
): Float64Array | null {
  const { options, maximize } = pb;
  const fixed: (number | undefined)[] = preset ? [...preset] : new Array(options.length).fill(undefined);
  let x: Float64Array = x0;
  for (;;) {
    const i = options.findIndex((o, j) => fixed[j] === undefined && !settled(o, x[j]!));
    if (i < 0) return x;
    let cands = candidates(options[i]!, x[i]!);
    if (policy === 'nearest') cands = [...cands].sort((a, b) => Math.abs(a - x[i]!) - Math.abs(b - x[i]!));
    let next: (Float64Array & { obj?: number }) | null = null;
    let chosen: number | undefined;
    for (const c of cands) {
      fixed[i] = c;
      const y = solveLp(pb, fixed);
      if (!y) continue;
      if (
        !next ||
        (policy === 'best' && (maximize ? y.obj! > next.obj! + 1e-9 : y.obj! < next.obj! - 1e-9))
      ) {
        next = y;
        chosen = c;
      }
      if (policy !== 'best') break;
    }
    if (!next) return null;
    fixed[i] = chosen;
    x = next;
  }
}

/**
 * The exact integer answer by branch and bound alone (no dive), for the benchmark that measures the dive
 * against it (scripts/bench-rates.ts; not exported from the library). Slower, and can time out (status "error"). Default 4000 iterations.
 * @example solveProductsExact(options, target, 0.05, limits, 30000).cost
 */
export function solveProductsExact(
  options: readonly ProductOption[],
  target: Record<Nutrient, number>,
  tolerance: number,
  limits: SeedRowLimits,
  maxIterations = 4000,
): SolveResult {
  const pb: Problem = { options, target, tolerance, limits, maximize: undefined };
  const m = solveMip(pb, maxIterations);
  return m.status === 'optimal'
    ? answerOf(pb, m.x, 'optimal (branch and bound)')
    : unsolved(options.length, m.status);
}
