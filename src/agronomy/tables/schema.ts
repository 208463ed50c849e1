/** The agronomy tables' schema and types (zod): what every entry holds, each with its `source`. */
import { z } from 'zod';
import { PLACEMENTS, NUTRIENTS, type Placement, type Nutrient } from '../../vocabulary.js';

/** Where a value comes from: `[published] <publication>`, `common practice...`, `from memory...`, `missing...`, or the user's own note. */
const source = z.string().min(3);
const num = (min = 0) => z.object({ value: z.number().min(min), source });
const bool = z.object({ value: z.boolean(), source });
const prob = z.object({ value: z.number().min(0).max(1), source });

// defined with the shared vocabulary, which every command loads without zod and yaml
export { PLACEMENTS, NUTRIENTS, type Placement, type Nutrient };
export const TEXTURES = ['light', 'medium', 'heavy'] as const;

/** A seed-placed P2O5 guideline "as MAP": the value and the drill configuration it was stated for. */
const seedPGuide = z.object({
  value: z.number().min(0),
  spread_in: z.number().positive(),
  rows_in: z.number().positive(),
  source,
});

const cropSchema = z.object({
  label: z.string(),
  bushel_lb: num(1),
  n_per_bu: num(),
  removal_per_bu: z.object({ n: num(), p2o5: num(), k2o: num(), s: num() }),
  /** the soil-test K below which a response class may call for K2O (the upper bound of the crop's K classes) */
  k_critical_ppm: num(),
  k_responds_above_critical: bool,
  /** which K class table the crop uses (a key of `k_classes`) */
  k_class_group: z.string(),
  s_low_below_lb: num(),
  s_when_low_lb: num(),
  s_floor_lb: num(),
  /** which seed-row N table the crop uses (a key of `seed_row_n`) */
  seed_row_group: z.string(),
  /** seed-placed P2O5 as MAP, by provincial guideline (plan key seed_row.p_guideline) */
  seed_row_p2o5: z.object({ manitoba: seedPGuide, saskatchewan: seedPGuide }),
  seed_row_k2o_max: num(),
  /** potash with the seed only when nothing else goes there (and only when the plan opts in) */
  seed_row_k2o_alone: bool,
  /** N + K2O with the seed at most this (null: no such limit) */
  seed_row_n_k2o_max: z.object({ value: z.number().min(0).nullable(), source }),
  /** the crop is always offered its seed-row P starter, whatever the soil test */
  seed_row_starter: bool,
});

const seedRowCell = z.union([
  z.object({
    spreads_in: z.array(z.number().positive()).min(1),
    rows_in: z.array(z.number().positive()).min(1),
    /** safe_n[spread index][row index], lb N/ac */
    safe_n: z.array(z.array(z.number().min(0).nullable())),
    source,
  }),
  z.object({ missing: z.literal(true), source }),
]);

const pClass = z.object({
  name: z.string(),
  /** upper bound (exclusive) of the class in ppm Olsen; null for the last class */
  below_ppm: z.number().positive().nullable(),
  response_probability: z.number().min(0).max(1),
  source,
});

const kClass = z.object({
  name: z.string(),
  /** upper bound (exclusive) in ppm; null for the last class (at or above the critical level) */
  below_ppm: z.number().positive().nullable(),
  response_probability: z.number().min(0).max(1),
  /** lb K2O/ac for the class */
  k2o_lb: z.number().min(0),
  source,
});

export const P_RULES = ['build_plus_removal', 'removal', 'fraction_of_removal', 'starter_or_none'] as const;

const nEffCell = z.union([
  z.object({ value: z.number().positive(), source }),
  z.object({ missing: z.literal(true), source }),
]);
const nEffTiming = z.object({ seed_row: nEffCell, band: nEffCell, broadcast: nEffCell });

const productSchema = z.object({
  label: z.string(),
  n: z.number().min(0).max(100),
  p2o5: z.number().min(0).max(100),
  k2o: z.number().min(0).max(100),
  s: z.number().min(0).max(100),
  form: z.enum(['granular', 'liquid']),
  /** liquids: kg per litre, for volume rates (ISO 11783-10 task data writes liquids as volume per area) */
  density_kg_l: z.object({ value: z.number().positive().max(3), source }).optional(),
  placements: z.array(z.enum(PLACEMENTS)).min(1),
  price_per_tonne: z.number().min(0),
  /** in the seed row: `counts` against the urea-N table, or `within_p_limit` (the P2O5 limit is stated as this product, its N allowed for) */
  seed_row_n: z.enum(['counts', 'within_p_limit']).default('counts'),
  source,
  price_source: source,
});

const effSchema = z.object({
  p2o5: z.number().positive().max(1),
  k2o: z.number().positive().max(1),
  s: z.number().positive().max(1),
  source,
});

export const tablesSchema = z.object({
  crops: z.record(z.string(), cropSchema),
  seed_row_n: z.record(z.string(), z.object({ light: seedRowCell, medium: seedRowCell, heavy: seedRowCell })),
  dry_seedbed_factor: prob,
  p_classes: z.object({
    olsen: z.array(pClass).min(1),
    /** published modified Kelowna class bounds (ppm) that win over Olsen x soil_test.kelowna_factor, by class name */
    kelowna_published_below_ppm: z.record(z.string(), num()),
  }),
  p_class_rates: z.record(
    z.string(),
    z.object({ rule: z.enum(P_RULES), fraction: z.number().min(0).max(2).default(1), source }),
  ),
  k_classes: z.record(z.string(), z.array(kClass).min(1)),
  k_min_useful_lb: num(),
  yield_gain_pct: z.object({
    p: z.record(z.string(), num()),
    k: z.record(z.string(), num()),
  }),
  soil: z.object({
    p2o5_per_ppm: num(),
    om_n_lb_per_pct: num(),
    om_n_available: prob,
    spring_mineralization_lb: num(),
    legume_credit_lb: num(),
  }),
  /** N relative efficiency by timing and placement, spring broadcast = 100; `reference` is what the N/bu values assume */
  n_relative_efficiency: z.object({
    reference: z.object({
      timing: z.enum(['spring', 'fall']),
      placement: z.enum(['seed_row', 'band', 'broadcast']),
      source,
    }),
    spring: nEffTiming,
    fall: nEffTiming,
  }),
  placement_efficiency: z.object({
    seed_row: effSchema,
    side_band: effSchema,
    mid_row_band: effSchema,
    broadcast: effSchema,
  }),
  products: z.record(z.string(), productSchema),
});

/** The validated agronomy tables (see docs/method.md, "Rate engine"). */
export type Tables = z.infer<typeof tablesSchema>;
export type TablesInput = z.input<typeof tablesSchema>;
export type CropTable = z.infer<typeof cropSchema>;
export type SeedRowCell = z.infer<typeof seedRowCell>;
