/**
 * Zones on the report's maps: every zone's outline once in the page's shared <defs>, drawn by <use> with a fill
 * and a label at a point well inside its largest part.
 */
import polylabel from 'polylabel';
import { ringArea, ringsBbox } from '../geo/area.js';
import { esc } from '../draw/escape.js';
import { type Frame, geoGroup, makeFrame, partsBbox, partsPath, px, py } from '../draw/frame.js';
import type { ReportInput, ReportPart, ReportZone } from './types.js';

/** A flat ring [x0, y0, x1, y1, ...] as polylabel's [[x, y], ...]. */
function ringPairs(r: ArrayLike<number>): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i + 1 < r.length; i += 2) out.push([r[i]!, r[i + 1]!]);
  return out;
}

/**
 * A point well inside a part, for its label: its pole of inaccessibility (the inside point farthest from every
 * edge, holes included), found by mapbox's polylabel to within 1/500 of the part's larger side.
 * @example labelPoint({ exterior: [0, 0, 10, 0, 10, 10, 0, 10], holes: [] }) // [5, 5]
 */
export function labelPoint(part: ReportPart): [number, number] {
  const rings = [part.exterior, ...part.holes].map(ringPairs);
  const [xmin, ymin, xmax, ymax] = ringsBbox([part.exterior]);
  const size = Math.max(xmax - xmin, ymax - ymin);
  if (!(size > 0)) return rings[0]!.length ? rings[0]![0]! : [0, 0];
  const [x, y] = polylabel(rings, size / 500);
  return [x, y];
}

/** A part's area, m² (exterior less holes, whichever way the rings turn). */
function partArea(p: ReportPart): number {
  return Math.abs(ringArea(p.exterior)) - p.holes.reduce((s, h) => s + Math.abs(ringArea(h)), 0);
}

/** Id of the shared path of zone `zi` of zone set `si` (see `zoneDefs`). */
const zoneRef = (si: number, zi: number): string => `zp-${si}-${zi}`;

/**
 * Every zone's outline, once, for the page's shared <defs>: the rate, binding and response maps draw them
 * with <use>, so a zone traced with thousands of vertices is written once, not once per map.
 */
export function zoneDefs(input: ReportInput): string {
  const f = makeFrame(partsBbox(input.field.parts));
  return input.zoneSets
    .map((set, si) =>
      set.zones
        .map(
          (z, zi) =>
            `<path id="${zoneRef(si, zi)}" class="zp" fill-rule="evenodd" d="${partsPath(f, z.parts)}"/>`,
        )
        .join(''),
    )
    .join('');
}

/** Zone polygons of set `si` filled by `fill(zone)`, labelled with `label(zone)` lines where the zone is big enough. */
export function zonePolys(
  f: Frame,
  si: number,
  zones: readonly ReportZone[],
  fill: (z: ReportZone) => string,
  label: (z: ReportZone) => string[],
): string {
  let polys = '';
  let texts = '';
  for (let zi = 0; zi < zones.length; zi++) {
    const z = zones[zi]!;
    polys += `<use href="#${zoneRef(si, zi)}" data-zone-id="${esc(z.id)}" fill="${esc(fill(z))}"/>`;
    if (!z.parts.length) continue;
    const big = z.parts.reduce((a, b) => (partArea(b) > partArea(a) ? b : a));
    if (partArea(big) * f.k * f.k < 900) continue;
    const [x, y] = labelPoint(big);
    const lines = label(z);
    const X = px(f, x).toFixed(1);
    const Y0 = py(f, y) - ((lines.length - 1) * 13) / 2 + 4;
    texts +=
      `<text x="${X}" y="${Y0.toFixed(1)}" text-anchor="middle">` +
      lines
        .map(
          (l, i) =>
            `<tspan x="${X}" dy="${i === 0 ? 0 : 13}"${i === 0 ? ' font-weight="bold"' : ''}>${esc(l)}</tspan>`,
        )
        .join('') +
      '</text>';
  }
  return `${geoGroup(f, 'zones')}<g stroke="#fff" stroke-width="1">${polys}</g></g><g class="zone-labels">${texts}</g>`;
}
