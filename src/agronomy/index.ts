/** The rate engine: pure agronomy, no spatial code. See docs/method.md, "Rate engine". */
export { decide } from './decide.js';
export {
  type Decision,
  type Rate,
  type ProductRate,
  type PlacementResult,
  type NutrientResult,
  type Economics,
} from './decision.js';
export {
  interpret,
  pClass,
  pClassTable,
  kClass,
  DEFAULT_KELOWNA_FACTOR,
  type SoilValues,
  type Interpretation,
} from './interpret.js';
export {
  parsePlan,
  validatePlan,
  planSchema,
  type Plan,
  type PlanInput,
  type ProductChoice,
} from './plan.js';
export { planTemplate } from './template.js';
export {
  sbuPct,
  sbuPoints,
  interpolateSbu,
  safeNFromTable,
  seedRowLimits,
  type SeedRowLimits,
} from './seedrow.js';
export { productOptions, nEfficiency, solveProducts, type ProductOption, type SolveResult } from './solve.js';
export {
  defaultTables,
  loadTables,
  tablesToYaml,
  tablesSchema,
  PLACEMENTS,
  NUTRIENTS,
  type Tables,
  type Nutrient,
  type Placement,
} from './tables.js';
export { targets, type Target, type Targets } from './targets.js';
export { formatDecision } from './format.js';
export { parseSoilSpec } from './soil.js';
