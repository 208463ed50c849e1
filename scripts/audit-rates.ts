/**
 * Agronomy sweep of the rate engine (run: npm run audit:rates). Not a test: it prints counts a reviewer reads
 * (docs/method.md, "Rate audit"). Seeded, so runs compare.
 *
 * Every crop's starter plan (`tilth plan init`) on random soils, textures, drills (opener spread, row spacing),
 * seedbed moisture and placement sets. Counts: product rates below 2 lb/ac and strictly between 0 and the
 * product's min_rate; products split across placements with a part below its min_rate; ammonium sulphate added
 * while the S target is 0; canola and pea decisions with a P need and a seed row, and how many get seed P and
 * how many fill the seed-row P limit; potash in the seed row ahead of unmet phosphate; infeasible decisions by
 * cause; decisions stopped to ask for a missing table value.
 */
import {
  decide,
  defaultTables,
  parsePlan,
  planTemplate,
  type Decision,
  type Plan,
} from '../src/agronomy/index.js';
import { mulberry32 } from '../src/stats/random.js';

const N = Number(process.argv[2] ?? 3000);
const rnd = mulberry32(20261202);
const T = defaultTables();
const pick = <V>(a: readonly V[]): V => a[Math.floor(rnd() * a.length)]!;

const counts = new Map<string, number>();
const add = (k: string, v = 1) => counts.set(k, (counts.get(k) ?? 0) + v);
for (const k of [
  'decisions with a product rate <= 2 lb/ac',
  'decisions with a rate strictly between 0 and the product min_rate',
  'products split across placements with a part below max(min_rate, 2 lb)',
  'ammonium sulphate applied while the S target is 0',
  'potash in the seed row while seed-row phosphate is below min(limit, target)',
  'stopped to ask (all crops)',
  'infeasible (all)',
])
  counts.set(k, 0);
const examples = new Map<string, string>();
const example = (k: string, v: string) => examples.has(k) || examples.set(k, v);

function planFor(crop: string): Plan {
  const base = parsePlan(planTemplate(crop, T), 'plan.yaml', T);
  const p: Plan = structuredClone(base);
  p.implement.opener_spread_in = pick([0.75, 1, 1, 1, 2, 3]);
  p.implement.row_spacing_in = pick([7, 9, 10, 10, 12, 15]);
  p.implement.seedbed_moisture = rnd() < 0.2 ? 'dry' : 'good';
  p.implement.placements = pick([
    ['seed_row', 'side_band'],
    ['seed_row', 'side_band'],
    ['seed_row', 'mid_row_band'],
    ['seed_row', 'broadcast'],
    ['seed_row'],
  ] as Plan['implement']['placements'][]);
  p.soil_test.nitrate_sampled = rnd() < 0.5 ? 'fall' : 'spring';
  // the starter plan's side-band products go to whatever band or broadcast placement the drill has
  const other = p.implement.placements.find((x) => x !== 'seed_row') ?? 'seed_row';
  for (const q of p.products)
    if (q.placements) q.placements = [...new Set(q.placements.map((x) => (x === 'side_band' ? other : x)))];
  return p;
}

function seedP(d: Decision): number {
  return d.seedRow.applied.p2o5;
}

