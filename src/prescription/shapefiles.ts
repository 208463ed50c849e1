/**
 * The prescription's shapefile sets for the controller: which sets (per placement or per product), which rate
 * columns, and a note for people. The format itself is written by src/io/shapefile/.
 */
import type { Feature, FeatureCollection, MultiPolygon, Polygon } from 'geojson';
import type { UtmZone } from '../types.js';
import { writeShapefile, resolveColumns, baseFileName, type ColumnSpec } from '../io/shapefile/write.js';
import { shortFileNames } from '../io/shapefile/names.js';
import { zipFiles } from '../io/zip.js';
import { groundAreaM2 } from '../geo/ground-area.js';
import { acToHa, m2ToAc, m2ToHa } from '../units/index.js';
import { VERSION } from '../version.js';
import { CAUTION, placementName } from '../vocabulary.js';

/** Rate units a prescription may carry, and the short form used in column names. */
export const RX_UNITS = { 'lb/ac': 'lbac', 'kg/ha': 'kgha', 'US gal/ac': 'galac', 'L/ha': 'lha' } as const;
export type RxUnit = keyof typeof RX_UNITS;

/** One product rate in one zone. */
export interface RxRate {
  /** product name as the plan gives it, e.g. "urea 46-0-0" */
  product: string;
  /** where it goes, e.g. "seed_row", "side_band", "broadcast" */
  placement: string;
  /** product (not nutrient) per area, >= 0 */
  rate: number;
  unit: RxUnit;
}

/**
 * The properties the layout reads from each zone feature (other properties are ignored).
 * Geometry: Polygon or MultiPolygon in WGS 84 lon/lat.
 * @example { zone_id: 3, rates: [{ product: 'urea 46-0-0', placement: 'side_band', rate: 95, unit: 'lb/ac' }] }
 */
export interface RxZoneProperties {
  /** whole number >= 0, or text up to 20 characters */
  zone_id: number | string;
  rates: RxRate[];
}

/** Options of {@link prescriptionFiles}. */
export interface LayoutOptions {
  /** per_placement: one set per placement, one rate column per product; per_product: one set per product and placement, one column `rate_<unit>` */
  layout: 'per_placement' | 'per_product';
  /** coordinates written (default 'lonlat', WGS 84) */
  crs?: 'lonlat' | 'utm';
  /** UTM zone (default: the zones' centre) */
  utm?: UtmZone;
  /** 8.3 upper-case file names (default false) */
  shortFileNames?: boolean;
  /** prefix of every set's name (default "rx") */
  prefix?: string;
  /** a line naming the field / plan, for the note (default none) */
  title?: string;
  /** date in .dbf headers and the note (default today, UTC) */
  date?: Date;
}

/** One rate column of one set, as described in the note. */
export interface RateColumn {
  set: string;
  column: string;
  product: string;
  placement: string;
  unit: RxUnit;
  min: number;
  max: number;
  /** product over the whole prescription: lb, kg, US gal or L */
  total: number;
}

const TOTAL_UNIT: Record<RxUnit, string> = {
  'lb/ac': 'lb',
  'kg/ha': 'kg',
  'US gal/ac': 'US gal',
  'L/ha': 'L',
};

function slug(s: string): string {
  return (
    s
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '_')
      .replace(/^_+|_+$/g, '') || 'x'
  );
}

/** Decimal places for a rate unit: 1 for mass, 2 for volume. */
const decimalsFor = (u: RxUnit) => (u === 'lb/ac' || u === 'kg/ha' ? 1 : 2);

function numberWidth(values: number[], decimals: number): number {
  let w = 1;
  for (const v of values) if (Number.isFinite(v)) w = Math.max(w, v.toFixed(decimals).length);
  return Math.min(20, Math.max(w + 1, decimals ? decimals + 4 : 4));
}

/**
 * Product stems for column names "<stem>_<unit>" (at most 10 characters): the product's name cut to fit,
 * made unique with a digit.
 */
