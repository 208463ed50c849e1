/**
 * Seed-row safety: seedbed utilization (SBU) and the safe N with the seed, interpolated in SBU
 * between the published table points. See docs/method.md, "Seed-row limits".
 */
import { UserError } from '../errors.js';
import type { Texture } from '../types.js';
import type { Plan } from './plan.js';
import type { CropTable, SeedRowCell, Tables } from './tables.js';

/**
 * Seedbed utilization, percent: opener spread / row spacing x 100
 * ([published] Manitoba Agriculture, Guidelines for Safely Applying Fertilizer with Seed).
 * @example sbuPct(2, 6) // 33.33
 */
export function sbuPct(spreadIn: number, rowSpacingIn: number): number {
  return Math.min(100, (spreadIn / rowSpacingIn) * 100);
}

type SeedRowTable = Exclude<SeedRowCell, { missing: true }>;

/**
 * A table's known cells as (SBU %, safe N) points sorted by SBU; equal SBUs keep the lowest N. Cells marked
 * null (not found in the source) are left out.
 * @example sbuPoints(defaultTables().seed_row_n.cereal.medium)[0] // { sbu: 8.33, n: 10 }
 */
export function sbuPoints(cell: SeedRowTable): { sbu: number; n: number }[] {
  const raw: { sbu: number; n: number }[] = [];
  cell.spreads_in.forEach((s, i) =>
    cell.rows_in.forEach((r, j) => {
      const v = cell.safe_n[i]![j];
      if (v !== null && v !== undefined) raw.push({ sbu: sbuPct(s, r), n: v });
    }),
  );
  raw.sort((a, b) => a.sbu - b.sbu || a.n - b.n);
  const out: { sbu: number; n: number }[] = [];
  for (const p of raw) {
    const last = out[out.length - 1];
    if (last && Math.abs(p.sbu - last.sbu) < 1e-9) last.n = Math.min(last.n, p.n);
    else out.push({ ...p });
  }
  return out;
}

/**
 * Safe N at a given SBU by linear interpolation between the table points. Below the smallest
 * tabled SBU it interpolates toward 0 N at 0 % SBU; above the largest it stays at the largest
 * SBU's value (never extrapolates upward).
 * @example interpolateSbu([{ sbu: 16.7, n: 20 }, { sbu: 33.3, n: 30 }], 25) // 25
 */
export function interpolateSbu(points: readonly { sbu: number; n: number }[], sbu: number): number {
  const pts = [{ sbu: 0, n: 0 }, ...points];
  if (sbu >= pts[pts.length - 1]!.sbu) return pts[pts.length - 1]!.n;
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!,
      b = pts[i]!;
    if (sbu <= b.sbu)
      return b.sbu === a.sbu ? Math.min(a.n, b.n) : a.n + ((b.n - a.n) * (sbu - a.sbu)) / (b.sbu - a.sbu);
  }
  return 0;
}

/**
 * Safe N from a table that may have cells not found in the source (null). Safe N never falls as SBU rises, so
 * a known 0 at or above the SBU settles it at 0. Otherwise the value is interpolated only where no unknown cell
 * lies between the known points around the SBU, and never beyond the largest known SBU while unknown cells
 * lie there; else null (ask the user). A table without null cells is plain `interpolateSbu`.
 * @example safeNFromTable(defaultTables().seed_row_n.canola.medium, 10) // 0
 */
export function safeNFromTable(cell: SeedRowTable, sbu: number): number | null {
  const pts = sbuPoints(cell);
  const unknown: number[] = [];
  cell.spreads_in.forEach((s, i) =>
    cell.rows_in.forEach((r, j) => {
      if (cell.safe_n[i]![j] === null) unknown.push(sbuPct(s, r));
    }),
  );
  if (unknown.length === 0) return interpolateSbu(pts, sbu);
  const above = pts.filter((p) => p.sbu >= sbu - 1e-9);
  if (above.length && Math.min(...above.map((p) => p.n)) === 0) return 0;
  if (!above.length || pts.length === 0) return null;
  const hi = above[0]!.sbu;
  const lo = pts.filter((p) => p.sbu < sbu).pop()?.sbu ?? 0;
  return unknown.some((u) => u > lo + 1e-9 && u < hi - 1e-9) ? null : interpolateSbu(pts, sbu);
}

