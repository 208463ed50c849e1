/** The tables a report names, each with its source and how that source is marked (published, common practice ...). */
import type { pClassTable } from '../agronomy/interpret.js';
import type { Plan } from '../agronomy/plan.js';
import type { CropTable, Tables } from '../agronomy/tables.js';
import type { ReportTableUsed } from '../report/types.js';
import type { PMethod } from '../types.js';
import { PLACEMENT_KIND_NAME, PLACEMENT_KINDS } from '../vocabulary.js';

function mark(source: string): string {
  if (source.startsWith('[published]')) return 'published';
  if (source.startsWith('common practice')) return 'common practice';
  if (source.startsWith('from memory')) return 'from memory';
  if (source.startsWith('missing')) return 'missing';
  return 'user';
}

type Add = (name: string, source: string) => void;

/**
 * The table entries a prescription used: the crop's, the P classes, N efficiency, the fall sample, the products.
 * @example tablesUsed(plan, tables, tables.crops.canola, pClassTable('olsen', tables, 1.3), 'olsen', false)[0].mark
 */
export function tablesUsed(
  plan: Plan,
  tables: Tables,
  crop: CropTable | undefined,
  pClasses: ReturnType<typeof pClassTable>,
  pMethod: PMethod,
  edited: boolean | undefined,
): ReportTableUsed[] {
  const tablesUsed: ReportTableUsed[] = [];
  const add: Add = (name, source) => tablesUsed.push({ name, source, mark: mark(source), edited });
  if (crop) cropTables(plan, tables, crop, add);
  for (const c of pClasses)
    add(
      `P class ${c.name} (${pMethod}${c.below_ppm === null ? '' : `, below ${c.below_ppm} ppm`}): ${tables.p_class_rates[c.name]?.rule.replace(/_/g, ' ') ?? ''}`,
      `${c.source}; rate: ${tables.p_class_rates[c.name]?.source ?? ''}`,
    );
  const nEff = tables.n_relative_efficiency;
  for (const tm of ['spring', 'fall'] as const)
    for (const pl of PLACEMENT_KINDS) {
      const cell = nEff[tm][pl];
      add(
        `N relative efficiency, ${tm} ${PLACEMENT_KIND_NAME[pl]}: ${'missing' in cell ? 'missing' : cell.value} (spring broadcast = 100; reference ${nEff.reference.timing} ${PLACEMENT_KIND_NAME[nEff.reference.placement]})`,
        cell.source,
      );
    }
  if (plan.soil_test.nitrate_sampled === 'fall')
    add(
      `fall nitrate sample used as read${plan.credits.fall_sample_mineralization ? ` + ${tables.soil.spring_mineralization_lb.value} lb N/ac spring mineralization` : ''}`,
      tables.soil.spring_mineralization_lb.source,
    );
  for (const p of plan.products) {
    const pr = tables.products[p.product];
    if (pr) add(`product ${pr.label}`, pr.source);
  }
  return tablesUsed;
}

function cropTables(plan: Plan, tables: Tables, crop: CropTable, add: Add): void {
  add(`${crop.label}: N need ${crop.n_per_bu.value} lb N/bu`, crop.n_per_bu.source);
  add(`${crop.label}: P2O5 removal ${crop.removal_per_bu.p2o5.value} lb/bu`, crop.removal_per_bu.p2o5.source);
  add(`${crop.label}: K critical level ${crop.k_critical_ppm.value} ppm`, crop.k_critical_ppm.source);
  add(`${crop.label}: S floor ${crop.s_floor_lb.value} lb S/ac`, crop.s_floor_lb.source);
  const gP = crop.seed_row_p2o5[plan.seed_row.p_guideline];
  add(
    `${crop.label}: seed-row P2O5 as MAP ${gP.value} lb/ac at ${gP.spread_in} in on ${gP.rows_in} in rows (P2O5 + K2O within it; lowered for wider rows)`,
    gP.source,
  );
  add(
    `${crop.label}: seed-row K2O at most ${crop.seed_row_k2o_max.value} lb/ac${crop.seed_row_k2o_alone.value ? ', alone, only when the plan opts in' : ''}`,
    crop.seed_row_k2o_max.source,
  );
  if (crop.seed_row_n_k2o_max.value !== null)
    add(
      `${crop.label}: seed-row N + K2O at most ${crop.seed_row_n_k2o_max.value} lb/ac`,
      crop.seed_row_n_k2o_max.source,
    );
  for (const c of tables.k_classes[crop.k_class_group] ?? [])
    add(
      `${crop.label}: K class ${c.name}${c.below_ppm === null ? '' : ` (below ${c.below_ppm} ppm)`}: ${c.k2o_lb} lb K2O, ${Math.round(c.response_probability * 100)} % chance`,
      c.source,
    );
  add(`minimum useful K2O rate ${tables.k_min_useful_lb.value} lb/ac`, tables.k_min_useful_lb.source);
  const sr = tables.seed_row_n[crop.seed_row_group];
  if (sr)
    for (const t of ['light', 'medium', 'heavy'] as const)
      add(`seed-row N, ${crop.seed_row_group}, ${t} soil`, sr[t].source);
}
