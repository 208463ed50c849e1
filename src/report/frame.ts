/**
 * The frame every report map shares: a view of the field in UTM metres, a scale bar in metres and feet,
 * a north arrow and a legend under the map. Geometry is drawn in metres (x - x0, y0 - y) inside a group
 * scaled to pixels, so the SVG holds the field's UTM coordinates shifted to the map's north-west corner
 * (recorded in data-utm-origin); labels, scale bar and legend are drawn in pixels on top.
 */
import { M_PER_FT, mToFt } from '../units/index.js';
import { esc, fmt } from '../draw/escape.js';
import type { ReportPart } from './types.js';

/** Width of the map area, px (the legend goes under the map, so a portrait page holds both). */
export const MAP_W = 700;
const MAX_MAP_H = 700;
const PAD = 16;
/** Room under the map for the scale bar, px. */
const FOOT = 50;

export interface Frame {
  /** UTM easting / northing of the map area's north-west corner (x0, y0) */
  x0: number;
  y0: number;
  /** pixels per metre */
  k: number;
  /** size of the map area in px */
  w: number;
  h: number;
}

/**
 * A frame that fits a bounding box [xmin, ymin, xmax, ymax] (metres) with a 3 % margin.
 * @example makeFrame([500000, 5700000, 500800, 5700800]) // k = 700 / 848 px per metre
 */
export function makeFrame(bbox: readonly [number, number, number, number]): Frame {
  const [xmin, ymin, xmax, ymax] = bbox;
  const mw = Math.max(1, xmax - xmin);
  const mh = Math.max(1, ymax - ymin);
  const m = 0.03 * Math.max(mw, mh);
  const k = Math.min(MAP_W / (mw + 2 * m), MAX_MAP_H / (mh + 2 * m));
  return { x0: xmin - m, y0: ymax + m, k, w: MAP_W, h: Math.ceil((mh + 2 * m) * k) };
}

/** Pixel x, y of a UTM point. */
export const px = (f: Frame, x: number): number => PAD + (x - f.x0) * f.k;
export const py = (f: Frame, y: number): number => PAD + (f.y0 - y) * f.k;

