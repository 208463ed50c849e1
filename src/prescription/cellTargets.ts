/**
 * Nutrient targets for every cell of the field grid, from the nutrient surfaces.
 *
 * Each nutrient's target depends only on its own soil values (N on nitrate and organic matter, P2O5 on
 * the P test, K2O on the K test, S on sulphate-S: see src/agronomy/targets.ts), so the rate engine is run
 * once per distinct value at lab reporting precision (nitrate 0.5 lb/ac, OM 0.05 %, P 0.1 ppm, K 1 ppm,
 * sulphate 0.2 lb/ac) and looked up per cell. That makes a 2.6 million cell grid cheap while giving the
 * same targets the engine gives a lab report. These cell targets only draw the zones; each zone's rates
 * come from its mean soil values through the full engine (src/prescription/index.ts).
 */
import type { Warning } from '../errors.js';
import { interpret, type SoilValues } from '../agronomy/interpret.js';
import type { Plan } from '../agronomy/plan.js';
import { NUTRIENTS, type Nutrient, type Tables } from '../agronomy/tables.js';
import { targets } from '../agronomy/targets.js';
import type { Analyte } from '../types.js';

/** Reporting precision used to share rate-engine runs between cells. */
export const TARGET_PRECISION = { no3_n: 0.5, om: 0.05, p: 0.1, k: 1, so4_s: 0.2 } as const;

/** Entries of the flat lookup table of quantized driver values (8 MB of targets); larger spreads use a Map. */
const TABLE_MAX = 1 << 20;

/** Lowest and highest quantized value (round(v / q)) over the field's cells; 0..0 without a surface or values. */
function keyRange(
  s: Float64Array | undefined,
  q: number,
  fraction: ArrayLike<number>,
): { lo: number; hi: number } {
  if (!s) return { lo: 0, hi: 0 };
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i < s.length; i++) {
    const v = s[i];
    if (!(fraction[i] > 0) || v !== v) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (!(lo <= hi)) return { lo: 0, hi: 0 };
  return { lo: Math.round(lo / q), hi: Math.round(hi / q) };
}

/** Which soil values each nutrient target reads. */
const DRIVERS: Record<Nutrient, Analyte[]> = { n: ['no3_n', 'om'], p2o5: ['p'], k2o: ['k'], s: ['so4_s'] };

/**
 * Per-cell targets (lb/ac) of N, P2O5, K2O and S; NaN where the cell has no soil value.
 * A nutrient whose surface is missing takes the target for "not tested" (NaN soil value).
 *
 * @param surfaces per analyte, row-major values (NaN = none); missing analytes are treated as not tested
 * @param fraction per cell share of the field (cells with 0 are skipped)
 * @example const t = cellTargets({ p: pValues, no3_n: nValues }, grid.fraction, plan, tables); t.p2o5[i]
 */
export function cellTargets(
  surfaces: Partial<Record<Analyte, Float64Array>>,
  fraction: ArrayLike<number>,
  plan: Plan,
  tables: Tables,
): Record<Nutrient, Float64Array> {
  const crop = tables.crops[plan.crop];
  const n = fraction.length;
  const out = {} as Record<Nutrient, Float64Array>;
  const sink: Warning[] = [];
  const base: SoilValues = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN };
  for (const nut of NUTRIENTS) {
    const arr = new Float64Array(n).fill(NaN);
    const drivers = DRIVERS[nut];
    const src = drivers.map((a) => surfaces[a]);
    const q = drivers.map((a) => TARGET_PRECISION[a as keyof typeof TARGET_PRECISION]);
    const one = (v0: number, v1: number) => {
      const soil: SoilValues = { ...base };
      (soil as unknown as Record<string, number>)[drivers[0]] = v0;
      if (drivers.length > 1) (soil as unknown as Record<string, number>)[drivers[1]] = v1;
      const it = interpret(soil, crop, plan, tables);
      sink.length = 0;
      return targets(it, crop, plan, tables, sink)[nut].lbac;
    };
    if (src.every((s) => s === undefined)) {
      const v = one(NaN, NaN);
      for (let i = 0; i < n; i++) if (fraction[i] > 0) arr[i] = v;
      out[nut] = arr;
      continue;
    }
    // at most two drivers (DRIVERS); scalars instead of a per-cell array keep 2.6 M cells free of garbage
    const s0 = src[0],
      s1 = drivers.length > 1 ? src[1] : undefined,
      two = drivers.length > 1;
    const q0 = q[0],
      q1 = two ? q[1] : 1;
    // the quantized driver values' ranges over the field: a flat table indexed by them answers most grids
    // (a few hundred thousand entries at most); far-spread values fall back to a Map
    const r0 = keyRange(s0, q0, fraction),
      r1 = keyRange(s1, q1, fraction);
    const w0 = r0.hi - r0.lo + 1,
      w1 = r1.hi - r1.lo + 1;
    const table = w0 * w1 <= TABLE_MAX ? new Float64Array(w0 * w1) : null;
    const known = table ? new Uint8Array(w0 * w1) : null;
    const cache = new Map<number, number>();
    for (let i = 0; i < n; i++) {
      if (!(fraction[i] > 0)) continue;
      // integer key from the quantized driver values; a missing surface counts as not tested (NaN)
      const a = s0 ? s0[i] : NaN;
      if (s0 && a !== a) continue;
      const b = s1 ? s1[i] : NaN;
      if (s1 && b !== b) continue;
      const k0 = s0 ? Math.round(a / q0) : 0;
      const k1 = s1 ? Math.round(b / q1) : 0;
      let t: number | undefined;
      if (table && known) {
        const at = (k0 - r0.lo) * w1 + (k1 - r1.lo);
        if (known[at] === 1) t = table[at];
        else {
          t = one(s0 ? k0 * q0 : NaN, s1 ? k1 * q1 : NaN);
          table[at] = t;
          known[at] = 1;
        }
      } else {
        const key = two ? (k0 + 2_000_000) * 4_000_003 + (k1 + 2_000_000) : k0 + 2_000_000;
        t = cache.get(key);
        if (t === undefined) {
          t = one(s0 ? k0 * q0 : NaN, s1 ? k1 * q1 : NaN);
          cache.set(key, t);
        }
      }
      arr[i] = t;
    }
    out[nut] = arr;
  }
  return out;
}
