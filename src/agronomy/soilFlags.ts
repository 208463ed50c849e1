/**
 * Soil conditions flagged for people, not for rates: saline areas (soluble salts, EC) and high-pH / free-lime areas.
 * They change no rate unless a plan says so; inspect, the report (through the warnings) and zones.csv show them.
 */
import type { Warning } from '../errors.js';
import type { Samples } from '../types.js';

/**
 * EC (dS/m) from which a soil is saline: 4 dS/m in a saturated-paste extract [published] USDA Agriculture Handbook
 * No. 60, Diagnosis and Improvement of Saline and Alkali Soils (Richards 1954). 1:1 and 1:2 water extracts read
 * lower than a paste for the same soil, so on those the flag is conservative (flags fewer places).
 */
export const SALINE_EC_DSM = 4;
/** EC from which yields of salt-sensitive crops (canola is fairly tolerant, peas and beans are not) start to suffer: common practice. */
export const SLIGHTLY_SALINE_EC_DSM = 2;
/** pH (water) from which free lime is likely and P availability falls: common practice on prairie soils. */
export const HIGH_PH = 7.8;
/** Carbonate (% CaCO3 equivalent) read as high free lime: common practice (from memory: 5 % and above). */
export const HIGH_CARBONATE_PCT = 5;

/**
 * The flags of one sample, as short words: "saline", "slightly saline", "high pH", "free lime".
 * @example sampleFlags(samples, 0) // ['saline', 'high pH']
 */
export function sampleFlags(s: Pick<Samples, 'values' | 'extra' | 'limeRating'>, i: number): string[] {
  const out: string[] = [];
  const ec = s.extra?.ec?.[i] ?? NaN;
  if (ec >= SALINE_EC_DSM) out.push('saline');
  else if (ec >= SLIGHTLY_SALINE_EC_DSM) out.push('slightly saline');
  if (s.values.ph[i] >= HIGH_PH) out.push('high pH');
  if ((s.extra?.carbonate?.[i] ?? NaN) >= HIGH_CARBONATE_PCT || s.limeRating?.[i] === 'high')
    out.push('free lime');
  return out;
}

/**
 * Sample id -> its flags joined ("saline; high pH"), only for flagged samples.
 * @example soilFlagsById(samples)['PV-03'] // 'saline; free lime'
 */
export function soilFlagsById(
  s: Pick<Samples, 'ids' | 'values' | 'extra' | 'limeRating'>,
): Record<string, string> {
  const out: Record<string, string> = {};
  s.ids.forEach((id, i) => {
    const f = sampleFlags(s, i);
    if (f.length) out[id] = f.join('; ');
  });
  return out;
}

/**
 * Warnings for saline and high-pH samples (carried into inspect, the report and summary.json).
 * @example soilFlagWarnings(samples, 'samples.csv').map((w) => w.code) // ['soil-saline', 'soil-high-ph']
 */
export function soilFlagWarnings(
  s: Pick<Samples, 'ids' | 'values' | 'extra' | 'limeRating' | 'ecMethod'>,
  file: string,
): Warning[] {
  const by = (f: string) => s.ids.filter((_, i) => sampleFlags(s, i).includes(f));
  const list = (ids: string[]) =>
    ids.length <= 8 ? ids.join(', ') : `${ids.slice(0, 8).join(', ')} and ${ids.length - 8} more`;
  const w: Warning[] = [];
  const saline = by('saline'),
    slight = by('slightly saline'),
    high = by('high pH'),
    lime = by('free lime');
  const method = s.ecMethod ? ` (${s.ecMethod})` : '';
  if (saline.length)
    w.push({
      code: 'soil-saline',
      file,
      field: 'ec',
      message: `${file}: ${saline.length} sample(s) are saline, EC${method} ${SALINE_EC_DSM} dS/m or more: ${list(saline)}. Rates are not changed for it; yields there may be limited by salt, not nutrients: check those areas with your agronomist.`,
    });
  if (slight.length)
    w.push({
      code: 'soil-slightly-saline',
      file,
      field: 'ec',
      message: `${file}: ${slight.length} sample(s) are slightly saline, EC${method} ${SLIGHTLY_SALINE_EC_DSM}-${SALINE_EC_DSM} dS/m: ${list(slight)}. Salt-sensitive crops may suffer there; rates are not changed for it.`,
    });
  if (high.length)
    w.push({
      code: 'soil-high-ph',
      file,
      field: 'ph',
      message: `${file}: ${high.length} sample(s) have pH ${HIGH_PH} or more (free lime likely, P less available): ${list(high)}. Rates are not changed for it unless the plan says so.`,
    });
  if (lime.length)
    w.push({
      code: 'soil-free-lime',
      file,
      field: 'carbonate',
      message: `${file}: ${lime.length} sample(s) have high free lime (carbonate ${HIGH_CARBONATE_PCT} % or more, or rated high): ${list(lime)}.`,
    });
  return w;
}
