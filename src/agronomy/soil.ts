/**
 * Parses one location's soil values written as `key=value` pairs (the `tilth rates --soil` option).
 */
import { UserError } from '../errors.js';
import type { SoilValues } from './interpret.js';

const KEYS: Record<string, 'no3_n' | 'p' | 'k' | 'so4_s' | 'om' | 'ph'> = {
  no3: 'no3_n',
  no3_n: 'no3_n',
  n: 'no3_n',
  p: 'p',
  k: 'k',
  s: 'so4_s',
  so4_s: 'so4_s',
  so4: 'so4_s',
  om: 'om',
  ph: 'ph',
};
const UNITS =
  'no3 = nitrate-N lb/ac 0-24 in, p = ppm 0-6 in, k = ppm 0-6 in, s = sulphate-S lb/ac 0-24 in, om = %, ph, texture = light|medium|heavy, p_method = olsen|kelowna';

/**
 * Parses "no3=25,p=8,k=140,s=12,om=4[,texture=medium,ph=7.5,p_method=olsen]". Keys left out are NaN (not tested).
 * @param where named in error messages (e.g. "option --soil")
 * @example parseSoilSpec('no3=25,p=8,k=140,s=12,om=4').k // 140
 */
export function parseSoilSpec(text: string, where = 'soil values'): SoilValues {
  const soil: SoilValues = {
    no3_n: NaN,
    p: NaN,
    k: NaN,
    so4_s: NaN,
    om: NaN,
    ph: NaN,
    texture: null,
    pMethod: null,
  };
  for (const part of text.split(/[,;\s]+/).filter(Boolean)) {
    const m = /^([a-z0-9_]+)\s*[=:]\s*(.+)$/i.exec(part);
    if (!m)
      throw new UserError(
        `${where}: "${part}" is not key=value. Fix: write e.g. "no3=25,p=8,k=140,s=12,om=4" (${UNITS}).`,
        { value: part },
      );
    const key = m[1]!.toLowerCase();
    const val = m[2]!.trim();
    if (key === 'texture') {
      if (val !== 'light' && val !== 'medium' && val !== 'heavy')
        throw new UserError(`${where}: texture "${val}"; allowed: light, medium, heavy.`, {
          field: 'texture',
          value: val,
        });
      soil.texture = val;
      continue;
    }
    if (key === 'p_method' || key === 'method') {
      if (val !== 'olsen' && val !== 'kelowna')
        throw new UserError(`${where}: p_method "${val}"; allowed: olsen, kelowna.`, {
          field: 'p_method',
          value: val,
        });
      soil.pMethod = val;
      continue;
    }
    const k = KEYS[key];
    if (!k)
      throw new UserError(
        `${where}: unknown key "${key}"; allowed: no3, p, k, s, om, ph, texture, p_method (${UNITS}).`,
        { field: key },
      );
    const v = Number(val);
    if (!Number.isFinite(v) || v < 0 || (k === 'ph' && v > 14) || (k === 'om' && v > 100)) {
      throw new UserError(`${where}: ${key}="${val}" is not a plausible number. Fix: give ${UNITS}.`, {
        field: key,
        value: val,
      });
    }
    soil[k] = v;
  }
  return soil;
}
