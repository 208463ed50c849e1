/**
 * Agronomy tables: schema, the shipped defaults, and merging a user's edited file over them.
 * Pure: the caller reads the file; this module only parses text.
 */
import { parse as parseYaml, stringify as stringifyYaml } from 'yaml';
import { z } from 'zod';
import { UserError } from '../errors.js';
import { DEFAULT_TABLES } from './tables/defaults.js';

/** Where a value comes from: `[published] <publication>`, `common practice...`, `from memory...`, `missing...`, or the user's own note. */
const source = z.string().min(3);
const num = (min = 0) => z.object({ value: z.number().min(min), source });
const bool = z.object({ value: z.boolean(), source });
const prob = z.object({ value: z.number().min(0).max(1), source });

export const PLACEMENTS = ['seed_row', 'side_band', 'mid_row_band', 'broadcast'] as const;
export type Placement = (typeof PLACEMENTS)[number];
export const NUTRIENTS = ['n', 'p2o5', 'k2o', 's'] as const;
export type Nutrient = (typeof NUTRIENTS)[number];
export const TEXTURES = ['light', 'medium', 'heavy'] as const;

const cropSchema = z.object({
  label: z.string(),
  bushel_lb: num(1),
  n_per_bu: num(),
  removal_per_bu: z.object({ n: num(), p2o5: num(), k2o: num(), s: num() }),
  k_critical_ppm: num(),
  k_responds_above_critical: bool,
  s_low_below_lb: num(),
  s_when_low_lb: num(),
  s_floor_lb: num(),
  /** which seed-row N table the crop uses (a key of `seed_row_n`) */
  seed_row_group: z.string(),
  seed_row_p2o5_max: num(),
  seed_row_p2o5_k2o_max: num(),
  seed_row_k2o_max: num(),
});

const seedRowCell = z.union([
  z.object({
    spreads_in: z.array(z.number().positive()).min(1),
    rows_in: z.array(z.number().positive()).min(1),
    /** safe_n[spread index][row index], lb N/ac */
    safe_n: z.array(z.array(z.number().min(0))),
    source,
  }),
  z.object({ missing: z.literal(true), source }),
]);

const pClass = z.object({
  name: z.string(),
  /** upper bound (exclusive) of the class in ppm; null for the last class */
  below_ppm: z.number().positive().nullable(),
  response_probability: z.number().min(0).max(1),
  source,
});

const productSchema = z.object({
  label: z.string(),
  n: z.number().min(0).max(100),
  p2o5: z.number().min(0).max(100),
  k2o: z.number().min(0).max(100),
  s: z.number().min(0).max(100),
  form: z.enum(['granular', 'liquid']),
  /** liquids: kg per litre, for volume rates (ISO 11783-10 task data writes liquids as volume per area) */
  density_kg_l: z.object({ value: z.number().positive().max(3), source }).optional(),
  placements: z.array(z.enum(PLACEMENTS)).min(1),
  price_per_tonne: z.number().min(0),
  source,
  price_source: source,
});

const effSchema = z.object({ n: z.number().positive().max(1), p2o5: z.number().positive().max(1), k2o: z.number().positive().max(1), s: z.number().positive().max(1), source });

export const tablesSchema = z.object({
  crops: z.record(z.string(), cropSchema),
  seed_row_n: z.record(z.string(), z.object({ light: seedRowCell, medium: seedRowCell, heavy: seedRowCell })),
  dry_seedbed_factor: prob,
  p_classes: z.object({ olsen: z.array(pClass).min(1), kelowna: z.array(pClass).min(1) }),
  p_class_rates: z.record(z.string(), z.object({ value: z.number().min(0), source, at_least_removal: z.boolean().default(false) })),
  k_response_probability: z.object({ below_critical: prob, above_critical: prob }),
  yield_gain_pct: z.object({
    p: z.record(z.string(), num()),
    k: z.object({ below_critical: num(), above_critical: num() }),
  }),
  soil: z.object({
    p2o5_per_ppm: num(),
    k2o_per_ppm: num(),
    om_n_lb_per_pct: num(),
    om_n_available: prob,
    fall_nitrate_adjust_lb: num(),
    legume_credit_lb: num(),
  }),
  placement_efficiency: z.object({ seed_row: effSchema, side_band: effSchema, mid_row_band: effSchema, broadcast: effSchema }),
  products: z.record(z.string(), productSchema),
});

/** The validated agronomy tables (see docs/method.md, "Rate engine"). */
export type Tables = z.infer<typeof tablesSchema>;
export type TablesInput = z.input<typeof tablesSchema>;
export type CropTable = z.infer<typeof cropSchema>;
export type ProductTable = z.infer<typeof productSchema>;
export type SeedRowCell = z.infer<typeof seedRowCell>;

