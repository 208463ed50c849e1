/**
 * The plan: the user's choices for one field and season, validated once at the edge.
 * Rate-engine keys plus the zoning, machine and output sections the later stages read.
 */
import { parse as parseYaml } from 'yaml';
import { z } from 'zod';
import { UserError } from '../errors.js';
import { parseLength, parseSpeed, type Length, type Speed } from '../units/index.js';
import { PLACEMENTS, type Tables } from './tables.js';

const placement = z.enum(PLACEMENTS);

const productChoice = z
  .object({
    /** key in the product table (`tilth tables`) */
    product: z.string().min(1),
    /** $ per tonne of product; omitted = the table's placeholder price */
    price_per_tonne: z.number().min(0).optional(),
    /** where this product may go; omitted = every implement placement the product table allows */
    placements: z.array(placement).min(1).optional(),
    /** machine limits, product rate in the plan's units; min: if applied at all, at least this much */
    min_rate: z.number().min(0).default(0),
    max_rate: z.number().positive().default(300),
    /** rates are multiples of this (0 = any rate) */
    step: z.number().min(0).default(1),
  })
  .strict();

/** The machine section as written in a plan. */
interface MachineInput {
  swath_width?: string | number;
  speed?: string | number;
  swath_width_ft?: number;
  speed_mph?: number;
  rate_change_s: number;
}

/** The machine section read: swath and speed with the unit they were given in, and where they came from. */
export interface MachineSettings {
  swath: Length;
  speed: Speed;
  /** seconds the controller takes to change rate */
  rate_change_s: number;
  /** the plan key each came from, or "default" */
  swathFrom: 'swath_width' | 'swath_width_ft' | 'default';
  speedFrom: 'speed' | 'speed_mph' | 'default';
}

type Issues = { addIssue(i: { code: 'custom'; message: string; path: string[]; input: unknown }): void };

/**
 * Reads the plan's machine settings: `swath_width` ("60 ft", "18 m") and `speed` ("5 mph", "8 km/h") with their
 * units, or the older `swath_width_ft` and `speed_mph` numbers; one of each at most. Defaults 60 ft and 5 mph.
 * @example machineSettings({ speed: '13 km/h', rate_change_s: 4 }, ctx).speed // { value: 13, unit: 'km/h' }
 */
function machineSettings(m: MachineInput, ctx: Issues): MachineSettings {
  const issue = (key: string, message: string) =>
    ctx.addIssue({
      code: 'custom',
      message,
      path: [key],
      input: (m as unknown as Record<string, unknown>)[key],
    });
  let swath: Length = { value: 60, unit: 'ft' },
    speed: Speed = { value: 5, unit: 'mph' };
  let swathFrom: MachineSettings['swathFrom'] = 'default',
    speedFrom: MachineSettings['speedFrom'] = 'default';
  if (m.swath_width !== undefined && m.swath_width_ft !== undefined)
    issue('swath_width', 'swath_width_ft gives the swath too; keep one (swath_width with its unit)');
  else if (m.swath_width !== undefined) {
    const l = parseLength(m.swath_width);
    if (l && l.value > 0) [swath, swathFrom] = [l, 'swath_width'];
    else issue('swath_width', 'give the swath width with its unit, e.g. 60 ft or 18 m');
  } else if (m.swath_width_ft !== undefined)
    [swath, swathFrom] = [{ value: m.swath_width_ft, unit: 'ft' }, 'swath_width_ft'];
  if (m.speed !== undefined && m.speed_mph !== undefined)
    issue('speed', 'speed_mph gives the speed too; keep one (speed with its unit)');
  else if (m.speed !== undefined) {
    const s = parseSpeed(m.speed);
    if (s && s.value > 0) [speed, speedFrom] = [s, 'speed'];
    else issue('speed', 'give the travel speed with its unit, e.g. 5 mph or 8 km/h');
  } else if (m.speed_mph !== undefined)
    [speed, speedFrom] = [{ value: m.speed_mph, unit: 'mph' }, 'speed_mph'];
  return { swath, speed, rate_change_s: m.rate_change_s, swathFrom, speedFrom };
}

