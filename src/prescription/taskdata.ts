/**
 * A prescription as ISO 11783-10 task data: one customer, farm and partfield (the field boundary), one
 * product per plan product, one task per placement (or per product and placement) and zone set, each
 * zone a treatment zone with one setpoint rate per product. Granular products as DDI 6 (mass per area,
 * mg/m2), liquids as DDI 1 (volume per area, mm3/m2, through the product's density). Zone code 0 is a
 * zero rate for every product, and is the task's default, position-lost and out-of-field zone: outside
 * the zones, or without a position fix, nothing is applied. Pure: returns file bytes. See docs/formats.md.
 */
import { UserError } from '../errors.js';
import type { Placement, Tables } from '../agronomy/tables.js';
import { projector } from '../geo/utm.js';
import { rasterizeLonLat, type LonLatFrame } from '../geo/rasterize.js';
import {
  encodeInt32LE,
  taskDataFiles,
  type IsoGrid,
  type IsoPolygon,
  type IsoTask,
  type IsoValue,
  type IsoValuePresentation,
  type IsoZone,
  type TaskData,
} from '../io/isoxml/index.js';
import {
  kghaToLha,
  kghaToMgm2,
  kgPerLToMgPerL,
  lbacToKgha,
  lhaToGalac,
  lhaToMm3m2,
  mgm2ToKgha,
  mm3m2ToLha,
  kghaToLbac,
} from '../units/index.js';
import { VERSION } from '../version.js';
import { productRate, usedPairs } from './totals.js';
import type { Prescription, ZoneSetResult } from './types.js';
import { PLACEMENT_NAME } from '../vocabulary.js';

/** Options of {@link prescriptionTaskData}. */
export interface TaskDataOptions {
  /** one task per placement (default) or per product and placement */
  layout?: 'per_placement' | 'per_product';
  /** a type-2 grid of rates instead of zone polygons (default false) */
  grid?: boolean;
  /** grid cell, m (default half the prescription's grid cell) */
  gridCellM?: number;
}

/** Treatment zone codes are one byte; 255 is reserved. */
const MAX_CODE = 254;

interface ProductInfo {
  id: string;
  label: string;
  liquid: boolean;
  densityKgL: number | null;
}
interface Pair {
  product: string;
  placement: Placement;
}

/** Setpoint for one product from its rate in lb/ac: [DDI, integer value]. */
function setpoint(p: ProductInfo, lbac: number): [number, number] {
  const kgha = lbacToKgha(lbac);
  return p.liquid
    ? [1, Math.round(lhaToMm3m2(kghaToLha(kgha, p.densityKgL!)))]
    : [6, Math.round(kghaToMgm2(kgha))];
}

function products(rx: Prescription, tables: Tables): Map<string, ProductInfo> {
  const out = new Map<string, ProductInfo>();
  for (const set of rx.zoneSets)
    for (const { product } of usedPairs(set)) {
      if (out.has(product)) continue;
      const t = tables.products[product];
      const liquid = t?.form === 'liquid';
      const density = t?.density_kg_l?.value ?? null;
      if (liquid && density === null) {
        throw new UserError(
          `product "${product}" is liquid but the product table gives no density_kg_l, so its rate cannot be written as a volume (ISO 11783-10 DDI 1). Fix: add density_kg_l: { value: <kg per litre>, source: ... } to the product in your tables file, or remove isoxml from output.formats.`,
          { field: 'density_kg_l', value: product },
        );
      }
      out.set(product, { id: `PDT${out.size + 1}`, label: t?.label ?? product, liquid, densityKgL: density });
    }
  return out;
}

/** Value presentations in the plan's units: VPN1 mass (DDI 6), VPN2 volume (DDI 1). */
function presentations(units: string): IsoValuePresentation[] {
  const kg = units === 'kg/ha';
  return [
    {
      id: 'VPN1',
      offset: 0,
      scale: kg ? mgm2ToKgha(1) : kghaToLbac(mgm2ToKgha(1)),
      decimals: 1,
      unit: kg ? 'kg/ha' : 'lb/ac',
    },
    {
      id: 'VPN2',
      offset: 0,
      scale: kg ? mm3m2ToLha(1) : lhaToGalac(mm3m2ToLha(1)),
      decimals: kg ? 1 : 2,
      unit: kg ? 'L/ha' : 'US gal/ac',
    },
  ];
}

