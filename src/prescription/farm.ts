/**
 * Farm batches: the farm file (many fields, each with its samples, boundary, plan and output folder) and the
 * farm summary (product totals per placement summed over fields, for ordering). Pure: the CLI
 * (src/cli/batch.ts) reads the file, runs the builds and prints.
 */
import { parse } from 'yaml';
import { z } from 'zod';
import { UserError } from '../errors.js';
import type { ProductTotal } from './types.js';

/** One field of a farm file, paths as written (relative to the farm file's folder). */
export interface FarmField {
  /** name for messages and the summary (default: the output folder's last part) */
  name: string;
  samples: string;
  boundary: string;
  plan: string;
  out: string;
  zones?: string;
  tables?: string;
  /** grid cell size, m (default: the build's) */
  cell?: number;
}

const entry = z
  .object({
    name: z.string().min(1).optional(),
    samples: z.string().min(1).optional(),
    boundary: z.string().min(1).optional(),
    plan: z.string().min(1).optional(),
    out: z.string().min(1).optional(),
    zones: z.string().min(1).optional(),
    tables: z.string().min(1).optional(),
    cell: z.number().positive().optional(),
  })
  .strict();

const farmSchema = z
  .object({
    defaults: entry.omit({ name: true, out: true }).optional(),
    fields: z.array(entry).min(1),
  })
  .strict();

/**
 * Reads a farm file (YAML): `fields:` a list of { samples, boundary, plan, out } with optional name, zones,
 * tables and cell; `defaults:` (optional) any of samples, boundary, plan, zones, tables, cell for every field.
 * @param text the file's text
 * @param file its name, for messages
 * @throws UserError naming the field (by number and name) and the key to fix
 * @example parseFarm('fields:\n  - { samples: a.csv, boundary: a.geojson, plan: plan.yaml, out: rx/a }', 'farm.yaml')
 */
export function parseFarm(text: string, file: string): FarmField[] {
  let raw: unknown;
  try {
    raw = parse(text);
  } catch (e) {
    throw new UserError(
      `${file}: not valid YAML (${(e as Error).message.split('\n')[0]}). Fix: correct the file; see \`tilth batch --help\` for an example.`,
      { file },
    );
  }
  const r = farmSchema.safeParse(raw);
  if (!r.success) {
    const i = r.error.issues[0];
    const where = i.path.length ? `key "${i.path.join('.')}"` : 'the file';
    throw new UserError(
      `${file}: ${where}: ${i.message}. Fix: give "fields:" as a list of entries with samples, boundary, plan and out (and optionally name, zones, tables, cell; "defaults:" for keys shared by every field).`,
      { file, field: i.path.join('.') },
    );
  }
  const d = r.data.defaults ?? {};
  const seen = new Map<string, number>();
  return r.data.fields.map((f, i) => {
    const m = { ...d, ...f };
    const label = `field ${i + 1}${f.name ? ` (${f.name})` : ''}`;
    for (const key of ['samples', 'boundary', 'plan', 'out'] as const) {
      if (!m[key])
        throw new UserError(
          `${file}: ${label} has no "${key}". Fix: add ${key}: to the field, or to "defaults:" when every field shares it (out cannot be shared).`,
          { file, field: `fields.${i}.${key}` },
        );
    }
    const prev = seen.get(m.out!);
    if (prev !== undefined)
      throw new UserError(
        `${file}: ${label} writes to "${m.out}", as field ${prev + 1} does. Fix: give each field its own out folder.`,
        { file, field: `fields.${i}.out`, value: m.out },
      );
    seen.set(m.out!, i);
    const name =
      f.name ??
      m
        .out!.replace(/[\\/]+$/, '')
        .split(/[\\/]/)
        .pop()!;
    return {
      name,
      samples: m.samples!,
      boundary: m.boundary!,
      plan: m.plan!,
      out: m.out!,
      zones: m.zones,
      tables: m.tables,
      cell: m.cell,
    };
  });
}

/** A product's total over the farm, one per product, placement and unit. */
export interface FarmTotal {
  product: string;
  label: string;
  placement: ProductTotal['placement'];
  unit: string;
  totalLb: number;
  totalKg: number;
  /** area that receives it, ac, summed over fields */
  appliedAc: number;
  /** fields that apply it */
  fields: number;
}

/**
 * Sums the fields' product totals per product and placement (zone sets of one field add up too), for
 * ordering product; fields that failed contribute nothing. Sorted by product, then placement.
 * @example farmTotals([{ totals: rxA.totals }, { totals: rxB.totals }])
 */
export function farmTotals(fields: { totals: readonly ProductTotal[] }[]): FarmTotal[] {
  const by = new Map<string, FarmTotal & { seen: Set<number> }>();
  fields.forEach((f, fi) => {
    for (const t of f.totals) {
      const key = `${t.product}\u0000${t.placement}\u0000${t.unit}`;
      let a = by.get(key);
      if (!a)
        by.set(
          key,
          (a = {
            product: t.product,
            label: t.label,
            placement: t.placement,
            unit: t.unit,
            totalLb: 0,
            totalKg: 0,
            appliedAc: 0,
            fields: 0,
            seen: new Set(),
          }),
        );
      a.totalLb += t.totalLb;
      a.totalKg += t.totalKg;
      a.appliedAc += t.appliedAc;
      a.seen.add(fi);
      a.fields = a.seen.size;
    }
  });
  return [...by.values()]
    .map(({ seen: _seen, ...t }) => t)
    .sort((a, b) =>
      a.product < b.product
        ? -1
        : a.product > b.product
          ? 1
          : a.placement < b.placement
            ? -1
            : a.placement > b.placement
              ? 1
              : 0,
    );
}
