/**
 * ISO 11783-10 task data as layers for `tilth check`: one layer per task and product, zones with their
 * setpoint rate in the DDI's unit (DDI 6 mass per area -> kg/ha, DDI 1 volume per area -> L/ha).
 * Polygon zones come as they are; a grid becomes one polygon per run of equal values (traced along cell
 * edges), cells with no product at all being left out unless their centre lies in the task's field. Pure: file bytes in, layers out.
 */
import type { Feature, MultiPolygon } from 'geojson';
import { UserError } from '../errors.js';
import {
  readTaskData,
  decodeInt32LE,
  RATE_DDIS,
  ddiHex,
  type IsoGrid,
  type IsoPartfield,
  type IsoTask,
  type IsoZone,
  type TaskData,
} from '../io/isoxml/index.js';
import { rasterizeLonLat } from '../geo/rasterize.js';
import { readZip, TASKDATA_ZIP_LIMITS } from '../io/zip.js';
import { traceZones } from '../zones/trace.js';
import { mgm2ToKgha, mm3m2ToLha } from '../units/index.js';
import type { CheckLayer } from './layer.js';

const CRS = {
  kind: 'lonlat',
  datum: 'WGS84',
  epsg: 4326,
  label: 'WGS 84 longitude/latitude (ISO 11783-10 task data)',
} as const;

/** Column name and converter for a rate DDI; unknown DDIs are refused naming the element. */
function rateOf(
  ddi: number,
  label: string,
  where: string,
): { column: string; convert: (v: number) => number } {
  if (ddi === 6) return { column: 'rate_kgha', convert: mgm2ToKgha };
  if (ddi === 1) return { column: 'rate_lha', convert: mm3m2ToLha };
  const known = Object.entries(RATE_DDIS)
    .map(([d, r]) => `DDI ${d} (${r.name}, ${r.unit})`)
    .join(' and ');
  throw new UserError(
    `${label}: ${where}: process data DDI ${ddiHex(ddi)} (${ddi}) is not a setpoint rate tilth can check; it reads ${known}. Fix: export the prescription with setpoint mass or volume per area rates.`,
    { file: label, where, value: ddi },
  );
}

const ringCoords = (r: Float64Array): number[][] => {
  const out: number[][] = [];
  for (let i = 0; i + 1 < r.length; i += 2) out.push([r[i], r[i + 1]]);
  return out;
};

function zoneFeatures(
  t: IsoTask,
  productId: string,
  label: string,
  where: string,
): { features: Feature[]; column: string } {
  let column = '';
  const features: Feature[] = [];
  for (const z of t.zones) {
    const v = z.values.find((x) => x.productId === productId);
    if (!v || z.polygons.length === 0) continue;
    const r = rateOf(v.ddi, label, `${where} > TZN code ${z.code}`);
    column ||= r.column;
    const geometry: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: z.polygons.map((p) => [ringCoords(p.exterior), ...p.holes.map(ringCoords)]),
    };
    features.push({
      type: 'Feature',
      properties: { zone_id: z.code, [r.column]: r.convert(v.value) },
      geometry,
    });
  }
  return { features, column };
}

/**
 * Per cell: the product's value, or NaN for a cell that is no zone: one with no product at all whose centre
 * lies outside the task's field (`inField`; without a field boundary, every cell with no product).
 */
function gridValues(
  g: IsoGrid,
  zones: IsoZone[],
  productId: string,
  inField: Int32Array | null,
  label: string,
  where: string,
): { values: Float64Array; column: string } {
  const n = g.cols * g.rows;
  const values = new Float64Array(n).fill(NaN);
  if (g.type === 2) {
    const z = zones.find((x) => x.code === g.zoneCode)!;
    const k = z.values.findIndex((x) => x.productId === productId);
    const r = rateOf(z.values[k].ddi, label, `${where} > TZN code ${z.code}`);
    const per = z.values.length,
      cells = decodeInt32LE(g.data);
    for (let i = 0; i < n; i++) {
      let any = inField !== null && inField[i] >= 0;
      for (let j = 0; j < per && !any; j++) any = cells[i * per + j] !== 0;
      if (any) values[i] = r.convert(cells[i * per + k]);
    }
    return { values, column: r.column };
  }
  let column = '';
  const byCode = new Map<number, number>();
  for (const z of zones) {
    const v = z.values.find((x) => x.productId === productId);
    if (!v) continue;
    const r = rateOf(v.ddi, label, `${where} > TZN code ${z.code}`);
    column ||= r.column;
    byCode.set(z.code, z.values.some((x) => x.value !== 0) ? r.convert(v.value) : NaN);
  }
  for (let i = 0; i < n; i++) {
    const v = byCode.get(g.data[i]) ?? NaN;
    values[i] = Number.isNaN(v) && inField !== null && inField[i] >= 0 ? 0 : v;
  }
  return { values, column: column || 'rate_kgha' };
}

