/**
 * The chance map of the variability study, drawn beside the value map: per cell the chance that the nutrient
 * is below its low threshold (from kriging, chanceMap.ts), in % classes, with the samples, the low ones ringed,
 * the expected share of the field below, and the assumption stated. When kriging was refused the map shows the
 * field and the samples with the reason in its middle, never an empty picture. A complete standalone SVG.
 */
import type { Grid, RingsPart } from '../types.js';
import { esc } from '../draw/escape.js';
import { wrapWords } from './charts.js';
import {
  chanceClass,
  chanceClassLabels,
  chanceColours,
  chanceSentence,
  type ChanceMap,
} from './chanceMap.js';
import {
  boundarySvg,
  mapFrame,
  northArrowSvg,
  rasterSvg,
  scaleBarSvg,
  svgOpen,
  type MapFrame,
} from './mapFrame.js';

export interface ChanceChartInput {
  /** field boundary parts in metres (Field.parts) */
  parts: RingsPart[];
  /** sample positions x0 y0 ... metres, and the nutrient's values (NaN = not tested) */
  xy: ArrayLike<number>;
  values: ArrayLike<number>;
  /** e.g. 'sulphate-S (0-24 in)' */
  label: string;
  /** the grid the chance was computed on */
  grid: Grid;
  map: ChanceMap;
}

/** "below 20 lb S/ac" or "at or below 10 ppm". */
function belowText(m: ChanceMap): string {
  return `${m.inclusive ? 'at or below' : 'below'} ${m.threshold} ${m.unit}`;
}

/** Title, how the chance was made and what it says for the field as a whole (four lines at most). */
function header(o: string[], f: MapFrame, input: ChanceChartInput): void {
  const m = input.map;
  o.push(
    `<text x="${f.m.l}" y="28" font-size="19" font-weight="bold">Chance that ${esc(input.label)} is ${esc(belowText(m))}</text>`,
  );
  const msse = m.msse !== null && Number.isFinite(m.msse) ? ` (leave-one-out MSSE ${m.msse.toFixed(2)})` : '';
  const share = m.expectedShare !== null ? ` ${chanceSentence(m)}` : '';
  const lines = m.refused
    ? ['No chance map: see the note on the map.']
    : wrapWords(`From ${m.method}${msse}.${share}`, 108);
  lines.slice(0, 4).forEach((l, i) => {
    o.push(`<text x="${f.m.l}" y="${50 + 17 * i}" font-size="13" fill="#444">${esc(l)}</text>`);
  });
}

/** The samples as small white dots, the low ones ringed in red. */
function samplesSvg(o: string[], f: MapFrame, input: ChanceChartInput): void {
  const m = input.map;
  for (let i = 0; i < input.values.length; i++) {
    const v = input.values[i];
    if (!Number.isFinite(v)) continue;
    const x = f.sx(input.xy[2 * i]).toFixed(1),
      y = f.sy(input.xy[2 * i + 1]).toFixed(1);
    o.push(`<circle cx="${x}" cy="${y}" r="4" fill="white" stroke="#222" stroke-width="1.2"/>`);
    if (v < m.threshold || (m.inclusive && v === m.threshold))
      o.push(`<circle cx="${x}" cy="${y}" r="8" fill="none" stroke="#e31a1c" stroke-width="2.5"/>`);
  }
}

/** The reason there is no map, in a box in the middle of the map area. */
function refusedNote(o: string[], f: MapFrame, reason: string): void {
  const lines = wrapWords(`${reason.charAt(0).toUpperCase()}${reason.slice(1)}.`, 52);
  const w = 420,
    h = 40 + 18 * lines.length;
  const cx = f.m.l + (f.W - f.m.l - f.m.r) / 2,
    cy = f.m.t + (f.H - f.m.t - f.m.b) / 2;
  o.push(
    `<rect x="${cx - w / 2}" y="${cy - h / 2}" width="${w}" height="${h}" fill="white" fill-opacity="0.93" stroke="#b10026" stroke-width="2" rx="6"/>`,
  );
  o.push(
    `<text x="${cx}" y="${cy - h / 2 + 26}" font-size="16" font-weight="bold" text-anchor="middle" fill="#b10026">No chance map</text>`,
  );
  lines.forEach((l, i) =>
    o.push(
      `<text x="${cx}" y="${cy - h / 2 + 48 + 18 * i}" font-size="13" text-anchor="middle">${esc(l)}</text>`,
    ),
  );
}

