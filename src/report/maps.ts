/**
 * The report's maps, each an inline SVG with legend, scale bar and north arrow (see frame.ts):
 * sample locations, one surface per nutrient with its samples' values, response-probability classes,
 * one rate map per zone set and product placement, and where the seed-row and other limits bind.
 */
import { classColours, NEUTRAL, QUALITATIVE, rateColours } from './colour.js';
import { esc, fmt } from './escape.js';
import {
  type Frame,
  type LegendItem,
  geoGroup,
  legend,
  makeFrame,
  mapSvg,
  partsBbox,
  partsPath,
  px,
  py,
} from './frame.js';
import { trueNorthOnGrid } from './north.js';
import { pngDataUri } from './png.js';
import { areaLabel } from './tables.js';
import type {
  ReportInput,
  ReportNutrient,
  ReportPart,
  ReportRaster,
  ReportZone,
  ReportZoneSet,
} from './types.js';

/** One drawn map. */
export interface ReportMap {
  id: string;
  kind: 'samples' | 'surface' | 'response' | 'rate' | 'binding';
  title: string;
  caption: string;
  svg: string;
  legendItems: number;
}

/**
 * Class index of every cell: 0 below breaks[0], i where breaks[i-1] <= v < breaks[i], 255 for NaN.
 * @example classify([1, 5, NaN, 12], [4, 10]) // Uint8Array [0, 1, 255, 2]
 */
export function classify(values: ArrayLike<number>, breaks: readonly number[]): Uint8Array {
  const out = new Uint8Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!Number.isFinite(v)) {
      out[i] = 255;
      continue;
    }
    let c = 0;
    while (c < breaks.length && v >= breaks[c]!) c++;
    out[i] = c;
  }
  return out;
}

/** Labels of the classes made by ascending breaks: "< 10", "10 – 20", "≥ 20". */
export function breakLabels(breaks: readonly number[], decimals = 0): string[] {
  if (breaks.length === 0) return ['all values'];
  const out = [`< ${fmt(breaks[0]!, decimals)}`];
  for (let i = 1; i < breaks.length; i++)
    out.push(`${fmt(breaks[i - 1]!, decimals)} – < ${fmt(breaks[i]!, decimals)}`);
  out.push(`≥ ${fmt(breaks[breaks.length - 1]!, decimals)}`);
  return out;
}

/**
 * Grows classes into empty cells next to them (8 neighbours, `passes` times), in place. A surface has values
 * only where the cell centre is in the field; without this the boundary cells whose centres fall outside
 * would show as white notches inside the drawn boundary. The image is clipped to the boundary afterwards.
 * @example dilateClasses(new Uint8Array([0, 255, 255]), 3, 1, 1) // [0, 0, 255]
 */
export function dilateClasses(index: Uint8Array, cols: number, rows: number, passes = 2): Uint8Array {
  for (let p = 0; p < passes; p++) {
    const src = index.slice();
    for (let r = 0; r < rows; r++)
      for (let c = 0; c < cols; c++) {
        if (src[r * cols + c] !== 255) continue;
        search: for (let dr = -1; dr <= 1; dr++)
          for (let dc = -1; dc <= 1; dc++) {
            const rr = r + dr,
              cc = c + dc;
            if (rr < 0 || cc < 0 || rr >= rows || cc >= cols) continue;
            const v = src[rr * cols + cc]!;
            if (v !== 255) {
              index[r * cols + c] = v;
              break search;
            }
          }
      }
  }
  return index;
}

function rasterImage(
  f: Frame,
  r: ReportRaster,
  index: Uint8Array,
  palette: readonly string[],
  clipId: string,
): string {
  const g = r.grid;
  const uri = pngDataUri(dilateClasses(index, g.cols, g.rows), g.cols, g.rows, palette);
  return (
    `<image class="raster" x="${(g.xmin - f.x0).toFixed(2)}" y="${(f.y0 - g.ymax).toFixed(2)}" width="${g.cols * g.cell}" height="${g.rows * g.cell}" ` +
    `preserveAspectRatio="none" style="image-rendering:pixelated" clip-path="url(#${clipId})" href="${uri}"/>`
  );
}

function clipDef(f: Frame, parts: readonly ReportPart[], id: string): string {
  return `<defs><clipPath id="${id}" clipPathUnits="userSpaceOnUse"><path clip-rule="evenodd" d="${partsPath(f, parts)}"/></clipPath></defs>`;
}

