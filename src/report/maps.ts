/**
 * The report's maps, each an inline SVG with legend, scale bar and north arrow (see frame.ts):
 * sample locations, one surface per nutrient with its samples' values (and beside it the chance below the
 * nutrient's low threshold, or why there is none), response-probability classes,
 * one rate map per zone set and product placement, and where the seed-row and other limits bind.
 * Building blocks: mapParts.ts (rasters, boundary, samples) and zoneParts.ts (zone outlines and labels).
 */
import { CHANCE_BREAKS, chanceClassLabels, chanceColours } from '../draw/chanceClasses.js';
import { classColours, NEUTRAL, QUALITATIVE, rateColours } from '../draw/colour.js';
import { fmt } from '../draw/escape.js';
import { type Frame, makeFrame, mapSvg, partsBbox } from '../draw/frame.js';
import {
  boundary,
  breakLabels,
  classify,
  type MapSample,
  noteBox,
  rasterLayer,
  samplePoints,
  labelsFit,
} from '../draw/layers.js';
import { type LegendItem, legend } from '../draw/legend.js';
import { trueNorthAtBox } from '../draw/north.js';
import { areaLabel } from './tables.js';
import type { ReportChanceMap, ReportInput, ReportNutrient, ReportZone, ReportZoneSet } from './types.js';
import { zonePolys } from './zoneParts.js';

export { labelPoint, zoneDefs } from './zoneParts.js';

/** Legend entries of the sample symbol and the boundary. */
const SAMPLE: LegendItem = { fill: '#fff', symbol: 'point', label: 'Soil sample' };
const BOUNDARY: LegendItem = { fill: 'none', symbol: 'line', label: 'Field boundary' };

/** The input's samples as map samples, labelled by `label(i)` (null: no label). */
function samples(input: ReportInput, label: (i: number) => string | null): MapSample[] {
  const { xy, ids } = input.samples;
  return ids.map((_, i) => ({ x: xy[2 * i]!, y: xy[2 * i + 1]!, label: label(i) }));
}

/** A sample's lab value as its label: "<" below detection, ">" above range; null without a value. */
function valueLabel(n: ReportNutrient, v: number, cens: number): string | null {
  if (!Number.isFinite(v)) return null;
  return (cens < 0 ? '<' : cens > 0 ? '>' : '') + fmt(v, n.decimals ?? 0);
}

/** One drawn map. */
export interface ReportMap {
  id: string;
  kind: 'samples' | 'surface' | 'chance' | 'response' | 'rate' | 'binding';
  title: string;
  caption: string;
  svg: string;
  legendItems: number;
}

/** What every map step shares: the input, the frame, the nutrient labels, and `add` to draw one map. */
interface MapContext {
  input: ReportInput;
  f: Frame;
  /** "UTM zone ...; the arrow points to true north ..." for captions */
  utmNote: string;
  nutLabel: (key: string) => ReportNutrient;
  /** draws one map: its body (given the map's id, for clip paths), caption and legend */
  add: (
    kind: ReportMap['kind'],
    title: string,
    caption: string,
    body: (id: string) => string,
    lg: { items: LegendItem[]; title: string; notes?: string[] },
  ) => void;
}

/**
 * Every map of the report, in reading order.
 * @example buildMaps(input).map((m) => m.title)
 */
export function buildMaps(input: ReportInput): ReportMap[] {
  const bbox = partsBbox(input.field.parts);
  const f = makeFrame(bbox);
  const north = trueNorthAtBox(input.utm, bbox);
  const maps: ReportMap[] = [];
  const nut = new Map(input.nutrients.map((n) => [n.key, n]));
  const ctx: MapContext = {
    input,
    f,
    utmNote: `UTM zone ${input.utm.zone}${input.utm.south ? 'S' : 'N'} (EPSG:${input.utm.epsg}); the arrow points to true north, ${fmt(Math.abs(north), 1)}° ${north < 0 ? 'west' : 'east'} of grid north.`,
    nutLabel: (key) => nut.get(key) ?? { key, label: key, unit: '' },
    add: (kind, title, caption, body, lg) => {
      const id = `map-${maps.length + 1}`;
      const l = legend(f, lg.title, lg.items, lg.notes ?? []);
      const svg = mapSvg(f, { id, kind, aria: title, utm: input.utm, trueNorthDeg: north }, body(id), l);
      maps.push({ id, kind, title, caption, svg, legendItems: lg.items.length });
    },
  };
  samplesMap(ctx);
  // a chance map right after its nutrient's surface (the mean map), the others after the surfaces
  const chance = input.chance ?? [];
  for (const s of input.surfaces) {
    surfaceMap(ctx, s);
    for (const c of chance) if (c.nutrient === s.nutrient) chanceMap(ctx, c);
  }
  for (const c of chance) if (!input.surfaces.some((s) => s.nutrient === c.nutrient)) chanceMap(ctx, c);
  for (const r of input.response) responseMap(ctx, r);
  input.zoneSets.forEach((set, si) => {
    for (const pp of productPlacements(set)) rateMap(ctx, set, si, pp);
    bindingMap(ctx, set, si);
  });
  return maps;
}

