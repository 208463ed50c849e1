/**
 * Interpretation of one location's soil test: P class and response probability, K against the crop's
 * critical level, S status, and available N with credits.
 */
import type { PMethod, Texture } from '../types.js';
import type { Plan } from './plan.js';
import type { CropTable, Tables } from './tables.js';

/**
 * One location's soil values in the canonical units of src/types.ts. NaN = not tested.
 * no3_n and so4_s are lb/ac 0-24 in; p and k ppm 0-6 in; om %; ph 1:1 water.
 */
export interface SoilValues {
  no3_n: number;
  p: number;
  k: number;
  so4_s: number;
  om: number;
  ph?: number;
  /** null/undefined = the plan's implement.default_texture */
  texture?: Texture | null;
  /** null/undefined = the plan's soil_test.p_method */
  pMethod?: PMethod | null;
}

export interface Interpretation {
  p: { ppm: number; method: PMethod; className: string | null; responseProbability: number; source: string };
  k: { ppm: number; criticalPpm: number; below: boolean | null; responseProbability: number; source: string };
  s: { lbac: number; status: 'low' | 'not_low_uncertain' | 'not_tested'; lowBelowLb: number };
  n: {
    nitrateLbac: number;
    fallAdjustLb: number;
    omCreditLb: number;
    legumeCreditLb: number;
    otherCreditLb: number;
    /** nitrate after the fall adjustment, plus credits, lb N/ac */
    availableLb: number;
  };
}

/**
 * The P class of a test value by method (classes are half-open: [previous below, below)); null when not tested.
 * @example pClass(10, 'olsen', defaultTables())!.name // 'medium'
 */
export function pClass(ppm: number, method: PMethod, tables: Tables): Tables['p_classes']['olsen'][number] | null {
  if (!Number.isFinite(ppm)) return null;
  for (const c of tables.p_classes[method]) if (c.below_ppm === null || ppm < c.below_ppm) return c;
  return null;
}

/**
 * Interprets one location's soil test for the plan's crop.
 * @example interpret({ no3_n: 25, p: 8, k: 140, so4_s: 12, om: 4 }, crop, plan, tables).p.className // 'low'
 */
export function interpret(soil: SoilValues, crop: CropTable, plan: Plan, tables: Tables): Interpretation {
  const method = soil.pMethod ?? plan.soil_test.p_method;
  const pc = pClass(soil.p, method, tables);
  const kc = crop.k_critical_ppm.value;
  const kBelow = Number.isFinite(soil.k) ? soil.k < kc : null;
  const kp = kBelow === null ? NaN : kBelow ? tables.k_response_probability.below_critical : tables.k_response_probability.above_critical;
  const sLow = crop.s_low_below_lb.value;
  const sStatus = !Number.isFinite(soil.so4_s) ? 'not_tested' : soil.so4_s < sLow ? 'low' : 'not_low_uncertain';

  const nitrate = Number.isFinite(soil.no3_n) ? Math.max(0, soil.no3_n) : 0;
  const fall = plan.soil_test.nitrate_sampled === 'fall' ? Math.min(nitrate, tables.soil.fall_nitrate_adjust_lb.value) : 0;
  const om = plan.credits.organic_matter && Number.isFinite(soil.om) ? Math.max(0, soil.om) * tables.soil.om_n_lb_per_pct.value * tables.soil.om_n_available.value : 0;
  const legume = plan.credits.previous_crop_legume ? tables.soil.legume_credit_lb.value : 0;
  const other = plan.credits.other_lb_n;
  return {
    p: { ppm: soil.p, method, className: pc?.name ?? null, responseProbability: pc?.response_probability ?? NaN, source: pc?.source ?? 'P not tested' },
    k: { ppm: soil.k, criticalPpm: kc, below: kBelow, responseProbability: typeof kp === 'number' ? kp : kp.value, source: crop.k_critical_ppm.source },
    s: { lbac: soil.so4_s, status: sStatus, lowBelowLb: sLow },
    n: { nitrateLbac: nitrate, fallAdjustLb: fall, omCreditLb: om, legumeCreditLb: legume, otherCreditLb: other, availableLb: nitrate - fall + om + legume + other },
  };
}