function rateColumnNames(products: string[], units: RxUnit[]): string[] {
  const used = new Set<string>();
  return products.map((p, i) => {
    const suf = '_' + RX_UNITS[units[i]];
    // the product's first word ("Urea 46-0-0" -> urea), or all of it when that is not a word
    const words = slug(p).split('_');
    const stem = /^[a-z]/.test(words[0]) ? words[0] : 'p' + words.join('');
    let name = stem.slice(0, 10 - suf.length) + suf;
    for (let k = 2; used.has(name); k++) name = stem.slice(0, 10 - suf.length - String(k).length) + k + suf;
    used.add(name);
    return name;
  });
}

interface SetPlan {
  name: string;
  cols: { key: string; product: string; placement: string; unit: RxUnit; column: string }[];
}

type Pair = { product: string; placement: string; unit: RxUnit };

/** The distinct (product, placement) pairs of the zones in first-seen order, with their unit (RangeError for bad zones). */
function productPlacements(feats: Feature<Polygon | MultiPolygon>[]): Pair[] {
  const pairs: Pair[] = [];
  feats.forEach((f, i) => {
    const p = f.properties as RxZoneProperties | null;
    if (!p || p.zone_id === undefined || !Array.isArray(p.rates))
      throw new RangeError(`prescriptionFiles: feature ${i + 1} lacks zone_id or rates`);
    for (const r of p.rates) {
      if (!(r.unit in RX_UNITS))
        throw new RangeError(`prescriptionFiles: zone ${p.zone_id}: unknown unit ${r.unit}`);
      if (!Number.isFinite(r.rate) || r.rate < 0)
        throw new RangeError(`prescriptionFiles: zone ${p.zone_id}: rate ${r.rate} for ${r.product}`);
      const have = pairs.find((q) => q.product === r.product && q.placement === r.placement);
      if (!have) pairs.push({ product: r.product, placement: r.placement, unit: r.unit });
      else if (have.unit !== r.unit)
        throw new RangeError(
          `prescriptionFiles: ${r.product} (${r.placement}) given in both ${have.unit} and ${r.unit}`,
        );
    }
  });
  return pairs;
}

/** The shapefile sets of a layout: one per placement (a rate column per product), or one per product (and placement). */
function setPlans(pairs: Pair[], layout: LayoutOptions['layout'], prefix: string): SetPlan[] {
  const plans: SetPlan[] = [];
  if (layout === 'per_placement') {
    const placements = [...new Set(pairs.map((q) => q.placement))];
    for (const pl of placements) {
      const ps = pairs.filter((q) => q.placement === pl);
      const names = rateColumnNames(
        ps.map((q) => q.product),
        ps.map((q) => q.unit),
      );
      plans.push({
        name: `${prefix}_${slug(pl)}`,
        cols: ps.map((q, k) => ({ key: `rate_${k}`, ...q, column: names[k] })),
      });
    }
  } else {
    const multi = new Map<string, number>();
    for (const q of pairs) multi.set(q.product, (multi.get(q.product) ?? 0) + 1);
    for (const q of pairs) {
      const name =
        multi.get(q.product)! > 1
          ? `${prefix}_${slug(q.product)}_${slug(q.placement)}`
          : `${prefix}_${slug(q.product)}`;
      plans.push({ name, cols: [{ key: 'rate_0', ...q, column: `rate_${RX_UNITS[q.unit]}` }] });
    }
  }
  return plans;
}