function boundary(f: Frame, parts: readonly ReportPart[]): string {
  return `${geoGroup(f, ' class="boundary"')}<path d="${partsPath(f, parts)}" fill="none" fill-rule="evenodd" stroke="#000" stroke-width="2.2" vector-effect="non-scaling-stroke"/></g>`;
}

/**
 * Sample dots (in metres) and their labels (in pixels, with a halo so they read on any fill). Each label takes
 * the first of four places around its dot (NE, SE, NW, SW) that does not overlap a label already placed, so
 * dense grids (1 sample per acre) stay readable; where none is free it goes NE.
 */
function samplePoints(f: Frame, input: ReportInput, label: (i: number) => string | null): string {
  const { xy, ids } = input.samples;
  const r = 4.5 / f.k;
  let dots = '';
  let texts = '';
  const placed = new BoxIndex();
  const CH = 6.3,
    H = 11; // approximate glyph width and height at 11 px
  for (let i = 0; i < ids.length; i++) {
    const x = xy[2 * i]!;
    const y = xy[2 * i + 1]!;
    dots += `<circle cx="${(x - f.x0).toFixed(1)}" cy="${(f.y0 - y).toFixed(1)}" r="${r.toPrecision(3)}"/>`;
    const t = label(i);
    if (t === null) continue;
    const X = px(f, x),
      Y = py(f, y),
      w = t.length * CH;
    const options: [number, number, string][] = [
      [X + 6, Y - 5, 'start'],
      [X + 6, Y + 14, 'start'],
      [X - 6, Y - 5, 'end'],
      [X - 6, Y + 14, 'end'],
    ];
    let pick = options[0]!;
    for (const o of options) {
      const box: [number, number, number, number] =
        o[2] === 'start' ? [o[0], o[1] - H, o[0] + w, o[1]] : [o[0] - w, o[1] - H, o[0], o[1]];
      if (!placed.overlaps(box)) {
        pick = o;
        break;
      }
    }
    placed.add(
      pick[2] === 'start'
        ? [pick[0], pick[1] - H, pick[0] + w, pick[1]]
        : [pick[0] - w, pick[1] - H, pick[0], pick[1]],
    );
    texts += `<text x="${pick[0].toFixed(1)}" y="${pick[1].toFixed(1)}"${pick[2] === 'end' ? ' text-anchor="end"' : ''}>${esc(t)}</text>`;
  }
  return (
    `${geoGroup(f, ' class="samples"')}<g fill="#fff" stroke="#000" stroke-width="1.5" class="sample-dots">${dots}</g></g>` +
    `<g class="sample-labels">${texts}</g>`
  );
}

/**
 * Placed label boxes [x0, y0, x1, y1] (px) in a uniform hash of 64 px cells, so that asking whether a new box
 * overlaps any placed one looks only at boxes nearby (thousands of samples: linear instead of quadratic).
 * The answer is the same as testing every placed box.
 */