function check(t: unknown, where: string): Tables {
  const r = tablesSchema.safeParse(t);
  if (!r.success) {
    const msgs = r.error.issues.slice(0, 5).map((i) => `key "${i.path.join('.')}": ${i.message}`);
    throw new UserError(`${where}: ${msgs.join('; ')}. Fix: compare with \`tilth tables\`; every entry needs its value and a "source".`, { file: where });
  }
  const tb = r.data;
  for (const [name, c] of Object.entries(tb.crops)) {
    if (!tb.seed_row_n[c.seed_row_group]) {
      throw new UserError(`${where}: key "crops.${name}.seed_row_group" is "${c.seed_row_group}", which is not a seed_row_n table; allowed: ${Object.keys(tb.seed_row_n).join(', ')}.`, { file: where });
    }
  }
  for (const [g, tex] of Object.entries(tb.seed_row_n)) {
    for (const [t, cell] of Object.entries(tex)) {
      if ('missing' in cell) continue;
      const ok = cell.safe_n.length === cell.spreads_in.length && cell.safe_n.every((r) => r.length === cell.rows_in.length);
      if (!ok) throw new UserError(`${where}: key "seed_row_n.${g}.${t}.safe_n" must have one row per spread (${cell.spreads_in.length}) and one value per row spacing (${cell.rows_in.length}).`, { file: where });
    }
  }
  for (const m of ['olsen', 'kelowna'] as const) {
    const cl = tb.p_classes[m];
    for (let i = 0; i < cl.length; i++) {
      const b = cl[i]!.below_ppm;
      const last = i === cl.length - 1;
      if (last ? b !== null : b === null || (i > 0 && b <= (cl[i - 1]!.below_ppm ?? Infinity))) {
        throw new UserError(`${where}: key "p_classes.${m}[${i}].below_ppm" must rise from class to class, and only the last class has null.`, { file: where });
      }
      if (!tb.p_class_rates[cl[i]!.name]) throw new UserError(`${where}: P class "${cl[i]!.name}" has no rate in "p_class_rates". Fix: add p_class_rates.${cl[i]!.name}.`, { file: where });
      if (!tb.yield_gain_pct.p[cl[i]!.name]) throw new UserError(`${where}: P class "${cl[i]!.name}" has no entry in "yield_gain_pct.p". Fix: add yield_gain_pct.p.${cl[i]!.name}.`, { file: where });
    }
  }
  return tb;
}

let cachedDefaults: Tables | undefined;

/**
 * The tables tilth ships (a fresh deep copy each call; edit freely).
 * @example defaultTables().crops.canola.n_per_bu // { value: 3, source: '[published] Canola Watch ...' }
 */
export function defaultTables(): Tables {
  cachedDefaults ??= check(DEFAULT_TABLES, 'default tables');
  return structuredClone(cachedDefaults);
}

function isObj(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/** Deep merge: objects merge key by key; arrays and scalars replace. */
function merge(base: unknown, over: unknown): unknown {
  if (isObj(base) && isObj(over)) {
    const o: Record<string, unknown> = { ...base };
    for (const [k, v] of Object.entries(over)) o[k] = k in base ? merge(base[k], v) : v;
    return o;
  }
  return over === undefined ? base : over;
}

/**
 * The tables in force: the defaults, with a user's YAML (or JSON) file merged over them. A user file
 * may change any entry or add crops, products and seed-row tables; a changed value should change its
 * `source` too (e.g. "my agronomist, 2026"). Entries merge key by key; lists replace the default list.
 * @param userYamlText the user's tables file text (omit for the defaults)
 * @param fileName named in error messages
 * @example loadTables('crops:\n  canola:\n    n_per_bu: { value: 2.8, source: "our hybrid trials" }\n', 'my-tables.yaml')
 */
export function loadTables(userYamlText?: string, fileName = 'tables file'): Tables {
  if (userYamlText === undefined) return defaultTables();
  let user: unknown;
  try {
    user = parseYaml(userYamlText);
  } catch (e) {
    throw new UserError(`${fileName}: not valid YAML (${(e as Error).message.split('\n')[0]}). Fix: start from \`tilth tables > ${fileName}\`.`, { file: fileName });
  }
  if (user === null || user === undefined) return defaultTables();
  if (!isObj(user)) throw new UserError(`${fileName}: expected a mapping of table names (crops, products, ...). Fix: start from \`tilth tables > ${fileName}\`.`, { file: fileName });
  return check(merge(defaultTables(), user), fileName);
}

/**
 * The tables as a YAML document users can edit and pass back with `--tables`.
 * @example loadTables(tablesToYaml(defaultTables())) // the same tables
 */
export function tablesToYaml(t: Tables): string {
  return (
    '# tilth agronomy tables. Edit values and their "source"; pass this file with --tables.\n' +
    '# Sources: [published] <publication> / common practice / from memory / missing (not found: the plan must supply it).\n' +
    '# These defaults are a starting point: have a licensed agronomist or certified crop adviser check them.\n' +
    stringifyYaml(t, { lineWidth: 0 })
  );
}
