/**
 * Property: over random soils AND random plans, no decision ever breaks a seed-row limit: urea-type N against the
 * urea-N table (MAP's N sits within the P2O5-as-MAP limit), P2O5 as MAP, P2O5 + K2O additive, the canola/pea potash
 * rule, cereal N + K2O; no product rate lies strictly between 0 and its min_rate; phosphate fills the seed row
 * before potash.
 * The seed-row totals are recomputed here from the product rates and the product analyses, and the limit is
 * checked against an independent bound taken straight from the published table points.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  decide,
  defaultTables,
  sbuPct,
  validatePlan,
  PLACEMENTS,
  type Decision,
  type Plan,
} from '../../src/agronomy/index.js';

const T = defaultTables();
const crops = Object.keys(T.crops);
const products = Object.keys(T.products);

const soilArb = fc.record({
  no3_n: fc.oneof(fc.double({ min: 0, max: 250, noNaN: true }), fc.constant(NaN)),
  p: fc.oneof(fc.double({ min: 0, max: 80, noNaN: true }), fc.constant(NaN)),
  k: fc.oneof(fc.double({ min: 20, max: 600, noNaN: true }), fc.constant(NaN)),
  so4_s: fc.oneof(fc.double({ min: 0, max: 150, noNaN: true }), fc.constant(NaN)),
  om: fc.double({ min: 0, max: 12, noNaN: true }),
  texture: fc.constantFrom('light', 'medium', 'heavy', null),
});

interface ProductPick {
  product: string;
  placementsPick: string[];
  step: number;
  min_rate: number;
  max_rate: number;
  price_per_tonne: number;
}
const productArb = fc.record({
  product: fc.constantFrom(...products),
  placementsPick: fc.subarray([...PLACEMENTS] as string[], { minLength: 1 }),
  step: fc.constantFrom(0, 1, 5, 10),
  min_rate: fc.constantFrom(0, 0, 20, 50),
  max_rate: fc.constantFrom(60, 150, 400),
  price_per_tonne: fc.integer({ min: 200, max: 1500 }),
});

const planArb = fc
  .record({
    crop: fc.constantFrom(...crops),
    target_yield_bu: fc.integer({ min: 10, max: 120 }),
    units: fc.constantFrom('lb/ac', 'kg/ha'),
    p_method: fc.constantFrom('olsen', 'kelowna'),
    sampled: fc.constantFrom('spring', 'fall'),
    om: fc.boolean(),
    pm: fc.constantFrom('response_class', 'removal', 'build', 'none'),
    tolerance_pct: fc.integer({ min: 0, max: 10 }),
    spread: fc.double({ min: 0.5, max: 4, noNaN: true }),
    row: fc.double({ min: 6, max: 15, noNaN: true }),
    moisture: fc.constantFrom('good', 'dry'),
    implPlacements: fc.oneof(
      fc.constant(['seed_row', 'side_band']),
      fc.constant(['seed_row', 'side_band']),
      fc.constant(['seed_row']),
      fc.constant(['seed_row', 'broadcast']),
      fc.subarray([...PLACEMENTS], { minLength: 1 }),
    ),
    missing: fc.constantFrom('light_soil_values', 'none_in_seed_row'),
    guideline: fc.constantFrom('manitoba', 'saskatchewan'),
    potashWithSeed: fc.boolean(),
    safeN: fc.oneof(fc.constant(null), fc.integer({ min: 0, max: 40 })),
    products: fc.oneof(
      fc.uniqueArray(productArb, { minLength: 1, maxLength: 5, selector: (p) => p.product }), // a plan lists each product once
      fc.tuple(productArb, productArb, productArb, productArb).map((a) =>
        a.map((p, i) => ({
          ...p,
          product: ['map', 'urea', 'ammonium_sulphate', 'potash'][i]!,
          max_rate: 400,
          placementsPick: ['seed_row', 'side_band', 'broadcast'],
        })),
      ),
    ),
  })
  .map((r): Plan =>
    validatePlan(
      {
        crop: r.crop,
        target_yield_bu: r.target_yield_bu,
        units: r.units,
        soil_test: { p_method: r.p_method, nitrate_sampled: r.sampled },
        credits: { organic_matter: r.om },
        strategy: { p: { method: r.pm }, tolerance_pct: r.tolerance_pct },
        implement: {
          opener_spread_in: r.spread,
          row_spacing_in: r.row,
          seedbed_moisture: r.moisture,
          placements: r.implPlacements,
        },
        seed_row: {
          safe_n_lb: r.safeN,
          when_table_missing: r.missing,
          p_guideline: r.guideline,
          potash_with_seed: r.potashWithSeed,
        },
        products: (r.products as ProductPick[]).map((p) => {
          const allowed = p.placementsPick.filter((x: string) =>
            (T.products[p.product]!.placements as string[]).includes(x),
          );
          return {
            product: p.product,
            placements: allowed.length ? allowed : T.products[p.product]!.placements,
            step: p.step,
            min_rate: p.min_rate,
            max_rate: p.max_rate,
            price_per_tonne: p.price_per_tonne,
          };
        }),
      },
      'random plan',
      T,
    ),
  );

/** Upper bound on safe urea-type seed-row N straight from the published points: the published tables rise with
 *  SBU, so the safe N at an SBU is at most the smallest value tabled at that SBU or above ([published] Manitoba
 *  Agriculture, Guidelines for Safely Applying Fertilizer with Seed; Seed-Placed Nitrogen Fertilizer). */
