/**
 * The report's sulphate-S pages (the variability charts and the chance-below map) as one pure step that needs only
 * the samples, the field, the grid and the S surface: nothing of the zones. So a caller with a second core can
 * compute them while the zones are drawn ({@link BuildOptions.onSurfaces}) and hand them to the folder step
 * (`FolderOptions.sulphur`); the CLI does (src/cli/sulphurAhead.ts). The pages are the same either way.
 */
import type { ReportChanceMap, ReportChart } from '../report/types.js';
import type { Plan } from '../agronomy/plan.js';
import type { Tables } from '../agronomy/tables.js';
import type { Field, FieldInputs, Grid, Samples } from '../types.js';
import type { NutrientSurface } from '../surface/nutrientSurface.js';
import { gridView } from './reportMaps.js';
import { buildSulphurChance, buildSulphurCharts, type CropSulphurEntries } from './sulphurCharts.js';

/** Everything the sulphate-S pages read: plain data (it can be posted to a worker thread). */
export interface SulphurPagesInput {
  samples: Samples;
  field: Field;
  /** the plan's crop entry in the tables (threshold and floor), if any */
  crop: CropSulphurEntries | undefined;
  /** the plan's S strategy method ('none': no floor) */
  sMethod: string;
  /** the build's grid */
  grid: Grid;
  /** the build's sulphate-S surface, if any */
  surface: NutrientSurface | undefined;
  /** kriging settings for the chance map when the S surface is not kriged (plan surface.log, kriging_neighbours) */
  kriging: { log: boolean; neighbours: number };
}

/** The sulphate-S entries of the report: charts (none without S values) and the chance map (null without S values). */
export interface SulphurPages {
  charts: ReportChart[];
  chance: ReportChanceMap | null;
}

/**
 * The input of {@link sulphurPages} for a build: its inputs, plan and tables, and its grid and surfaces (known once
 * the surface stage is done).
 * @example sulphurPagesInput(inputs, plan, tables, rx.grid, rx.surfaces)
 */
export function sulphurPagesInput(
  inputs: FieldInputs,
  plan: Plan,
  tables: Tables,
  grid: Grid,
  surfaces: readonly NutrientSurface[],
): SulphurPagesInput {
  return {
    samples: inputs.samples,
    field: inputs.field,
    crop: tables.crops[plan.crop],
    sMethod: plan.strategy.s.method,
    grid,
    surface: surfaces.find((s) => s.analyte === 'so4_s'),
    kriging: { log: plan.surface.log, neighbours: plan.surface.kriging_neighbours },
  };
}

/**
 * The sulphate-S charts and chance map of a build's report.
 * @example const pages = sulphurPages({ samples, field, crop: tables.crops.canola, sMethod: 'response_class', grid: rx.grid, surface: rx.surfaces.find((s) => s.analyte === 'so4_s'), kriging: { log: false, neighbours: 16 } })
 */
export function sulphurPages(i: SulphurPagesInput): SulphurPages {
  const s = i.surface;
  const charts = buildSulphurCharts(
    i.samples,
    i.field,
    i.crop,
    i.sMethod,
    s ? { grid: s.grid, values: s.values, note: s.choice, zones: s.method === 'zones' } : undefined,
  );
  // beside the S surface: the chance S is below the crop's low level, from kriging (or why there is none)
  const chance = buildSulphurChance(i.samples, i.grid, i.crop, s, i.kriging, gridView(i.grid));
  return { charts, chance };
}