/** The seed-row limits for one location. */
export interface SeedRowLimits {
  /** percent */
  sbu: number;
  texture: Texture;
  /** lb N/ac from products whose seed-row N counts against the urea-N table (urea, UAN, ammonium sulphate, thiosulphate) */
  n: number;
  nSource: string;
  /** lb P2O5/ac as MAP (the N of a `within_p_limit` product inside it is allowed for) */
  p2o5: number;
  pSource: string;
  /** P2O5 + K2O together stay within the P limit */
  p2o5K2o: number;
  k2o: number;
  kSource: string;
  /** all N + K2O with the seed (Infinity: no such limit) */
  nK2o: number;
  /** potash may go with the seed only when nothing else is there */
  kAlone: boolean;
  notes: string[];
}

function missingN(
  cropKey: string,
  texture: Texture,
  why: string,
  group: Tables['seed_row_n'][string],
  sbu: number,
  plan: Plan,
): { n: number; nSource: string } {
  const light = group.light;
  const lightN = 'missing' in light ? null : safeNFromTable(light, sbu);
  const mode = plan.seed_row.when_table_missing;
  if (mode === 'ask') {
    const hint =
      lightN === null
        ? ''
        : ` (the light-soil value at SBU ${sbu.toFixed(1)} % is ${lightN.toFixed(1)} lb N/ac)`;
    throw new UserError(
      `seed-row N for ${cropKey} on ${texture} soil at SBU ${sbu.toFixed(1)} % is not in the tables: ${why}. ` +
        `Fix: in the plan set seed_row.safe_n_lb to the lb N/ac you and your agronomist confirm, or seed_row.when_table_missing: light_soil_values${hint} or none_in_seed_row.`,
      { field: 'seed_row.when_table_missing' },
    );
  }
  if (mode === 'light_soil_values' && lightN !== null) {
    return {
      n: lightN,
      nSource: `${texture}-soil value missing (${why}); light-soil value used as confirmed in plan key seed_row.when_table_missing: ${(light as SeedRowTable).source}`,
    };
  }
  return {
    n: 0,
    nSource: `${texture}-soil value missing (${why}); no urea-type N in the seed row (plan key seed_row.when_table_missing)`,
  };
}

function seedRowN(
  crop: CropTable,
  cropKey: string,
  texture: Texture,
  sbu: number,
  plan: Plan,
  tables: Tables,
  notes: string[],
): { n: number; nSource: string } {
  const group = tables.seed_row_n[crop.seed_row_group]!;
  const cell = group[texture];
  const v = 'missing' in cell ? null : safeNFromTable(cell, sbu);
  if (plan.seed_row.safe_n_lb !== null) {
    const own = plan.seed_row.safe_n_lb;
    // an override far above the published table (more than 1.5 x, and 10 lb N/ac over) is kept, and said plainly
    if (v !== null && own > 1.5 * v && own - v > 10) {
      notes.push(
        `seed-row N ${own} lb N/ac from plan key seed_row.safe_n_lb is far above the published table's ${v.toFixed(1)} lb N/ac for ${cropKey} on ${texture} soil at SBU ${sbu.toFixed(1)} % (${cell.source}); so much N with the seed can injure or kill seedlings. Have your agronomist confirm it.`,
      );
    }
    return { n: own, nSource: `plan key seed_row.safe_n_lb (${own} lb N/ac, supplied by the user)` };
  }
  let r: { n: number; nSource: string };
  if (v !== null && !('missing' in cell)) r = { n: v, nSource: `${cell.source}; at SBU ${sbu.toFixed(1)} %` };
  else {
    r = missingN(
      cropKey,
      texture,
      'missing' in cell ? cell.source : `no published cell at this SBU (${cell.source})`,
      group,
      sbu,
      plan,
    );
    notes.push(r.nSource);
  }
  if (plan.implement.seedbed_moisture === 'dry') {
    r.n *= tables.dry_seedbed_factor.value;
    r.nSource += `; x ${tables.dry_seedbed_factor.value} for a dry seedbed (${tables.dry_seedbed_factor.source})`;
  }
  return r;
}

