/**
 * The samples one nutrient's surface is built from: samples without a value are skipped (and named),
 * samples at one location are merged (values averaged, with a warning when they differ).
 */
import type { Warning } from '../errors.js';

/** Samples of one nutrient, ready to interpolate. */
export interface NutrientPoints {
  xy: Float64Array;
  z: Float64Array;
  /** id (or ids joined with "+") per point */
  ids: string[];
  /** zone key per point (zone-composite samples), else null */
  zone: (string | null)[];
  warnings: Warning[];
}

/** Positions closer than this (metres) count as one location. */
export const SAME_PLACE_M = 0.001;

/**
 * Filters and merges one nutrient's samples.
 * @param xy positions x0 y0 ... (metres)
 * @param values the nutrient's values, NaN = not tested
 * @param ids sample ids (for messages)
 * @param label nutrient name for messages, e.g. "P (ppm)"
 * @param zone zone key per sample (optional)
 * @example const pts = nutrientPoints(s.xy, s.values.p, s.ids, 'P (ppm)')
 */
export function nutrientPoints(
  xy: Float64Array,
  values: ArrayLike<number>,
  ids: string[],
  label: string,
  zone?: (string | null)[],
): NutrientPoints {
  const warnings: Warning[] = [];
  const n = values.length;
  const missing: string[] = [];
  const groups = new Map<string, number[]>();
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(values[i])) {
      missing.push(ids[i] ?? `#${i + 1}`);
      continue;
    }
    const key = `${Math.round(xy[2 * i] / SAME_PLACE_M)},${Math.round(xy[2 * i + 1] / SAME_PLACE_M)}`;
    const g = groups.get(key);
    if (g) g.push(i);
    else groups.set(key, [i]);
  }
  if (missing.length) {
    warnings.push({
      code: 'surface-value-missing',
      message: `${label}: ${missing.length} sample${missing.length > 1 ? 's have' : ' has'} no value and ${missing.length > 1 ? 'are' : 'is'} skipped for this nutrient: ${list(missing)}.`,
      field: label,
      where: missing.join(', '),
    });
  }
  const m = groups.size;
  const out: NutrientPoints = {
    xy: new Float64Array(2 * m),
    z: new Float64Array(m),
    ids: [],
    zone: [],
    warnings,
  };
  let k = 0;
  for (const g of groups.values()) {
    let s = 0,
      lo = Infinity,
      hi = -Infinity;
    for (const i of g) {
      s += values[i];
      lo = Math.min(lo, values[i]);
      hi = Math.max(hi, values[i]);
    }
    out.xy[2 * k] = xy[2 * g[0]];
    out.xy[2 * k + 1] = xy[2 * g[0] + 1];
    out.z[k] = s / g.length;
    const gid = g.map((i) => ids[i] ?? `#${i + 1}`);
    out.ids.push(gid.join('+'));
    out.zone.push(zone ? zone[g[0]] : null);
    if (g.length > 1 && hi > lo) {
      warnings.push({
        code: 'surface-same-location',
        message: `${label}: samples ${gid.join(', ')} are at one location with different values (${g.map((i) => values[i]).join(', ')}); their average ${round(out.z[k])} is used.`,
        field: label,
        where: gid.join(', '),
      });
    }
    k++;
  }
  return out;
}

function list(a: string[]): string {
  return a.length <= 12 ? a.join(', ') : `${a.slice(0, 12).join(', ')} and ${a.length - 12} more`;
}

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