export const planSchema = z
  .object({
    farm: z.string().default(''),
    field: z.string().default(''),
    crop: z.string().min(1),
    target_yield_bu: z.number().positive().max(250),
    crop_price_per_bu: z.number().min(0).default(0),
    units: z.enum(['lb/ac', 'kg/ha']).default('lb/ac'),
    soil_test: z
      .object({
        p_method: z.enum(['olsen', 'kelowna']).default('olsen'),
        nitrate_sampled: z.enum(['spring', 'fall']).default('spring'),
        /** modified Kelowna reads this many times Olsen; scales the Olsen class bounds where no published Kelowna bound exists */
        kelowna_factor: z.number().min(1).max(2).default(1.3),
        /** values the neighbour outlier test flags: keep them in the maps (named in a warning) or drop them from interpolation; --outliers wins */
        outliers: z.enum(['keep', 'drop']).default('keep'),
      })
      .strict()
      .prefault({}),
    credits: z
      .object({
        organic_matter: z.boolean().default(false),
        previous_crop_legume: z.boolean().default(false),
        other_lb_n: z.number().min(0).default(0),
        /** fall-sampled nitrate: add the spring mineralization (tables soil.spring_mineralization_lb); never a deduction */
        fall_sample_mineralization: z.boolean().default(false),
      })
      .strict()
      .prefault({}),
    strategy: z
      .object({
        n: z
          .object({
            method: z.enum(['mass_balance', 'none']).default('mass_balance'),
            /** null = the tables' relative efficiency by placement and timing; a number replaces it for every placement */
            efficiency: z.number().gt(0).max(1.5).nullable().default(null),
            /** when the N outside the seed row goes on */
            timing: z.enum(['spring', 'fall']).default('spring'),
          })
          .strict()
          .prefault({}),
        p: z
          .object({
            method: z.enum(['response_class', 'removal', 'build', 'none']).default('response_class'),
            build_to_ppm: z.number().positive().default(15),
            build_years: z.number().int().min(1).max(20).default(4),
            /** lb P2O5/ac per ppm of rise; null = the table's soil value */
            p2o5_per_ppm: z.number().positive().nullable().default(null),
          })
          .strict()
          .prefault({}),
        k: z
          .object({ method: z.enum(['response_class', 'none']).default('response_class') })
          .strict()
          .prefault({}),
        s: z
          .object({ method: z.enum(['need_or_floor', 'none']).default('need_or_floor') })
          .strict()
          .prefault({}),
        tolerance_pct: z.number().min(0).max(25).default(5),
      })
      .strict()
      .prefault({}),
    implement: z
      .object({
        opener_spread_in: z.number().positive().max(24).default(1),
        row_spacing_in: z.number().positive().max(30).default(10),
        default_texture: z.enum(['light', 'medium', 'heavy']).default('medium'),
        seedbed_moisture: z.enum(['good', 'dry']).default('good'),
        placements: z.array(placement).min(1).default(['seed_row', 'side_band']),
      })
      .strict()
      .prefault({}),
    seed_row: z
      .object({
        /** lb N/ac you and your agronomist confirm for the seed row; null = the table */
        safe_n_lb: z.number().min(0).nullable().default(null),
        /** what to do where the seed-row N table has no published value */
        when_table_missing: z.enum(['ask', 'light_soil_values', 'none_in_seed_row']).default('ask'),
        /** which seed-placed P2O5 (as MAP) guideline: its value and drill configuration come from the tables */
        p_guideline: z.enum(['manitoba', 'saskatchewan']).default('manitoba'),
        /** canola and peas: potash with the seed (at most the crop's K2O limit, and only with nothing else there) */
        potash_with_seed: z.boolean().default(false),
      })
      .strict()
      .prefault({}),
    products: z
      .array(productChoice)
      .min(1)
      .superRefine((list, ctx) => {
        // one entry per product (a second would silently replace the first's limits and price); limits in order
        const seen = new Set<string>();
        list.forEach((p, i) => {
          if (seen.has(p.product))
            ctx.addIssue({
              code: 'custom',
              path: [i, 'product'],
              message: `product "${p.product}" is listed twice; list each product once`,
            });
          seen.add(p.product);
          if (p.min_rate > p.max_rate)
            ctx.addIssue({
              code: 'custom',
              path: [i, 'min_rate'],
              message: `min_rate ${p.min_rate} is above max_rate ${p.max_rate}`,
            });
        });
      }),
    /**
     * Boundary parts farther than the unsampled distance (1 000 m) from every sample: null = refuse the build;
     * "none" = no product there; a rate (one-product plans); or per product a rate or { rate, placement }, in the
     * plan's units. The parts that get it are named in the output.
     */
    unsampled_parts: z
      .union([
        z.literal('none'),
        z.number().min(0),
        z.record(
          z.string(),
          z.union([z.number().min(0), z.object({ rate: z.number().min(0), placement }).strict()]),
        ),
      ])
      .nullable()
      .default(null),
    /**
     * The machine: swath and speed with their units ("60 ft" or "18 m", "5 mph" or "8 km/h"; default 60 ft and
     * 5 mph), or the older keys swath_width_ft and speed_mph; read into `swath` and `speed` (see machineSettings).
     */
    machine: z
      .object({
        swath_width: z.union([z.string(), z.number()]).optional(),
        speed: z.union([z.string(), z.number()]).optional(),
        swath_width_ft: z.number().positive().optional(),
        speed_mph: z.number().positive().optional(),
        rate_change_s: z.number().min(0).default(4),
      })
      .strict()
      .prefault({})
      .transform(machineSettings),
    /** how each nutrient's soil-test surface is interpolated (docs/surface.md) */
    surface: z
      .object({
        /** idw (default), kriging (ordinary kriging; refused with the reason when the semivariogram is unusable), or auto (lowest leave-one-out RMSE) */
        method: z.enum(['auto', 'idw', 'kriging']).default('idw'),
        /** krige natural logarithms and back-transform to the lognormal mean (skewed soil tests) */
        log: z.boolean().default(false),
        kriging_neighbours: z.number().int().min(1).max(256).default(16),
      })
      .strict()
      .prefault({}),
    zoning: z
      .object({
        method: z.enum(['jenks', 'quantile', 'equal', 'kmeans']).default('jenks'),
        classes: z.number().int().min(1).max(10).default(5),
        smoothing_passes: z.number().int().min(0).max(10).default(2),
        min_zone_ac: z.union([z.literal('auto'), z.number().positive()]).default('auto'),
        zone_sets: z.enum(['per_product', 'shared']).default('per_product'),
        /** what classes are drawn from: the nutrient targets (default), or for P2O5 and K2O the expected chance of a yield response to P and K (kriging class probabilities x the classes' response chances; docs/zones.md) */
        basis: z.enum(['targets', 'response_chance']).default('targets'),
        /** per_product sets: neighbouring classes whose mean targets differ by less than this % of the field's mean target are merged (tilth default, no published source) */
        min_class_difference_pct: z.number().min(0).max(100).default(5),
        /** neighbouring zones stay apart only if some product rate differs by at least this (plan units): auto = the larger of the product's step and min_rate_difference_pct % of its field mean; a number for every product, or per product */
        min_rate_difference: z
          .union([z.literal('auto'), z.number().min(0), z.record(z.string(), z.number().min(0))])
          .default('auto'),
        /** share of a product's field mean rate that auto uses, % (tilth default 10, common practice) */
        min_rate_difference_pct: z.number().min(0).max(100).default(10),
        /** zone edges are simplified to within this many grid cells (shared edges once; the field boundary is kept exact); 0 = cell staircase */
        simplify_cells: z.number().min(0).max(10).default(1),
      })
      .strict()
      .prefault({}),
    output: z
      .object({
        shapefile_layout: z.enum(['per_placement', 'per_product']).default('per_placement'),
        short_names: z.boolean().default(false),
        crs: z.enum(['wgs84', 'utm']).default('wgs84'),
        /** a zone set whose polygons would need more vertices than this fails with an error; null = no limit */
        max_vertices: z.number().int().positive().nullable().default(null),
        /** machine files besides prescription.geojson, zones.csv, summary and report (always written) */
        formats: z.array(z.enum(['shapefile', 'isoxml'])).default(['shapefile', 'isoxml']),
        /** ISO 11783-10 task data: a type-2 grid of rates instead of zone polygons */
        isoxml_grid: z.boolean().default(false),
        /** grid cell, m; null = half the build's grid cell, so every zone holds whole grid cells */
        isoxml_grid_cell_m: z.number().positive().max(100).nullable().default(null),
      })
      .strict()
      .prefault({}),
  })
  .strict();