/**
 * Lays out a prescription for machines: shapefile sets (see {@link writeShapefile}) plus, per set,
 * a readable note (`<set>.note.txt`, 8.3: `<SET>.TXT`) and a zip of the set with its note (`<set>.zip`).
 * Every set has the columns `zone_id`, `area_ac`, `area_ha` (ground area from the geometry) and its rate
 * columns; a rate column's name ends with its unit (`_lbac`, `_kgha`, `_galac`, `_lha`) and the note and
 * `.columns.csv` give the full product and placement. A zone with no rate for a column gets 0 (no product).
 *
 * @param fc zones: each feature's properties follow {@link RxZoneProperties}
 * @returns the files (name -> bytes, all in one folder) and the rate columns written
 * @example
 * const { files } = prescriptionFiles(fc, { layout: 'per_placement', crs: 'utm' });
 * for (const [name, bytes] of Object.entries(files)) writeFileAtomic(join(out, 'shapefiles', name), bytes);
 */
export function prescriptionFiles(
  fc: FeatureCollection,
  opts: LayoutOptions,
): { files: Record<string, Uint8Array>; columns: RateColumn[] } {
  const prefix = opts.prefix ?? 'rx';
  const feats = fc.features as Feature<Polygon | MultiPolygon>[];
  if (!feats.length) throw new RangeError('prescriptionFiles: the prescription has no zones');
  const pairs = productPlacements(feats);
  const plans = setPlans(pairs, opts.layout, prefix);
  // unique set names (long and 8.3)
  const longNames = plans.map((p, i) =>
    plans.findIndex((q) => q.name === p.name) < i ? `${p.name}_${i + 1}` : p.name,
  );
  const setNames = opts.shortFileNames ? shortFileNames(longNames) : longNames.map((n) => baseFileName(n));

  const areasM2 = feats.map((f) =>
    groundAreaM2(f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates),
  );
  const zoneIds = feats.map((f) => (f.properties as RxZoneProperties).zone_id);
  const zones: Zones = { feats, areasM2, zoneIds };
  const files: Record<string, Uint8Array> = {};
  const columns: RateColumn[] = [];
  const date = opts.date ?? new Date();
  const enc = new TextEncoder();

  plans.forEach((plan, si) => {
    const set = setNames[si];
    const rows = setRows(zones, plan);
    const specs = columnSpecs(zones, plan, rows);
    const written = resolveColumns(specs);
    const setFiles = writeShapefile(rows, specs, {
      name: set,
      crs: opts.crs,
      utm: opts.utm,
      shortFileName: opts.shortFileNames,
      date,
    });
    const rateCols = rateColumns(set, plan, rows, written, areasM2);
    columns.push(...rateCols);
    const note = noteText(set, rateCols, opts, feats.length, areasM2, date);
    const noteName = opts.shortFileNames ? `${set}.TXT` : `${set}.note.txt`;
    setFiles[noteName] = enc.encode(note);
    Object.assign(files, setFiles);
    files[opts.shortFileNames ? `${set}.ZIP` : `${set}.zip`] = zipFiles(setFiles);
  });
  return { files, columns };
}

/** The zones as every set writes them: features, ground areas (m2) and ids. */
interface Zones {
  feats: Feature<Polygon | MultiPolygon>[];
  areasM2: number[];
  zoneIds: (number | string)[];
}

function rateOf(f: Feature, product: string, placement: string): number {
  const r = ((f.properties as RxZoneProperties | null)?.rates ?? []).find(
    (x) => x.product === product && x.placement === placement,
  );
  return r ? r.rate : 0;
}

/** One row per zone: id, ground area in ac and ha, and the set's rates (0 where the zone has none). */
function setRows(z: Zones, plan: SetPlan): Feature[] {
  return z.feats.map((f, i) => {
    const props: Record<string, unknown> = {
      zone_id: z.zoneIds[i],
      area_ac: m2ToAc(z.areasM2[i]),
      area_ha: m2ToHa(z.areasM2[i]),
    };
    for (const c of plan.cols) props[c.key] = rateOf(f, c.product, c.placement);
    return { type: 'Feature', properties: props, geometry: f.geometry } as Feature;
  });
}

