/**
 * Interpretation of one location's soil test: P class and response probability, K class against the crop's
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
  p: {
    ppm: number;
    method: PMethod;
    className: string | null;
    responseProbability: number;
    source: string;
    kelownaFactor: number | null;
  };
  k: {
    ppm: number;
    criticalPpm: number;
    below: boolean | null;
    className: string | null;
    responseProbability: number;
    classK2o: number;
    source: string;
  };
  s: { lbac: number; status: 'low' | 'not_low_uncertain' | 'not_tested'; lowBelowLb: number };
  n: {
    nitrateLbac: number;
    /** spring mineralization added to a fall sample when the plan asks (never a deduction) */
    springMineralizationLb: number;
    omCreditLb: number;
    legumeCreditLb: number;
    otherCreditLb: number;
    /** nitrate plus credits, lb N/ac */
    availableLb: number;
  };
}

/** The default `soil_test.kelowna_factor` (common practice: modified Kelowna reads about 10-50 % above Olsen). */
export const DEFAULT_KELOWNA_FACTOR = 1.3;

export type PClassRow = Tables['p_classes']['olsen'][number];

/**
 * The P classes for a test method. Olsen: the table. Modified Kelowna: each Olsen bound x `kelownaFactor`,
 * except bounds published for Kelowna (tables `p_classes.kelowna_published_below_ppm`), which win.
 * @example pClassTable('kelowna', defaultTables(), 1.3).map((c) => c.below_ppm) // [6.5, 17, 26, 39, null]
 */
export function pClassTable(
  method: PMethod,
  tables: Tables,
  kelownaFactor = DEFAULT_KELOWNA_FACTOR,
): PClassRow[] {
  const olsen = tables.p_classes.olsen;
  if (method === 'olsen') return olsen;
  const pub = tables.p_classes.kelowna_published_below_ppm;
  return olsen.map((c) => {
    const p = pub[c.name];
    if (c.below_ppm === null)
      return {
        ...c,
        source: `${c.source}; modified Kelowna: Olsen bounds x ${kelownaFactor} (plan key soil_test.kelowna_factor)`,
      };
    if (p)
      return {
        ...c,
        below_ppm: p.value,
        source: `${c.source}; modified Kelowna bound ${p.value} ppm: ${p.source}`,
      };
    return {
      ...c,
      below_ppm: Math.round(c.below_ppm * kelownaFactor * 100) / 100,
      source: `${c.source}; modified Kelowna: Olsen bound x ${kelownaFactor} (plan key soil_test.kelowna_factor)`,
    };
  });
}

/**
 * The P class of a test value by method (classes are half-open: [previous below, below)); null when not tested.
 * @example pClass(10, 'olsen', defaultTables())!.name // 'medium'
 */
export function pClass(
  ppm: number,
  method: PMethod,
  tables: Tables,
  kelownaFactor = DEFAULT_KELOWNA_FACTOR,
): PClassRow | null {
  if (!Number.isFinite(ppm)) return null;
  for (const c of pClassTable(method, tables, kelownaFactor))
    if (c.below_ppm === null || ppm < c.below_ppm) return c;
  return null;
}

/**
 * The K class of a test value for a crop (its `k_class_group` table); null when not tested.
 * @example kClass(115, defaultTables().crops.canola!, defaultTables())!.name // 'medium'
 */
export function kClass(
  ppm: number,
  crop: CropTable,
  tables: Tables,
): Tables['k_classes'][string][number] | null {
  if (!Number.isFinite(ppm)) return null;
  for (const c of tables.k_classes[crop.k_class_group]!)
    if (c.below_ppm === null || ppm < c.below_ppm) return c;
  return null;
}

/**
 * Interprets one location's soil test for the plan's crop.
 * @example interpret({ no3_n: 25, p: 8, k: 140, so4_s: 12, om: 4 }, crop, plan, tables).p.className // 'low'
 */
export function interpret(soil: SoilValues, crop: CropTable, plan: Plan, tables: Tables): Interpretation {
  const method = soil.pMethod ?? plan.soil_test.p_method;
  const factor = plan.soil_test.kelowna_factor;
  const pc = pClass(soil.p, method, tables, factor);
  const kc = kClass(soil.k, crop, tables);
  const crit = crop.k_critical_ppm.value;
  const sLow = crop.s_low_below_lb.value;
  const sStatus = !Number.isFinite(soil.so4_s)
    ? 'not_tested'
    : soil.so4_s < sLow
      ? 'low'
      : 'not_low_uncertain';

  const nitrate = Number.isFinite(soil.no3_n) ? Math.max(0, soil.no3_n) : 0;
  const minz =
    plan.soil_test.nitrate_sampled === 'fall' && plan.credits.fall_sample_mineralization
      ? tables.soil.spring_mineralization_lb.value
      : 0;
  const om =
    plan.credits.organic_matter && Number.isFinite(soil.om)
      ? Math.max(0, soil.om) * tables.soil.om_n_lb_per_pct.value * tables.soil.om_n_available.value
      : 0;
  const legume = plan.credits.previous_crop_legume ? tables.soil.legume_credit_lb.value : 0;
  const other = plan.credits.other_lb_n;
  return {
    p: {
      ppm: soil.p,
      method,
      className: pc?.name ?? null,
      responseProbability: pc?.response_probability ?? NaN,
      source: pc?.source ?? 'P not tested',
      kelownaFactor: method === 'kelowna' ? factor : null,
    },
    k: {
      ppm: soil.k,
      criticalPpm: crit,
      below: Number.isFinite(soil.k) ? soil.k < crit : null,
      className: kc?.name ?? null,
      responseProbability: kc?.response_probability ?? NaN,
      classK2o: kc?.k2o_lb ?? 0,
      source: kc?.source ?? 'K not tested',
    },
    s: { lbac: soil.so4_s, status: sStatus, lowBelowLb: sLow },
    n: {
      nitrateLbac: nitrate,
      springMineralizationLb: minz,
      omCreditLb: om,
      legumeCreditLb: legume,
      otherCreditLb: other,
      availableLb: nitrate + minz + om + legume + other,
    },
  };
}