/** A validated plan (every default filled in). */
export type Plan = z.infer<typeof planSchema>;
export type PlanInput = z.input<typeof planSchema>;
export type ProductChoice = Plan['products'][number];

function valueAt(obj: unknown, path: PropertyKey[]): unknown {
  let v = obj;
  for (const k of path) v = v && typeof v === 'object' ? (v as Record<PropertyKey, unknown>)[k] : undefined;
  return v;
}

function keyName(path: PropertyKey[]): string {
  return path.map((p, i) => (typeof p === 'number' ? `[${p}]` : (i ? '.' : '') + String(p))).join('');
}

/**
 * Validates a plan object (from YAML or JSON). Errors name the file, the key, the value and what is allowed.
 * With `tables`, also checks the crop and product names against them.
 * @example validatePlan({ crop: 'wheat', target_yield_bu: 60, products: [{ product: 'urea' }] }, 'plan', defaultTables()).units // 'lb/ac'
 */
export function validatePlan(input: unknown, fileName = 'plan', tables?: Tables): Plan {
  const r = planSchema.safeParse(input);
  if (!r.success) {
    const msgs = r.error.issues.slice(0, 4).map((i) => {
      const key = keyName(i.path);
      const got = valueAt(input, i.path);
      const allowed = 'values' in i && Array.isArray(i.values) ? `; allowed: ${i.values.join(', ')}` : '';
      if (i.code === 'unrecognized_keys')
        return `unknown key${i.keys.length > 1 ? 's' : ''} ${i.keys.map((k) => `"${key ? key + '.' : ''}${k}"`).join(', ')} (check the spelling against \`tilth plan init\`)`;
      if (got === undefined) return `key "${key}" is missing (${i.message})`;
      return `key "${key}" is ${JSON.stringify(got)}: ${i.message}${allowed}`;
    });
    throw new UserError(
      `${fileName}: ${msgs.join('; ')}. Fix: correct the plan; \`tilth plan init\` prints every key with its default.`,
      { file: fileName },
    );
  }
  const plan = r.data;
  if (tables) {
    if (!tables.crops[plan.crop]) {
      throw new UserError(
        `${fileName}: key "crop" is "${plan.crop}"; allowed: ${Object.keys(tables.crops).join(', ')}. Fix: choose one, or add the crop to your tables file.`,
        { file: fileName, field: 'crop', value: plan.crop },
      );
    }
    plan.products.forEach((p, i) => {
      const t = tables.products[p.product];
      if (!t)
        throw new UserError(
          `${fileName}: key "products[${i}].product" is "${p.product}"; allowed: ${Object.keys(tables.products).join(', ')}. Fix: choose one, or add it to your tables file.`,
          { file: fileName, field: 'product', value: p.product },
        );
      for (const pl of p.placements ?? []) {
        if (!t.placements.includes(pl))
          throw new UserError(
            `${fileName}: key "products[${i}].placements" has "${pl}", which the product table does not allow for ${p.product}; allowed: ${t.placements.join(', ')}.`,
            { file: fileName },
          );
      }
    });
  }
  plan.products.forEach((p, i) => {
    if (p.min_rate > p.max_rate)
      throw new UserError(
        `${fileName}: key "products[${i}].min_rate" (${p.min_rate}) is above max_rate (${p.max_rate}). Fix: lower min_rate or raise max_rate.`,
        { file: fileName },
      );
    if (p.step > 0 && Math.floor(p.max_rate / p.step) * p.step < p.min_rate)
      throw new UserError(
        `${fileName}: products[${i}]: no multiple of step ${p.step} lies between min_rate ${p.min_rate} and max_rate ${p.max_rate}.`,
        { file: fileName },
      );
  });
  return plan;
}

/**
 * Parses and validates a plan file (YAML or JSON text).
 * @param yamlText the file's text
 * @param fileName named in every error message
 * @param tables optional: also check crop and product names against these tables
 * @example parsePlan('crop: canola\ntarget_yield_bu: 50\nproducts:\n  - product: map\n', 'plan.yaml')
 */
export function parsePlan(yamlText: string, fileName = 'plan.yaml', tables?: Tables): Plan {
  let obj: unknown;
  try {
    obj = parseYaml(yamlText);
  } catch (e) {
    throw new UserError(
      `${fileName}: not valid YAML (${(e as Error).message.split('\n')[0]}). Fix: start from \`tilth plan init\`.`,
      { file: fileName },
    );
  }
  if (obj === null || typeof obj !== 'object' || Array.isArray(obj)) {
    throw new UserError(
      `${fileName}: expected a mapping with keys crop, target_yield_bu, products, ... Fix: start from \`tilth plan init --crop canola > ${fileName}\`.`,
      { file: fileName },
    );
  }
  return validatePlan(obj, fileName, tables);
}
