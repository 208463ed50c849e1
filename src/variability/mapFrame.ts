/**
 * The frame shared by the variability study's maps (the sample map and the chance map): the field fitted into
 * the drawing, a gridded surface drawn at display resolution, the boundary, a scale bar and a north arrow.
 * Coordinates are UTM metres, so grid north is up.
 */
import type { Grid, RingsPart } from '../types.js';
import { FONT } from './charts.js';

/** The drawing and its scales from metres to pixels. */
export interface MapFrame {
  W: number;
  H: number;
  /** margins: the legend sits in the right one */
  m: { l: number; r: number; t: number; b: number };
  xmin: number;
  ymin: number;
  xmax: number;
  ymax: number;
  /** pixels per metre */
  scale: number;
  sx: (x: number) => number;
  sy: (y: number) => number;
}

/**
 * Fits the boundary (and the samples with a value) into a W x H drawing, leaving the margins free (`top`
 * px above the map for the title lines, default 60).
 * @example const f = mapFrame(field.parts, samples.xy, samples.values.so4_s, 860, 640)
 */
export function mapFrame(
  parts: RingsPart[],
  xy: ArrayLike<number>,
  values: ArrayLike<number>,
  W: number,
  H: number,
  top = 60,
): MapFrame {
  const m = { l: 96, r: 236, t: top, b: 56 };
  let xmin = Infinity,
    ymin = Infinity,
    xmax = -Infinity,
    ymax = -Infinity;
  const grow = (x: number, y: number) => {
    if (x < xmin) xmin = x;
    if (x > xmax) xmax = x;
    if (y < ymin) ymin = y;
    if (y > ymax) ymax = y;
  };
  for (const p of parts)
    for (let i = 0; i < p.exterior.length; i += 2) grow(p.exterior[i], p.exterior[i + 1]);
  for (let i = 0; i < xy.length; i += 2) if (Number.isFinite(values[i / 2])) grow(xy[i], xy[i + 1]);
  if (!Number.isFinite(xmin)) {
    xmin = 0;
    ymin = 0;
    xmax = 1;
    ymax = 1;
  }
  const pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const scale = Math.min(pw / Math.max(xmax - xmin, 1e-9), ph / Math.max(ymax - ymin, 1e-9)) * 0.94;
  const ox = m.l + (pw - (xmax - xmin) * scale) / 2;
  const oy = m.t + (ph - (ymax - ymin) * scale) / 2;
  const sx = (x: number) => ox + (x - xmin) * scale;
  const sy = (y: number) => oy + (ymax - y) * scale;
  return { W, H, m, xmin, ymin, xmax, ymax, scale, sx, sy };
}

/** The opening <svg> and its white background. */
export function svgOpen(f: MapFrame): string {
  return (
    `<svg xmlns="http://www.w3.org/2000/svg" width="${f.W}" height="${f.H}" viewBox="0 0 ${f.W} ${f.H}" ${FONT}>\n` +
    `<rect width="${f.W}" height="${f.H}" fill="white"/>`
  );
}

/**
 * A gridded surface drawn at display resolution: cells under 1.5 px are shown coarser by a whole factor, each
 * coarse cell the value of the fine cell at its centre (nearest); cells are put into classes by `bin` (-1: not
 * drawn) and equal classes in a row merged into one rectangle (small files). Without `clip` only cells whose
 * centre is inside the field are drawn; with it every cell with a value, clipped to the boundary (no notches at
 * the edge). Returns the SVG group and a note such as ", drawn at 10 m cells" ('' at full resolution).
 * @param bin class of a value, or -1 for none
 * @param fill colour of a class
 * @example rasterSvg(f, grid, values, (v) => Math.round(v * 47), (b) => viridis(b / 47), 0.75)
 */
