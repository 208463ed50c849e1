/**
 * Lab values as printed: numbers, censored values ("<2", "> 60"), blanks. One idea: text to a
 * number with a censoring flag, and the substitution used for censored values (docs/method.md).
 */
import type { Censor } from '../types.js';
import type { RawValue } from '../io/records.js';
import { parseUnit, type ValueUnit } from '../io/columns.js';

/** A parsed lab value: `limit` is the printed number; `value` the number tilth uses (see substitute). */
export interface LabValue {
  value: number;
  limit: number;
  censor: Censor;
  /** a unit printed in the cell itself ("12 ppm"), if any */
  unit?: ValueUnit;
}

/**
 * The number used for a censored value: below detection ("<2") -> half the limit (1),
 * above range (">60") -> the limit itself (60). Common practice for summaries and maps, not a
 * measurement; the flag travels with the value (Samples.censored) so reports can say so.
 * @example substitute(2, -1) // 1
 */
export function substitute(limit: number, censor: Censor): number {
  return censor === -1 ? limit / 2 : limit;
}

/** Words labs print for "not tested"; read as no value. */
const MISSING = /^(|-|--|n\/?a|na|nd|not tested|nt|none|null|\.)$/i;

/**
 * Parses one lab value. Returns null for a blank (not tested), 'bad' for text that is not a value.
 * @example parseLabValue('<2') // { value: 1, limit: 2, censor: -1 }
 * @example parseLabValue(' 12.5 ') // { value: 12.5, limit: 12.5, censor: 0 }
 * @example parseLabValue('24 lb/ac') // { value: 24, limit: 24, censor: 0, unit: 'lbac' }
 */
export function parseLabValue(raw: RawValue): LabValue | null | 'bad' {
  if (raw === null) return null;
  if (typeof raw === 'number') return Number.isFinite(raw) ? { value: raw, limit: raw, censor: 0 } : 'bad';
  if (typeof raw === 'boolean') return 'bad';
  const s = raw.trim();
  if (MISSING.test(s)) return null;
  const m =
    /^(<|>|<=|>=|less than|greater than)?\s*([-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?)\s*([a-z%/ ]*)$/i.exec(
      s,
    );
  if (!m) return 'bad';
  let unit: ValueUnit | undefined;
  if (m[6] && m[6].trim() !== '%') {
    const u = parseUnit(m[6]);
    if (!u) return 'bad';
    unit = u;
  }
  const v = Number(m[2]);
  const extra = unit ? { unit } : {};
  if (!m[1]) return { value: v, limit: v, censor: 0, ...extra };
  const censor: Censor = m[1].startsWith('<') || m[1].toLowerCase().startsWith('less') ? -1 : 1;
  return { value: substitute(v, censor), limit: v, censor, ...extra };
}
