/**
 * tilth reads task data written by another program: the `isoxml` npm package (1.11.2) writes a polygon task
 * and a type-2 grid task (its own grid generator) from tests/fixtures/check/good.geojson; `tilth check`'s
 * reader must find the same zones and rates.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ISOXMLManager, TAGS, ExtendedPolygon } from 'isoxml';
import { layersFromTaskDataFiles } from '../../src/check/taskdata.js';
import { checkPrescription, layerFromGeoJSON } from '../../src/check/index.js';

const FIX = join(import.meta.dirname, '..', 'fixtures', 'check');
const fc = JSON.parse(readFileSync(join(FIX, 'good.geojson'), 'utf8'));
/** 1 lb/ac = 112.085 mg/m2 (0.45359237 kg / 0.40468564224 ha, the 1959 yard and pound agreement, x 100) */
const MGM2_PER_LBAC = 112.085;

async function writtenByIsoxml(): Promise<Uint8Array> {
  const m = new ISOXMLManager({ version: 4, fmisTitle: 'outside writer', fmisVersion: '1' });
  const pdt = m.createEntityFromAttributes(TAGS.Product, { ProductDesignator: 'urea' }) as any;
  const ref = m.registerEntity(pdt);
  m.rootElement.attributes.Product = [pdt];
  const pdv = (v: number) =>
    m.createEntityFromAttributes(TAGS.ProcessDataVariable, {
      ProcessDataDDI: '0006',
      ProcessDataValue: v,
      ProductIdRef: ref,
    });
  const zones = fc.features.map((f: any, i: number) =>
    m.createEntityFromAttributes(TAGS.TreatmentZone, {
      TreatmentZoneCode: i + 1,
      ProcessDataVariable: [pdv(Math.round(f.properties.urea_lbac * MGM2_PER_LBAC))],
      PolygonTreatmentZoneonly: ExtendedPolygon.fromGeoJSON(f.geometry, '2' as any, m),
    }),
  );
  zones.push(
    m.createEntityFromAttributes(TAGS.TreatmentZone, { TreatmentZoneCode: 0, ProcessDataVariable: [pdv(0)] }),
  );
  const t1 = m.createEntityFromAttributes(TAGS.Task, {
    TaskDesignator: 'zones',
    TaskStatus: '1',
    TreatmentZone: zones,
    OutOfFieldTreatmentZoneCode: 0,
  });
  const t2 = m.createEntityFromAttributes(TAGS.Task, { TaskDesignator: 'grid', TaskStatus: '1' }) as any;
  m.registerEntity(t1);
  m.registerEntity(t2);
  const rated = {
    type: 'FeatureCollection',
    features: fc.features.map((f: any) => ({
      ...f,
      properties: { r: Math.round(f.properties.urea_lbac * MGM2_PER_LBAC) },
    })),
  };
  t2.addGridFromGeoJSON(rated, [pdv(0)], ['r']);
  m.rootElement.attributes.Task = [t1, t2];
  return m.saveISOXML();
}

describe('task data from the isoxml package', () => {
  it('reads its polygon task and its grid task: same rates, every check passes', async () => {
    const layers = layersFromTaskDataFiles({ 'other.zip': await writtenByIsoxml() }, 'other.zip');
    expect(layers.map((l) => l.label)).toEqual([
      'other.zip:TASKDATA/TASKDATA.XML task TSK1 "zones", product PDT1 "urea"',
      'other.zip:TASKDATA/TASKDATA.XML task TSK2 "grid", product PDT1 "urea"',
    ]);
    const boundary = layerFromGeoJSON(
      readFileSync(join(FIX, 'boundary.geojson'), 'utf8'),
      'boundary.geojson',
    );
    // polygons: each zone's kg/ha is the fixture's lb/ac x 1.12085 within the DDI's resolution (1 mg/m2 = 0.01 kg/ha)
    const byZone = new Map(layers[0].features.map((f) => [f.properties!.zone_id, f.properties!.rate_kgha]));
    for (const [i, f] of fc.features.entries())
      expect(
        Math.abs(byZone.get(i + 1) - (f.properties.urea_lbac * MGM2_PER_LBAC) / 100),
      ).toBeLessThanOrEqual(0.005 + 1e-9);
    // grid: the distinct rates are the zones' rates
    const gridRates = [...new Set(layers[1].features.map((f) => f.properties!.rate_kgha))].sort(
      (a, b) => a - b,
    );
    expect(gridRates).toEqual([...byZone.values()].sort((a, b) => a - b));
    const totals = layers.map((l) => {
      const r = checkPrescription(l, { boundary });
      expect(r.lines.filter((x) => x.status === 'fail')).toEqual([]);
      return r.totals[0].total;
    });
    // the grid approximates the zones: totals within 1 %
    expect(Math.abs(totals[1] - totals[0]) / totals[0]).toBeLessThan(0.01);
  }, 120_000);
});
