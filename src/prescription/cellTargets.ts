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
    if (w0 * w1 <= TABLE_MAX) {
      // the common case: a flat table, filled by a loop specialised to one or two present surfaces
      // (one loop for every shape made V8 drop its optimised code at each change of shape)
      const table = new Float64Array(w0 * w1);
      const known = new Uint8Array(w0 * w1);
      if (s0 && s1) fillTwo(arr, fraction, s0, s1, q0, q1, r0.lo, r1.lo, w1, table, known, one);
      else if (s0) fillOne(arr, fraction, s0, q0, r0.lo, table, known, (v) => one(v, NaN));
      else if (s1) fillOne(arr, fraction, s1, q1, r1.lo, table, known, (v) => one(NaN, v));
    } else fillMap(arr, fraction, s0, s1, q0, q1, one);
    out[nut] = arr;
  }
  return out;
}

/** Targets of cells read from a flat table over one quantized driver (entries made on first use). */
function fillOne(
  arr: Float64Array,
  fraction: ArrayLike<number>,
  s: Float64Array,
  q: number,
  lo: number,
  table: Float64Array,
  known: Uint8Array,
  one: (v: number) => number,
): void {
  for (let i = 0; i < arr.length; i++) {
    if (!(fraction[i] > 0)) continue;
    const a = s[i];
    if (a !== a) continue;
    const k = Math.round(a / q);
    const at = k - lo;
    if (known[at] === 0) {
      table[at] = one(k * q);
      known[at] = 1;
    }
    arr[i] = table[at];
  }
}

/** Targets of cells read from a flat table over two quantized drivers (row = first, column = second). */
function fillTwo(
  arr: Float64Array,
  fraction: ArrayLike<number>,
  s0: Float64Array,
  s1: Float64Array,
  q0: number,
  q1: number,
  lo0: number,
  lo1: number,
  w1: number,
  table: Float64Array,
  known: Uint8Array,
  one: (v0: number, v1: number) => number,
): void {
  for (let i = 0; i < arr.length; i++) {
    if (!(fraction[i] > 0)) continue;
    const a = s0[i];
    if (a !== a) continue;
    const b = s1[i];
    if (b !== b) continue;
    const k0 = Math.round(a / q0);
    const k1 = Math.round(b / q1);
    const at = (k0 - lo0) * w1 + (k1 - lo1);
    if (known[at] === 0) {
      table[at] = one(k0 * q0, k1 * q1);
      known[at] = 1;
    }
    arr[i] = table[at];
  }
}

/** Targets of cells whose drivers spread too far for a flat table: entries kept in a Map by integer key. */
function fillMap(
  arr: Float64Array,
  fraction: ArrayLike<number>,
  s0: Float64Array | undefined,
  s1: Float64Array | undefined,
  q0: number,
  q1: number,
  one: (v0: number, v1: number) => number,
): void {
  const cache = new Map<number, number>();
  for (let i = 0; i < arr.length; i++) {
    if (!(fraction[i] > 0)) continue;
    // a missing surface counts as not tested (NaN)
    const a = s0 ? s0[i] : NaN;
    if (s0 && a !== a) continue;
    const b = s1 ? s1[i] : NaN;
    if (s1 && b !== b) continue;
    const k0 = s0 ? Math.round(a / q0) : 0;
    const k1 = s1 ? Math.round(b / q1) : 0;
    const key = (k0 + 2_000_000) * 4_000_003 + (k1 + 2_000_000);
    let t = cache.get(key);
    if (t === undefined) {
      t = one(s0 ? k0 * q0 : NaN, s1 ? k1 * q1 : NaN);
      cache.set(key, t);
    }
    arr[i] = t;
  }
}