const flat = (ring: number[][]): Float64Array => Float64Array.from(ring.flat());
const zonePolygons = (lonlat: number[][][][]): IsoPolygon[] =>
  lonlat.map((poly) => ({ type: 2, exterior: flat(poly[0]), holes: poly.slice(1).map(flat) }));

function values(pairs: Pair[], info: Map<string, ProductInfo>, rate: (p: Pair) => number): IsoValue[] {
  return pairs.map((pair) => {
    const p = info.get(pair.product)!;
    const [ddi, value] = setpoint(p, rate(pair));
    return { ddi, value, productId: p.id, valuePresentationId: p.liquid ? 'VPN2' : 'VPN1' };
  });
}

/** The lon/lat grid over the field: cells of about `cellM` metres, corner rounded to 9 decimals (outwards). */
export function taskGridFrame(rx: Prescription, cellM: number): LonLatFrame {
  let w = Infinity,
    e = -Infinity,
    s = Infinity,
    n = -Infinity;
  for (const poly of rx.field.lonlat)
    for (const [x, y] of poly[0]) {
      w = Math.min(w, x);
      e = Math.max(e, x);
      s = Math.min(s, y);
      n = Math.max(n, y);
    }
  const proj = projector(rx.field.utm);
  const [cx, cy] = proj.forward([(w + e) / 2, (s + n) / 2]);
  const ll = proj.inverse([cx, cy, cx + cellM, cy, cx, cy + cellM]);
  const cellEast = ll[2] - ll[0],
    cellNorth = ll[5] - ll[1];
  const west = Math.floor(w * 1e9) / 1e9,
    south = Math.floor(s * 1e9) / 1e9;
  return {
    south,
    west,
    cellNorth,
    cellEast,
    cols: Math.ceil((e - west) / cellEast),
    rows: Math.ceil((n - south) / cellNorth),
  };
}

function taskGrid(
  rx: Prescription,
  set: ZoneSetResult,
  zoneValues: IsoValue[][],
  cellM: number,
  fileNo: number,
): IsoGrid {
  const f = taskGridFrame(rx, cellM);
  const zoneOf = rasterizeLonLat(
    set.zones.map((z) => z.lonlat),
    f,
  );
  const per = zoneValues[0]?.length ?? 0;
  const cells = new Int32Array(f.cols * f.rows * per);
  for (let i = 0; i < zoneOf.length; i++) {
    const z = zoneOf[i];
    if (z >= 0) for (let k = 0; k < per; k++) cells[i * per + k] = zoneValues[z][k].value;
  }
  return {
    type: 2,
    ...f,
    fileName: `GRD${String(fileNo).padStart(5, '0')}`,
    zoneCode: 1,
    data: encodeInt32LE(cells),
  };
}

/** Groups of (product, placement) pairs that one task carries. */
function taskGroups(
  set: ZoneSetResult,
  layout: 'per_placement' | 'per_product',
): { name: string; pairs: Pair[] }[] {
  const pairs = usedPairs(set);
  if (layout === 'per_product')
    return pairs.map((p) => ({ name: `${p.label}, ${PLACEMENT_NAME[p.placement]}`, pairs: [p] }));
  const groups = new Map<Placement, Pair[]>();
  for (const p of pairs) groups.set(p.placement, [...(groups.get(p.placement) ?? []), p]);
  return [...groups].map(([pl, ps]) => ({ name: PLACEMENT_NAME[pl], pairs: ps }));
}