function publishedBound(plan: Plan, texture: 'light' | 'medium' | 'heavy'): number {
  if (plan.seed_row.safe_n_lb !== null) return plan.seed_row.safe_n_lb;
  const group = T.seed_row_n[T.crops[plan.crop]!.seed_row_group]!;
  const sbu = sbuPct(plan.implement.opener_spread_in, plan.implement.row_spacing_in);
  const boundOf = (cell: (typeof group)['light']): number => {
    if ('missing' in cell) return Infinity;
    let bound = Infinity;
    let largest = -Infinity;
    cell.spreads_in.forEach((s, i) =>
      cell.rows_in.forEach((r, j) => {
        const v = cell.safe_n[i]![j];
        if (v === null || v === undefined) return;
        if ((s / r) * 100 >= sbu - 1e-9) bound = Math.min(bound, v);
        largest = Math.max(largest, v);
      }),
    );
    return bound === Infinity && cell.safe_n.flat().every((v) => v !== null) ? largest : bound;
  };
  let b = boundOf(group[texture]);
  const fallback =
    plan.seed_row.when_table_missing === 'none_in_seed_row'
      ? 0
      : Math.min(boundOf(group.light), 'missing' in group.light ? 0 : Infinity);
  b = Number.isFinite(b)
    ? Math.max(b, Number.isFinite(fallback) ? fallback : 0)
    : Number.isFinite(fallback)
      ? fallback
      : 0;
  return plan.implement.seedbed_moisture === 'dry' ? b * T.dry_seedbed_factor.value : b;
}

/** Seed-placed P2O5 as MAP: the guideline at its drill configuration, lowered (never raised) by SBU, halved dry
 *  ([published] Manitoba Agriculture, Safe Rates of Seed-Placed Phosphorus; Saskatchewan values; common practice). */
function pBound(plan: Plan): number {
  const g = T.crops[plan.crop]!.seed_row_p2o5[plan.seed_row.p_guideline];
  const sbu = sbuPct(plan.implement.opener_spread_in, plan.implement.row_spacing_in);
  const dry = plan.implement.seedbed_moisture === 'dry' ? T.dry_seedbed_factor.value : 1;
  return g.value * Math.min(1, sbu / ((g.spread_in / g.rows_in) * 100)) * dry;
}

type Sums = { ureaN: number; n: number; p2o5: number; k2o: number; other: number };

function seedRowSums(d: Decision): Sums {
  const sr: Sums = { ureaN: 0, n: 0, p2o5: 0, k2o: 0, other: 0 };
  for (const pl of d.placements) {
    if (pl.placement !== 'seed_row') continue;
    for (const q of pl.products) {
      const t = T.products[q.product]!;
      if (t.seed_row_n === 'counts') sr.ureaN += (q.rate.lbac * t.n) / 100;
      sr.n += (q.rate.lbac * t.n) / 100;
      sr.p2o5 += (q.rate.lbac * t.p2o5) / 100;
      sr.k2o += (q.rate.lbac * t.k2o) / 100;
      if (t.k2o === 0) sr.other += q.rate.lbac;
    }
  }
  return sr;
}

/** Machine limits in the plan's units: whole steps, never strictly between 0 and the product's min_rate, at most the maximum. */
function checkRates(d: Decision, plan: Plan): void {
  for (const pl of d.placements) {
    for (const q of pl.products) {
      const t = T.products[q.product]!;
      const choices = plan.products.filter(
        (c) => c.product === q.product && (c.placements ?? t.placements).includes(pl.placement),
      );
      const choice = choices[0]!;
      expect(q.rate.value).toBeGreaterThan(0);
      expect(q.rate.value).toBeLessThanOrEqual(Math.max(...choices.map((c) => c.max_rate)) + 1e-6);
      if (choices.length === 1) {
        expect(q.rate.value).toBeGreaterThanOrEqual(choice.min_rate - 1e-6);
        if (choice.step > 0)
          expect(Math.abs(q.rate.value / choice.step - Math.round(q.rate.value / choice.step))).toBeLessThan(
            1e-6,
          );
      }
    }
  }
}