export class BoxIndex {
  private cells = new Map<number, [number, number, number, number][]>();
  private static readonly S = 64;
  private keys(b: readonly number[], fn: (key: number) => boolean | void): boolean {
    const S = BoxIndex.S;
    for (let gy = Math.floor(b[1]! / S); gy <= Math.floor(b[3]! / S); gy++) {
      for (let gx = Math.floor(b[0]! / S); gx <= Math.floor(b[2]! / S); gx++)
        if (fn((gy + 4096) * 8192 + gx + 4096)) return true;
    }
    return false;
  }
  add(b: [number, number, number, number]): void {
    this.keys(b, (k) => {
      const l = this.cells.get(k);
      if (l) l.push(b);
      else this.cells.set(k, [b]);
    });
  }
  overlaps(box: readonly [number, number, number, number]): boolean {
    return this.keys(box, (k) =>
      (this.cells.get(k) ?? []).some((b) => box[0] < b[2] && b[0] < box[2] && box[1] < b[3] && b[1] < box[3]),
    );
  }
}

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
function zonePolys(
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

function valueLabel(n: ReportNutrient, v: number, cens: number): string | null {
  if (!Number.isFinite(v)) return null;
  return (cens < 0 ? '<' : cens > 0 ? '>' : '') + fmt(v, n.decimals ?? 0);
}

/**
 * Every map of the report, in reading order.
 * @example buildMaps(input).map((m) => m.title)
 */
export function buildMaps(input: ReportInput): ReportMap[] {
  const bbox = partsBbox(input.field.parts);
  const f = makeFrame(bbox);
  const north = trueNorthOnGrid(input.utm, (bbox[0] + bbox[2]) / 2, (bbox[1] + bbox[3]) / 2);
  const maps: ReportMap[] = [];
  const fieldParts = input.field.parts;
  const nut = new Map(input.nutrients.map((n) => [n.key, n]));
  const nutLabel = (key: string): ReportNutrient => nut.get(key) ?? { key, label: key, unit: '' };
  // each map sets bodyFor (its content, given the map's id for clip paths), then calls add
  let bodyFor: (id: string) => string = () => '';
  const add = (
    kind: ReportMap['kind'],
    title: string,
    caption: string,
    items: LegendItem[],
    legendTitle: string,
    notes: string[] = [],
  ): void => {
    const id = `map-${maps.length + 1}`;
    const svg = mapSvg(
      f,
      id,
      kind,
      bodyFor(id),
      legend(f, legendTitle, items, notes),
      input.utm,
      title,
      north,
    );
    maps.push({ id, kind, title, caption, svg, legendItems: items.length });
  };
  const utmNote = `UTM zone ${input.utm.zone}${input.utm.south ? 'S' : 'N'} (EPSG:${input.utm.epsg}); the arrow points to true north, ${fmt(Math.abs(north), 1)}° ${north < 0 ? 'west' : 'east'} of grid north.`;

  // 1. sample locations
  bodyFor = () => boundary(f, fieldParts) + samplePoints(f, input, (i) => input.samples.ids[i] ?? '');
  add(
    'samples',
    'Soil sample locations',
    `${input.samples.ids.length} samples, labelled with their ids. ${utmNote}`,
    [
      { fill: 'point', label: `Soil sample (${input.samples.ids.length}), labelled with its id` },
      { fill: 'line', label: 'Field boundary' },
    ],
    'Samples',
  );

  // 2. surfaces
  for (const s of input.surfaces) {
    const n = nutLabel(s.nutrient);
    const labels = breakLabels(s.breaks, n.decimals ?? 0);
    const colours = classColours('viridis', labels.length);
    const vals = input.samples.values[s.nutrient];
    const cens = input.samples.censored?.[s.nutrient];
    bodyFor = (id) =>
      geoGroup(f) +
      clipDef(f, fieldParts, `${id}-clip`) +
      rasterImage(f, s.raster, classify(s.raster.values, s.breaks), colours, `${id}-clip`) +
      '</g>' +
      boundary(f, fieldParts) +
      samplePoints(f, input, (i) => (vals ? valueLabel(n, vals[i]!, cens ? cens[i]! : 0) : null));
    const unit = n.unit ? ` (${n.unit})` : '';
    add(
      'surface',
      `${n.label}: interpolated surface`,
      `${n.label}${unit}${s.method ? `, ${s.method}` : ''}, ${fmt(s.raster.grid.cell, s.raster.grid.cell < 10 ? 1 : 0)} m cells; samples labelled with their lab values ("<" below detection, ">" above range). Classes are the zones' classes. ${utmNote}`,
      [
        ...labels.map((l, i) => ({ fill: colours[i]!, label: l })),
        { fill: 'point', label: 'Soil sample and its value' },
        { fill: 'line', label: 'Field boundary' },
      ],
      `${n.label}${unit}`,
      s.raster.notes,
    );
  }

  // 3. response-probability classes
  for (const r of input.response) {
    const n = nutLabel(r.nutrient);
    const colours = classColours('magma', r.classes.length).reverse();
    const items: LegendItem[] = r.classes.map((c, i) => ({ fill: colours[i]!, label: c.label }));
    if (r.raster) {
      const rr = r.raster;
      const idx = new Uint8Array(rr.values.length);
      for (let i = 0; i < idx.length; i++) {
        const v = rr.values[i]!;
        idx[i] = Number.isFinite(v) && v >= 0 && v < colours.length ? v : 255;
      }
      bodyFor = (id) =>
        geoGroup(f) +
        clipDef(f, fieldParts, `${id}-clip`) +
        rasterImage(f, rr, idx, colours, `${id}-clip`) +
        '</g>' +
        boundary(f, fieldParts);
    } else if (r.byZone) {
      const si = input.zoneSets.findIndex((s) => s.name === r.byZone!.zoneSet);
      const cls = r.byZone.classes;
      bodyFor = () =>
        zonePolys(
          f,
          si,
          si >= 0 ? input.zoneSets[si]!.zones : [],
          (z) => colours[cls[z.id] ?? -1] ?? NEUTRAL,
          (z) => [z.id],
        ) + boundary(f, fieldParts);
    } else bodyFor = () => boundary(f, fieldParts);
    add(
      'response',
      `${n.label}: chance of a yield response`,
      `Chance that the crop responds to applied ${n.label}, by soil-test class${r.source ? ` (${r.source})` : ''}. ${utmNote}`,
      [...items, { fill: 'line', label: 'Field boundary' }],
      `Chance of response to ${n.label}`,
      r.raster?.notes,
    );
  }

  // 4. rates per zone set and product placement; 5. binding limits per zone set
  input.zoneSets.forEach((set, si) => {
    for (const { product, placement, unit } of productPlacements(set)) {
      const rateOf = (z: ReportZone): number | undefined =>
        z.rates.find((r) => r.product === product && r.placement === placement)?.rate;
      const distinct = [
        ...new Set(set.zones.map(rateOf).filter((v): v is number => v !== undefined && Number.isFinite(v))),
      ].sort((a, b) => a - b);
      const close =
        set.minDifference?.find((m) => m.product === product && m.placement === placement)?.value ?? 0;
      const colours = rateColours('cividis', distinct, close);
      const colourOf = (z: ReportZone): string => {
        const v = rateOf(z);
        const i = v === undefined ? -1 : distinct.indexOf(v);
        return i >= 0 ? colours[i]! : NEUTRAL;
      };
      const decimals = distinct.some((v) => !Number.isInteger(v)) ? 1 : 0;
      const items: LegendItem[] = distinct.map((v, i) => {
        const zs = set.zones.filter((z) => rateOf(z) === v);
        const a = zs.reduce((s, z) => s + z.areaM2, 0);
        return {
          fill: colours[i]!,
          label: `${fmt(v, decimals)} ${unit}: ${zs.length} zone${zs.length === 1 ? '' : 's'}, ${areaLabel(a, input.units.area)}`,
        };
      });
      if (set.zones.some((z) => rateOf(z) === undefined)) items.push({ fill: NEUTRAL, label: 'not applied' });
      bodyFor = () =>
        zonePolys(f, si, set.zones, colourOf, (z) => {
          const v = rateOf(z);
          return [z.id, v === undefined ? '–' : `${fmt(v, decimals)}`];
        }) + boundary(f, fieldParts);
      add(
        'rate',
        `${product}, ${placement}: rate by zone${input.zoneSets.length > 1 ? ` (${set.name})` : ''}`,
        `Product rate of ${product} (${placement}) in ${unit} for each of the ${set.zones.length} zones of "${set.name}"; labels give the zone id and rate. ${utmNote}`,
        items,
        `${product}, ${placement} (${unit})`,
        ['Labels: zone id, then rate.'],
      );
    }
    const limits = [...new Set(set.zones.map((z) => z.bindingLimit).filter((v): v is string => !!v))].sort();
    const colourOf = (z: ReportZone): string =>
      z.bindingLimit ? QUALITATIVE[limits.indexOf(z.bindingLimit) % QUALITATIVE.length]! : NEUTRAL;
    const items: LegendItem[] = limits.map((l, i) => ({
      fill: QUALITATIVE[i % QUALITATIVE.length]!,
      label: l,
    }));
    items.push({ fill: NEUTRAL, label: 'no limit binds: rates meet the targets' });
    bodyFor = () => zonePolys(f, si, set.zones, colourOf, (z) => [z.id]) + boundary(f, fieldParts);
    add(
      'binding',
      `Where limits bind${input.zoneSets.length > 1 ? ` (${set.name})` : ''}`,
      `Zones where a seed-row safety limit or another limit of the plan cut a rate below its target. ${utmNote}`,
      items,
      'Binding limit',
    );
  });
  return maps;
}

/** Distinct (product, placement, unit) of a zone set, in the order first met. */
export function productPlacements(
  set: ReportZoneSet,
): { product: string; placement: string; unit: string }[] {
  const seen = new Map<string, { product: string; placement: string; unit: string }>();
  for (const z of set.zones)
    for (const r of z.rates) {
      const key = `${r.product}\u0000${r.placement}`;
      if (!seen.has(key)) seen.set(key, { product: r.product, placement: r.placement, unit: r.unit });
    }
  return [...seen.values()];
}
