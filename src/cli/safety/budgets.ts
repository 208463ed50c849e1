/**
 * Work budgets and option checks made before the work starts, so a command either finishes in reasonable time
 * and memory or refuses at once, naming the option value that fits. Numbers: docs/reliability.md.
 */
import { ringsBbox } from '../../geo/area.js';
import { UserError } from '../../errors.js';
import type { Field, RingsPart } from '../../types.js';

/** Grid cells `tilth build` works on, over the boundary's bounding box: 4 million (a 2 km x 2 km field at 1 m). */
export const BUILD_MAX_CELLS = 4_000_000;
/** Vertices in a boundary (all rings): 100 000 (a GPS-walked quarter section has a few thousand). */
export const MAX_BOUNDARY_VERTICES = 100_000;
/** Lags in a semivariogram (cutoff / width): 1 000. */
export const MAX_LAGS = 1_000;
/** Sample pairs a semivariogram compares: 50 million (about 10 000 samples). */
export const MAX_PAIRS = 50_000_000;
// the unsampled distance and its test live in the library (the build honours the plan's unsampled_parts)
export { farParts, MAX_UNSAMPLED_DISTANCE_M } from '../../validate/coverage.js';

const fmt = (n: number) => n.toLocaleString('en-US');

/**
 * Refuses a build grid over {@link BUILD_MAX_CELLS}; the message names the smallest cell size that fits.
 * @example checkBuildCells(field.bbox, 0.5) // throws for a 800 m x 800 m field: 2,560,000 ... fits? no, see docs
 */
export function checkBuildCells(bbox: readonly number[], cell: number, budget = BUILD_MAX_CELLS): void {
  const w = bbox[2]! - bbox[0]!,
    h = bbox[3]! - bbox[1]!;
  const cells = Math.ceil(w / cell) * Math.ceil(h / cell);
  if (cells <= budget) return;
  const fits = Math.ceil(Math.sqrt((w * h) / budget) * 10 + 1) / 10;
  throw new UserError(
    `the boundary spans ${(w / 1000).toFixed(2)} km x ${(h / 1000).toFixed(2)} km; ${cell} m cells make ${fmt(cells)} cells, more than the ${fmt(budget)} a build works on. ` +
      `Fix: give --cell ${fits} or larger${w > 10_000 || h > 10_000 ? ', and check the boundary: are parts of it far apart (another field in the file)?' : ''}.`,
  );
}

/** Vertices of all rings of all parts. */
export function vertexCount(parts: readonly RingsPart[]): number {
  let n = 0;
  for (const p of parts) {
    n += p.exterior.length / 2;
    for (const h of p.holes) n += h.length / 2;
  }
  return n;
}

/**
 * Refuses a boundary with more than {@link MAX_BOUNDARY_VERTICES} vertices, with the command that simplifies it.
 * @example checkBoundaryVertices(field, 'boundary.shp')
 */
export function checkBoundaryVertices(
  field: Pick<Field, 'parts'>,
  file: string,
  budget = MAX_BOUNDARY_VERTICES,
): void {
  const n = vertexCount(field.parts);
  if (n <= budget) return;
  throw new UserError(
    `${file}: the boundary has ${fmt(n)} vertices, more than the ${fmt(budget)} tilth works with. Fix: simplify it to about 0.2 m, e.g. \`ogr2ogr -simplify 0.2 simple.shp ${file}\` (GDAL) in a projected system, and pass the simplified file.`,
    { file },
  );
}

/**
 * Refuses a semivariogram with more than {@link MAX_LAGS} lags or {@link MAX_PAIRS} pairs.
 * @param cutoff metres, or undefined for the default (a third of the samples' bounding-box diagonal)
 * @example checkLags(samples.xy, 400, 0.001) // throws: 400 000 lags
 */
export function checkLags(xy: Float64Array, cutoff: number | undefined, width: number | undefined): void {
  const n = xy.length / 2;
  if ((n * (n - 1)) / 2 > MAX_PAIRS)
    throw new UserError(
      `${fmt(n)} samples make ${fmt(Math.round((n * (n - 1)) / 2))} pairs, more than the ${fmt(MAX_PAIRS)} a semivariogram compares. Fix: use a subset of the samples.`,
    );
  if (width === undefined) return;
  const [x0, y0, x1, y1] = ringsBbox([xy]);
  const c = cutoff ?? Math.hypot(x1 - x0, y1 - y0) / 3;
  if (c / width > MAX_LAGS) {
    throw new UserError(
      `option --width ${width}: ${c.toFixed(0)} m of cutoff in lags of ${width} m make ${fmt(Math.floor(c / width) + 1)} lags, more than ${fmt(MAX_LAGS)}. Fix: give --width ${Math.ceil((c / MAX_LAGS) * 100) / 100} or more (the default is cutoff / 15).`,
    );
  }
}

/**
 * Options that contradict each other are usage errors.
 * @example checkOrder('--min', 300, '--max', 10) // throws
 */
export function checkOrder(
  loName: string,
  lo: number | undefined,
  hiName: string,
  hi: number | undefined,
): void {
  if (lo !== undefined && hi !== undefined && lo > hi) {
    throw new UserError(
      `options ${loName} ${lo} and ${hiName} ${hi} contradict each other (${loName} is above ${hiName}). Fix: swap them, or correct one.`,
    );
  }
}
