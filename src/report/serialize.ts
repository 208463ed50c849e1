/**
 * report-data.json: the ReportInput as JSON, written by `tilth build` beside its outputs and read by
 * `tilth report DIR`. Numeric arrays are JSON arrays with null for NaN; long typed arrays (rasters) are
 * stored as { "f32": base64 of little-endian float32 } to keep the file small (a 160 ac field at 2 m cells
 * is ~160 000 values per surface).
 */
import { z } from 'zod';
import { UserError } from '../errors.js';
import { base64, fromBase64 } from '../draw/png.js';
import { REPORT_SCHEMA, type ReportInput } from './types.js';

/** Raster `values` typed arrays longer than this are written as base64 float32 (coordinates never are). */
const PACK_OVER = 4096;

function packF32(a: ArrayLike<number>): { f32: string } {
  const bytes = new Uint8Array(a.length * 4);
  const dv = new DataView(bytes.buffer);
  for (let i = 0; i < a.length; i++) dv.setFloat32(i * 4, a[i]!, true);
  return { f32: base64(bytes) };
}

function unpackF32(s: string): Float32Array {
  const bytes = fromBase64(s);
  if (bytes.length % 4) throw new Error('length is not a multiple of 4 bytes');
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const out = new Float32Array(bytes.length / 4);
  for (let i = 0; i < out.length; i++) out[i] = dv.getFloat32(i * 4, true);
  return out;
}

/**
 * The input as JSON text (2-space indent off: the file is for programs; `tilth report` reads it).
 * @example writeFileAtomic(join(dir, 'report-data.json'), serializeReportInput(input))
 */
export function serializeReportInput(input: ReportInput): string {
  return JSON.stringify({ ...input, schema: REPORT_SCHEMA }, (_k, v: unknown) => {
    if (ArrayBuffer.isView(v) && !(v instanceof DataView)) {
      const a = v as unknown as ArrayLike<number>;
      return _k === 'values' && a.length > PACK_OVER
        ? packF32(a)
        : Array.from(a, (x) => (Number.isFinite(x) ? x : null));
    }
    return v;
  });
}

const nums = z.union([
  z.array(z.number().nullable()).transform((a) => Float64Array.from(a, (x) => (x === null ? NaN : x))),
  z.object({ f32: z.string() }).transform((o, ctx) => {
    try {
      return unpackF32(o.f32);
    } catch (e) {
      ctx.addIssue({
        code: 'custom',
        message: `packed float32 values are not valid base64 (${(e as Error).message})`,
      });
      return z.NEVER;
    }
  }),
]);
const num = z
  .number()
  .nullable()
  .transform((x) => (x === null ? NaN : x));
const part = z.object({ exterior: nums, holes: z.array(nums) });
const grid = z.object({
  xmin: z.number(),
  ymax: z.number(),
  cell: z.number().positive(),
  cols: z.number().int().positive(),
  rows: z.number().int().positive(),
});
const raster = z
  .object({ grid, values: nums, notes: z.array(z.string()).optional() })
  .refine((r) => r.values.length === r.grid.cols * r.grid.rows, {
    message: 'values must hold cols x rows numbers',
  });
const str = z.string();