/** 1. Sample locations, labelled with their ids. */
function samplesMap(ctx: MapContext): void {
  const { input, f } = ctx;
  const n = input.samples.ids.length;
  const fit = labelsFit(f, n);
  ctx.add(
    'samples',
    'Soil sample locations',
    `${n} samples, ${fit ? 'labelled with their ids' : `too close together at this scale to label (the ids are in report-data.json)`}. ${ctx.utmNote}`,
    () =>
      boundary(f, input.field.parts) +
      samplePoints(
        f,
        samples(input, (i) => input.samples.ids[i] ?? ''),
      ),
    {
      items: [
        {
          ...SAMPLE,
          label: fit ? `Soil sample (${n}), labelled with its id` : `Soil sample (${n}; too dense to label)`,
        },
        BOUNDARY,
      ],
      title: 'Samples',
    },
  );
}

/** 2. A nutrient's interpolated surface in the zones' classes, samples labelled with their lab values. */
function surfaceMap(ctx: MapContext, s: ReportInput['surfaces'][number]): void {
  const { input, f } = ctx;
  const parts = input.field.parts;
  const n = ctx.nutLabel(s.nutrient);
  const labels = breakLabels(s.breaks, n.decimals ?? 0);
  const colours = classColours('viridis', labels.length);
  const vals = input.samples.values[s.nutrient];
  const cens = input.samples.censored?.[s.nutrient];
  const body = (id: string) =>
    rasterLayer(f, parts, s.raster.grid, classify(s.raster.values, s.breaks), colours, id).svg +
    boundary(f, parts) +
    samplePoints(
      f,
      samples(input, (i) => (vals ? valueLabel(n, vals[i]!, cens ? cens[i]! : 0) : null)),
    );
  const unit = n.unit ? ` (${n.unit})` : '';
  const fit = labelsFit(f, vals ? input.samples.ids.length : 0);
  ctx.add(
    'surface',
    `${n.label}: interpolated surface`,
    `${n.label}${unit}${s.method ? `, ${s.method}` : ''}, ${fmt(s.raster.grid.cell, s.raster.grid.cell < 10 ? 1 : 0)} m cells; ${fit ? 'samples labelled with their lab values ("<" below detection, ">" above range)' : 'samples too close together at this scale to label with their values (they are in report-data.json)'}. Classes are the zones' classes. ${ctx.utmNote}`,
    body,
    {
      items: [
        ...labels.map((l, i) => ({ fill: colours[i]!, label: l })),
        { ...SAMPLE, label: fit ? 'Soil sample and its value' : 'Soil sample (too dense to label)' },
        BOUNDARY,
      ],
      title: `${n.label}${unit}`,
      notes: s.raster.notes,
    },
  );
}

/** 2b. The chance a nutrient is below its low threshold, in % classes; or, without one, why there is none. */
function chanceMap(ctx: MapContext, c: ReportChanceMap): void {
  const { input, f } = ctx;
  const parts = input.field.parts;
  const n = ctx.nutLabel(c.nutrient);
  const below = `below ${fmt(c.threshold, n.decimals ?? 0)} ${c.unit}`;
  const colours = chanceColours();
  const labels = chanceClassLabels();
  const rr = c.raster;
  const dots = samples(input, () => null);
  const body = rr
    ? (id: string) =>
        rasterLayer(f, parts, rr.grid, classify(rr.values, CHANCE_BREAKS), colours, id).svg +
        boundary(f, parts) +
        samplePoints(f, dots)
    : () => boundary(f, parts) + samplePoints(f, dots) + noteBox(f, 'No chance map', c.refused ?? '');
  ctx.add(
    'chance',
    `${n.label}: chance ${below}`,
    rr
      ? `From ${c.method}.${c.summary ? ` ${c.summary}` : ''} ${ctx.utmNote}`
      : `No chance map of ${n.label}: ${c.refused}. ${ctx.utmNote}`,
    body,
    {
      items: [...(rr ? labels.map((l, i) => ({ fill: colours[i]!, label: l })) : []), SAMPLE, BOUNDARY],
      title: `% chance ${below}`,
      notes: rr ? [c.assumption, ...(rr.notes ?? [])] : [`No chance map: ${c.refused}.`],
    },
  );
}