/** The .dbf columns of a set: zone id (number or text), areas, then one rate column per product. */
function columnSpecs(z: Zones, plan: SetPlan, rows: Feature[]): ColumnSpec[] {
  const idsNumeric = z.zoneIds.every((id) => typeof id === 'number' && Number.isInteger(id) && id >= 0);
  return [
    idsNumeric
      ? {
          key: 'zone_id',
          type: 'N',
          width: numberWidth(z.zoneIds as number[], 0),
          description: 'zone number',
        }
      : { key: 'zone_id', type: 'C', width: 20, description: 'zone name' },
    {
      key: 'area_ac',
      type: 'N',
      width: numberWidth(
        rows.map((r) => r.properties!.area_ac as number),
        2,
      ),
      decimals: 2,
      description: 'zone ground area, acres (WGS 84 ellipsoid)',
    },
    {
      key: 'area_ha',
      type: 'N',
      width: numberWidth(
        rows.map((r) => r.properties!.area_ha as number),
        2,
      ),
      decimals: 2,
      description: 'zone ground area, hectares',
    },
    ...plan.cols.map((c): ColumnSpec => ({
      key: c.key,
      name: c.column,
      type: 'N',
      decimals: decimalsFor(c.unit),
      width: numberWidth(
        rows.map((r) => r.properties![c.key] as number),
        decimalsFor(c.unit),
      ),
      description: `${c.product}, ${c.placement}, ${c.unit} of product`,
    })),
  ];
}

/** Each rate column as written (its final name), with its range and the product total over the zones. */
function rateColumns(
  set: string,
  plan: SetPlan,
  rows: Feature[],
  written: ReturnType<typeof resolveColumns>,
  areasM2: number[],
): RateColumn[] {
  return plan.cols.map((c, k) => {
    const vals = rows.map((r) => r.properties![c.key] as number);
    return {
      set,
      column: written[3 + k].name,
      product: c.product,
      placement: c.placement,
      unit: c.unit,
      min: Math.min(...vals),
      max: Math.max(...vals),
      total: vals.reduce(
        (s, v, i) =>
          s + v * (c.unit === 'lb/ac' || c.unit === 'US gal/ac' ? m2ToAc(areasM2[i]) : m2ToHa(areasM2[i])),
        0,
      ),
    };
  });
}

function noteText(
  set: string,
  cols: RateColumn[],
  opts: LayoutOptions,
  zones: number,
  areas: number[],
  date: Date,
): string {
  const acres = m2ToAc(areas.reduce((s, a) => s + a, 0));
  const lines = [
    `Prescription file set "${set}"${opts.title ? ` for ${opts.title}` : ''}`,
    `Written by tilth ${VERSION} on ${date.toISOString().slice(0, 10)}.`,
    '',
    `Zones: ${zones}, ${acres.toFixed(2)} ac (${acToHa(acres).toFixed(2)} ha) in all.`,
    `Coordinates: ${opts.crs === 'utm' ? 'WGS 84 / UTM metres (see the .prj)' : 'WGS 84 longitude/latitude, EPSG:4326'}.`,
    `Layout: ${opts.layout === 'per_placement' ? 'one file set per placement, one rate column per product' : 'one file set per product, one rate column'}.`,
    '',
    'Rate columns (rates are product, not nutrient; the unit is the end of the column name):',
    ...cols.map(
      (c) =>
        `  ${c.column}: ${c.product}, placed ${placementName(c.placement)}, ${c.unit}; ${c.min.toFixed(decimalsFor(c.unit))} to ${c.max.toFixed(decimalsFor(c.unit))}; about ${c.total.toFixed(0)} ${TOTAL_UNIT[c.unit]} in all`,
    ),
    '',
    'Other columns: zone_id (zone), area_ac and area_ha (zone ground area). The .columns.csv (8.3: .CSV) lists every column.',
    'Outside every zone the controller applies its own default or off-field rate: set it on the terminal.',
    '',
    ...CAUTION.split('\n'),
    'Run `tilth check` on these files before going to the field.',
  ];
  return lines.join('\n') + '\n';
}
