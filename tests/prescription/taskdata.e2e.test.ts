/**
 * Task data written by tilth, read back by outside readers: the `isoxml` npm package (ISO 11783-10
 * entities, grids) and xmllint (libxml2, well-formedness). Areas by GeographicLib (Karney 2013).
 */
import { readFileSync, mkdtempSync, writeFileSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { ISOXMLManager } from 'isoxml';
import geodesic from 'geographiclib-geodesic';
import { parse as parseYaml, stringify } from 'yaml';
import {
  buildPrescription,
  productRate,
  usedPairs,
  type Prescription,
} from '../../src/prescription/index.js';
import { prescriptionGeojson, rateColumn } from '../../src/prescription/outputs.js';
import { prescriptionTaskDataFiles } from '../../src/prescription/taskdata.js';
import { parsePlan, defaultTables } from '../../src/agronomy/index.js';
import { fieldInputs, quarterFile } from '../helpers/inputs.js';
import { projector } from '../../src/geo/utm.js';
import { labelPoint } from '../../src/report/maps.js';
import { zipFiles } from '../../src/io/zip.js';
import { lbacToKgha } from '../../src/units/index.js';
import { readTaskData, taskDataFiles } from '../../src/io/isoxml/index.js';
import { layersFromTaskData } from '../../src/check/taskdata.js';
import { checkPrescription, layerFromGeoJSON } from '../../src/check/index.js';
import { ROOT } from '../helpers/cli.js';
import { requireTool } from '../helpers/tools.js';

const tables = defaultTables();
const src = quarterFile;
const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');
const plan = (edit: (p: Record<string, any>) => void = () => {}) => {
  const p = parseYaml(PLAN);
  edit(p);
  return parsePlan(stringify(p), 'plan.yaml', tables);
};
const inputs = await fieldInputs(src('samples.csv'), src('boundary.geojson'));

/** Parses a TASKDATA folder (as a zip, the way isoxml reads grid files) with the isoxml library. */
async function outside(files: Record<string, Uint8Array>): Promise<ISOXMLManager> {
  const m = new ISOXMLManager();
  const zip = zipFiles(Object.fromEntries(Object.entries(files).map(([n, b]) => [`TASKDATA/${n}`, b])));
  await m.parseISOXMLFile(zip, 'application/zip');
  return m;
}

/** Geodesic area on WGS 84 (GeographicLib) of one ring of [lon, lat] points. */
function ringArea(ring: number[][]): number {
  const p = geodesic.Geodesic.WGS84.Polygon(false);
  for (const [lon, lat] of ring.slice(0, -1)) p.AddPoint(lat, lon);
  return Math.abs(p.Compute(false, true).area!);
}
const polyArea = (poly: number[][][]) =>
  ringArea(poly[0]) - poly.slice(1).reduce((s, r) => s + ringArea(r), 0);

const A = (e: any) => e.attributes;
const pnts = (lsg: any): number[][] => A(lsg).Point.map((p: any) => [A(p).PointEast, A(p).PointNorth]);
/** PDV value -> the plan's unit (lb/ac) via the DDI: DDI 6 mg/m2 = kg/ha x 100 (ISO 11783-11), 1 lb/ac = 1.12085 kg/ha. */
const ddi6ToLbac = (v: number) => v / 100 / lbacToKgha(1);

/** The demo quarter's prescription (10 m cells), shared by the polygon and grid tests. */
let base: Prescription;
beforeAll(() => {
  base = buildPrescription(inputs, plan(), tables, { cell: 10 });
});

describe('task data with zone polygons, read by the isoxml package', () => {
  let rx: Prescription, files: Record<string, Uint8Array>, m: ISOXMLManager;
  beforeAll(async () => {
    rx = base;
    files = prescriptionTaskDataFiles(rx, tables);
    m = await outside(files);
  }, 120_000);

  it('parses without a warning; products, tasks and zones as written', () => {
    expect(m.getWarnings()).toEqual([]);
    const root = A(m.rootElement);
    expect(root.VersionMajor).toBe('4');
    const set = rx.zoneSets[0];
    const pairs = usedPairs(set);
    expect(root.Product.length).toBe(new Set(pairs.map((p) => p.product)).size);
    expect(root.Task.length).toBe(new Set(pairs.map((p) => p.placement)).size);
    for (const t of root.Task) {
      expect(A(t).TreatmentZone.length).toBe(set.zones.length + 1);
      // default, position-lost and out-of-field zone: code 0, a zero rate for every product
      expect([
        A(t).DefaultTreatmentZoneCode,
        A(t).PositionLostTreatmentZoneCode,
        A(t).OutOfFieldTreatmentZoneCode,
      ]).toEqual([0, 0, 0]);
      const zero = A(t).TreatmentZone.find((z: any) => A(z).TreatmentZoneCode === 0);
      expect(A(zero).ProcessDataVariable.every((v: any) => A(v).ProcessDataValue === 0)).toBe(true);
    }
    expect(A(root.Partfield[0]).PartfieldDesignator).toBe('Home quarter');
    expect(A(root.Farm[0]).FarmDesignator).toBe('Willowbrae Farms');
  });

  it("each zone's rate (DDI 6 -> lb/ac) equals prescription.geojson's within the DDI's resolution", () => {
    const set = rx.zoneSets[0];
    const fc = JSON.parse(prescriptionGeojson(rx, set));
    const root = A(m.rootElement);
    const placementOf: Record<string, string> = { 'seed row': 'seed_row', 'side band': 'side_band' };
    let compared = 0;
    for (const t of root.Task) {
      const placement = placementOf[A(t).TaskDesignator.split(': ')[1]];
      for (const z of A(t).TreatmentZone) {
        const code = A(z).TreatmentZoneCode;
        if (code === 0) continue;
        const f = fc.features.find((x: any) => x.properties.zone_id === code);
        for (const v of A(z).ProcessDataVariable) {
          expect(A(v).ProcessDataDDI).toBe('0006');
          const product = Object.entries(tables.products).find(
            ([, p]) => p.label === A(A(v).ProductIdRef.entity).ProductDesignator,
          )![0];
          const want = f.properties[rateColumn(product, placement as any, 'lb/ac')];
          // resolution 1 mg/m2: half of it in lb/ac
          expect(Math.abs(ddi6ToLbac(A(v).ProcessDataValue) - want)).toBeLessThanOrEqual(
            0.5 / 100 / lbacToKgha(1) + 1e-9,
          );
          compared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(set.zones.length);
  });

  it('zone polygons rebuilt from the parsed file match prescription.geojson (area 0.01 %, same holes)', () => {
    const fc = JSON.parse(prescriptionGeojson(rx, rx.zoneSets[0]));
    for (const t of A(m.rootElement).Task)
      for (const z of A(t).TreatmentZone) {
        const code = A(z).TreatmentZoneCode;
        if (code === 0) continue;
        const polys = (A(z).PolygonTreatmentZoneonly ?? []).map((pln: any) => {
          expect(A(pln).PolygonType).toBe('2');
          const lsg = A(pln).LineString;
          return [
            pnts(lsg.find((l: any) => A(l).LineStringType === '1')),
            ...lsg.filter((l: any) => A(l).LineStringType === '2').map(pnts),
          ];
        });
        const g = fc.features.find((x: any) => x.properties.zone_id === code).geometry;
        const want: number[][][][] = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
        expect(polys.map((p: number[][][]) => p.length - 1)).toEqual(want.map((p) => p.length - 1));
        const a = polys.reduce((s: number, p: number[][][]) => s + polyArea(p), 0),
          b = want.reduce((s, p) => s + polyArea(p), 0);
        // prescription.geojson rounds to 7 decimals (RFC 7946 advice, about 1 cm), which alone moves a small zone's
        // area by up to its perimeter x 0.56 cm (half of 1e-7 degree of latitude); the task data keeps 9 decimals
        const perimeter = want
          .flat()
          .reduce(
            (s, r) =>
              s +
              r
                .slice(1)
                .reduce(
                  (t, q, i) => t + Math.hypot((q[0] - r[i][0]) * 68_000, (q[1] - r[i][1]) * 111_300),
                  0,
                ),
            0,
          );
        expect(Math.abs(a - b)).toBeLessThan(Math.max(1e-4 * b, perimeter * 0.0056));
        // against the prescription's own (unrounded) zone, the 0.01 % holds outright
        const exact = rx.zoneSets[0].zones
          .find((x) => x.id === code)!
          .lonlat.reduce((s, p) => s + polyArea(p), 0);
        expect(Math.abs(a - exact) / exact).toBeLessThan(1e-4);
      }
  });

  it('the partfield boundary keeps its hole', () => {
    const pfd = A(m.rootElement).Partfield[0];
    const plns = A(pfd).PolygonnonTreatmentZoneonly ?? A(pfd).Polygon;
    expect(plns.length).toBe(rx.field.lonlat.length);
    expect(A(plns[0]).LineString.filter((l: any) => A(l).LineStringType === '2').length).toBe(
      rx.field.lonlat[0].length - 1,
    );
  });

  it.skipIf(!requireTool('xmllint', 'libxml2-utils'))(
    'xmllint --noout finds TASKDATA.XML well formed (libxml2)',
    () => {
      const d = mkdtempSync(join(tmpdir(), 'tilth-isoxml-'));
      writeFileSync(join(d, 'TASKDATA.XML'), files['TASKDATA.XML']);
      const r = spawnSync('xmllint', ['--noout', join(d, 'TASKDATA.XML')], { encoding: 'utf8' });
      expect(r.stderr).toBe('');
      expect(r.status).toBe(0);
    },
  );
});

describe('task data as a type-2 grid, read by the isoxml package', () => {
  let rx: Prescription, files: Record<string, Uint8Array>;
  beforeAll(() => {
    rx = base;
    files = prescriptionTaskDataFiles(rx, tables, { grid: true });
  }, 120_000);

  it('passes tilth check with the boundary (the staircase along the edge is under one cell wide); a grid cut short leaves a gap', () => {
    const boundary = layerFromGeoJSON(
      readFileSync(join(ROOT, 'sample-fields/quarter/boundary.geojson'), 'utf8'),
      'boundary.geojson',
    );
    const layers = layersFromTaskData(readTaskData(files), 'TASKDATA.XML');
    expect(layers.length).toBeGreaterThan(2);
    for (const l of layers) {
      const r = checkPrescription(l, { boundary, speedKmh: 8 });
      expect(r.lines.filter((x) => x.status === 'fail')).toEqual([]);
    }
    const td = readTaskData(files);
    const g = td.tasks[0].grid!;
    const per = td.tasks[0].zones.find((z) => z.code === g.zoneCode)!.values.length;
    g.rows = Math.floor(g.rows / 2);
    g.data = g.data.slice(0, g.rows * g.cols * per * 4);
    const cut = layersFromTaskData(readTaskData(taskDataFiles(td)), 'TASKDATA.XML')[0];
    expect(checkPrescription(cut, { boundary }).lines.find((x) => x.check === 'gaps')!.status).toBe('fail');
  }, 120_000);

  it("decodes to each zone's rate at the zone's label point", async () => {
    const m = await outside(files);
    expect(m.getWarnings()).toEqual([]);
    const set = rx.zoneSets[0];
    const proj = projector(rx.field.utm);
    for (const t of A(m.rootElement).Task) {
      const grd = A(t).Grid[0];
      const g = A(grd);
      expect(g.GridType).toBe('2');
      const tzn = A(t).TreatmentZone.find((z: any) => A(z).TreatmentZoneCode === g.TreatmentZoneCode);
      const pdvs = A(tzn).ProcessDataVariable;
      const cells = new Int32Array(
        grd.binaryData.buffer,
        grd.binaryData.byteOffset,
        grd.binaryData.byteLength / 4,
      );
      const placement = A(t).TaskDesignator.includes('seed row') ? 'seed_row' : 'side_band';
      for (const z of set.zones) {
        const big = z.parts.reduce((a, b) => (b.exterior.length > a.exterior.length ? b : a));
        const [x, y] = labelPoint(big);
        const [lon, lat] = proj.inverse([x, y]);
        const c = Math.floor((lon - g.GridMinimumEastPosition) / g.GridCellEastSize),
          r = Math.floor((lat - g.GridMinimumNorthPosition) / g.GridCellNorthSize);
        pdvs.forEach((v: any, k: number) => {
          const product = Object.entries(tables.products).find(
            ([, p]) => p.label === A(A(v).ProductIdRef.entity).ProductDesignator,
          )![0];
          const want = productRate(z.decision, product, placement).lbac;
          // rows run south to north: row r from the south is at index r * cols
          expect(
            Math.abs(ddi6ToLbac(cells[(r * g.GridMaximumColumn + c) * pdvs.length + k]) - want),
          ).toBeLessThanOrEqual(0.5 / 100 / lbacToKgha(1) + 1e-9);
        });
      }
    }
  }, 120_000);
});

describe('task layouts', () => {
  it('per_product: one task per product and placement; per-product zone sets: tasks per set, ids unique', async () => {
    const rx = buildPrescription(
      inputs,
      plan((p) => {
        p.zoning.zone_sets = 'per_product';
      }),
      tables,
      { cell: 10 },
    );
    const m = await outside(prescriptionTaskDataFiles(rx, tables, { layout: 'per_product' }));
    expect(m.getWarnings()).toEqual([]);
    const tasks = A(m.rootElement).Task;
    expect(tasks.length).toBe(rx.zoneSets.reduce((s, set) => s + usedPairs(set).length, 0));
    for (const t of tasks) {
      const set = rx.zoneSets.find((x) => A(t).TaskDesignator.endsWith(`(${x.name} zones)`))!;
      expect(A(t).TreatmentZone.length).toBe(set.zones.length + 1);
      expect(A(t).TreatmentZone.every((z: any) => A(z).ProcessDataVariable.length === 1)).toBe(true);
    }
    // every TSK, TZN code within a task and PDT is unique (the reader warns on a repeated id)
    expect(new Set(tasks.map((t: any) => m.getReferenceByEntity(t).xmlId)).size).toBe(tasks.length);
  }, 120_000);
});

describe('names and liquids', () => {
  it('names from the plan are escaped and read back exactly; a liquid is written as DDI 1 through its density', async () => {
    const name = `Smith & "Sons" <North> 'A'`;
    const pl = plan((p) => {
      p.farm = name;
      p.field = 'Field <7> & co';
      p.strategy.s.method = 'none';
      p.strategy.k.method = 'none';
      p.products = [
        { product: 'map', placements: ['seed_row', 'side_band'], max_rate: 200, step: 1 },
        { product: 'uan', placements: ['side_band'], max_rate: 600, step: 1 },
      ];
    });
    const rx = buildPrescription(inputs, pl, tables, { cell: 10 });
    const files = prescriptionTaskDataFiles(rx, tables);
    const m = await outside(files);
    expect(m.getWarnings()).toEqual([]);
    const root = A(m.rootElement);
    expect(A(root.Customer[0]).CustomerLastName).toBe(name);
    expect(A(root.Partfield[0]).PartfieldDesignator).toBe('Field <7> & co');
    const uan = root.Product.find((p: any) => A(p).ProductDesignator === 'UAN 28-0-0');
    expect(A(uan).DensityMassPerVolume).toBe(1_280_000); // mg/L
    const band = root.Task.find((t: any) => A(t).TaskDesignator.endsWith('side band'));
    const set = rx.zoneSets[0];
    for (const z of A(band).TreatmentZone) {
      const code = A(z).TreatmentZoneCode;
      if (code === 0) continue;
      const v = A(z).ProcessDataVariable.find(
        (x: any) => A(x).ProductIdRef.xmlId === A(uan).ProductId || A(x).ProductIdRef.entity === uan,
      );
      expect(A(v).ProcessDataDDI).toBe('0001');
      // DDI 1 mm3/m2 = L/ha x 100 (ISO 11783-11); L/ha = kg/ha / 1.28 kg/L
      const lbac = productRate(set.zones.find((x) => x.id === code)!.decision, 'uan', 'side_band').lbac;
      expect(Math.abs(A(v).ProcessDataValue - (lbacToKgha(lbac) / 1.28) * 100)).toBeLessThanOrEqual(0.5);
    }
    // tilth check reads it back in L/ha (DDI 1: mm3/m2 / 100)
    const layer = layersFromTaskData(readTaskData(files), 'TASKDATA.XML').find(
      (l) => l.label.includes('side band') && l.label.includes('UAN'),
    )!;
    expect(layer.fields.map((f) => f.name)).toEqual(['zone_id', 'rate_lha']);
    for (const f of layer.features) {
      const lbac = productRate(
        set.zones.find((x) => x.id === f.properties!.zone_id)!.decision,
        'uan',
        'side_band',
      ).lbac;
      expect(Math.abs(f.properties!.rate_lha - lbacToKgha(lbac) / 1.28)).toBeLessThanOrEqual(0.005 + 1e-9);
    }
  }, 120_000);
});
