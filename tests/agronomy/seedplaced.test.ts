/**
 * Rates a prairie agronomist would sign: phosphate with canola and pea seed, phosphate before potash, the
 * potash rules, N efficiency by placement and timing, practical product rates. Each check names its source.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  decide,
  defaultTables,
  loadTables,
  parsePlan,
  planTemplate,
  seedRowLimits,
  validatePlan,
  type PlanInput,
  type Tables,
} from '../../src/agronomy/index.js';
import { isUserError } from '../../src/errors.js';

const T = defaultTables();
const SOIL = { no3_n: 25, p: 8, k: 140, so4_s: 12, om: 4, texture: 'medium' as const };

/** A canola plan with MAP only and N, K and S off unless the test asks; continuous rates unless the test sets a step. */
function plan(over: Partial<PlanInput> & Record<string, unknown>, tables: Tables = T) {
  return validatePlan(
    {
      crop: 'canola',
      target_yield_bu: 50,
      seed_row: { when_table_missing: 'none_in_seed_row' },
      products: [{ product: 'map', step: 0 }],
      ...over,
      strategy: {
        n: { method: 'none' },
        k: { method: 'none' },
        s: { method: 'none' },
        ...(over.strategy as object),
      },
    },
    'test plan',
    tables,
  );
}
type Placement = 'seed_row' | 'side_band' | 'mid_row_band' | 'broadcast';
const seedProducts = (d: ReturnType<typeof decide>) =>
  d.placements.find((p) => p.placement === 'seed_row')?.products.map((q) => q.product) ?? [];

describe('phosphate with canola and pea seed', () => {
  it('MAP goes with canola seed although the urea-N table allows 0: its N is within the P2O5-as-MAP limit', () => {
    // [published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer: A Second Opinion Please, Table 1: canola,
    // medium soil, 1 in spread: 0 lb urea-N on 6 and 9 in rows; [published] Manitoba Agriculture, Safe Rates of
    // Seed-Placed Phosphorus: the P2O5 limits are stated as MAP (canola 20 lb P2O5, 1 in spread, 6-7 in rows)
    const p = plan({
      products: [
        { product: 'map', placements: ['seed_row', 'side_band'], step: 0 },
        { product: 'ammonium_sulphate', placements: ['seed_row', 'side_band'], step: 0 },
        { product: 'urea', placements: ['seed_row', 'side_band'], step: 0 },
      ],
      strategy: { n: { method: 'mass_balance' }, s: { method: 'need_or_floor' } },
    });
    const d = decide(SOIL, p, T);
    expect(d.seedRow.n).toBe(0);
    expect(seedProducts(d)).toEqual(['map']); // no urea or ammonium sulphate with the seed
    expect(d.seedRow.applied.nCounted).toBe(0);
    expect(d.seedRow.applied.n).toBeGreaterThan(0); // MAP's own N
    expect(d.seedRow.applied.p2o5).toBeCloseTo(14, 6); // 20 x 7 / 10 on 10 in rows
  });

  it('peas get MAP with the seed too, and the pea starter plan runs', () => {
    // [published] Manitoba Agriculture, Safe Rates of Seed-Placed Phosphorus: peas 20 lb P2O5; Saskatchewan 15
    const p = parsePlan(planTemplate('peas', T), 'peas.yaml', T);
    const d = decide(SOIL, p, T);
    expect(d.status).toBe('ok');
    expect(seedProducts(d)).toEqual(['map']);
    const sk = { ...p, seed_row: { ...p.seed_row, p_guideline: 'saskatchewan' as const } };
    expect(seedRowLimits(T.crops.peas!, 'peas', 'medium', sk, T).p2o5).toBeCloseTo((15 * 9) / 10, 9);
  });

  it('the P limit is lowered for wider rows, never raised for a wider spread, halved in a dry seedbed', () => {
    // common practice (agronomy.md): lower the as-MAP rates for a 1 in spread on wider rows, never raise them
    // automatically for a wider spread; halve them in a dry seedbed
    const at = (
      spread: number,
      row: number,
      moisture: 'good' | 'dry' = 'good',
      guide: 'manitoba' | 'saskatchewan' = 'manitoba',
    ) =>
      seedRowLimits(
        T.crops.canola!,
        'canola',
        'medium',
        plan({
          implement: { opener_spread_in: spread, row_spacing_in: row, seedbed_moisture: moisture },
          seed_row: { when_table_missing: 'none_in_seed_row', p_guideline: guide },
        }),
        T,
      ).p2o5;
    expect(at(1, 7)).toBeCloseTo(20, 9);
    expect(at(1, 14)).toBeCloseTo(10, 9);
    expect(at(3, 7)).toBeCloseTo(20, 9);
    expect(at(2, 12)).toBeCloseTo(20, 9);
    expect(at(1, 7, 'dry')).toBeCloseTo(10, 9);
    // [published] Canola Watch 2011 / Saskatchewan Agriculture 2018: 25 lb P2O5 at a 1 in knife on 9 in rows
    expect(at(1, 9, 'good', 'saskatchewan')).toBeCloseTo(25, 9);
    expect(at(1, 10, 'good', 'saskatchewan')).toBeCloseTo(22.5, 9);
  });

  it('says why a P need got no seed P when the limit is below what MAP carries at its minimum rate', () => {
    const p = plan({
      implement: { opener_spread_in: 1, row_spacing_in: 15 },
      products: [{ product: 'map', placements: ['seed_row', 'side_band'], min_rate: 20, step: 5 }],
    });
    const d = decide(SOIL, p, T);
    expect(d.seedRow.applied.p2o5).toBe(0);
    expect(d.warnings.find((w) => w.code === 'no-seed-p')!.message).toMatch(/below the 10.4 lb P2O5/);
  });
});

