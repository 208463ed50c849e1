/**
 * Agronomy tables: the shipped defaults, and merging a user's edited file over them; the schema is in tables/schema.ts.
 * Pure: the caller reads the file; this module only parses text.
 */
import { cautionComment } from '../vocabulary.js';
import { parse as parseYaml, stringify as stringifyYaml } from 'yaml';
import { UserError } from '../errors.js';
import { DEFAULT_TABLES } from './tables/defaults.js';
import { tablesSchema, type Tables } from './tables/schema.js';

export {
  PLACEMENTS,
  NUTRIENTS,
  TEXTURES,
  tablesSchema,
  type Placement,
  type Nutrient,
  type Tables,
  type CropTable,
  type SeedRowCell,
} from './tables/schema.js';

function check(t: unknown, where: string): Tables {
  const r = tablesSchema.safeParse(t);
  if (!r.success) {
    const msgs = r.error.issues.slice(0, 5).map((i) => `key "${i.path.join('.')}": ${i.message}`);
    throw new UserError(
      `${where}: ${msgs.join('; ')}. Fix: compare with \`tilth tables\`; every entry needs its value and a "source".`,
      { file: where },
    );
  }
  const tb = r.data;
  for (const [name, c] of Object.entries(tb.crops)) {
    if (!tb.seed_row_n[c.seed_row_group]) {
      throw new UserError(
        `${where}: key "crops.${name}.seed_row_group" is "${c.seed_row_group}", which is not a seed_row_n table; allowed: ${Object.keys(tb.seed_row_n).join(', ')}.`,
        { file: where },
      );
    }
  }
  for (const [g, tex] of Object.entries(tb.seed_row_n)) {
    for (const [t, cell] of Object.entries(tex)) {
      if ('missing' in cell) continue;
      const ok =
        cell.safe_n.length === cell.spreads_in.length &&
        cell.safe_n.every((r) => r.length === cell.rows_in.length);
      if (!ok)
        throw new UserError(
          `${where}: key "seed_row_n.${g}.${t}.safe_n" must have one row per spread (${cell.spreads_in.length}) and one value per row spacing (${cell.rows_in.length}).`,
          { file: where },
        );
    }
  }
  checkBounds(tb.p_classes.olsen, 'p_classes.olsen', where);
  for (const c of tb.p_classes.olsen) {
    if (!tb.p_class_rates[c.name])
      throw new UserError(
        `${where}: P class "${c.name}" has no rate in "p_class_rates". Fix: add p_class_rates.${c.name}.`,
        { file: where },
      );
    if (!tb.yield_gain_pct.p[c.name])
      throw new UserError(
        `${where}: P class "${c.name}" has no entry in "yield_gain_pct.p". Fix: add yield_gain_pct.p.${c.name}.`,
        { file: where },
      );
  }
  for (const k of Object.keys(tb.p_classes.kelowna_published_below_ppm)) {
    if (!tb.p_classes.olsen.some((c) => c.name === k && c.below_ppm !== null))
      throw new UserError(
        `${where}: key "p_classes.kelowna_published_below_ppm.${k}" names no bounded Olsen class; allowed: ${tb.p_classes.olsen
          .filter((c) => c.below_ppm !== null)
          .map((c) => c.name)
          .join(', ')}.`,
        { file: where },
      );
  }
  for (const [g, cl] of Object.entries(tb.k_classes)) {
    checkBounds(cl, `k_classes.${g}`, where);
    for (const c of cl)
      if (!tb.yield_gain_pct.k[c.name])
        throw new UserError(
          `${where}: K class "${c.name}" has no entry in "yield_gain_pct.k". Fix: add yield_gain_pct.k.${c.name}.`,
          { file: where },
        );
  }
  for (const [name, c] of Object.entries(tb.crops)) {
    if (!tb.k_classes[c.k_class_group])
      throw new UserError(
        `${where}: key "crops.${name}.k_class_group" is "${c.k_class_group}", which is not a k_classes table; allowed: ${Object.keys(tb.k_classes).join(', ')}.`,
        { file: where },
      );
  }
  return tb;
}

/** Class bounds rise from class to class; only the last class is open (null). */
function checkBounds(cl: readonly { below_ppm: number | null }[], key: string, where: string): void {
  for (let i = 0; i < cl.length; i++) {
    const b = cl[i]!.below_ppm;
    const last = i === cl.length - 1;
    if (last ? b !== null : b === null || (i > 0 && b <= (cl[i - 1]!.below_ppm ?? Infinity))) {
      throw new UserError(
        `${where}: key "${key}[${i}].below_ppm" must rise from class to class, and only the last class has null.`,
        { file: where },
      );
    }
  }
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
    throw new UserError(
      `${fileName}: not valid YAML (${(e as Error).message.split('\n')[0]}). Fix: start from \`tilth tables > ${fileName}\`.`,
      { file: fileName },
    );
  }
  if (user === null || user === undefined) return defaultTables();
  if (!isObj(user))
    throw new UserError(
      `${fileName}: expected a mapping of table names (crops, products, ...). Fix: start from \`tilth tables > ${fileName}\`.`,
      { file: fileName },
    );
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
    '# These defaults are a starting point, not a recommendation.\n' +
    cautionComment() +
    '\n' +
    stringifyYaml(t, { lineWidth: 0 })
  );
}
