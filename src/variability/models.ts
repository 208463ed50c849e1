/**
 * Semivariogram model shapes in gstat's parameterisation (gstat 2.1.0, `vgm()`):
 * gamma(h) = nugget + psill * unit(h / a) for h > 0, and 0 at h = 0.
 *
 * - spherical:   unit = 1.5 t - 0.5 t^3 for t < 1, else 1;  reaches the sill at h = a (effective range a)
 * - exponential: unit = 1 - exp(-t);   a is a distance parameter: 95 % of the sill at h = 3a (effective range 3a)
 * - gaussian:    unit = 1 - exp(-t^2); 95 % of the sill at h = sqrt(3) a (effective range sqrt(3) a)
 */

export type ModelKind = 'spherical' | 'exponential' | 'gaussian';

/** gstat's short names, for output that is compared with gstat */
export const GSTAT_NAME: Readonly<Record<ModelKind, string>> = {
  spherical: 'Sph',
  exponential: 'Exp',
  gaussian: 'Gau',
};

/**
 * The unit (sill 1, no nugget) model at distance h > 0 with range parameter a.
 * @example unitVariogram('spherical', 50, 100) // 0.6875
 */
export function unitVariogram(kind: ModelKind, h: number, a: number): number {
  if (h <= 0) return 0;
  const t = h / a;
  switch (kind) {
    case 'spherical':
      return t >= 1 ? 1 : 1.5 * t - 0.5 * t * t * t;
    case 'exponential':
      return 1 - Math.exp(-t);
    case 'gaussian':
      return 1 - Math.exp(-t * t);
  }
}

/**
 * The distance at which the model reaches its sill (spherical) or 95 % of it (exponential 3a, Gaussian sqrt(3) a).
 * @example effectiveRange('exponential', 100) // 300
 */
export function effectiveRange(kind: ModelKind, a: number): number {
  switch (kind) {
    case 'spherical':
      return a;
    case 'exponential':
      return 3 * a;
    case 'gaussian':
      return Math.sqrt(3) * a;
  }
}

/** How to read the range parameter, for people. */
export const RANGE_NOTE: Readonly<Record<ModelKind, string>> = {
  spherical: 'spherical: the range parameter is the distance at which the sill is reached',
  exponential:
    "exponential: gstat's range parameter a; 95 % of the sill is reached at 3a (the effective range)",
  gaussian:
    "Gaussian: gstat's range parameter a; 95 % of the sill is reached at sqrt(3) a (the effective range)",
};
