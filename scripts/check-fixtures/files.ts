/**
 * The fixtures of `tilth check` that are files other than GeoJSON: shapefile sets (the `setfiles` check and the
 * readers around it) and ISO 11783-10 task data (`taskdata`), each made from the invented field (./field.ts).
 */
import type { Feature } from 'geojson';
import { writeShapefile, type ColumnSpec } from '../../src/io/shapefile/index.js';
import { taskDataXml, type IsoTask, type IsoZone, type TaskData } from '../../src/io/isoxml/index.js';
import { sample } from '../../tests/helpers/taskdata.js';
import { rect, zones, fc, ll, type Z } from './field.js';

const COLS: ColumnSpec[] = [
  { key: 'zone_id', type: 'N', width: 4 },
  { key: 'urea_lbac', type: 'N', width: 8, decimals: 1 },
  { key: 'map_lbac', type: 'N', width: 8, decimals: 1 },
];

/** The .dbf header's date, fixed so that the fixtures are written byte for byte again. */
const DATE = new Date(Date.UTC(2026, 0, 15));

/** A shapefile set's files by name. */
type FileSet = Record<string, Uint8Array>;

/** Big-endian int32 written at `at` into a copy of `b`. */
function withInt32BE(b: Uint8Array, at: number, v: number): Uint8Array {
  const c = b.slice();
  new DataView(c.buffer).setInt32(at, v, false);
  return c;
}

/**
 * Shapefile sets, one per case: `pass` as tilth writes it; each `refused-*` damages one part the way a copy, an
 * edit or an export gone wrong does.
 */
export function shapefileCases(): Record<string, FileSet> {
  const feats = fc(zones()).features as unknown as Feature[];
  // the set's own parts (the column list writeShapefile adds beside them is for people)
  const set = (fs: Feature[]) =>
    Object.fromEntries(
      Object.entries(writeShapefile(fs, COLS, { name: 'rx', date: DATE })).filter(([k]) =>
        /\.(shp|shx|dbf|prj|cpg)$/.test(k),
      ),
    );
  const good = set(feats);
  const noDbf = { ...good };
  delete noDbf['rx.dbf'];
  const shx = good['rx.shx'];
  const dbf = good['rx.dbf'].slice();
  // first record's urea_lbac (after the deletion flag and the 4-byte zone_id): letters where a number belongs
  const headerLen = new DataView(dbf.buffer).getUint16(8, true);
  dbf.set(new TextEncoder().encode('  110 lb'), headerLen + 1 + 4);
  return {
    pass: good,
    'refused-missing-dbf': noDbf,
    'refused-dbf-count': { ...good, 'rx.dbf': set(feats.slice(0, 3))['rx.dbf'] },
    // the .shx's second entry points 8 bytes (4 words) past the record it indexes
    'refused-shx-offset': {
      ...good,
      'rx.shx': withInt32BE(shx, 108, new DataView(shx.buffer).getInt32(108, false) + 4),
    },
    'refused-dbf-not-number': { ...good, 'rx.dbf': dbf },
  };
}

const flat = (ring: number[][]) => Float64Array.from(ring.flatMap(ll));

/** Treatment zone 0 (outside the field, rate 0), then one per field zone: DDI `ddi`, its urea rate as mg/m2 (1 lb/ac = 112.085 mg/m2). */
function isoZones(zs: Z[], ddi: number): IsoZone[] {
  const value = (v: number) => ({ ddi, value: v, productId: 'PDT1', valuePresentationId: null });
  return [
    { code: 0, name: 'outside', polygons: [], values: [value(0)] },
    ...zs.map((z) => ({
      code: z.id,
      name: `zone ${z.id}`,
      polygons: z.polys.map((p) => ({ type: 2, exterior: flat(p[0]), holes: p.slice(1).map(flat) })),
      values: [value(Math.round(Number(z.urea) * 112.085))],
    })),
  ];
}

/** A task data set around `tasks` (the test set's customer and farm), the product urea. */
const taskData = (tasks: IsoTask[]): TaskData => ({
  ...sample(),
  products: [{ id: 'PDT1', name: 'urea 46-0-0', type: 1 }],
  tasks,
});

/** A polygon task; zone 0 is the out-of-field zone when there are zones. */
const task = (zs: IsoZone[]): IsoTask => ({
  id: 'TSK1',
  name: 'Coulee Bend West urea',
  status: 1,
  outOfFieldZone: zs.length ? 0 : undefined,
  zones: zs,
  grid: null,
});

/**
 * TASKDATA.XML per case: `pass` the field as polygon treatment zones (DDI 6, setpoint mass per area); the others
 * as task data goes wrong: overlapping zones, a DDI tilth does not read, no task with a rate.
 */
export function taskDataCases(): Record<string, string> {
  return {
    pass: taskDataXml(taskData([task(isoZones(zones(), 6))])),
    'fail-overlapping-zones': taskDataXml(
      taskData([task(isoZones(zones({ 3: [[rect(400, 250, 800, 600)]] }), 6))]),
    ),
    // DDI 16 (0x0010) is not one of the two rate DDIs tilth reads (1 volume, 6 mass per area)
    'refused-unread-ddi': taskDataXml(taskData([task(isoZones(zones(), 16))])),
    'refused-no-rate': taskDataXml(taskData([task([])])),
  };
}
