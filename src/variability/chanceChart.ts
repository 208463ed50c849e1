/**
 * The chance map of the variability study, drawn beside the value map: per cell the chance that the nutrient
 * is below its low threshold (from kriging, chanceMap.ts), in % classes, with the samples, the low ones ringed,
 * the expected share of the field below, and the assumption stated. When kriging was refused the map shows the
 * field and the samples with the reason in its middle, never an empty picture. A complete standalone SVG, drawn
 * with the report's map renderer (src/draw/).
 */
import { wrapWords } from '../draw/escape.js';
import { makeFrame, mapHeader, mapSvg, PAD, partsBbox } from '../draw/frame.js';
import { boundary, type MapSample, noteBox, rasterLayer, samplePoints } from '../draw/layers.js';
import { type LegendItem, legend } from '../draw/legend.js';
import { trueNorthAtBox } from '../draw/north.js';
import type { Grid, RingsPart, UtmZone } from '../types.js';
import {
  chanceClass,
  chanceClassLabels,
  chanceColours,
  chanceSentence,
  type ChanceMap,
} from './chanceMap.js';

export interface ChanceChartInput {
  /** field boundary parts in metres (Field.parts) */
  parts: RingsPart[];
  /** the field's UTM zone (Field.utm), for the north arrow's true north; without it the arrow shows grid north */
  utm?: UtmZone;
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
function header(input: ChanceChartInput): ReturnType<typeof mapHeader> {
  const m = input.map;
  const msse = m.msse !== null && Number.isFinite(m.msse) ? ` (leave-one-out MSSE ${m.msse.toFixed(2)})` : '';
  const share = m.expectedShare !== null ? ` ${chanceSentence(m)}` : '';
  const lines = m.refused
    ? ['No chance map: see the note on the map.']
    : wrapWords(`From ${m.method}${msse}.${share}`, 100);
  return mapHeader(`Chance that ${input.label} is ${belowText(m)}`, lines);
}

/** The tested samples as white dots, the low ones ringed in red. */
function mapSamples(input: ChanceChartInput): MapSample[] {
  const m = input.map;
  const out: MapSample[] = [];
  for (let i = 0; i < input.values.length; i++) {
    const v = input.values[i];
    if (!Number.isFinite(v)) continue;
    const low = v < m.threshold || (m.inclusive && v === m.threshold);
    out.push({ x: input.xy[2 * i], y: input.xy[2 * i + 1], low });
  }
  return out;
}

/**
 * The chance map: per cell the chance that the nutrient is below its threshold, in % classes (magma, darker =
 * more likely), the samples with the low ones ringed, a legend with the assumption, a scale bar and a north
 * arrow (to true north when `utm` is given); with the reason in the middle of the field when there is no map.
 * 732 px wide; the height follows the field.
 * @example writeFileSync('so4_s-chance-below.svg', chanceMapSvg({ parts: field.parts, utm: field.utm, xy: samples.xy, values: samples.values.so4_s, label: 'sulphate-S (0-24 in)', grid, map: chanceBelowMap(samples, 'so4_s', grid, { value: 20, unit: 'lb S/ac' }) }))
 */
export function chanceMapSvg(input: ChanceChartInput): string {
  const m = input.map;
  const head = header(input);
  const pts = mapSamples(input);
  const bbox = partsBbox(
    input.parts,
    pts.flatMap((p) => [p.x, p.y]),
  );
  const f = makeFrame(bbox, { top: PAD + head.height });
  const colours = chanceColours();
  let body = head.svg;
  if (m.chance) {
    const idx = new Uint8Array(m.chance.length);
    for (let i = 0; i < idx.length; i++) {
      const c = chanceClass(m.chance[i]);
      idx[i] = c < 0 ? 255 : c;
    }
    body += rasterLayer(f, input.parts, input.grid, idx, colours, 'chance-map').svg;
  }
  body += boundary(f, input.parts, !m.chance) + samplePoints(f, pts);
  if (m.refused) body += noteBox(f, 'No chance map', m.refused);
  const items: LegendItem[] = [
    ...(m.refused ? [] : chanceClassLabels().map((label, c) => ({ fill: colours[c], label }))),
    { fill: '#fff', symbol: 'point', label: 'sample' },
    { fill: '#fff', symbol: 'ring', label: `sample ${belowText(m)}` },
    { fill: 'none', symbol: 'line', label: 'field boundary' },
  ];
  const notes = [m.assumption];
  if (m.msse !== null) notes.push('MSSE near 1: the kriging variances fit the leave-one-out errors.');
  const lg = legend(f, `% chance ${belowText(m)}`, items, notes);
  const doc = {
    id: 'chance-map',
    kind: 'chance',
    aria: `Chance that ${input.label} is ${belowText(m)}`,
    utm: input.utm,
    trueNorthDeg: trueNorthAtBox(input.utm, bbox),
    standalone: true,
  };
  return mapSvg(f, doc, body, lg);
}
