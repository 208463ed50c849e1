/**
 * Benchmark of the rate engine (run: npx tsx scripts/bench-rates.ts). Seeded, so runs compare.
 * 1. decide() per location on the canola starter plan over random soils (the zone stage's workload);
 * 2. the rounding dive against yalps' exact branch and bound on random machine steps and minimums:
 *    how often each answers, time, and the dive's extra cost.
 */
import {
  decide,
  defaultTables,
  parsePlan,
  planTemplate,
  productOptions,
  seedRowLimits,
  solveProducts,
  validatePlan,
} from '../src/agronomy/index.js';
import { solveProductsExact } from '../src/agronomy/solve.js';

let seed = 20261201;
const rnd = () => (seed = (seed * 1664525 + 1013904223) >>> 0) / 2 ** 32;
const T = defaultTables();
const plan = parsePlan(planTemplate('canola', T), 'plan.yaml', T);
const soils = Array.from({ length: 2000 }, () => ({
  no3_n: rnd() * 120,
  p: rnd() * 40,
  k: 60 + rnd() * 400,
  so4_s: rnd() * 60,
  om: 1 + rnd() * 8,
  texture: (['light', 'medium', 'heavy'] as const)[Math.floor(rnd() * 3)]!,
}));
for (const s of soils.slice(0, 100)) decide(s, plan, T); // warm up
let t0 = performance.now();
for (const s of soils) decide(s, plan, T);
const ms = performance.now() - t0;
console.log(
  `decide, canola starter plan: ${soils.length} soils in ${ms.toFixed(0)} ms = ${((ms / soils.length) * 1000).toFixed(0)} us each`,
);

// dive vs exact
const problems = Array.from({ length: 300 }, () => {
  const units = rnd() < 0.5 ? 'lb/ac' : 'kg/ha';
  const prod = (product: string) => ({
    product,
    placements: ['seed_row', 'side_band'].filter((p) => T.products[product]!.placements.includes(p as never)),
    step: [1, 5, 10][Math.floor(rnd() * 3)]!,
    min_rate: [0, 20, 50][Math.floor(rnd() * 3)]!,
    max_rate: 400,
  });
  const p = validatePlan(
    {
      crop: ['canola', 'wheat', 'barley'][Math.floor(rnd() * 3)],
      target_yield_bu: 30 + Math.floor(rnd() * 60),
      units,
      seed_row: { when_table_missing: 'light_soil_values' },
      implement: { opener_spread_in: 1 + rnd() * 2, row_spacing_in: 7 + rnd() * 5 },
      products: ['map', 'urea', 'ammonium_sulphate', 'potash'].map(prod),
    },
    'bench',
    T,
  );
  return { p, soil: soils[Math.floor(rnd() * soils.length)]! };
});
/** What the solver gets for one problem: the product options, the seed-row limits and the nutrient targets. */
function solverInputs(p: (typeof problems)[number]['p'], soil: (typeof problems)[number]['soil']) {
  const d = decide(soil, p, T);
  const opts = productOptions(p, T);
  const lim = seedRowLimits(T.crops[p.crop]!, p.crop, soil.texture, p, T);
  const target = {
    n: d.nutrients.n.target.lbac,
    p2o5: d.nutrients.p2o5.target.lbac,
    k2o: d.nutrients.k2o.target.lbac,
    s: d.nutrients.s.target.lbac,
  };
  return { opts, lim, target };
}

let diveMs = 0,
  exactMs = 0,
  diveOk = 0,
  exactOk = 0,
  both = 0,
  gapSum = 0,
  gapMax = 0;
for (const { p, soil } of problems) {
  const { opts, lim, target } = solverInputs(p, soil);
  t0 = performance.now();
  const a = solveProducts(opts, target, p.strategy.tolerance_pct / 100, lim);
  diveMs += performance.now() - t0;
  t0 = performance.now();
  const b = solveProductsExact(opts, target, p.strategy.tolerance_pct / 100, lim, 30000);
  exactMs += performance.now() - t0;
  if (a.status === 'optimal') diveOk++;
  if (b.status === 'optimal') exactOk++;
  if (a.status === 'optimal' && b.status === 'optimal') {
    both++;
    // compare what both minimize: product cost + 1000 $ per lb short of a target (within the tolerance)
    const gap =
      (a.cost + 1000 * a.shortfall - (b.cost + 1000 * b.shortfall)) /
      Math.max(b.cost + 1000 * b.shortfall, 1e-9);
    gapSum += gap;
    gapMax = Math.max(gapMax, gap);
  }
}
console.log(
  `solver, ${problems.length} random step/minimum problems: dive answered ${diveOk} in ${diveMs.toFixed(0)} ms; exact branch and bound (30000 iterations) answered ${exactOk} in ${exactMs.toFixed(0)} ms`,
);
console.log(
  `  where both answered (${both}): dive's objective (cost + shortfall penalty) is ${((gapSum / Math.max(both, 1)) * 100).toFixed(2)} % above the exact one on average, at most ${(gapMax * 100).toFixed(2)} % (negative = exact search stopped short of the optimum)`,
);
if (process.env.SHOW_WORST) {
  let worst:
    { gap: number; a: unknown; b: unknown; opts: unknown; target: unknown; lim: unknown } | undefined;
  for (const { p, soil } of problems) {
    const { opts, lim, target } = solverInputs(p, soil);
    const a = solveProducts(opts, target, p.strategy.tolerance_pct / 100, lim);
    const b = solveProductsExact(opts, target, p.strategy.tolerance_pct / 100, lim, 30000);
    const gap = (a.cost + 1000 * a.shortfall - (b.cost + 1000 * b.shortfall)) / (b.cost + 1000 * b.shortfall);
    if (a.status === 'optimal' && b.status === 'optimal' && (!worst || gap > worst.gap))
      worst = {
        gap,
        a: [...a.rates, a.shortfall],
        b: [...b.rates, b.shortfall],
        opts: opts.map((o) => [o.key, o.minLb, o.stepLb, o.pricePerLb]),
        target,
        lim: [lim.n, lim.p2o5, lim.p2o5K2o, lim.k2o],
      };
  }
  console.log(JSON.stringify(worst));
}