const schema = z.object({
  schema: z.literal(REPORT_SCHEMA).optional(),
  title: z.object({
    farm: str,
    field: str,
    crop: str,
    targetYield: str,
    planSummary: str,
    date: str,
    version: str,
    hash: str,
    preparedBy: str.optional(),
    notes: z.array(str).optional(),
  }),
  units: z.object({ area: z.enum(['ac', 'ha']) }),
  utm: z.object({ zone: z.number().int().min(1).max(60), south: z.boolean(), epsg: z.number().int() }),
  field: z.object({ parts: z.array(part).min(1), areaM2: z.number().nonnegative() }),
  nutrients: z.array(
    z.object({ key: str, label: str, unit: str, decimals: z.number().int().min(0).max(6).optional() }),
  ),
  samples: z.object({
    ids: z.array(str),
    xy: nums,
    values: z.record(str, nums),
    censored: z.record(str, nums).optional(),
  }),
  surfaces: z.array(z.object({ nutrient: str, raster, breaks: z.array(z.number()), method: str.optional() })),
  response: z.array(
    z.object({
      nutrient: str,
      classes: z.array(z.object({ label: str })).min(1),
      raster: raster.optional(),
      byZone: z.object({ zoneSet: str, classes: z.record(str, z.number().int()) }).optional(),
      source: str.optional(),
    }),
  ),
  chance: z
    .array(
      z.object({
        nutrient: str,
        threshold: z.number(),
        unit: str,
        raster: raster.optional(),
        refused: str.optional(),
        method: str,
        assumption: str,
        summary: str.optional(),
      }),
    )
    .optional(),
  zoneSets: z.array(
    z.object({
      name: str,
      products: z.array(str),
      targetUnit: str,
      zones: z.array(
        z.object({
          id: str,
          parts: z.array(part),
          areaM2: z.number().nonnegative(),
          class: z.number().int().nullable(),
          soilMeans: z.record(str, num),
          targets: z.record(str, num),
          rates: z.array(z.object({ product: str, placement: str, rate: num, unit: str })),
          bindingLimit: str.nullable(),
          notes: z.array(str).optional(),
        }),
      ),
      minDifference: z.array(z.object({ product: str, placement: str, value: num })).optional(),
      design: z.array(str).optional(),
    }),
  ),
  totals: z.array(
    z.object({
      product: str,
      placement: str,
      total: num,
      totalUnit: str,
      packaging: str.optional(),
      meanRate: num,
      minRate: num,
      maxRate: num,
      rateUnit: str,
    }),
  ),
  crossValidation: z.array(
    z.object({
      nutrient: str,
      method: str,
      rmse: num,
      meanError: num,
      mae: num.optional(),
      chosen: z.boolean(),
    }),
  ),
  warnings: z.array(
    z.object({ code: str, message: str, file: str.optional(), where: str.optional(), field: str.optional() }),
  ),
  tablesUsed: z.array(
    z.object({ name: str, source: str, mark: str.optional(), edited: z.boolean().optional() }),
  ),
  cautions: z.array(str),
  charts: z.array(z.object({ title: str, svg: str, caption: str.optional() })),
});

function pathText(path: readonly PropertyKey[]): string {
  return (
    path.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i ? '.' : ''}${String(p)}`)).join('') ||
    '(top level)'
  );
}

/**
 * Parses and checks report-data.json text; throws a UserError naming the file, the place in it and the fix.
 * @param file the file's path, for messages
 * @example parseReportInput(readFileSync('out/report-data.json', 'utf8'), 'out/report-data.json')
 */
export function parseReportInput(text: string, file = 'report-data.json'): ReportInput {
  const fix = 'Fix: re-run `tilth build` to write it again (do not edit it by hand).';
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new UserError(`${file} is not valid JSON (${(e as Error).message}). ${fix}`, { file });
  }
  if (
    typeof raw === 'object' &&
    raw !== null &&
    'schema' in raw &&
    (raw as { schema: unknown }).schema !== REPORT_SCHEMA
  ) {
    throw new UserError(
      `${file}: schema "${String((raw as { schema: unknown }).schema)}" is not "${REPORT_SCHEMA}", which this tilth reads. ${fix}`,
      { file, field: 'schema' },
    );
  }
  const r = schema.safeParse(raw);
  if (!r.success) {
    const is = r.error.issues[0]!;
    const where = pathText(is.path);
    throw new UserError(
      `${file}, at ${where}: ${is.message}${r.error.issues.length > 1 ? ` (and ${r.error.issues.length - 1} more problems)` : ''}. ${fix}`,
      { file, where },
    );
  }
  return r.data as ReportInput;
}
