import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { booleanValid, area as turfArea, booleanPointInPolygon, point } from '@turf/turf';
import { parse as parseYaml, stringify } from 'yaml';
import { buildPrescription } from '../../src/prescription/index.js';
import { prescriptionGeojson, zonesCsv } from '../../src/prescription/outputs.js';
import { parsePlan, defaultTables } from '../../src/agronomy/index.js';
import { fieldInputs } from '../helpers/inputs.js';
import { M2_PER_AC } from '../../src/units/index.js';
import { ROOT } from '../helpers/cli.js';

const src = (dir: string, f: string) => ({
  name: f,
  bytes: readFileSync(join(ROOT, 'sample-fields', dir, f)),
});
const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');
const withPlan = (edit: (p: Record<string, any>) => void) => {
  const p = parseYaml(PLAN);
  edit(p);
  return stringify(p);
};

const inputs = await fieldInputs(src('quarter', 'samples.csv'), src('quarter', 'boundary.geojson'));

describe('buildPrescription on the demo quarter', () => {
  const tables = defaultTables();
  for (const sets of ['shared', 'per_product'] as const) {
    it(`${sets} zone sets: zones cover the field once, every sample in exactly one zone`, async () => {
      const plan = parsePlan(
        withPlan((p) => {
          p.zoning.zone_sets = sets;
        }),
        'plan.yaml',
        tables,
      );
      const rx = buildPrescription(inputs, plan, tables, { cell: 5 });
      expect(rx.zoneSets.length).toBe(
        sets === 'shared' ? 1 : new Set(plan.products.map((p) => p.product)).size,
      );
      for (const set of rx.zoneSets) {
        // zone areas add up to the field (0.01 %): the zones neither overlap nor leave gaps
        const sum = set.zones.reduce((s, z) => s + z.areaM2, 0);
        expect(Math.abs(sum - rx.field.areaM2) / rx.field.areaM2).toBeLessThan(1e-4);
        const fc = JSON.parse(prescriptionGeojson(rx, set));
        expect(fc.features.length).toBe(set.zones.length);
        // independent check: turf booleanValid, and the geodesic area of the written zones (turf, spherical) adds up
        // to turf's area of the boundary within 0.01 %
        let turfSum = 0;
        for (const f of fc.features) {
          expect(booleanValid(f)).toBe(true);
          turfSum += turfArea(f);
        }
        const boundary = JSON.parse(
          readFileSync(join(ROOT, 'sample-fields/quarter/boundary.geojson'), 'utf8'),
        );
        expect(Math.abs(turfSum - turfArea(boundary)) / turfArea(boundary)).toBeLessThan(1e-4);
        // every sample inside the field lies in exactly one zone (turf point-in-polygon)
        for (let i = 0; i < inputs.samples.ids.length; i++) {
          const pt = point([inputs.samples.lonlat[2 * i], inputs.samples.lonlat[2 * i + 1]]);
          const hits = fc.features.filter((f: any) =>
            booleanPointInPolygon(pt, f, { ignoreBoundary: true }),
          ).length;
          expect(hits).toBe(1);
        }
        // no zone puts more urea-type N (MAP's N sits within the P2O5-as-MAP limit), or P2O5 + K2O, in the seed row than the limits allow
        for (const z of set.zones) {
          const d = z.decision;
          expect(d.seedRow.applied.nCounted).toBeLessThanOrEqual(d.seedRow.n + 1e-6);
          expect(d.seedRow.applied.p2o5 + d.seedRow.applied.k2o).toBeLessThanOrEqual(
            d.seedRow.p2o5K2o + 1e-6,
          );
        }
      }
      // totals: sum over zones of rate x area (arithmetic check of the ordering totals)
      for (const t of rx.totals) {
        const set = rx.zoneSets.find((s) => s.name === t.zoneSet)!;
        let lb = 0;
        for (const z of set.zones)
          for (const p of z.decision.placements)
            if (p.placement === t.placement)
              for (const q of p.products)
                if (q.product === t.product) lb += (q.rate.lbac * z.areaM2) / M2_PER_AC;
        expect(t.totalLb).toBeCloseTo(lb, 6);
      }
      const csv = zonesCsv(rx).trim().split('\n');
      expect(csv.length).toBe(1 + rx.zoneSets.reduce((s, z) => s + z.zones.length, 0));
    });
  }

  it('zone-composite field: the zones are the sampled polygons', async () => {
    const zin = await fieldInputs(
      src('zoned', 'samples.geojson'),
      src('zoned', 'boundary.geojson'),
      src('zoned', 'zones.geojson'),
    );
    const plan = parsePlan(PLAN, 'plan.yaml', tables);
    const rx = buildPrescription(zin, plan, tables);
    expect(rx.sampled).toBe(true);
    expect(rx.zoneSets[0].zones.length).toBe(zin.zones!.keys.length);
    const sum = rx.zoneSets[0].zones.reduce((s, z) => s + z.areaM2, 0);
    expect(sum).toBeLessThanOrEqual(rx.field.areaM2 * (1 + 1e-6));
  });
});