export function rasterSvg(
  f: MapFrame,
  g: Grid,
  vals: ArrayLike<number>,
  bin: (v: number) => number,
  fill: (b: number) => string,
  opacity: number,
  clip?: { id: string; parts: RingsPart[] },
): { svg: string[]; drawnNote: string } {
  const k = Math.max(1, Math.ceil(1.5 / (g.cell * f.scale)));
  const drawnNote = k > 1 ? `, drawn at ${k * g.cell} m cells` : '';
  const cols = Math.ceil(g.cols / k),
    rows = Math.ceil(g.rows / k);
  const at = (r: number, c: number) =>
    Math.min(g.rows - 1, r * k + (k >> 1)) * g.cols + Math.min(g.cols - 1, c * k + (k >> 1));
  // clipped: every cell with a value (partly inside too), cut at the boundary; else cells whose centre is inside
  const shown = (i: number) => (clip ? true : g.mask[i] === 1) && Number.isFinite(vals[i]);
  const classOf = (i: number) => (shown(i) ? bin(vals[i]) : -1);
  // opacity on the group, so the slight overlaps that hide seams do not darken
  const o = clip
    ? [
        `<defs><clipPath id="${clip.id}"><path clip-rule="evenodd" d="${ringsPath(f, clip.parts)}"/></clipPath></defs>`,
        `<g opacity="${opacity}" shape-rendering="crispEdges" clip-path="url(#${clip.id})">`,
      ]
    : [`<g opacity="${opacity}" shape-rendering="crispEdges">`];
  for (let r = 0; r < rows; r++) {
    let c = 0;
    while (c < cols) {
      const b = classOf(at(r, c));
      if (b < 0) {
        c++;
        continue;
      }
      let e = c + 1;
      while (e < cols && classOf(at(r, e)) === b) e++;
      const x0 = g.xmin + c * k * g.cell;
      const y0 = g.ymax - r * k * g.cell;
      o.push(
        `<rect x="${f.sx(x0).toFixed(1)}" y="${f.sy(y0).toFixed(1)}" width="${((e - c) * k * g.cell * f.scale + 0.6).toFixed(1)}" height="${(k * g.cell * f.scale + 0.6).toFixed(1)}" fill="${fill(b)}"/>`,
      );
      c = e;
    }
  }
  o.push('</g>');
  return { svg: o, drawnNote };
}

/** The path data of the parts' rings, in pixels. */
function ringsPath(f: MapFrame, parts: RingsPart[]): string {
  let d = '';
  for (const p of parts)
    for (const ring of [p.exterior, ...p.holes]) {
      for (let i = 0; i < ring.length; i += 2)
        d += `${i ? 'L' : 'M'}${f.sx(ring[i]).toFixed(1)} ${f.sy(ring[i + 1]).toFixed(1)}`;
      d += 'Z';
    }
  return d;
}

/** The field boundary (holes even-odd), filled pale when nothing is drawn beneath it. */
export function boundarySvg(f: MapFrame, parts: RingsPart[], filled: boolean): string {
  return `<path d="${ringsPath(f, parts)}" fill="${filled ? '#f4f1e8' : 'none'}" fill-rule="evenodd" stroke="#222" stroke-width="2"/>`;
}

/** A scale bar bottom left: a nice length about a quarter of the map width. */
export function scaleBarSvg(f: MapFrame): string {
  const target = (f.xmax - f.xmin) / 4;
  const mag = Math.pow(10, Math.floor(Math.log10(Math.max(target, 1))));
  const len =
    [1, 2, 5, 10]
      .map((k) => k * mag)
      .filter((l) => l <= target)
      .pop() ?? mag;
  const bx = 24;
  const by = f.H - 22;
  return (
    `<rect x="${bx}" y="${by - 6}" width="${(len * f.scale).toFixed(1)}" height="6" fill="#222"/>\n` +
    `<text x="${bx}" y="${by - 10}" font-size="12">0</text><text x="${(bx + len * f.scale).toFixed(1)}" y="${by - 10}" font-size="12" text-anchor="middle">${len >= 1000 ? len / 1000 + ' km' : len + ' m'}</text>`
  );
}

/** A north arrow with its tip at (x, y) (the maps are drawn in UTM metres: grid north up). */
export function northArrowSvg(x: number, y: number): string {
  return `<path d="M${x} ${y} l8 22 l-8 -6 l-8 6 Z" fill="#222"/><text x="${x}" y="${y + 38}" font-size="13" text-anchor="middle" font-weight="bold">N</text>`;
}
