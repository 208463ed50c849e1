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

/**
 * A table's cells as (SBU %, safe N) points sorted by SBU; equal SBUs keep the lowest N.
 * @example sbuPoints(defaultTables().seed_row_n.cereal.medium)[0] // { sbu: 8.33, n: 10 }
 */
export function sbuPoints(cell: Exclude<SeedRowCell, { missing: true }>): { sbu: number; n: number }[] {
  const raw: { sbu: number; n: number }[] = [];
  cell.spreads_in.forEach((s, i) => cell.rows_in.forEach((r, j) => raw.push({ sbu: sbuPct(s, r), n: cell.safe_n[i]![j]! })));
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
    const a = pts[i - 1]!, b = pts[i]!;
    if (sbu <= b.sbu) return b.sbu === a.sbu ? Math.min(a.n, b.n) : a.n + ((b.n - a.n) * (sbu - a.sbu)) / (b.sbu - a.sbu);
  }
  return 0;
}

/** The seed-row limits for one location. */
export interface SeedRowLimits {
  /** percent */
  sbu: number;
  texture: Texture;
  /** lb N/ac, all N with the seed (urea, MAP, ammonium sulphate ...) */
  n: number;
  nSource: string;
  p2o5: number;
  p2o5K2o: number;
  k2o: number;
  notes: string[];
}

/**
 * Seed-row limits for the plan's crop and implement on a soil of the given texture.
 * Missing table cells follow `plan.seed_row.when_table_missing`; `ask` throws a UserError naming the plan keys.
 * `plan.seed_row.safe_n_lb`, when set, replaces the table (and the dry-seedbed factor).
 * @example seedRowLimits(tables.crops.wheat, 'wheat', 'medium', plan, tables).n // 20 at 1 in on 6 in rows
 */
export function seedRowLimits(crop: CropTable, cropKey: string, texture: Texture, plan: Plan, tables: Tables): SeedRowLimits {
  const sbu = sbuPct(plan.implement.opener_spread_in, plan.implement.row_spacing_in);
  const notes: string[] = [];
  let n: number;
  let nSource: string;
  if (plan.seed_row.safe_n_lb !== null) {
    n = plan.seed_row.safe_n_lb;
    nSource = `plan key seed_row.safe_n_lb (${n} lb N/ac, supplied by the user)`;
  } else {
    const group = tables.seed_row_n[crop.seed_row_group]!;
    const cell = group[texture];
    if (!('missing' in cell)) {
      n = interpolateSbu(sbuPoints(cell), sbu);
      nSource = `${cell.source}; interpolated at SBU ${sbu.toFixed(1)} %`;
    } else {
      const light = group.light;
      const mode = plan.seed_row.when_table_missing;
      if (mode === 'ask') {
        const hint = 'missing' in light ? '' : ` (the light-soil value at SBU ${sbu.toFixed(1)} % is ${interpolateSbu(sbuPoints(light), sbu).toFixed(1)} lb N/ac)`;
        throw new UserError(
          `seed-row N for ${cropKey} on ${texture} soil is not in the tables: ${cell.source}. ` +
            `Fix: in the plan set seed_row.safe_n_lb to the lb N/ac you and your agronomist confirm, or seed_row.when_table_missing: light_soil_values${hint} or none_in_seed_row.`,
          { field: 'seed_row.when_table_missing' },
        );
      }
      if (mode === 'light_soil_values' && !('missing' in light)) {
        n = interpolateSbu(sbuPoints(light), sbu);
        nSource = `${texture}-soil value missing (${cell.source}); light-soil value used as confirmed in plan key seed_row.when_table_missing: ${light.source}`;
      } else {
        n = 0;
        nSource = `${texture}-soil value missing (${cell.source}); no N in the seed row (plan key seed_row.when_table_missing)`;
      }
      notes.push(nSource);
    }
    if (plan.implement.seedbed_moisture === 'dry') {
      n *= tables.dry_seedbed_factor.value;
      nSource += `; x ${tables.dry_seedbed_factor.value} for a dry seedbed (${tables.dry_seedbed_factor.source})`;
    }
  }
  return {
    sbu,
    texture,
    n,
    nSource,
    p2o5: crop.seed_row_p2o5_max.value,
    p2o5K2o: crop.seed_row_p2o5_k2o_max.value,
    k2o: crop.seed_row_k2o_max.value,
    notes,
  };
}
