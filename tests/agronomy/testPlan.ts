/** The test plan the rate-engine tests share: default tables, a typical soil, a plan with everything off unless asked. */
import { defaultTables, validatePlan, type PlanInput, type Tables } from '../../src/agronomy/index.js';

export const T = defaultTables();
export const SOIL = { no3_n: 25, p: 8, k: 140, so4_s: 12, om: 4 };

/** A plan with only the given products, side band only, continuous rates, no tolerance, strategies off unless asked. */
export function plan(over: Partial<PlanInput> & Record<string, unknown> = {}, tables: Tables = T) {
  return validatePlan(
    {
      crop: 'wheat',
      target_yield_bu: 60,
      implement: { placements: ['seed_row', 'side_band'] },
      products: [{ product: 'map', placements: ['side_band'], step: 0 }],
      // canola on medium soil has no published seed-row N value: these tests use the light-soil values
      seed_row: { when_table_missing: 'light_soil_values' },
      ...over,
      strategy: {
        n: { method: 'none' },
        p: { method: 'none' },
        k: { method: 'none' },
        s: { method: 'none' },
        tolerance_pct: 0,
        ...(over.strategy as object),
      },
    },
    'test plan',
    tables,
  );
}
