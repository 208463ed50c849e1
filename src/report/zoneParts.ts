/**
 * Zones on the report's maps: every zone's outline once in the page's shared <defs>, drawn by <use> with a fill
 * and a label at a point well inside its largest part.
 */
import { esc } from './escape.js';
import { type Frame, geoGroup, makeFrame, partsBbox, partsPath, px, py } from './frame.js';
import type { ReportInput, ReportPart, ReportZone } from './types.js';

/**
 * A point well inside a part, for its label: the candidate farthest from every edge, searched on a
 * 12 x 12 grid over the part's box and refined twice around the best (a coarse pole of inaccessibility).
 * @example labelPoint({ exterior: [0, 0, 10, 0, 10, 10, 0, 10], holes: [] }) // ~[5, 5]
 */
export function labelPoint(part: ReportPart): [number, number] {
  const rings = [part.exterior, ...part.holes];
  const e = part.exterior;
  let xmin = Infinity,
    ymin = Infinity,
    xmax = -Infinity,
    ymax = -Infinity;
  for (let i = 0; i + 1 < e.length; i += 2) {
    xmin = Math.min(xmin, e[i]!);
    xmax = Math.max(xmax, e[i]!);
    ymin = Math.min(ymin, e[i + 1]!);
    ymax = Math.max(ymax, e[i + 1]!);
  }
  // signed: distance to the nearest edge, negative outside (even-odd over all rings)
  const score = (x: number, y: number): number => {
    let inside = false;
    let d2 = Infinity;
    for (const r of rings) {
      const n = r.length >> 1;
      for (let i = 0, j = n - 1; i < n; j = i++) {
        const xi = r[2 * i]!,
          yi = r[2 * i + 1]!,
          xj = r[2 * j]!,
          yj = r[2 * j + 1]!;
        if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
        const dx = xj - xi,
          dy = yj - yi;
        const l2 = dx * dx + dy * dy;
        const t = l2 > 0 ? Math.max(0, Math.min(1, ((x - xi) * dx + (y - yi) * dy) / l2)) : 0;
        d2 = Math.min(d2, (x - xi - t * dx) ** 2 + (y - yi - t * dy) ** 2);
      }
    }
    return inside ? Math.sqrt(d2) : -Math.sqrt(d2);
  };
  let best: [number, number] = [(xmin + xmax) / 2, (ymin + ymax) / 2];
  let bestS = score(best[0], best[1]);
  let sx = (xmax - xmin) / 12,
    sy = (ymax - ymin) / 12;
  let cx = xmin + sx / 2,
    cy = ymin + sy / 2;
  for (let pass = 0; pass < 3; pass++) {
    const n = pass === 0 ? 12 : 5;
    for (let a = 0; a < n; a++)
      for (let b = 0; b < n; b++) {
        const x = cx + a * sx,
          y = cy + b * sy;
        const sc = score(x, y);
        if (sc > bestS) {
          bestS = sc;
          best = [x, y];
        }
      }
    cx = best[0] - 2 * (sx / 2.5);
    cy = best[1] - 2 * (sy / 2.5);
    sx /= 2.5;
    sy /= 2.5;
  }
  return best;
}

function partArea(p: ReportPart): number {
  const ring = (r: ArrayLike<number>): number => {
    let a = 0;
    const n = r.length / 2;
    for (let i = 0; i < n; i++) {
      const j = (i + 1) % n;
      a += r[2 * i]! * r[2 * j + 1]! - r[2 * j]! * r[2 * i + 1]!;
    }
    return Math.abs(a) / 2;
  };
  return ring(p.exterior) - p.holes.reduce((s, h) => s + ring(h), 0);
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
  return `${geoGroup(f, ' class="zones"')}<g stroke="#fff" stroke-width="1">${polys}</g></g><g class="zone-labels">${texts}</g>`;
}