describe('report rasters of very fine grids are shown coarser', () => {
  it('coarsen keeps the value at each coarse cell centre (nearest), factor 1 is the identity', async () => {
    const { coarsen } = await import('../../src/prescription/reportMaps.js');
    const g = { xmin: 100, ymax: 500, cell: 1, cols: 7, rows: 5 };
    const v = Float64Array.from({ length: 35 }, (_, i) => i);
    expect(coarsen(g, 1).pick(v)).toBe(v);
    const c = coarsen(g, 3);
    expect(c.grid).toEqual({ xmin: 100, ymax: 500, cell: 3, cols: 3, rows: 2 });
    // coarse cell (r, c) covers fine rows 3r..3r+2, cols 3c..3c+2; its centre is fine cell (3r+1, 3c+1), clamped
    expect(Array.from(c.pick(v))).toEqual([1 * 7 + 1, 1 * 7 + 4, 1 * 7 + 6, 4 * 7 + 1, 4 * 7 + 4, 4 * 7 + 6]);
  });
});

describe('mergeCloseClasses', () => {
  it('merges neighbouring classes closer than the share of the mean (hand-worked)', async () => {
    const { mergeCloseClasses } = await import('../../src/prescription/index.js');
    // four classes of equal weight with means 100, 103, 120, 150: overall mean 118.25, 5 % = 5.9
    // 100 and 103 merge (3 < 5.9); 120 - 101.5 = 18.5 and 150 - 120 = 30 stay apart
    const c = {
      classOf: Int16Array.from([0, 1, 2, 3, -1]),
      count: 4,
      breaks: [98, 101, 110, 130, 160],
      mean: [100, 103, 120, 150],
      value: [100, 103, 120, 150],
      weight: [1, 1, 1, 1],
      method: 'jenks' as const,
    };
    const m = mergeCloseClasses(c, 5);
    expect(m.count).toBe(3);
    expect(Array.from(m.classOf)).toEqual([0, 0, 1, 2, -1]);
    expect(m.breaks).toEqual([98, 110, 130, 160]);
    expect(mergeCloseClasses(c, 0).count).toBe(4);
    expect(mergeCloseClasses(c, 100).count).toBe(1);
  });
});

describe('machine settings with their unit', () => {
  it('the same machine in metric or US units gives the same minimum zone area, named as given', async () => {
    const { minZoneArea, designLines } = await import('../../src/prescription/zoneDesign.js');
    const T = defaultTables();
    const plan = (machine: string) =>
      parsePlan(
        `crop: canola\ntarget_yield_bu: 50\nproducts: [{ product: map }]\nmachine:\n${machine}`,
        'p.yaml',
        T,
      );
    const us = minZoneArea(plan('  swath_width: 60 ft\n  speed: 5 mph\n'), 627000, 62);
    // 60 ft = 18.288 m and 5 mph = 8.04672 km/h exactly (international foot and mile, 1959)
    const si = minZoneArea(plan('  swath_width: 18.288 m\n  speed: 8.04672 km/h\n'), 627000, 62);
    const old = minZoneArea(plan('  swath_width_ft: 60\n  speed_mph: 5\n'), 627000, 62);
    // 18.288 m x 2.2352 m/s x 4 s = 163.51 m2
    expect(us.machineM2).toBeCloseTo(18.288 * 2.2352 * 4, 9);
    expect(si.machineM2).toBeCloseTo(us.machineM2, 9);
    expect(old.machineM2).toBe(us.machineM2);
    expect(si.machine).toEqual({ swath: '18.288 m', speed: '8.04672 km/h', rateChangeS: 4 });
    const design = { minArea: si, minDifference: {}, rmse: {}, counts: {}, vertices: {}, pairs: [], why: '' };
    expect(designLines(design as any, 'lb/ac').join('\n')).toContain(
      'during a rate change: 18.288 m x 8.04672 km/h x 4 s)',
    );
  });
});