const crops = Object.keys(T.crops);
let decisions = 0;
for (let i = 0; i < N; i++) {
  const crop = crops[i % crops.length]!;
  const plan = planFor(crop);
  const soil = {
    no3_n: rnd() * 120,
    p: rnd() * 40,
    k: 40 + rnd() * 360,
    so4_s: rnd() * 60,
    om: 1 + rnd() * 7,
    texture: pick(['light', 'medium', 'heavy'] as const),
  };
  let d: Decision;
  try {
    d = decide(soil, plan, T);
  } catch (e) {
    add(`${crop}: stopped to ask (${(e as Error).message.split(':')[0]!.slice(0, 60)})`);
    add('stopped to ask (all crops)');
    continue;
  }
  decisions++;
  add(`decisions ${crop}`);
  if (d.status === 'infeasible') {
    const drill =
      plan.implement.placements.length === 1
        ? 'seed-row-only drill'
        : `seed row + ${plan.implement.placements.filter((x) => x !== 'seed_row').join(' ')}`;
    for (const r of d.infeasible)
      add(
        `infeasible: ${crop} ${r.nutrient ?? 'joint'}, ${drill}: ${r.reason.replace(/\d+(\.\d+)?/g, '#').split(/[,:]/)[0]!}`,
      );
    add('infeasible (all)');
    continue;
  }
  const minOf = (prod: string) => plan.products.find((q) => q.product === prod)?.min_rate ?? 0;
  let trickle2 = false,
    belowMin = false;
  const byProduct = new Map<string, number[]>();
  for (const pl of d.placements) {
    for (const q of pl.products) {
      if (q.rate.lbac > 0 && q.rate.lbac <= 2) trickle2 = true;
      if (q.rate.value > 1e-9 && q.rate.value < minOf(q.product) - 1e-9) belowMin = true;
      byProduct.set(q.product, [...(byProduct.get(q.product) ?? []), q.rate.value]);
    }
  }
  if (trickle2) {
    add('decisions with a product rate <= 2 lb/ac');
    example(
      'trickle',
      `${crop} ${JSON.stringify(d.placements.map((p) => [p.placement, p.products.map((q) => `${q.product} ${q.rate.value}`)]))}`,
    );
  }
  if (belowMin) add('decisions with a rate strictly between 0 and the product min_rate');
  for (const [prod, parts] of byProduct)
    if (parts.length > 1 && parts.some((v) => v < Math.max(minOf(prod), 2.0001)))
      add('products split across placements with a part below max(min_rate, 2 lb)');
  const as = d.placements.flatMap((p) => p.products).filter((q) => q.product === 'ammonium_sulphate');
  if (as.length && !(d.nutrients.s.target.lbac > 0)) {
    add('ammonium sulphate applied while the S target is 0');
    example(
      'as',
      `${crop} ${JSON.stringify(plan.implement)} N ${d.nutrients.n.target.lbac.toFixed(1)} ${JSON.stringify(d.placements.map((p) => [p.placement, p.products.map((q) => `${q.product} ${q.rate.value}`)]))}`,
    );
  }
  const pNeed = d.nutrients.p2o5.target.lbac > 0;
  const hasSeed = plan.implement.placements.includes('seed_row');
  if ((crop === 'canola' || crop === 'peas') && pNeed && hasSeed) {
    add(`${crop}: P need and a seed row`);
    if (seedP(d) > 0.01) add(`${crop}: ... gets seed P`);
    else {
      const map = plan.products.find((q) => q.product === 'map')!;
      const why =
        Math.min(d.seedRow.p2o5, d.seedRow.p2o5K2o) < (map.min_rate * T.products.map!.p2o5) / 100
          ? 'the seed-row P2O5 limit is below what MAP at its min_rate carries'
          : 'other';
      add(`${crop}: ... no seed P: ${why}`);
      if (why === 'other')
        example(
          `noseedp-${crop}`,
          `${JSON.stringify(plan.implement)} P ${d.nutrients.p2o5.target.lbac.toFixed(1)} lim ${d.seedRow.p2o5.toFixed(1)} ${JSON.stringify(d.placements.map((p) => [p.placement, p.products.map((q) => `${q.product} ${q.rate.value}`)]))}`,
        );
    }
    const lim = Math.min(d.seedRow.p2o5, d.seedRow.p2o5K2o, d.nutrients.p2o5.target.lbac);
    if (seedP(d) >= lim - 5.5)
      add(`${crop}: ... seed P within one 5 lb MAP step (2.6 lb P2O5) of min(limit, target)`);
  }
  if (
    d.seedRow.applied.k2o > 0.01 &&
    d.seedRow.applied.p2o5 < Math.min(d.seedRow.p2o5, d.nutrients.p2o5.target.lbac) - 3
  ) {
    add('potash in the seed row while seed-row phosphate is below min(limit, target)');
    example(
      'pk',
      `${crop} ${JSON.stringify(plan.implement)} P ${d.nutrients.p2o5.target.lbac.toFixed(1)} K ${d.nutrients.k2o.target.lbac.toFixed(1)} lim ${d.seedRow.p2o5.toFixed(1)} nk ${d.seedRow.nK2o} ${JSON.stringify(d.placements.map((p) => [p.placement, p.products.map((q) => `${q.product} ${q.rate.value}`)]))}`,
    );
  }
  if (d.seedRow.applied.k2o > 0.01 && (crop === 'canola' || crop === 'peas'))
    add(`${crop}: potash with the seed`);
}

console.log(`tilth rate audit: ${N} starter-plan decisions (seed 20261202), ${decisions} answered`);
for (const [k, v] of [...counts.entries()].sort((a, b) => a[0].localeCompare(b[0])))
  console.log(`${String(v).padStart(6)}  ${k}`);
for (const [k, v] of examples) console.log(`example ${k}: ${v}`);