/** Bounding box of parts' exterior rings. */
export function partsBbox(parts: readonly ReportPart[]): [number, number, number, number] {
  let xmin = Infinity,
    ymin = Infinity,
    xmax = -Infinity,
    ymax = -Infinity;
  for (const p of parts) {
    const e = p.exterior;
    for (let i = 0; i + 1 < e.length; i += 2) {
      xmin = Math.min(xmin, e[i]!);
      xmax = Math.max(xmax, e[i]!);
      ymin = Math.min(ymin, e[i + 1]!);
      ymax = Math.max(ymax, e[i + 1]!);
    }
  }
  return [xmin, ymin, xmax, ymax];
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
export function partsPath(f: Frame, parts: readonly ReportPart[]): string {
  return parts.map((p) => ringPath(f, p.exterior) + p.holes.map((h) => ringPath(f, h)).join('')).join('');
}

/** Opening tag of the group in which geometry is drawn in metres. */
export function geoGroup(f: Frame, extra = ''): string {
  return `<g class="geo" transform="translate(${PAD} ${PAD}) scale(${f.k.toPrecision(6)})"${extra}>`;
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
 * A scale bar with a round length in metres and another in feet, each about a quarter of the map wide.
 * @example scaleBar(frame) // '<g class="scalebar" data-m="200" data-ft="500">...'
 */
export function scaleBar(f: Frame): string {
  const maxM = (f.w * 0.3) / f.k;
  const m = niceLength(maxM);
  const ft = niceLength(mToFt(maxM));
  const y = PAD + f.h + 10;
  const mLabel = m >= 1000 ? `${fmt(m / 1000, m % 1000 ? 1 : 0)} km` : `${fmt(m)} m`;
  const ftLabel = `${fmt(ft)} ft`;
  return (
    `<g class="scalebar" data-m="${m}" data-ft="${ft}">` +
    bar(PAD, y, m * f.k, mLabel, 'sb-m') +
    bar(PAD + m * f.k + 40, y, ft * M_PER_FT * f.k, ftLabel, 'sb-ft') +
    '</g>'
  );
}

/**
 * A north arrow, top right of the map area, pointing to true north: `trueNorthDeg` is its clockwise angle
 * from grid north (see north.ts); a thin tick marks grid north.
 */
export function northArrow(f: Frame, trueNorthDeg = 0): string {
  const x = PAD + f.w - 28;
  const y = PAD + 12;
  return (
    `<g class="north" transform="translate(${x} ${y})" data-true-north-deg="${trueNorthDeg.toFixed(3)}">` +
    `<title>True north; grid north (UTM) differs by ${Math.abs(trueNorthDeg).toFixed(1)}°</title>` +
    `<circle cx="0" cy="22" r="20" fill="#fff" fill-opacity="0.85" stroke="#222"/>` +
    `<line x1="0" y1="2" x2="0" y2="10" stroke="#222" stroke-width="1"/>` +
    `<path d="M0 4 L9 32 L0 26 L-9 32 Z" fill="#222" transform="rotate(${trueNorthDeg.toFixed(2)} 0 22)"/>` +
    `<text x="0" y="56" text-anchor="middle" class="n-t">N</text></g>`
  );
}

export interface LegendItem {
  /** fill colour, or 'point' for the sample symbol, or 'line' for the boundary */
  fill: string;
  label: string;
}

/** Characters per line in the legend (at the legend's font sizes). */
const TITLE_CHARS = 70;
const ITEM_CHARS = 42;
const NOTE_CHARS = 100;
/** Legend items go in two columns under the map. */
const COL_W = MAP_W / 2;

/** Lines of about `width` characters, broken on spaces (a longer word is cut). */
function lines(text: string, width: number): string[] {
  const out: string[] = [];
  let cur = '';
  for (let w of text.split(/\s+/)) {
    while (w.length > width) {
      if (cur) out.push(cur);
      cur = '';
      out.push(w.slice(0, width));
      w = w.slice(width);
    }
    if (cur && (cur + ' ' + w).length > width) {
      out.push(cur);
      cur = w;
    } else cur = cur ? cur + ' ' + w : w;
  }
  if (cur) out.push(cur);
  return out.length ? out : [''];
}

/** Text broken into lines, as <text> with <tspan>s. */
function wrapText(text: string, x: number, y: number, width: number, cls: string, step = 14): string {
  return (
    `<text x="${x}" y="${y}" class="${cls}">` +
    lines(text, width)
      .map((l, i) => `<tspan x="${x}" dy="${i === 0 ? 0 : step}">${esc(l)}</tspan>`)
      .join('') +
    '</text>'
  );
}

/** Where the legend starts: under the map and its scale bar. */
const legendTop = (f: Frame): number => PAD + f.h + FOOT;

/**
 * The legend under the map: a title (with the unit), one swatch per class in two columns (down the
 * first column, then the second), and notes in small print. Returns the SVG and the height used.
 * @example legend(frame, 'Olsen P (ppm)', [{ fill: '#440154', label: '< 10' }])
 */
export function legend(
  f: Frame,
  title: string,
  items: readonly LegendItem[],
  notes: readonly string[] = [],
): { svg: string; bottom: number } {
  const x0 = PAD;
  let y = legendTop(f);
  let s = `<g class="legend">${wrapText(title, x0, y + 12, TITLE_CHARS, 'lg-title', 17)}`;
  y += 24 + 17 * (lines(title, TITLE_CHARS).length - 1);
  const heights = items.map((it) => 24 + 14 * (lines(it.label, ITEM_CHARS).length - 1));
  const half = Math.ceil(items.length / 2);
  const colH = [0, 0];
  items.forEach((it, i) => {
    const col = items.length > 3 && i >= half ? 1 : 0;
    const x = x0 + col * COL_W;
    const yy = y + colH[col]!;
    if (it.fill === 'point') {
      s += `<circle cx="${x + 11}" cy="${yy + 9}" r="4.5" fill="#fff" stroke="#000" stroke-width="1.5"/>`;
    } else if (it.fill === 'line') {
      s += `<rect x="${x + 1}" y="${yy + 1}" width="20" height="16" fill="none" stroke="#000" stroke-width="2"/>`;
    } else {
      s += `<rect class="swatch" x="${x}" y="${yy}" width="22" height="18" fill="${esc(it.fill)}" stroke="#555" stroke-width="0.6"/>`;
    }
    s += wrapText(it.label, x + 30, yy + 13, ITEM_CHARS, 'lg-t');
    colH[col]! += heights[i]!;
  });
  y += Math.max(colH[0]!, colH[1]!) + 4;
  for (const n of notes) {
    s += wrapText(n, x0, y + 10, NOTE_CHARS, 'lg-n');
    y += 14 * lines(n, NOTE_CHARS).length + 4;
  }
  return { svg: s + '</g>', bottom: y };
}

/**
 * The whole <svg> of one map: map content (already built), frame items and legend.
 * @param id unique per page (used for clip paths)
 */
export function mapSvg(
  f: Frame,
  id: string,
  kind: string,
  body: string,
  lg: { svg: string; bottom: number },
  utm: { epsg: number },
  aria: string,
  trueNorthDeg = 0,
): string {
  const W = PAD * 2 + MAP_W;
  const H = Math.ceil(lg.bottom + PAD);
  return (
    `<svg class="map" data-map="${esc(id)}" data-kind="${esc(kind)}" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" ` +
    `role="img" aria-label="${esc(aria)}" data-epsg="${utm.epsg}" data-utm-origin="${f.x0.toFixed(2)} ${f.y0.toFixed(2)}" data-px-per-m="${f.k.toPrecision(6)}">` +
    `<rect class="map-bg" x="${PAD}" y="${PAD}" width="${f.w}" height="${f.h}" fill="#fff"/>` +
    body +
    northArrow(f, trueNorthDeg) +
    scaleBar(f) +
    lg.svg +
    '</svg>'
  );
}
