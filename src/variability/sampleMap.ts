/**
 * The low-spot map of the variability study: the field outline, an optional interpolated surface, the samples
 * coloured by value (viridis), low samples ringed in red and labelled, a colour bar with the threshold, a scale
 * bar and a north arrow. A complete standalone SVG document as a string.
 */
import type { Grid, RingsPart } from '../types.js';
import { ramp } from '../draw/colour.js';
import { esc } from '../draw/escape.js';
import { fmtTick, niceTicks } from './charts.js';

const viridis = (t: number): string => ramp('viridis', t);
import {
  boundarySvg,
  mapFrame,
  northArrowSvg,
  rasterSvg,
  scaleBarSvg,
  svgOpen,
  type MapFrame,
} from './mapFrame.js';

export interface SampleMapInput {
  /** field boundary parts in metres (Field.parts) */
  parts: RingsPart[];
  /** sample positions x0 y0 ... metres */
  xy: ArrayLike<number>;
  values: ArrayLike<number>;
  ids: string[];
  label: string;
  unit: string;
  /** "low" means below; null for no marking */
  threshold: number | null;
  /** the threshold value itself counts as low (default false) */
  thresholdInclusive?: boolean;
  /** optional interpolated surface drawn beneath the samples */
  surface?: {
    grid: Grid;
    values: ArrayLike<number>;
    /** legend text, default 'interpolated (IDW)' */ label?: string;
  };
}

type Box = [number, number, number, number];

/** The colour scale's range: samples and surface together (0..1 when there is no value). */
function valueRange(input: SampleMapInput): { vmin: number; vmax: number } {
  let vmin = Infinity,
    vmax = -Infinity;
  const grow = (vs: ArrayLike<number>) => {
    for (let i = 0; i < vs.length; i++) {
      const v = vs[i];
      if (!Number.isFinite(v)) continue;
      if (v < vmin) vmin = v;
      if (v > vmax) vmax = v;
    }
  };
  grow(input.values);
  if (input.surface) grow(input.surface.values);
  if (!Number.isFinite(vmin)) {
    vmin = 0;
    vmax = 1;
  }
  if (vmax === vmin) vmax = vmin + 1;
  return { vmin, vmax };
}

/** Whether sample i is low (below the threshold, or at it when inclusive). */
function lowTest(input: SampleMapInput): (i: number) => boolean {
  return (i) =>
    input.threshold !== null &&
    Number.isFinite(input.values[i]) &&
    (input.values[i] < input.threshold ||
      (Boolean(input.thresholdInclusive) && input.values[i] === input.threshold));
}

/** A low sample's label: the first free spot of right, left, above, below and the diagonals; else right. */
function placeLabel(f: MapFrame, x: number, y: number, label: string, taken: Box[]): string {
  const w = label.length * 7.2;
  const spots: [number, number, string][] = [
    [x + 15, y + 4, 'start'],
    [x - 15, y + 4, 'end'],
    [x, y - 17, 'middle'],
    [x, y + 25, 'middle'],
    [x + 12, y - 14, 'start'],
    [x - 12, y - 14, 'end'],
    [x + 12, y + 22, 'start'],
    [x - 12, y + 22, 'end'],
  ];
  const box = (sp: [number, number, string]): Box => {
    const x0 = sp[2] === 'start' ? sp[0] : sp[2] === 'end' ? sp[0] - w : sp[0] - w / 2;
    return [x0, sp[1] - 11, x0 + w, sp[1] + 3];
  };
  const own = (t: Box) => Math.abs(t[0] + 8 - x) < 1e-6 && Math.abs(t[1] + 8 - y) < 1e-6;
  const free = (b: Box) =>
    b[0] >= 4 &&
    b[2] <= f.W - f.m.r + 36 &&
    b[1] >= f.m.t - 4 &&
    b[3] <= f.H - f.m.b + 20 &&
    taken.every((t) => own(t) || b[2] < t[0] || b[0] > t[2] || b[3] < t[1] || b[1] > t[3]);
  const sp = spots.find((p) => free(box(p))) ?? spots[0];
  taken.push(box(sp));
  return `<text x="${sp[0].toFixed(1)}" y="${sp[1].toFixed(1)}" font-size="12" font-weight="bold" text-anchor="${sp[2]}" fill="#b10026" stroke="white" stroke-width="3" paint-order="stroke">${esc(label)}</text>`;
}

