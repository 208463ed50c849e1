/**
 * The frame every map shares (the report's and the variability study's): a view of the field in UTM metres, a
 * scale bar in metres and feet, a north arrow and, under the map, a legend (legend.ts). Geometry is drawn in
 * metres (x - x0, y0 - y) inside a group scaled to pixels, so the SVG holds the field's UTM coordinates shifted
 * to the map's north-west corner (recorded in data-utm-origin); labels, scale bar and legend are drawn in pixels
 * on top.
 */
import { ringsBbox } from '../geo/area.js';
import { M_PER_FT, mToFt } from '../units/index.js';
import { esc, fmt, wrapWords } from './escape.js';
import { MAP_CSS } from './style.js';

/** Width of the map area, px (the legend goes under the map, so a portrait page holds both). */
export const MAP_W = 700;
const MAX_MAP_H = 700;
/** Margin around the map area, px. */
export const PAD = 16;
/** Room under the map for the scale bar, px. */
const FOOT = 50;

/** Rings of a polygon part in metres, flat [x0, y0, x1, y1, ...] (Field.parts and ReportPart alike). */
export interface MapPart {
  exterior: ArrayLike<number>;
  holes: ArrayLike<number>[];
}

export interface Frame {
  /** UTM easting / northing of the map area's north-west corner (x0, y0) */
  x0: number;
  y0: number;
  /** pixels per metre */
  k: number;
  /** size of the map area in px */
  w: number;
  h: number;
  /** where the map area's top left corner is in the drawing, px */
  left: number;
  top: number;
}

/**
 * A frame that fits a bounding box [xmin, ymin, xmax, ymax] (metres) with a 3 % margin into a map area
 * `width` px wide (default 700) and at most `maxHeight` tall (default 700), centred across; the area's height
 * follows the box, so the aspect ratio is kept. `top` (default 16 px) leaves room above for a title.
 * @example makeFrame([500000, 5700000, 500800, 5700800]) // k = 700 / 848 px per metre
 */
export function makeFrame(
  bbox: readonly [number, number, number, number],
  area: { width?: number; maxHeight?: number; left?: number; top?: number } = {},
): Frame {
  const { width = MAP_W, maxHeight = MAX_MAP_H, left = PAD, top = PAD } = area;
  const [xmin, ymin, xmax, ymax] = bbox;
  const ok = [xmin, ymin, xmax, ymax].every(Number.isFinite);
  const mw = ok ? Math.max(1, xmax - xmin) : 1;
  const mh = ok ? Math.max(1, ymax - ymin) : 1;
  const m = 0.03 * Math.max(mw, mh);
  const k = Math.min(width / (mw + 2 * m), maxHeight / (mh + 2 * m));
  const spare = width / k - (mw + 2 * m); // metres left over across when the height limits the scale
  return {
    x0: (ok ? xmin : 0) - m - spare / 2,
    y0: (ok ? ymax : 1) + m,
    k,
    w: width,
    h: Math.ceil((mh + 2 * m) * k),
    left,
    top,
  };
}

/** Pixel x, y of a UTM point. */
export const px = (f: Frame, x: number): number => f.left + (x - f.x0) * f.k;
export const py = (f: Frame, y: number): number => f.top + (f.y0 - y) * f.k;

/**
 * Bounding box of parts' exterior rings and of extra points x0 y0 x1 y1 ... (e.g. samples outside the field).
 * @example partsBbox(field.parts, samples.xy) // [xmin, ymin, xmax, ymax]
 */
export function partsBbox(
  parts: readonly MapPart[],
  points: ArrayLike<number> = [],
): [number, number, number, number] {
  return ringsBbox([...parts.map((p) => p.exterior), points]);
}

function ringPath(f: Frame, r: ArrayLike<number>): string {
  if (r.length < 6) return '';
  let d = '';
  for (let i = 0; i + 1 < r.length; i += 2) {
    d += (i === 0 ? 'M' : 'L') + (r[i]! - f.x0).toFixed(1) + ' ' + (f.y0 - r[i + 1]!).toFixed(1);
  }
  return d + 'Z';
}

/** SVG path data (metres from the frame origin, for use inside `geoGroup`) of parts with holes (even-odd). */
export function partsPath(f: Frame, parts: readonly MapPart[]): string {
  return parts.map((p) => ringPath(f, p.exterior) + p.holes.map((h) => ringPath(f, h)).join('')).join('');
}

/**
 * Opening tag of the group in which geometry is drawn in metres, with an extra class name (one class attribute:
 * a standalone SVG is XML, where a repeated attribute is an error).
 * @example geoGroup(f, 'boundary') // '<g class="geo boundary" transform="translate(16 16) scale(0.825472)">'
 */
export function geoGroup(f: Frame, cls = ''): string {
  return `<g class="geo${cls ? ` ${cls}` : ''}" transform="translate(${f.left} ${f.top}) scale(${f.k.toPrecision(6)})">`;
}

/**
 * The largest "nice" length (1, 2 or 5 x 10^n) not over `max`.
 * @example niceLength(730) // 500
 */
export function niceLength(max: number): number {
  if (!(max > 0)) return 0;
  let p = 10 ** Math.floor(Math.log10(max));
  if (p > max) p /= 10; // log10 rounds up just below a power of ten
  for (const m of [5, 2, 1]) if (m * p <= max) return m * p;
  return p;
}