describe('phosphate before potash; the potash rules', () => {
  it('phosphate fills the seed row before potash, even when the price says potash', () => {
    // common practice (agronomy.md): where phosphate and potash compete for the seed row, phosphate goes first.
    // Broadcast is half as efficient for both ([published] Manitoba Soil Fertility Guide, Potassium; P from memory),
    // so by price alone the dear product (potash here) would take the seed row.
    const p = plan({
      crop: 'wheat',
      target_yield_bu: 60,
      implement: { opener_spread_in: 1, row_spacing_in: 7, placements: ['seed_row', 'broadcast'] },
      products: [
        {
          product: 'potash',
          price_per_tonne: 3000,
          placements: ['seed_row', 'broadcast'],
          step: 0,
          max_rate: 800,
        },
        {
          product: 'map',
          price_per_tonne: 50,
          placements: ['seed_row', 'broadcast'],
          step: 0,
          max_rate: 800,
        },
      ],
      strategy: { k: { method: 'response_class' } },
    });
    const d = decide({ ...SOIL, p: 8, k: 50 }, p, T);
    // wheat P target (low class) is above the 50 lb P2O5 limit, so the whole additive limit goes to phosphate
    expect(d.nutrients.p2o5.target.lbac).toBeGreaterThan(50);
    expect(d.seedRow.applied.p2o5).toBeCloseTo(50, 6);
    expect(d.seedRow.applied.k2o).toBe(0);
  });

  it('canola: no potash with the seed unless the plan opts in, then at most 15 lb K2O and alone', () => {
    // [published] Alberta Agriculture potassium guide (older edition): canola, flax, peas at most 15 lb K2O/ac with
    // the seed and only if nothing else goes with the seed
    const products = [
      { product: 'map', placements: ['seed_row', 'side_band'] as Placement[] },
      { product: 'potash', placements: ['seed_row', 'side_band'] as Placement[] },
    ];
    const off = decide(
      { ...SOIL, k: 40 },
      plan({ products, strategy: { k: { method: 'response_class' } } }),
      T,
    );
    expect(off.seedRow.applied.k2o).toBe(0);
    const optIn = plan({
      products,
      strategy: { k: { method: 'response_class' } },
      seed_row: { when_table_missing: 'none_in_seed_row', potash_with_seed: true },
    });
    const withP = decide({ ...SOIL, k: 40 }, optIn, T);
    expect(withP.seedRow.applied.k2o).toBe(0); // the P need has the row
    expect(seedProducts(withP)).toEqual(['map']);
    const noP = decide(
      { ...SOIL, k: 40 },
      { ...optIn, strategy: { ...optIn.strategy, p: { ...optIn.strategy.p, method: 'none' } } },
      T,
    );
    expect(seedProducts(noP)).toEqual(['potash']);
    expect(noP.seedRow.applied.k2o).toBeGreaterThan(0);
    expect(noP.seedRow.applied.k2o).toBeLessThanOrEqual(15 + 1e-9);
  });

  it('cereals: N + K2O with the seed at most 40 lb/ac', () => {
    // [published] Alberta Agriculture potassium guide (older edition): N + K2O with the seed at most 40 lb/ac
    const p = plan({
      crop: 'barley',
      target_yield_bu: 80,
      implement: { opener_spread_in: 3, row_spacing_in: 6 },
      seed_row: { when_table_missing: 'ask' },
      products: [
        { product: 'urea', placements: ['seed_row', 'side_band'], step: 0 },
        { product: 'potash', placements: ['seed_row'], step: 0 },
      ],
      strategy: {
        n: { method: 'mass_balance' },
        p: { method: 'none' },
        k: { method: 'response_class' },
        tolerance_pct: 25,
      },
    });
    const d = decide({ ...SOIL, no3_n: 0, k: 100 }, p, T);
    // [published] Manitoba Agriculture: medium soil, 3 in spread on 6 in rows, 40 lb urea-N; potash must go with the seed
    expect(d.seedRow.n).toBe(40);
    expect(d.status).toBe('ok');
    expect(d.seedRow.applied.k2o).toBeGreaterThan(0);
    expect(d.seedRow.applied.n + d.seedRow.applied.k2o).toBeLessThanOrEqual(40 + 1e-6);
    expect(d.binding.join()).toContain('seed-row N + K2O limit 40 lb/ac');
  });
});

