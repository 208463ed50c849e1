/**
 * One lab cell to one soil layer in tilth's canonical unit, and a sample's layers to its one value: nitrate-N and
 * sulphate-S summed to 0-24 in (lb/ac), everything else from the 0-6 in (top) layer.
 */
import { UserError } from '../errors.js';
import type { Censor } from '../types.js';
import { kghaToLbac, kMeqToPpm, lbacToPpm, ppmToLbac, uscmToDsm } from '../units/index.js';
import { UNIT_LABEL, type ColumnInfo, type SoilValue, type ValueUnit } from '../io/columns.js';
import type { RawRecord } from '../io/records.js';
import type { LabValue } from './values.js';
import { ANALYTE_NAME } from '../vocabulary.js';

export interface Layer {
  top: number;
  bottom: number;
  value: number;
  censor: Censor;
  where: string;
}

export const SOIL_NAMES: Record<SoilValue, string> = {
  ...ANALYTE_NAME,
  ec: 'soluble salts (EC)',
  carbonate: 'carbonate (free lime)',
};

/** Units each soil value may be given in (first: the canonical one). */
const ALLOWED: Record<SoilValue, (ValueUnit | null)[]> = {
  no3_n: ['lbac', 'ppm', 'kgha'],
  so4_s: ['lbac', 'ppm', 'kgha'],
  p: ['ppm', null, 'lbac', 'kgha'],
  k: ['ppm', null, 'lbac', 'kgha', 'meq100g'],
  om: ['pct', null],
  ph: [null],
  ec: ['dsm', null, 'uscm'],
  carbonate: ['pct', null],
};

/** Context for messages. */
export interface LayerContext {
  file: string;
  id: string;
  record: RawRecord;
  column: ColumnInfo & { role: SoilValue };
}

/**
 * Converts a parsed lab value of a layer to the canonical unit (lb/ac 0-24 in sums for nitrate / sulphate, ppm for
 * P and K, % for OM and carbonate, dS/m for EC).
 * @returns the value, or throws a UserError naming the column and the fix
 */
export function toCanonical(
  v: LabValue,
  unit: ValueUnit | null,
  d: [number, number],
  ctx: LayerContext,
): number {
  const { file, record: r, column: c } = ctx;
  if (!ALLOWED[c.role].includes(unit)) {
    const fix = ALLOWED[c.role].filter((u): u is ValueUnit => u !== null).map((u) => UNIT_LABEL[u]);
    throw new UserError(
      `${file}: column "${c.name}" holds ${SOIL_NAMES[c.role]}${unit ? `, but its unit ${UNIT_LABEL[unit]} is not one for it` : ' but does not say its unit'}. ` +
        `Fix: ${fix.length ? `state the unit with --columns "${c.role}=${c.name}:${fix[0]}" (${fix.join(', ')})` : `map the column with --columns "${c.role}=${c.name}"`}.`,
      { file, where: r.where, field: c.name },
    );
  }
  const x = v.value;
  switch (unit) {
    case 'ppm':
      return c.role === 'no3_n' || c.role === 'so4_s' ? ppmToLbac(x, d[0], d[1]) : x;
    case 'kgha':
      return c.role === 'no3_n' || c.role === 'so4_s' ? kghaToLbac(x) : lbacToPpm(kghaToLbac(x), d[0], d[1]);
    case 'lbac':
      return c.role === 'no3_n' || c.role === 'so4_s' ? x : lbacToPpm(x, d[0], d[1]);
    case 'meq100g':
      return kMeqToPpm(x);
    case 'uscm':
      return uscmToDsm(x);
    default:
      return x;
  }
}

/**
 * Checks a value against what the soil value can be (a value that cannot be means the wrong column).
 * @throws UserError naming file, row, column, value and fix
 */
export function checkRange(v: LabValue, raw: unknown, ctx: LayerContext): void {
  const { file, id, record: r, column: c } = ctx;
  const at = `${file} ${r.where} (sample "${id}"), column "${c.name}"`;
  const fail = (why: string, fix: string) => {
    throw new UserError(`${at}: ${why}. Fix: ${fix}`, { file, where: r.where, field: c.name, value: raw });
  };
  if (v.limit < 0)
    fail(`${raw} is negative; soil test values cannot be`, 'correct the value or leave it empty.');
  if (c.role === 'ph' && (v.limit < 2 || v.limit > 12))
    fail(`pH ${raw} is outside any soil's range (2-12)`, 'check the column; is it pH?');
  if ((c.role === 'om' || c.role === 'carbonate') && v.limit > 100)
    fail(`${SOIL_NAMES[c.role]} ${raw} % is over 100 %`, 'check the column and its unit.');
}

/**
 * A sample's one value from its layers: nitrate and sulphate summed from the surface to 24 in (0-6 in alone times
 * the depth factor), other values from the layer that starts at the surface.
 * @returns [value, censor], or null when the sample has none of this value
 */
export function mergeLayers(
  list: Layer[],
  role: SoilValue,
  id: string,
  file: string,
  depthFactor: number | undefined,
): [number, Censor, boolean] | null {
  if (list.length === 0) return null;
  list.sort((x, y) => x.top - y.top || x.bottom - y.bottom);
  if (role === 'no3_n' || role === 'so4_s') {
    let depth = 0,
      sum = 0,
      cens: Censor = 0;
    for (const l of list) {
      if (l.top !== depth || depth >= 24) break;
      sum += l.value;
      depth = l.bottom;
      if (!cens && l.censor) cens = l.censor;
    }
    if (depth === 24) return [sum, cens, false];
    if (depth === 6) {
      if (depthFactor === undefined) {
        throw new UserError(
          `${file}: sample "${id}" has ${SOIL_NAMES[role]} for 0-6 in only; tilth's rates are calibrated to 0-24 in. ` +
            "Fix: give the 6-24 in results, or give --depth-factor X (your lab's or agronomist's factor from 0-6 in to 0-24 in; there is no published default).",
          { file, where: id, field: role },
        );
      }
      return [sum * depthFactor, cens, true];
    }
    throw new UserError(
      `${file}: sample "${id}" has ${SOIL_NAMES[role]} for ${list.map((l) => `${l.top}-${l.bottom}`).join(', ')} in, which does not make 0-24 in from the surface. ` +
        'Fix: give 0-6 and 6-24 in (or 0-24 in), or 0-6 in with --depth-factor.',
      { file, where: id, field: role },
    );
  }
  const top = list.find((l) => l.top === 0);
  if (!top) {
    if (role === 'ec' || role === 'carbonate') return null;
    throw new UserError(
      `${file}: sample "${id}" has ${SOIL_NAMES[role]} only below the surface (${list[0].top}-${list[0].bottom} in). ` +
        `Fix: give the 0-6 in result; if the column's depth was misread, give it with --columns "${role}=COLUMN@0-6".`,
      { file, where: id, field: role },
    );
  }
  return [top.value, top.censor, false];
}