function setTasks(
  rx: Prescription,
  set: ZoneSetResult,
  info: Map<string, ProductInfo>,
  opts: Required<TaskDataOptions>,
  firstId: number,
): IsoTask[] {
  if (set.zones.length > MAX_CODE) {
    throw new UserError(
      `zone set ${set.name} has ${set.zones.length} zones; ISO 11783-10 task data holds at most ${MAX_CODE} treatment zones per task. Fix: raise zoning.min_zone_ac or lower zoning.classes, or set output.isoxml_grid: true.`,
      { field: 'output.formats' },
    );
  }
  const field = rx.plan.field || rx.field.name || 'field';
  const suffix = rx.zoneSets.length > 1 ? ` (${set.name} zones)` : '';
  return taskGroups(set, opts.layout).map((g, gi): IsoTask => {
    const zero: IsoZone = {
      code: 0,
      name: 'no product (default, position lost, outside the field)',
      polygons: [],
      values: values(g.pairs, info, () => 0),
    };
    const zoneValues = set.zones.map((z) =>
      values(g.pairs, info, (p) => productRate(z.decision, p.product, p.placement).lbac),
    );
    const zones: IsoZone[] = [zero];
    let grid: IsoGrid | null = null;
    if (opts.grid) {
      zones.push({
        code: 1,
        name: 'rates per grid cell',
        polygons: [],
        values: values(g.pairs, info, () => 0),
      });
      grid = taskGrid(rx, set, zoneValues, opts.gridCellM, firstId + gi);
    } else {
      set.zones.forEach((z, zi) =>
        zones.push({
          code: z.id,
          name: `zone ${z.id}`,
          polygons: zonePolygons(z.lonlat),
          values: zoneValues[zi],
        }),
      );
    }
    return {
      id: `TSK${firstId + gi}`,
      name: `${field}: ${g.name}${suffix}`,
      customerId: 'CTR1',
      farmId: 'FRM1',
      partfieldId: 'PFD1',
      status: 1,
      defaultZone: 0,
      positionLostZone: 0,
      outOfFieldZone: 0,
      zones,
      grid,
    };
  });
}

/**
 * The prescription as task data (plain data; see {@link prescriptionTaskDataFiles} for the bytes).
 * @example prescriptionTaskData(rx, defaultTables()).tasks.map((t) => t.name) // ['Home quarter: seed row', 'Home quarter: side band']
 */
export function prescriptionTaskData(rx: Prescription, tables: Tables, opts: TaskDataOptions = {}): TaskData {
  const o: Required<TaskDataOptions> = {
    layout: opts.layout ?? 'per_placement',
    grid: opts.grid ?? false,
    gridCellM: opts.gridCellM ?? rx.grid.cell / 2,
  };
  const info = products(rx, tables);
  const field = rx.plan.field || rx.field.name || 'field';
  const farm = rx.plan.farm || field;
  const tasks: IsoTask[] = [];
  for (const set of rx.zoneSets) tasks.push(...setTasks(rx, set, info, o, tasks.length + 1));
  return {
    versionMajor: 4,
    versionMinor: 3,
    software: { manufacturer: 'tilth', version: VERSION },
    customers: [{ id: 'CTR1', name: farm }],
    farms: [{ id: 'FRM1', name: farm, customerId: 'CTR1' }],
    partfields: [
      {
        id: 'PFD1',
        name: field,
        areaM2: rx.field.areaM2,
        customerId: 'CTR1',
        farmId: 'FRM1',
        polygons: rx.field.lonlat.map((poly) => ({
          type: 1,
          exterior: flat(poly[0]),
          holes: poly.slice(1).map(flat),
        })),
      },
    ],
    products: [...info.values()].map((p) => ({
      id: p.id,
      name: p.label,
      type: 1,
      densityMgPerL: p.densityKgL === null ? undefined : kgPerLToMgPerL(p.densityKgL),
    })),
    valuePresentations: presentations(rx.plan.units),
    tasks,
  };
}

/**
 * The files of a TASKDATA folder for the prescription: `TASKDATA.XML` and any `GRDnnnnn.bin`.
 * @example Object.keys(prescriptionTaskDataFiles(rx, tables)) // ['TASKDATA.XML']
 */
export function prescriptionTaskDataFiles(
  rx: Prescription,
  tables: Tables,
  opts: TaskDataOptions = {},
): Record<string, Uint8Array> {
  return taskDataFiles(prescriptionTaskData(rx, tables, opts));
}
