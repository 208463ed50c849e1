/**
 * The low-spot map of the variability study: the field outline, an optional interpolated surface, the samples
 * coloured by value (viridis), low samples ringed in red and labelled, a colour bar with the threshold, a scale
 * bar and a north arrow. A complete standalone SVG document as a string, drawn with the report's map renderer
 * (src/draw/).
 */
import { ramp } from '../draw/colour.js';
import { makeFrame, mapHeader, mapSvg, PAD, partsBbox } from '../draw/frame.js';
import { boundary, labelsFit, type MapSample, rasterLayer, samplePoints } from '../draw/layers.js';
import { type LegendItem, legend } from '../draw/legend.js';
import { trueNorthAtBox } from '../draw/north.js';
import type { Grid, RingsPart, UtmZone } from '../types.js';

const viridis = (t: number): string => ramp('viridis', t);

export interface SampleMapInput {
  /** field boundary parts in metres (Field.parts) */
  parts: RingsPart[];
  /** the field's UTM zone (Field.utm), for the north arrow's true north; without it the arrow shows grid north */
  utm?: UtmZone;
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

/** The tested samples (NaN: not tested, not drawn), coloured by value; the low ones ringed and labelled. */
function mapSamples(input: SampleMapInput, t: (v: number) => number): MapSample[] {
  const isLow = lowTest(input);
  const out: MapSample[] = [];
  for (let i = 0; i < input.values.length; i++) {
    const v = input.values[i];
    if (!Number.isFinite(v)) continue;
    const low = isLow(i);
    out.push({
      x: input.xy[2 * i],
      y: input.xy[2 * i + 1],
      fill: viridis(t(v)),
      low,
      label: low ? `${input.ids[i]}: ${fmtVal(v)}` : null,
    });
  }
  return out;
}

/** The surface in 48 colour steps, clipped to the field; and the legend's note when shown coarser. */
function surfaceLayer(
  f: ReturnType<typeof makeFrame>,
  input: SampleMapInput,
  t: (v: number) => number,
): { svg: string; note: string } {
  const s = input.surface;
  if (!s) return { svg: '', note: '' };
  const idx = new Uint8Array(s.values.length);
  for (let i = 0; i < idx.length; i++) {
    const v = s.values[i];
    idx[i] = Number.isFinite(v) ? Math.round(t(v) * 47) : 255;
  }
  const palette = Array.from({ length: 48 }, (_, b) => viridis(b / 47));
  const r = rasterLayer(f, input.parts, s.grid, idx, palette, 'sample-map', 0.75);
  return { svg: r.svg, note: r.factor > 1 ? `, drawn at ${r.factor * s.grid.cell} m cells` : '' };
}

/**
 * A map of the nutrient: the field outline, the samples coloured by value (viridis), low samples ringed in red
 * and labelled with their ids, a colour bar with the threshold, a scale bar and a north arrow (to true north
 * when `utm` is given). 732 px wide; the height follows the field.
 * @example writeFileSync('map.svg', sampleMapSvg({ parts: field.parts, utm: field.utm, xy: samples.xy, values: samples.values.so4_s, ids: samples.ids, label: 'sulphate-S', unit: 'lb S/ac', threshold: 20 }))
 */
export function sampleMapSvg(input: SampleMapInput): string {
  const { vmin, vmax } = valueRange(input);
  const t = (v: number) => (v - vmin) / (vmax - vmin);
  const pts = mapSamples(input, t);
  const nLow = pts.filter((p) => p.low).length;
  const head = mapHeader(`${input.label} (${input.unit})`, [
    input.threshold === null
      ? 'samples coloured by value'
      : `${nLow} sample(s) ${input.thresholdInclusive ? 'at or below' : 'below'} ${input.threshold} ${input.unit} ringed in red`,
  ]);
  const bbox = partsBbox(
    input.parts,
    pts.flatMap((p) => [p.x, p.y]),
  );
  const f = makeFrame(bbox, { top: PAD + head.height });
  const surface = surfaceLayer(f, input, t);
  const body =
    head.svg +
    surface.svg +
    boundary(f, input.parts, !input.surface) +
    samplePoints(f, pts, { lowLabels: true });
  const items: LegendItem[] = [
    { fill: viridis(0.5), symbol: 'point', label: 'sample (colour: its value)' },
    ...(input.threshold !== null
      ? [
          {
            fill: viridis(0.1),
            symbol: 'ring' as const,
            label: labelsFit(f, nLow) ? 'low sample (id: value)' : 'low sample (too many to label here)',
          },
        ]
      : []),
    { fill: 'none', symbol: 'line', label: 'field boundary' },
    ...(input.surface
      ? [{ fill: viridis(0.4), label: (input.surface.label ?? 'interpolated (IDW)') + surface.note }]
      : []),
  ];
  const th = input.threshold;
  const lg = legend(f, input.unit, items, [], {
    ramp: 'viridis',
    min: vmin,
    max: vmax,
    threshold: th === null ? null : { value: th, label: `${th} low` },
  });
  const doc = {
    id: 'sample-map',
    kind: 'samples',
    aria: `${input.label}: samples and low spots`,
    utm: input.utm,
    trueNorthDeg: trueNorthAtBox(input.utm, bbox),
    standalone: true,
  };
  return mapSvg(f, doc, body, lg);
}

function fmtVal(v: number): string {
  return Math.abs(v) >= 100 ? v.toFixed(0) : v.toFixed(1);
}
