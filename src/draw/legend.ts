/**
 * A map's legend, under the map: a title (with the unit), an optional continuous colour bar, one entry per class
 * or symbol in two columns (down the first, then the second), and notes in small print.
 */
import { LOW_RED, type RampName, ramp } from './colour.js';
import { esc, wrapWords } from './escape.js';
import { type Frame, legendTop } from './frame.js';
import { fmtTick, niceTicks } from './ticks.js';

/** One legend entry: a class swatch (default), a sample dot, a low sample (dot ringed red) or the boundary. */
export interface LegendItem {
  fill: string;
  label: string;
  symbol?: 'swatch' | 'point' | 'ring' | 'line';
}

/** A continuous colour bar: the ramp over [min, max] with ticks, and a threshold marked in red. */
export interface ColourBar {
  ramp: RampName;
  min: number;
  max: number;
  threshold?: { value: number; label: string } | null;
}

/** Lines of about `width` characters (one empty line for empty text). */
function lines(text: string, width: number): string[] {
  const l = wrapWords(text, width);
  return l.length ? l : [''];
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

function symbol(it: LegendItem, x: number, y: number): string {
  switch (it.symbol ?? 'swatch') {
    case 'point':
      return `<circle cx="${x + 11}" cy="${y + 9}" r="4.5" fill="${esc(it.fill)}" stroke="#000" stroke-width="1.5"/>`;
    case 'ring':
      return (
        `<circle cx="${x + 11}" cy="${y + 9}" r="4.5" fill="${esc(it.fill)}" stroke="#000" stroke-width="1.5"/>` +
        `<circle cx="${x + 11}" cy="${y + 9}" r="9" fill="none" stroke="${LOW_RED}" stroke-width="2.5"/>`
      );
    case 'line':
      return `<rect x="${x + 1}" y="${y + 1}" width="20" height="16" fill="none" stroke="#000" stroke-width="2"/>`;
    default:
      return `<rect class="swatch" x="${x}" y="${y}" width="22" height="18" fill="${esc(it.fill)}" stroke="#555" stroke-width="0.6"/>`;
  }
}

/**
 * A horizontal colour bar `w` px wide at (x, y): 64 steps of the ramp, nice ticks under it, the threshold as a
 * red mark. Returns the SVG and the height used.
 * @example colourBar({ ramp: 'viridis', min: 2, max: 84, threshold: { value: 20, label: '20 low' } }, 16, 800, 320)
 */
export function colourBar(cb: ColourBar, x: number, y: number, w: number): { svg: string; height: number } {
  const span = cb.max > cb.min ? cb.max - cb.min : 1;
  const vx = (v: number): number => x + (w * (v - cb.min)) / span;
  const steps = 64;
  let s = '<g class="colour-bar">';
  for (let k = 0; k < steps; k++)
    s += `<rect x="${(x + (w * k) / steps).toFixed(1)}" y="${y}" width="${(w / steps + 0.5).toFixed(2)}" height="14" fill="${ramp(cb.ramp, (k + 0.5) / steps)}"/>`;
  s += `<rect x="${x}" y="${y}" width="${w}" height="14" fill="none" stroke="#333"/>`;
  const ticks = niceTicks(cb.min, cb.max, 5).filter((t) => t >= cb.min - 1e-9 && t <= cb.max + 1e-9);
  const step = ticks.length > 1 ? ticks[1]! - ticks[0]! : 1;
  for (const t of ticks)
    s +=
      `<line x1="${vx(t).toFixed(1)}" y1="${y + 14}" x2="${vx(t).toFixed(1)}" y2="${y + 19}" stroke="#333"/>` +
      `<text x="${vx(t).toFixed(1)}" y="${y + 31}" class="cb-t" text-anchor="middle">${fmtTick(t, step)}</text>`;
  const th = cb.threshold;
  if (th && th.value >= cb.min && th.value <= cb.max) {
    const tx = vx(th.value).toFixed(1);
    s +=
      `<line x1="${tx}" y1="${y - 5}" x2="${tx}" y2="${y + 19}" stroke="${LOW_RED}" stroke-width="3"/>` +
      `<text x="${tx}" y="${y - 8}" class="cb-low" text-anchor="middle">${esc(th.label)}</text>`;
  }
  return { svg: s + '</g>', height: 40 };
}

/**
 * The legend under the map: a title (with the unit), a colour bar when given, one entry per class in two
 * columns (one column up to three entries), and notes in small print. Returns the SVG and the bottom used.
 * @example legend(frame, 'Olsen P (ppm)', [{ fill: '#440154', label: '< 10' }])
 */
export function legend(
  f: Frame,
  title: string,
  items: readonly LegendItem[],
  notes: readonly string[] = [],
  bar?: ColourBar,
): { svg: string; bottom: number } {
  const x0 = f.left;
  const colW = f.w / 2;
  const titleChars = Math.floor(f.w / 10);
  const itemChars = Math.floor((colW - 30) / 7.6);
  const noteChars = Math.floor(f.w / 7);
  let y = legendTop(f);
  let s = `<g class="legend">${wrapText(title, x0, y + 12, titleChars, 'lg-title', 17)}`;
  y += 24 + 17 * (lines(title, titleChars).length - 1);
  if (bar) {
    const b = colourBar(bar, x0 + 4, y + (bar.threshold ? 14 : 2), Math.min(f.w - 8, 420));
    s += b.svg;
    y += b.height + (bar.threshold ? 14 : 2);
  }
  const heights = items.map((it) => 24 + 14 * (lines(it.label, itemChars).length - 1));
  const half = Math.ceil(items.length / 2);
  const colH = [0, 0];
  items.forEach((it, i) => {
    const col = items.length > 3 && i >= half ? 1 : 0;
    const x = x0 + col * colW;
    const yy = y + colH[col]!;
    s += symbol(it, x, yy) + wrapText(it.label, x + 30, yy + 13, itemChars, 'lg-t');
    colH[col]! += heights[i]!;
  });
  y += Math.max(colH[0]!, colH[1]!) + 4;
  for (const n of notes) {
    s += wrapText(n, x0, y + 10, noteChars, 'lg-n');
    y += 14 * lines(n, noteChars).length + 4;
  }
  return { svg: s + '</g>', bottom: y };
}
