// buildPrescription end to end on the demo quarter: both zone-set layouts, and the zone-composite field.
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
        // each zone's sample list (its own point-in-polygon test, which skips zones whose box the sample is
        // outside) holds exactly the samples turf finds in that zone's polygon
        fc.features.forEach((f: any, k: number) => {
          const inZone = inputs.samples.ids.filter((_, i) =>
            booleanPointInPolygon(
              point([inputs.samples.lonlat[2 * i], inputs.samples.lonlat[2 * i + 1]]),
              f,
              {
                ignoreBoundary: true,
              },
            ),
          );
          expect(set.zones[k].samples).toEqual(inZone);
        });
        expect(set.zones.some((z) => z.samples.length > 0)).toBe(true);
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