function bar(x: number, y: number, lenPx: number, label: string, cls: string): string {
  const half = lenPx / 2;
  return (
    `<g class="${cls}">` +
    `<rect x="${x.toFixed(1)}" y="${y}" width="${half.toFixed(1)}" height="6" fill="#222"/>` +
    `<rect x="${(x + half).toFixed(1)}" y="${y}" width="${half.toFixed(1)}" height="6" fill="#fff" stroke="#222" stroke-width="1"/>` +
    `<text x="${x.toFixed(1)}" y="${y + 19}" class="sb-t">0</text>` +
    `<text x="${(x + lenPx).toFixed(1)}" y="${y + 19}" class="sb-t" text-anchor="end">${label}</text></g>`
  );
}

/**
 * A scale bar under the map with a round length in metres and another in feet, each at most 30 % of the map
 * wide (nice lengths: `niceLength`).
 * @example scaleBar(frame) // '<g class="scalebar" data-m="200" data-ft="500">...'
 */
export function scaleBar(f: Frame): string {
  const maxM = (f.w * 0.3) / f.k;
  const m = niceLength(maxM);
  const ft = niceLength(mToFt(maxM));
  const y = f.top + f.h + 10;
  const mLabel = m >= 1000 ? `${fmt(m / 1000, m % 1000 ? 1 : 0)} km` : `${fmt(m)} m`;
  const ftLabel = `${fmt(ft)} ft`;
  return (
    `<g class="scalebar" data-m="${m}" data-ft="${ft}">` +
    bar(f.left, y, m * f.k, mLabel, 'sb-m') +
    bar(f.left + m * f.k + 40, y, ft * M_PER_FT * f.k, ftLabel, 'sb-ft') +
    '</g>'
  );
}

/**
 * A north arrow, top right of the map area, pointing to true north: `trueNorthDeg` (default 0) is its clockwise
 * angle from grid north (`trueNorthOnGrid` in north.ts); a thin tick marks grid north.
 * @example northArrow(frame, 0.78) // '<g class="north" ... data-true-north-deg="0.780">...'
 */
export function northArrow(f: Frame, trueNorthDeg = 0): string {
  const x = f.left + f.w - 28;
  const y = f.top + 12;
  return (
    `<g class="north" transform="translate(${x} ${y})" data-true-north-deg="${trueNorthDeg.toFixed(3)}">` +
    `<title>True north; grid north (UTM) differs by ${Math.abs(trueNorthDeg).toFixed(1)}°</title>` +
    `<circle cx="0" cy="22" r="20" fill="#fff" fill-opacity="0.85" stroke="#222"/>` +
    `<line x1="0" y1="2" x2="0" y2="10" stroke="#222" stroke-width="1"/>` +
    `<path d="M0 4 L9 32 L0 26 L-9 32 Z" fill="#222" transform="rotate(${trueNorthDeg.toFixed(2)} 0 22)"/>` +
    `<text x="0" y="56" text-anchor="middle" class="n-t">N</text></g>`
  );
}

/**
 * The title (19 px bold, wrapped at 60 characters) and up to four lines of small print above a standalone map;
 * make the frame with `top: PAD + height` to put the map under them.
 * @example const h = mapHeader('sulphate-S (lb S/ac)', ['34 samples below 20 lb S/ac ringed in red'])
 */
export function mapHeader(title: string, lines: readonly string[] = []): { svg: string; height: number } {
  const t = wrapWords(title, 60);
  let s = '';
  t.forEach((l, i) => (s += `<text x="${PAD}" y="${PAD + 18 + 23 * i}" class="m-title">${esc(l)}</text>`));
  const y0 = PAD + 18 + 23 * (t.length - 1) + 22;
  lines
    .slice(0, 4)
    .forEach((l, i) => (s += `<text x="${PAD}" y="${y0 + 17 * i}" class="m-sub">${esc(l)}</text>`));
  return { svg: `<g class="map-header">${s}</g>`, height: y0 - PAD + 17 * Math.min(4, lines.length) };
}

/** Where a legend under the map starts: below the map and its scale bar. */
export const legendTop = (f: Frame): number => f.top + f.h + FOOT;

/** What a map's <svg> says about itself. */
export interface MapDoc {
  /** unique per page (clip path ids start with it) */
  id: string;
  kind: string;
  /** the accessible name */
  aria: string;
  utm?: { epsg: number };
  /** clockwise angle of true north from grid north, degrees (default 0) */
  trueNorthDeg?: number;
  /** a standalone document carries its own style sheet (the report's page has it once) */
  standalone?: boolean;
}

/**
 * The whole <svg> of one map: map content (already built), frame items (north arrow, scale bar) and legend.
 * @example mapSvg(f, { id: 'map-1', kind: 'samples', aria: 'Samples' }, body, legend(f, 'Samples', items))
 */
export function mapSvg(f: Frame, doc: MapDoc, body: string, lg: { svg: string; bottom: number }): string {
  const W = f.left + f.w + PAD;
  const H = Math.ceil(lg.bottom + PAD);
  const size = doc.standalone ? ` width="${W}" height="${H}"` : '';
  const epsg = doc.utm ? ` data-epsg="${doc.utm.epsg}"` : '';
  return (
    `<svg class="map" data-map="${esc(doc.id)}" data-kind="${esc(doc.kind)}" xmlns="http://www.w3.org/2000/svg"${size} viewBox="0 0 ${W} ${H}" ` +
    `role="img" aria-label="${esc(doc.aria)}"${epsg} data-utm-origin="${f.x0.toFixed(2)} ${f.y0.toFixed(2)}" data-px-per-m="${f.k.toPrecision(6)}">` +
    (doc.standalone ? `<style>${MAP_CSS}</style><rect width="${W}" height="${H}" fill="#fff"/>` : '') +
    `<rect class="map-bg" x="${f.left}" y="${f.top}" width="${f.w}" height="${f.h}" fill="#fff"/>` +
    body +
    northArrow(f, doc.trueNorthDeg ?? 0) +
    scaleBar(f) +
    lg.svg +
    '</svg>'
  );
}