/** A grid's runs of equal values as zones: traced along cell edges (rows flipped to north-up). */
function gridFeatures(
  g: IsoGrid,
  zones: IsoZone[],
  productId: string,
  field: IsoPartfield | undefined,
  label: string,
  where: string,
): { features: Feature[]; column: string } {
  const inField = field?.polygons.length
    ? rasterizeLonLat([field.polygons.map((p) => [ringCoords(p.exterior), ...p.holes.map(ringCoords)])], g)
    : null;
  const { values, column } = gridValues(g, zones, productId, inField, label, where);
  const ids = new Map<number, number>();
  const lab = new Int32Array(g.cols * g.rows).fill(-1);
  for (let r = 0; r < g.rows; r++)
    for (let c = 0; c < g.cols; c++) {
      const v = values[r * g.cols + c];
      if (Number.isNaN(v)) continue;
      if (!ids.has(v)) ids.set(v, ids.size);
      lab[(g.rows - 1 - r) * g.cols + c] = ids.get(v)!;
    }
  const parts = traceZones(lab, ids.size, { xmin: 0, ymax: g.rows, cell: 1, cols: g.cols, rows: g.rows });
  const toLonLat = (ring: Float64Array) => {
    const out: number[][] = [];
    for (let i = 0; i + 1 < ring.length; i += 2)
      out.push([g.west + ring[i] * g.cellEast, g.south + ring[i + 1] * g.cellNorth]);
    if (out.length && (out[0][0] !== out[out.length - 1][0] || out[0][1] !== out[out.length - 1][1]))
      out.push(out[0]);
    return out;
  };
  const features: Feature[] = [...ids].map(([v, id]) => ({
    type: 'Feature',
    properties: { zone_id: id + 1, [column]: v },
    geometry: {
      type: 'MultiPolygon',
      coordinates: parts[id].map((p) => [toLonLat(p.exterior), ...p.holes.map(toLonLat)]),
    },
  }));
  return { features, column };
}

/**
 * Layers of a task data set: one per task and product it sets a rate for.
 * @param td a read task data set (src/io/isoxml readTaskData)
 * @param label file name for messages and layer names
 * @example layersFromTaskData(readTaskData(files), 'TASKDATA.XML').map((l) => l.label)
 */
export function layersFromTaskData(td: TaskData, label: string): CheckLayer[] {
  const layers: CheckLayer[] = [];
  for (const t of td.tasks) {
    const where = `TSK ${t.id}`;
    const pids = [...new Set(t.zones.flatMap((z) => z.values.map((v) => v.productId ?? '')))];
    for (const pid of pids) {
      const pname = td.products.find((p) => p.id === pid)?.name ?? (pid || 'no product named');
      const { features, column } = t.grid
        ? gridFeatures(
            t.grid,
            t.zones,
            pid,
            td.partfields.find((p) => p.id === t.partfieldId),
            label,
            where,
          )
        : zoneFeatures(t, pid, label, where);
      layers.push({
        label: `${label} task ${t.id} "${t.name}", product ${pid || '-'} "${pname}"`,
        features,
        fields: [
          { name: 'zone_id', numeric: true },
          { name: column || 'rate_kgha', numeric: true },
        ],
        crs: { ...CRS },
        crsSource: 'geojson',
        resolutionM: t.grid ? cellMetres(t.grid) : undefined,
      });
    }
  }
  if (layers.length === 0)
    throw new UserError(
      `${label}: holds no task with a rate (no TSK with TZN and PDV). Fix: export the prescription as a task with treatment zones.`,
      { file: label },
    );
  return layers;
}

/** A grid cell's shorter side in metres (a sphere of 6371 km is close enough for a tolerance). */
function cellMetres(g: IsoGrid): number {
  const m = (6_371_000 * Math.PI) / 180;
  return Math.min(
    g.cellNorth * m,
    g.cellEast * m * Math.cos(((g.south + (g.rows * g.cellNorth) / 2) * Math.PI) / 180),
  );
}

/** True when `name` (a path or zip entry) is a TASKDATA.XML. */
export const isTaskDataXml = (name: string): boolean => /(^|[/\\])taskdata\.xml$/i.test(name);

/**
 * Layers from files: `files` holds TASKDATA.XML and its grid files by name, or one zip holding a TASKDATA
 * folder (any depth); `main` names the TASKDATA.XML or the zip.
 * @example layersFromTaskDataFiles({ 'taskdata.zip': bytes }, 'taskdata.zip')
 */
export function layersFromTaskDataFiles(files: Record<string, Uint8Array>, main: string): CheckLayer[] {
  if (/\.zip$/i.test(main)) {
    const entries = readZip(files[main], main, TASKDATA_ZIP_LIMITS);
    const xmls = Object.keys(entries).filter(isTaskDataXml);
    if (xmls.length !== 1)
      throw new UserError(
        `${main}: holds ${xmls.length} TASKDATA.XML files; tilth checks one task data set at a time. Fix: zip one TASKDATA folder.`,
        { file: main },
      );
    const dir = xmls[0].slice(0, xmls[0].length - 'TASKDATA.XML'.length);
    const inDir: Record<string, Uint8Array> = {};
    for (const [k, v] of Object.entries(entries))
      if (k.startsWith(dir) && !k.slice(dir.length).includes('/')) inDir[k.slice(dir.length)] = v;
    return layersFromTaskData(readTaskData(inDir, `${main}:${xmls[0]}`), `${main}:${xmls[0]}`);
  }
  return layersFromTaskData(readTaskData(files, main), main);
}