/** The legend: % classes, samples, boundary, then the assumption in small print; returns its bottom. */
function legendSvg(o: string[], f: MapFrame, input: ChanceChartInput, colours: string[]): number {
  const m = input.map;
  const lx = f.W - f.m.r + 24;
  let ly = f.m.t + 8;
  for (const l of wrapWords(`% chance ${belowText(m)}`, 24)) {
    o.push(`<text x="${lx}" y="${ly}" font-size="13" font-weight="bold">${esc(l)}</text>`);
    ly += 17;
  }
  ly += 4;
  if (!m.refused)
    chanceClassLabels()
      .map((l, c) => ({ l, c }))
      .reverse()
      .forEach(({ l, c }) => {
        o.push(
          `<rect x="${lx}" y="${ly}" width="24" height="18" fill="${colours[c]}" stroke="#555" stroke-width="0.6"/><text x="${lx + 32}" y="${ly + 14}" font-size="13">${l}</text>`,
        );
        ly += 22;
      });
  ly += 12;
  o.push(
    `<circle cx="${lx + 12}" cy="${ly}" r="4" fill="white" stroke="#222" stroke-width="1.2"/><text x="${lx + 32}" y="${ly + 4}" font-size="12">sample</text>`,
  );
  ly += 22;
  o.push(
    `<circle cx="${lx + 12}" cy="${ly}" r="4" fill="white" stroke="#222" stroke-width="1.2"/><circle cx="${lx + 12}" cy="${ly}" r="8" fill="none" stroke="#e31a1c" stroke-width="2.5"/><text x="${lx + 32}" y="${ly + 4}" font-size="12">sample ${esc(belowText(m))}</text>`,
  );
  ly += 22;
  o.push(
    `<line x1="${lx}" y1="${ly}" x2="${lx + 24}" y2="${ly}" stroke="#222" stroke-width="2"/><text x="${lx + 32}" y="${ly + 4}" font-size="12">field boundary</text>`,
  );
  ly += 24;
  const notes = [m.assumption];
  if (m.msse !== null) notes.push('MSSE near 1: the kriging variances fit the leave-one-out errors.');
  for (const l of notes.flatMap((n) => wrapWords(n, 32))) {
    o.push(`<text x="${lx}" y="${ly}" font-size="11" fill="#444">${esc(l)}</text>`);
    ly += 14;
  }
  return ly;
}

/**
 * The chance map: per cell the chance that the nutrient is below its threshold, in % classes (magma, darker =
 * more likely), the samples with the low ones ringed, a legend with the assumption, a scale bar and a north
 * arrow; with the reason in the middle of the field when there is no map.
 * @param size width 860, height 680 px
 * @example writeFileSync('so4_s-chance-below.svg', chanceMapSvg({ parts: field.parts, xy: samples.xy, values: samples.values.so4_s, label: 'sulphate-S (0-24 in)', grid, map: chanceBelowMap(samples, 'so4_s', grid, { value: 20, unit: 'lb S/ac' }) }))
 */
export function chanceMapSvg(
  input: ChanceChartInput,
  size: { width?: number; height?: number } = {},
): string {
  const f = mapFrame(input.parts, input.xy, input.values, size.width ?? 860, size.height ?? 680, 118);
  const colours = chanceColours();
  const o: string[] = [svgOpen(f)];
  header(o, f, input);
  const chance = input.map.chance;
  const clip = { id: 'chance-clip', parts: input.parts };
  if (chance) o.push(...rasterSvg(f, input.grid, chance, chanceClass, (c) => colours[c], 1, clip).svg);
  o.push(boundarySvg(f, input.parts, !chance));
  samplesSvg(o, f, input);
  if (input.map.refused) refusedNote(o, f, input.map.refused);
  const ly = legendSvg(o, f, input, colours);
  o.push(scaleBarSvg(f));
  o.push(northArrowSvg(f.W - f.m.r + 36, Math.min(ly + 10, f.H - 60)));
  o.push('</svg>');
  return o.join('\n');
}