describe('potassium by class, practical rates', () => {
  it('canola just under the old 150 ppm level gets no potash (was 2.4 lb K2O, 20 lb potash at a 20 lb minimum)', () => {
    // common practice (agronomy.md): rates go by class with a minimum useful rate, not (critical - test) x 2.41
    const p = parsePlan(planTemplate('canola', T), 'canola.yaml', T);
    const d = decide({ ...SOIL, k: 149 }, p, T);
    expect(d.nutrients.k2o.target.lbac).toBe(0);
    expect(d.placements.flatMap((x) => x.products).some((q) => q.product === 'potash')).toBe(false);
  });

  it('every crop starter plan runs on a typical soil; every rate is 0 or at least 20 lb/ac, in 5 lb steps', () => {
    // common practice: the smallest rate worth metering; starter plans use 20 lb/ac and 5 lb/ac steps
    for (const crop of Object.keys(T.crops)) {
      for (const texture of ['light', 'medium', 'heavy'] as const) {
        const p = parsePlan(planTemplate(crop, T), `${crop}.yaml`, T);
        const d = decide({ ...SOIL, texture }, p, T);
        expect(d.status, `${crop} ${texture}`).toBe('ok');
        for (const q of d.placements.flatMap((x) => x.products)) {
          expect(q.rate.value).toBeGreaterThanOrEqual(20);
          expect(q.rate.value % 5).toBe(0);
        }
      }
    }
  });

  it('a negative one-year P return is called a soil-balance choice, with the drawdown', () => {
    // common practice (agronomy.md): 30-35 % of applied P is used in the year; removal 0.9 lb P2O5/bu (common
    // practice) and 18 lb P2O5 per ppm ([published] Canola Watch 2016: 12-40) give the drawdown
    const p = parsePlan(planTemplate('canola', T), 'canola.yaml', T);
    const d = decide({ ...SOIL, p: 15 }, p, T);
    const e = d.economics.find((x) => x.nutrient === 'p2o5')!;
    expect(e.expectedNet).toBeLessThan(0);
    expect(e.note).toContain('soil-balance choice');
    expect(e.note).toContain('45 lb P2O5/ac (about 2.5 ppm Olsen');
  });
});

