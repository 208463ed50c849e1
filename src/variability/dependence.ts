/**
 * Spatial dependence class from the nugget-to-sill ratio
 * [published] Cambardella et al. 1994, Soil Sci. Soc. Am. J. 58:1501-1511:
 * nugget / (nugget + partial sill) < 25 % strong, 25-75 % moderate, > 75 % weak.
 */

export type DependenceClass = 'strong' | 'moderate' | 'weak';

export interface Dependence {
  /** nugget / sill, a fraction 0..1 */
  ratio: number;
  class: DependenceClass;
}

/**
 * Classifies spatial dependence. Exactly 25 % and 75 % count as moderate.
 * @example spatialDependence(0.05, 0.59) // { ratio: 0.078, class: 'strong' }
 */
export function spatialDependence(nugget: number, psill: number): Dependence {
  const sill = nugget + psill;
  const ratio = sill > 0 ? nugget / sill : NaN;
  if (!Number.isFinite(ratio)) return { ratio, class: 'weak' };
  return { ratio, class: ratio < 0.25 ? 'strong' : ratio > 0.75 ? 'weak' : 'moderate' };
}