/** common practice (agronomy.md): where phosphate and potash compete for the seed row, phosphate goes first: with potash
 *  in the row, no seed-row phosphate option can take one more step (or its minimum) within the P2O5 limit, or the P
 *  target is already met there. */
function checkPhosphateFirst(d: Decision, plan: Plan, sr: Sums, pLim: number): void {
  if (!(sr.k2o > 1e-6)) return;
  if (sr.p2o5 >= d.nutrients.p2o5.target.lbac * (1 - plan.strategy.tolerance_pct / 100) - 1e-6) return;
  const toLb = plan.units === 'kg/ha' ? 1 / 1.12085 : 1;
  for (const c of plan.products) {
    const t = T.products[c.product]!;
    if (
      !(t.p2o5 > 0) ||
      !(c.placements ?? t.placements).includes('seed_row') ||
      !plan.implement.placements.includes('seed_row')
    )
      continue;
    const now =
      d.placements.find((p) => p.placement === 'seed_row')?.products.find((q) => q.product === c.product)
        ?.rate.lbac ?? 0;
    const next = now > 0 ? now + Math.max(c.step, 1e-3) * toLb : Math.max(c.min_rate, c.step, 1e-3) * toLb;
    const fitsP = sr.p2o5 + ((next - now) * t.p2o5) / 100 <= pLim + 1e-6;
    const fitsN = t.seed_row_n !== 'counts' || sr.ureaN + ((next - now) * t.n) / 100 <= d.seedRow.n + 1e-6;
    const fitsMax = next <= c.max_rate * toLb + 1e-6;
    expect(fitsP && fitsN && fitsMax, `${c.product} could take more of the seed row before potash`).toBe(
      false,
    );
  }
}

describe('seed-row safety over random soils and plans', () => {
  it('never over any seed-row limit; no rate between 0 and min_rate; phosphate before potash', () => {
    let feasible = 0,
      withSeedRow = 0,
      withSeedP = 0;
    fc.assert(
      fc.property(soilArb, planArb, (soil, plan) => {
        const d = decide(soil, plan, T);
        const crop = T.crops[plan.crop]!;
        const texture = soil.texture ?? plan.implement.default_texture;
        const dry = plan.implement.seedbed_moisture === 'dry' ? T.dry_seedbed_factor.value : 1;
        expect(d.seedRow.n).toBeLessThanOrEqual(publishedBound(plan, texture) + 1e-9);
        checkRates(d, plan);
        const sr = seedRowSums(d);
        const pLim = pBound(plan);
        // urea-type N (urea, UAN, ammonium sulphate, thiosulphate) against the urea-N table; MAP's N within the P limit
        expect(sr.ureaN).toBeLessThanOrEqual(publishedBound(plan, texture) + 1e-6);
        // P2O5 as MAP, and P2O5 + K2O additive within the same limit (common practice)
        expect(sr.p2o5).toBeLessThanOrEqual(pLim + 1e-6);
        expect(sr.p2o5 + sr.k2o).toBeLessThanOrEqual(pLim + 1e-6);
        // [published] Alberta Agriculture potassium guide (older edition): canola, peas at most 15 lb K2O, only alone
        // and only by the plan's choice; cereals N + K2O at most 40 lb/ac
        expect(sr.k2o).toBeLessThanOrEqual(crop.seed_row_k2o_max.value * dry + 1e-6);
        if (crop.seed_row_k2o_alone.value && sr.k2o > 0) {
          expect(plan.seed_row.potash_with_seed).toBe(true);
          expect(sr.other).toBe(0);
        }
        if (crop.seed_row_n_k2o_max.value !== null)
          expect(sr.n + sr.k2o).toBeLessThanOrEqual(crop.seed_row_n_k2o_max.value * dry + 1e-6);
        checkPhosphateFirst(d, plan, sr, pLim);
        if (d.status === 'ok') {
          feasible++;
          if (sr.n + sr.p2o5 + sr.k2o > 0) withSeedRow++;
          if (sr.p2o5 > 0) withSeedP++;
          for (const n of ['n', 'p2o5', 'k2o', 's'] as const) {
            expect(d.nutrients[n].effective).toBeGreaterThanOrEqual(
              d.nutrients[n].target.lbac * (1 - plan.strategy.tolerance_pct / 100) - 1e-6,
            );
          }
        } else {
          expect(d.infeasible.length).toBeGreaterThan(0);
          expect(d.placements).toEqual([]);
          // the solver always answers: an infeasible plan is explained, never a solver failure
          expect(d.infeasible[0]!.reason).not.toMatch(/^the solver stopped/);
        }
      }),
      { numRuns: 400, seed: 20261201 },
    );
    // the property must exercise real seed-row fills, not only empty or infeasible answers
    expect(feasible).toBeGreaterThan(100);
    expect(withSeedRow).toBeGreaterThan(50);
    expect(withSeedP).toBeGreaterThan(30);
  });
});
