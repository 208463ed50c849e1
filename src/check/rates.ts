/** Checks `rate_field`, `rate_range` and `total`: the rate columns, the machine's range and product totals. */
import { UserError } from '../errors.js';
import { m2ToAc, m2ToHa } from '../units/index.js';
import { fmt, lineWriter, list, UNIT_SUFFIX, type AddLine, type CheckContext } from './context.js';
import type { CheckLine, CheckOptions, RateTotal } from './types.js';
import type { CheckLayer } from './layer.js';

/**
 * The `rate_field` and `rate_range` lines, and the rate columns with their values per zone (null = blank) for
 * {@link rateTotals}, whose `total` lines close the report. Throws UserError for a rate written as text.
 * @example
 * checkRates(ctx).lines.at(-1) // with { rateField: 'urea_lbac', min: 100, max: 150 }:
 * // { check: 'rate_range', status: 'fail', message: '"urea_lbac" outside ... below: zone 3 (90); above: zone 4 (170)', zones: ['zone 3', 'zone 4'] }
 */
export function checkRates(ctx: CheckContext): {
  lines: CheckLine[];
  rateFields: string[];
  rates: Record<string, (number | null)[]>;
} {
  const { lines, add } = lineWriter();
  const found = checkRateFields(ctx, add);
  checkRateRange(ctx, add, found.rateFields, found.rates);
  return { lines, ...found };
}

/** Adds the `rate_field` lines; returns the rate columns and their values per zone (null = blank). */
function checkRateFields(
  ctx: CheckContext,
  add: AddLine,
): {
  rateFields: string[];
  rates: Record<string, (number | null)[]>;
} {
  const rateFields = pickRateFields(ctx.layer, ctx.opts, add);
  const rates: Record<string, (number | null)[]> = {};
  for (const rf of rateFields) {
    const field = ctx.layer.fields.find((x) => x.name === rf)!;
    rates[rf] = ctx.feats.map((f, i) => {
      const v = f.properties?.[rf];
      if (field.numeric && typeof v === 'number' && Number.isFinite(v)) return v;
      const text = typeof v === 'string' ? v.trim() : (ctx.layer.rawText?.[rf]?.[i] ?? '');
      if (text === '') return null;
      throw new UserError(
        `${ctx.layer.label}, ${ctx.names[i]}, column "${rf}": "${text}" is ${field.numeric ? 'not a number' : 'text (a text column)'}; a controller needs a numeric rate column. Fix: write the rate as a plain number in a numeric column (in a GIS, a Real/Double field), with the unit in the column name.`,
        { file: ctx.layer.label, where: ctx.names[i], field: rf, value: text },
      );
    });
  }
  for (const rf of rateFields) {
    const missing = rates[rf].map((v, i) => (v === null ? ctx.names[i] : '')).filter(Boolean);
    if (missing.length)
      add(
        'rate_field',
        'fail',
        `"${rf}": ${missing.length} zone${missing.length > 1 ? 's have' : ' has'} no rate: ${list(missing)}`,
        missing,
      );
    else add('rate_field', 'pass', `"${rf}" is numeric in every zone`);
  }

  return { rateFields, rates };
}

/** Adds the `rate_range` lines: rates above 0 below the machine's lowest, above its highest, or negative fail. */
function checkRateRange(
  ctx: CheckContext,
  add: AddLine,
  rateFields: string[],
  rates: Record<string, (number | null)[]>,
): void {
  if (ctx.opts.min === undefined && ctx.opts.max === undefined)
    add('rate_range', 'skip', 'no --min or --max given');
  else
    for (const rf of rateFields) {
      const low: string[] = [],
        high: string[] = [];
      rates[rf].forEach((v, i) => {
        if (v === null) return;
        if (ctx.opts.min !== undefined && v > 0 && v < ctx.opts.min) low.push(`${ctx.names[i]} (${v})`);
        if (ctx.opts.max !== undefined && v > ctx.opts.max) high.push(`${ctx.names[i]} (${v})`);
        if (v < 0) low.push(`${ctx.names[i]} (${v}, negative)`);
      });
      const zones = [...low, ...high].map((s) => s.replace(/ \(.*$/, ''));
      if (low.length || high.length) {
        add(
          'rate_range',
          'fail',
          `"${rf}" outside the machine's ${ctx.opts.min ?? '-'} to ${ctx.opts.max ?? '-'}: ${[low.length ? `below: ${list(low)}` : '', high.length ? `above: ${list(high)}` : ''].filter(Boolean).join('; ')}`,
          zones,
        );
      } else
        add(
          'rate_range',
          'pass',
          `"${rf}" within ${ctx.opts.min ?? '-'} to ${ctx.opts.max ?? '-'} (0 = off)`,
        );
    }
}

/**
 * A `total` line per rate column, and the totals (product = rate x ground area).
 * @example rateTotals(ctx, rateFields, rates).totals // [{ field: 'urea_lbac', unit: 'lb/ac', total: 18716.3, totalUnit: 'lb', areaAc: 158.24 }, ...]
 */
export function rateTotals(
  ctx: CheckContext,
  rateFields: string[],
  rates: Record<string, (number | null)[]>,
): { lines: CheckLine[]; totals: RateTotal[] } {
  const { lines, add } = lineWriter();
  const totals: RateTotal[] = [];
  const areaAc = m2ToAc(ctx.groundAreas.reduce((s, a) => s + a, 0));
  for (const rf of rateFields) {
    const u = UNIT_SUFFIX.find(([re]) => re.test(rf));
    const total = rates[rf].reduce<number>(
      (s, v, i) => s + (v ?? 0) * (u?.[3] === 'ha' ? m2ToHa(ctx.groundAreas[i]) : m2ToAc(ctx.groundAreas[i])),
      0,
    );
    const t: RateTotal = {
      field: rf,
      unit: u ? u[1] : null,
      total,
      totalUnit: u ? u[2] : 'rate x ac',
      areaAc,
    };
    totals.push(t);
    add(
      'total',
      ctx.work ? 'pass' : 'warn',
      `"${rf}": ${fmt(total, 0)} ${t.totalUnit} over ${fmt(areaAc, 2)} ac${u ? '' : ' (unit not known from the column name)'}${ctx.work ? '' : ' (areas in file units: coordinate system unknown)'}`,
    );
  }
  return { lines, totals };
}

function pickRateFields(layer: CheckLayer, opts: CheckOptions, add: AddLine): string[] {
  const all = layer.fields.map((f) => f.name);
  if (opts.rateField) {
    const f = layer.fields.find((x) => x.name.toLowerCase() === opts.rateField!.toLowerCase());
    if (!f) {
      add('rate_field', 'fail', `no column "${opts.rateField}"; the columns are ${all.join(', ') || 'none'}`);
      return [];
    }
    return [f.name];
  }
  const byUnit = layer.fields.filter((f) => UNIT_SUFFIX.some(([re]) => re.test(f.name)));
  if (byUnit.length) return byUnit.map((f) => f.name);
  const numeric = layer.fields.filter(
    (f) =>
      f.numeric && !/^(zone_?id|zone|id|zone_no|fid|objectid|area.*|acres?|hectares?|ha|ac)$/i.test(f.name),
  );
  if (numeric.length === 1) {
    add(
      'rate_field',
      'warn',
      `no --rate-field given; using the only numeric column "${numeric[0].name}" (unit unknown)`,
    );
    return [numeric[0].name];
  }
  add(
    'rate_field',
    'fail',
    `cannot tell the rate column: give --rate-field (columns: ${all.join(', ') || 'none'})`,
  );
  return [];
}