describe('N efficiency by placement and timing', () => {
  const products = (pl: 'side_band' | 'broadcast') => [
    { product: 'urea', placements: [pl], step: 0, max_rate: 800 },
  ];
  const base = {
    crop: 'wheat',
    target_yield_bu: 60,
    implement: { placements: ['seed_row', 'side_band', 'broadcast'] as Placement[] },
    seed_row: { when_table_missing: 'ask' as const },
    strategy: { n: { method: 'mass_balance' as const }, p: { method: 'none' as const }, tolerance_pct: 0 },
  };

  it('spring broadcast N counts 100/120 of spring-banded N; fall banding as spring broadcast', () => {
    // [published] Canola Digest, Jan 2018 (Manitoba relative values, spring broadcast = 100): spring band about
    // 20 % better; [published] Manitoba Agriculture, N options when seeding is delayed: fall band similar to spring broadcast
    const band = decide(SOIL, plan({ ...base, products: products('side_band') }), T);
    const bc = decide(SOIL, plan({ ...base, products: products('broadcast') }), T);
    expect(bc.nutrients.n.supplied.lbac / band.nutrients.n.supplied.lbac).toBeCloseTo(1.2, 6);
    const fall = decide(
      SOIL,
      plan({
        ...base,
        strategy: { ...base.strategy, n: { timing: 'fall' } },
        products: products('side_band'),
      }),
      T,
    );
    expect(fall.nutrients.n.supplied.lbac).toBeCloseTo(bc.nutrients.n.supplied.lbac, 6);
  });

  it('fall broadcast is missing from the table: the plan is asked, never given an invented value', () => {
    try {
      decide(
        SOIL,
        plan({
          ...base,
          strategy: { ...base.strategy, n: { timing: 'fall' } },
          products: products('broadcast'),
        }),
        T,
      );
      expect.unreachable();
    } catch (e) {
      expect(isUserError(e)).toBe(true);
      expect((e as Error).message).toContain('strategy.n.efficiency');
    }
    const given = decide(
      SOIL,
      plan({
        ...base,
        strategy: { ...base.strategy, n: { timing: 'fall', efficiency: 0.7 } },
        products: products('broadcast'),
      }),
      T,
    );
    expect(given.nutrients.n.target.lbac).toBeCloseTo((2.75 * 60 - 25) / 0.7, 6);
    const edited = loadTables(
      'n_relative_efficiency:\n  fall:\n    broadcast: { value: 70, source: "my agronomist" }\n',
      't.yaml',
    );
    expect(
      decide(
        SOIL,
        plan(
          { ...base, strategy: { ...base.strategy, n: { timing: 'fall' } }, products: products('broadcast') },
          edited,
        ),
        edited,
      ).status,
    ).toBe('ok');
  });
});

describe('demo data', () => {
  it('the demo plan says fall sampling, as the lab file does', () => {
    const csv = readFileSync(new URL('../../sample-fields/quarter/samples.csv', import.meta.url), 'utf8');
    const received = /^Received,(\d{4})-(\d{2})-\d{2}/m.exec(csv)!;
    expect(Number(received[2])).toBeGreaterThanOrEqual(9); // received in the fall
    const p = parsePlan(
      readFileSync(new URL('../../sample-fields/quarter/plan.yaml', import.meta.url), 'utf8'),
      'plan.yaml',
      T,
    );
    expect(p.soil_test.nitrate_sampled).toBe('fall');
  });
});