/** The samples (others first, low on top, low ones ringed) and the low samples' labels. */
function samplesSvg(
  o: string[],
  f: MapFrame,
  input: SampleMapInput,
  col: (v: number) => string,
  isLow: (i: number) => boolean,
): void {
  const order: number[] = [];
  for (let i = 0; i < input.values.length; i++) if (Number.isFinite(input.values[i])) order.push(i);
  order.sort((a, b) => Number(isLow(a)) - Number(isLow(b)));
  const labels: string[] = [];
  // sample dots are obstacles for labels too
  const taken: Box[] = order.map((i) => {
    const x = f.sx(input.xy[2 * i]);
    const y = f.sy(input.xy[2 * i + 1]);
    return [x - 8, y - 8, x + 8, y + 8];
  });
  for (const i of order) {
    const x = f.sx(input.xy[2 * i]);
    const y = f.sy(input.xy[2 * i + 1]);
    o.push(
      `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="7" fill="${col(input.values[i])}" stroke="#222" stroke-width="1"/>`,
    );
    if (!isLow(i)) continue;
    o.push(
      `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="12" fill="none" stroke="#e31a1c" stroke-width="3"/>`,
    );
    labels.push(placeLabel(f, x, y, `${input.ids[i]}: ${fmtVal(input.values[i])}`, taken));
  }
  o.push(...labels);
}

/** The colour bar with its ticks and the threshold; returns where the key below it starts. */
function colourBar(o: string[], f: MapFrame, input: SampleMapInput, vmin: number, vmax: number): number {
  const lx = f.W - f.m.r + 58;
  const ly = f.m.t + 20;
  const lh = Math.min(300, f.H - f.m.t - f.m.b - 120);
  o.push(`<text x="${lx}" y="${ly - 8}" font-size="13" font-weight="bold">${esc(input.unit)}</text>`);
  const steps = 40;
  for (let k = 0; k < steps; k++) {
    const t = 1 - k / steps;
    o.push(
      `<rect x="${lx}" y="${(ly + (lh * k) / steps).toFixed(1)}" width="22" height="${(lh / steps + 0.5).toFixed(1)}" fill="${viridis(t)}"/>`,
    );
  }
  o.push(`<rect x="${lx}" y="${ly}" width="22" height="${lh}" fill="none" stroke="#333"/>`);
  const vy = (v: number) => ly + lh * (1 - (v - vmin) / (vmax - vmin));
  const ticks = niceTicks(vmin, vmax, 5).filter((t) => t >= vmin - 1e-9 && t <= vmax + 1e-9);
  const tstep = ticks.length > 1 ? ticks[1] - ticks[0] : 1;
  for (const t of ticks) {
    o.push(
      `<line x1="${lx + 22}" y1="${vy(t).toFixed(1)}" x2="${lx + 28}" y2="${vy(t).toFixed(1)}" stroke="#333"/>`,
    );
    o.push(`<text x="${lx + 32}" y="${(vy(t) + 4).toFixed(1)}" font-size="12">${fmtTick(t, tstep)}</text>`);
  }
  if (input.threshold !== null && input.threshold >= vmin && input.threshold <= vmax) {
    const y = vy(input.threshold);
    o.push(
      `<line x1="${lx - 6}" y1="${y.toFixed(1)}" x2="${lx + 28}" y2="${y.toFixed(1)}" stroke="#e31a1c" stroke-width="3"/>`,
    );
    o.push(
      `<text x="${lx + 32}" y="${(y + 4).toFixed(1)}" font-size="12" font-weight="bold" fill="#b10026" stroke="white" stroke-width="3" paint-order="stroke">${input.threshold} low</text>`,
    );
  }
  return ly + lh + 40;
}