/**
 * Seed-row limits for the plan's crop and implement on a soil of the given texture.
 * - urea-type N: the crop's table at the plan's SBU; missing cells follow `plan.seed_row.when_table_missing`
 *   (`ask` throws a UserError naming the plan keys); `plan.seed_row.safe_n_lb`, when set, replaces the table.
 * - P2O5 as MAP: the plan's guideline (`seed_row.p_guideline`, default manitoba) x min(1, SBU / the SBU of the
 *   configuration the guideline was stated for): lowered for a narrower spread or wider rows, never raised.
 * - P2O5 + K2O: the same limit. K2O: the crop's limit; for crops whose potash must go alone (canola, peas) 0
 *   unless the plan sets `seed_row.potash_with_seed`. N + K2O: the crop's limit (cereals 40).
 * - a dry seedbed multiplies every limit by `dry_seedbed_factor`.
 * @example seedRowLimits(tables.crops.wheat, 'wheat', 'medium', plan, tables).n // 15.6 at 1 in on 10 in rows
 */
export function seedRowLimits(
  crop: CropTable,
  cropKey: string,
  texture: Texture,
  plan: Plan,
  tables: Tables,
): SeedRowLimits {
  const sbu = sbuPct(plan.implement.opener_spread_in, plan.implement.row_spacing_in);
  const notes: string[] = [];
  const { n, nSource } = seedRowN(crop, cropKey, texture, sbu, plan, tables, notes);
  const dry = plan.implement.seedbed_moisture === 'dry' ? tables.dry_seedbed_factor.value : 1;
  const dryText = dry < 1 ? `; x ${dry} for a dry seedbed` : '';
  const g = crop.seed_row_p2o5[plan.seed_row.p_guideline];
  const refSbu = sbuPct(g.spread_in, g.rows_in);
  const f = Math.min(1, sbu / refSbu);
  const p2o5 = g.value * f * dry;
  const pSource = `${g.source}; ${g.value} lb P2O5/ac at ${g.spread_in} in on ${g.rows_in} in rows (SBU ${refSbu.toFixed(1)} %)${f < 1 ? `, x ${f.toFixed(2)} for SBU ${sbu.toFixed(1)} % (lowered, never raised)` : ''}${dryText} (plan key seed_row.p_guideline: ${plan.seed_row.p_guideline})`;
  const alone = crop.seed_row_k2o_alone.value;
  const kAllowed = !alone || plan.seed_row.potash_with_seed;
  const k2o = kAllowed ? crop.seed_row_k2o_max.value * dry : 0;
  const kSource = kAllowed
    ? `${crop.seed_row_k2o_max.source}${alone ? ' (plan key seed_row.potash_with_seed: true)' : ''}${dryText}`
    : `no potash with ${crop.label} seed unless the plan sets seed_row.potash_with_seed (${crop.seed_row_k2o_alone.source})`;
  const nk = crop.seed_row_n_k2o_max.value;
  return {
    sbu,
    texture,
    n,
    nSource,
    p2o5,
    pSource,
    p2o5K2o: p2o5,
    k2o,
    kSource,
    nK2o: nk === null ? Infinity : nk * dry,
    kAlone: alone && kAllowed,
    notes,
  };
}
