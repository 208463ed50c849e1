/**
 * Where the samples are: every position a pair of finite longitude/latitude numbers, samples far from the field
 * or outside its boundary, samples at one point. Steps of prepareInputs (src/validate/inputs.ts). Pure.
 */
import { UserError, type Warning } from '../errors.js';
import { pointInParts } from '../geo/area.js';
import type { RawTable } from '../io/records.js';
import type { Field, Samples } from '../types.js';
import { abbrev } from './samples.js';
import { subset, subsetXY } from './subset.js';

type LonLatSamples = Omit<Samples, 'xy'>;

/** "row 12" from "samples.csv row 12": the sample's place in its file, without the file name. */
const place = (s: LonLatSamples, i: number, file: string) => s.origin[i].replace(file + ' ', '');

/**
 * Refuses a sample position that is not a pair of finite numbers, swapped latitude and longitude, projected
 * metres given as degrees, or 0, 0 (a missing GPS fix). Every reader's positions pass here, before projection.
 * @example checkPositions(built.samples, table) // throws UserError for [NaN, 52]
 */
export function checkPositions(s: LonLatSamples, table: RawTable): void {
  const file = table.file;
  for (let i = 0; i < s.ids.length; i++) {
    const lon = s.lonlat[2 * i],
      lat = s.lonlat[2 * i + 1];
    const info = { file, where: s.ids[i], value: [lon, lat] };
    if (!Number.isFinite(lon) || !Number.isFinite(lat)) {
      throw new UserError(
        `${file} sample "${s.ids[i]}" (${place(s, i, file)}): position [${lon}, ${lat}] is not a pair of finite numbers. Fix: give the sample's position in decimal degrees, or export the file again.`,
        info,
      );
    }
    if (Math.abs(lat) > 90 && Math.abs(lat) <= 180 && Math.abs(lon) <= 90) {
      throw new UserError(
        `${file} sample "${s.ids[i]}" (${place(s, i, file)}): latitude ${lat} and longitude ${lon} look swapped. ` +
          'Fix: swap the latitude and longitude columns (or name them with --columns "lat=...,lon=...").',
        info,
      );
    }
    if (Math.abs(lon) > 180 || Math.abs(lat) > 90) {
      throw new UserError(
        `${file} sample "${s.ids[i]}" (${place(s, i, file)}): position [${lon}, ${lat}] is not a longitude/latitude; it looks like projected metres. ` +
          'Fix: give sample positions in WGS 84 decimal degrees (or a shapefile with its .prj).',
        info,
      );
    }
    if (lat > -1e-9 && lat < 1e-9 && lon > -1e-9 && lon < 1e-9) {
      throw new UserError(
        `${file} sample "${s.ids[i]}": position 0, 0 (a missing GPS fix?). Fix: give the sample's position or remove it.`,
        { file, where: s.ids[i] },
      );
    }
  }
}

/** Samples after the boundary test: those kept, their projected positions, and their indices in the samples read. */
export interface Placed<S extends LonLatSamples> {
  s: S;
  xy: Float64Array;
  /** for each sample in s, its index in the samples given (differs when --drop-outside dropped some) */
  kept: number[];
}

/**
 * Refuses samples that all lie more than 5 km (or twice the field's diagonal) from the boundary; warns about
 * samples outside it, or drops them with `dropOutside`.
 * @example placeSamples(s, xy, field, 'samples.csv', 'boundary.geojson', false, warnings).kept
 */
export function placeSamples<S extends LonLatSamples>(
  s: S,
  xy: Float64Array,
  field: Pick<Field, 'bbox' | 'parts'>,
  files: { samples: string; boundary: string },
  dropOutside: boolean | undefined,
  warnings: Warning[],
): Placed<S> {
  const [x0, y0, x1, y1] = field.bbox;
  const diag = Math.hypot(x1 - x0, y1 - y0);
  const far: string[] = [];
  const outside: number[] = [];
  for (let i = 0; i < s.ids.length; i++) {
    const x = xy[2 * i],
      y = xy[2 * i + 1];
    if (!pointInParts(field.parts, x, y)) outside.push(i);
    const dx = Math.max(x0 - x, 0, x - x1),
      dy = Math.max(y0 - y, 0, y - y1);
    if (Math.hypot(dx, dy) > Math.max(5000, 2 * diag) || !Number.isFinite(x)) far.push(s.ids[i]);
  }
  const file = files.samples;
  if (far.length === s.ids.length) {
    throw new UserError(
      `${file}: every sample lies far from the boundary in ${files.boundary} (more than 5 km). Fix: check that the files belong to the same field, and that latitude and longitude are not swapped.`,
      { file },
    );
  }
  const all = s.ids.map((_, i) => i);
  if (!outside.length) return { s, xy, kept: all };
  const outIds = outside.map((i) => s.ids[i]);
  if (dropOutside) {
    warnings.push({
      code: 'dropped-outside',
      file,
      message: `${file}: ${outIds.length} sample(s) outside the boundary were dropped (--drop-outside): ${abbrev(outIds, 20)}.`,
    });
    const out = new Set(outside);
    const keep = all.filter((i) => !out.has(i));
    return { s: subset(s, keep), xy: subsetXY(xy, keep), kept: keep };
  }
  warnings.push({
    code: 'outside-boundary',
    file,
    where: outIds.join(','),
    message: `${file}: ${outIds.length} sample(s) lie outside the boundary (${abbrev(outIds, 20)}); they are kept${far.length ? ` (${abbrev(far)} more than 5 km away)` : ''}. Use --drop-outside to leave them out.`,
  });
  return { s, xy, kept: all };
}

/** Comparisons the same-place test makes at most: 20 million (a file of thousands of samples at one point is reported, not exhausted). */
const COMPARE_BUDGET = 20_000_000;

/**
 * Different ids within 0.5 m of each other: a warning naming five pairs and counting the rest. Where they share a
 * point, the surface stage averages their values (src/surface/prepare.ts), as a lab would for a re-tested site.
 * Memory stays linear however many samples share a point.
 * @example samePlaceWarning(s, xy, 'samples.csv') // null, or { code: 'same-place', ... }
 */
export function samePlaceWarning(s: LonLatSamples, xy: Float64Array, file: string): Warning | null {
  const order = s.ids.map((_, i) => i).sort((a, c) => xy[2 * a] - xy[2 * c]);
  const pairs: string[] = [];
  let nPairs = 0,
    compared = 0;
  for (let a = 0; a < order.length && compared < COMPARE_BUDGET; a++) {
    for (
      let c = a + 1;
      c < order.length && xy[2 * order[c]] - xy[2 * order[a]] < 0.5 && compared < COMPARE_BUDGET;
      c++, compared++
    ) {
      const i = order[a],
        j = order[c];
      if (Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]) >= 0.5) continue;
      if (++nPairs <= 5)
        pairs.push(`"${s.ids[i]}" and "${s.ids[j]}" (${s.lonlat[2 * i + 1]}, ${s.lonlat[2 * i]})`);
    }
  }
  if (!nPairs) return null;
  const more =
    compared >= COMPARE_BUDGET ? ' and many more' : nPairs > 5 ? ` and ${nPairs - 5} more pairs` : '';
  return {
    code: 'same-place',
    file,
    where: pairs.join('; '),
    message: `${file}: samples ${pairs.join(', ')}${more} are within 0.5 m of each other; at one point their values are averaged in the maps. Fix: if they are different sites, correct the coordinates of one of them.`,
  };
}