/** The key under the colour bar (sample, low sample, boundary, surface); returns the y of its last line. */
function key(o: string[], f: MapFrame, input: SampleMapInput, ky: number, drawnNote: string): number {
  const lx = f.W - f.m.r + 58;
  o.push(
    `<circle cx="${lx + 10}" cy="${ky}" r="7" fill="${viridis(0.5)}" stroke="#222"/><text x="${lx + 26}" y="${ky + 4}" font-size="12">sample</text>`,
  );
  ky += 28;
  if (input.threshold !== null) {
    o.push(
      `<circle cx="${lx + 10}" cy="${ky}" r="7" fill="${viridis(0.1)}" stroke="#222"/><circle cx="${lx + 10}" cy="${ky}" r="12" fill="none" stroke="#e31a1c" stroke-width="3"/><text x="${lx + 28}" y="${ky + 4}" font-size="12">low sample (id: value)</text>`,
    );
    ky += 26;
  }
  o.push(
    `<line x1="${lx}" y1="${ky}" x2="${lx + 22}" y2="${ky}" stroke="#222" stroke-width="2"/><text x="${lx + 28}" y="${ky + 4}" font-size="12">field boundary</text>`,
  );
  if (input.surface) {
    ky += 26;
    o.push(
      `<rect x="${lx}" y="${ky - 8}" width="22" height="16" fill="${viridis(0.4)}" opacity="0.75"/><text x="${lx + 28}" y="${ky + 4}" font-size="12">${esc((input.surface.label ?? 'interpolated (IDW)') + drawnNote)}</text>`,
    );
  }
  return ky;
}

/**
 * A map of the nutrient: the field outline, the samples coloured by value (viridis), low samples ringed in red
 * and labelled with their ids, a colour legend with the threshold, a scale bar and a north arrow.
 * @param size width 860, height 640 px
 * @example writeFileSync('map.svg', sampleMapSvg({ parts: field.parts, xy: samples.xy, values: samples.values.so4_s, ids: samples.ids, label: 'sulphate-S', unit: 'lb S/ac', threshold: 20 }))
 */
export function sampleMapSvg(input: SampleMapInput, size: { width?: number; height?: number } = {}): string {
  const f = mapFrame(input.parts, input.xy, input.values, size.width ?? 860, size.height ?? 640);
  const { vmin, vmax } = valueRange(input);
  const col = (v: number) => viridis((v - vmin) / (vmax - vmin));
  const isLow = lowTest(input);
  let nLow = 0;
  for (let i = 0; i < input.values.length; i++) if (isLow(i)) nLow++;
  const o: string[] = [svgOpen(f)];
  o.push(
    `<text x="${f.m.l}" y="28" font-size="19" font-weight="bold">${esc(input.label)} (${esc(input.unit)})</text>`,
  );
  o.push(
    `<text x="${f.m.l}" y="46" font-size="13" fill="#444">${input.threshold === null ? 'samples coloured by value' : `${nLow} sample(s) ${input.thresholdInclusive ? 'at or below' : 'below'} ${input.threshold} ${esc(input.unit)} ringed in red`}</text>`,
  );
  let drawnNote = '';
  if (input.surface) {
    // colours quantised to 48 steps
    const q = (v: number) => Math.round(((v - vmin) / (vmax - vmin)) * 47);
    const r = rasterSvg(f, input.surface.grid, input.surface.values, q, (b) => viridis(b / 47), 0.75);
    o.push(...r.svg);
    drawnNote = r.drawnNote;
  }
  o.push(boundarySvg(f, input.parts, !input.surface));
  samplesSvg(o, f, input, col, isLow);
  const ky = key(o, f, input, colourBar(o, f, input, vmin, vmax), drawnNote);
  o.push(scaleBarSvg(f));
  o.push(northArrowSvg(f.W - f.m.r + 58 + 11, ky + 30));
  o.push('</svg>');
  return o.join('\n');
}

function fmtVal(v: number): string {
  return Math.abs(v) >= 100 ? v.toFixed(0) : v.toFixed(1);
}