/** 3. Response-probability classes of a nutrient, per cell or per zone. */
function responseMap(ctx: MapContext, r: ReportInput['response'][number]): void {
  const { input, f } = ctx;
  const parts = input.field.parts;
  const n = ctx.nutLabel(r.nutrient);
  const colours = classColours('magma', r.classes.length).reverse();
  const items: LegendItem[] = r.classes.map((c, i) => ({ fill: colours[i]!, label: c.label }));
  let body: (id: string) => string = () => boundary(f, parts);
  if (r.raster) {
    const rr = r.raster;
    const idx = new Uint8Array(rr.values.length);
    for (let i = 0; i < idx.length; i++) {
      const v = rr.values[i]!;
      idx[i] = Number.isFinite(v) && v >= 0 && v < colours.length ? v : 255;
    }
    body = (id) => rasterLayer(f, parts, rr.grid, idx, colours, id).svg + boundary(f, parts);
  } else if (r.byZone) {
    const si = input.zoneSets.findIndex((s) => s.name === r.byZone!.zoneSet);
    const cls = r.byZone.classes;
    body = () =>
      zonePolys(
        f,
        si,
        si >= 0 ? input.zoneSets[si]!.zones : [],
        (z) => colours[cls[z.id] ?? -1] ?? NEUTRAL,
        (z) => [z.id],
      ) + boundary(f, parts);
  }
  ctx.add(
    'response',
    `${n.label}: chance of a yield response`,
    `Chance that the crop responds to applied ${n.label}, by soil-test class${r.source ? ` (${r.source})` : ''}. ${ctx.utmNote}`,
    body,
    {
      items: [...items, BOUNDARY],
      title: `Chance of response to ${n.label}`,
      notes: r.raster?.notes,
    },
  );
}

/** 4. One product and placement's rate by zone, in close colours where rates differ by less than matters. */
function rateMap(
  ctx: MapContext,
  set: ReportZoneSet,
  si: number,
  { product, placement, unit }: { product: string; placement: string; unit: string },
): void {
  const { input, f } = ctx;
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
  const body = () =>
    zonePolys(f, si, set.zones, colourOf, (z) => {
      const v = rateOf(z);
      return [z.id, v === undefined ? '–' : `${fmt(v, decimals)}`];
    }) + boundary(f, input.field.parts);
  ctx.add(
    'rate',
    `${product}, ${placement}: rate by zone${input.zoneSets.length > 1 ? ` (${set.name})` : ''}`,
    `Product rate of ${product} (${placement}) in ${unit} for each of the ${set.zones.length} zones of "${set.name}"; labels give the zone id and rate. ${ctx.utmNote}`,
    body,
    { items, title: `${product}, ${placement} (${unit})`, notes: ['Labels: zone id, then rate.'] },
  );
}

/** 5. Where a seed-row or other limit of the plan cut a rate below its target. */
function bindingMap(ctx: MapContext, set: ReportZoneSet, si: number): void {
  const { input, f } = ctx;
  const limits = [...new Set(set.zones.map((z) => z.bindingLimit).filter((v): v is string => !!v))].sort();
  const colourOf = (z: ReportZone): string =>
    z.bindingLimit ? QUALITATIVE[limits.indexOf(z.bindingLimit) % QUALITATIVE.length]! : NEUTRAL;
  const items: LegendItem[] = limits.map((l, i) => ({
    fill: QUALITATIVE[i % QUALITATIVE.length]!,
    label: l,
  }));
  items.push({ fill: NEUTRAL, label: 'no limit binds: rates meet the targets' });
  ctx.add(
    'binding',
    `Where limits bind${input.zoneSets.length > 1 ? ` (${set.name})` : ''}`,
    `Zones where a seed-row safety limit or another limit of the plan cut a rate below its target. ${ctx.utmNote}`,
    () => zonePolys(f, si, set.zones, colourOf, (z) => [z.id]) + boundary(f, input.field.parts),
    { items, title: 'Binding limit' },
  );
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
