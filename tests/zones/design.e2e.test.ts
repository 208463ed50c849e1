/**
 * Zones worth a boundary, end to end through buildPrescription: the demo quarter, and an invented held-out
 * field (not the demo) with a strong soil-test P trend and a weak nitrate one, and its no-trend twin.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  buildPrescription,
  productRate,
  usedPairs,
  type ZoneSetResult,
} from '../../src/prescription/index.js';
import { defaultTables, parsePlan } from '../../src/agronomy/index.js';
import { fieldInputs, quarterFile, quarterPlanWith } from '../helpers/inputs.js';
import { M2_PER_AC } from '../../src/units/index.js';
import { mulberry32 } from '../../src/stats/random.js';
import { ROOT } from '../helpers/cli.js';

const tables = defaultTables();
const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');
const planWith = (edit: (p: Record<string, any>) => void) => quarterPlanWith(edit, tables);
const src = quarterFile;

/** Neighbouring zone pairs from the zone raster (cells sharing an edge), independent of the design record. */
function neighbours(set: ZoneSetResult, cols: number): [number, number][] {
  const z = set.zoneOfCell!,
    seen = new Set<string>(),
    out: [number, number][] = [];
  for (let i = 0; i < z.length; i++)
    for (const j of [(i + 1) % cols ? i + 1 : -1, i + cols]) {
      if (j < 0 || j >= z.length || z[i] < 0 || z[j] < 0 || z[i] === z[j]) continue;
      const a = Math.min(z[i], z[j]),
        b = Math.max(z[i], z[j]);
      if (!seen.has(`${a},${b}`)) {
        seen.add(`${a},${b}`);
        out.push([a, b]);
      }
    }
  return out;
}

/** Every neighbouring pair: some product rate differs by at least the set's minimum difference for it. */
function expectMeaningfulPairs(set: ZoneSetResult, cols: number): void {
  for (const [a, b] of neighbours(set, cols)) {
    const apart = usedPairs(set).some((p) => {
      const d = Math.abs(
        productRate(set.zones[a].decision, p.product, p.placement).value -
          productRate(set.zones[b].decision, p.product, p.placement).value,
      );
      return d > 0 && d >= set.design!.minDifference[`${p.product}|${p.placement}`];
    });
    expect(apart, `zones ${a + 1} and ${b + 1}`).toBe(true);
  }
}

describe('zones worth a boundary', () => {
  it("demo quarter, the demo plan: 3-6 zones, each at least one grid sample's area, every neighbouring pair meaningfully different", async () => {
    const inputs = await fieldInputs(src('samples.csv'), src('boundary.geojson'));
    const rx = buildPrescription(inputs, parsePlan(PLAN, 'plan.yaml', tables), tables, { cell: 5 });
    const set = rx.zoneSets[0];
    expect(set.zones.length).toBeGreaterThanOrEqual(3);
    expect(set.zones.length).toBeLessThanOrEqual(6);
    // one sample's area: the field's area over the samples (62 grid samples, counted from the file)
    const perSample = rx.field.areaM2 / new Set(inputs.samples.ids).size;
    expect(set.design!.minArea.perSampleM2).toBeCloseTo(perSample, 0);
    for (const z of set.zones) expect(z.areaM2).toBeGreaterThanOrEqual(perSample * (1 - 1e-6));
    expectMeaningfulPairs(set, rx.grid.cols);
    // the minimum difference is at least the machine step and 10 % of the mean rate (common practice)
    for (const t of rx.totals)
      expect(set.design!.minDifference[`${t.product}|${t.placement}`]).toBeGreaterThanOrEqual(
        Math.max(1, 0.1 * t.meanRate) * 0.5,
      );
    // smoothing: fewer vertices than the staircase
    expect(set.design!.vertices.simplified).toBeLessThan(set.design!.vertices.traced / 2);
    // output.max_vertices: a limit below what the zones need stops the build, naming the key and the count
    const written = set.design!.vertices.clipped;
    const tight = planWith((p) => {
      p.output.max_vertices = written - 1;
    });
    expect(() => buildPrescription(inputs, tight, tables, { cell: 5 })).toThrow(
      new RegExp(
        `needs ${written} polygon vertices, more than plan key output.max_vertices \\(${written - 1}\\)`,
      ),
    );
    expect(
      buildPrescription(
        inputs,
        planWith((p) => {
          p.output.max_vertices = written;
        }),
        tables,
        { cell: 5 },
      ).zoneSets[0].zones.length,
    ).toBe(set.zones.length);
  }, 180_000);

  // An invented field (not the demo): 800 m x 800 m near 52.1 N 106.5 W with a 100 m slough, 8 x 8 grid samples
  // 100 m apart. Olsen P runs from 5 ppm (west) to 32 ppm (east): it crosses the 10 and 20 ppm classes, a real
  // difference in MAP. Nitrate moves 3 lb/ac north to south (below the nitrate map's error), every value with
  // seeded lab noise.
  async function heldOut(pTrend: boolean) {
    const rnd = mulberry32(20261202);
    const lat0 = 52.1,
      lon0 = -106.5,
      dLat = 1 / 111_320,
      dLon = 1 / (111_320 * Math.cos((lat0 * Math.PI) / 180));
    const ll = (x: number, y: number) => [lon0 + x * dLon, lat0 + y * dLat];
    const ringOf = (pts: number[][]) => [...pts, pts[0]].map(([x, y]) => ll(x, y));
    const boundary = {
      type: 'Feature',
      properties: { name: 'Test section (invented)' },
      geometry: {
        type: 'Polygon',
        coordinates: [
          ringOf([
            [0, 0],
            [800, 0],
            [800, 800],
            [0, 800],
          ]),
          ringOf([
            [350, 350],
            [350, 450],
            [450, 450],
            [450, 350],
          ]),
        ],
      },
    };
    const rows = [
      'Sample,Latitude,Longitude,Depth (in),NO3-N (lb/ac),P Olsen (ppm),K (ppm),SO4-S (lb/ac),OM (%),Texture',
    ];
    let k = 0;
    for (let i = 0; i < 8; i++)
      for (let j = 0; j < 8; j++) {
        const x = 50 + 100 * i,
          y = 50 + 100 * j;
        if (x > 340 && x < 460 && y > 340 && y < 460) continue;
        const [lon, lat] = ll(x, y);
        const p = pTrend ? 5 + (27 * x) / 800 : 15;
        const no3 = 30 + (3 * y) / 800 + (rnd() - 0.5) * 4;
        rows.push(
          `T-${++k},${lat.toFixed(7)},${lon.toFixed(7)},0-24,${no3.toFixed(0)},${(p + (rnd() - 0.5) * 2).toFixed(1)},${(380 + (rnd() - 0.5) * 40).toFixed(0)},${(30 + (rnd() - 0.5) * 6).toFixed(0)},3.5,medium`,
        );
      }
    const inputs = await fieldInputs(
      { name: 'samples.csv', bytes: Buffer.from(rows.join('\n')) },
      { name: 'boundary.geojson', bytes: Buffer.from(JSON.stringify(boundary)) },
    );
    return {
      ...buildPrescription(
        inputs,
        planWith(() => {}),
        tables,
        { cell: 5 },
      ),
      nSamples: k,
    };
  }

  it('held-out field: the strong P trend gives zones split by MAP rate, the weak nitrate trend and the noise give none', async () => {
    const rx = await heldOut(true);
    const set = rx.zoneSets[0];
    expect(set.zones.length).toBeGreaterThanOrEqual(2);
    expect(set.zones.length).toBeLessThanOrEqual(4);
    expectMeaningfulPairs(set, rx.grid.cols);
    // what keeps neighbours apart is MAP (the P trend), never urea (the weak nitrate trend)
    for (const p of set.design!.pairs) expect(p.why?.product).toBe('map');
    // west (low P) gets more MAP than east (high P)
    const mapAt = (x: number) => {
      const c = Math.floor((x - rx.grid.xmin) / rx.grid.cell),
        r = Math.floor(rx.grid.rows / 2) + 20;
      return productRate(set.zones[set.zoneOfCell![r * rx.grid.cols + c]].decision, 'map', 'side_band').value;
    };
    const x0 = rx.grid.xmin,
      x1 = rx.grid.xmin + rx.grid.cols * rx.grid.cell;
    expect(mapAt(x0 + 20)).toBeGreaterThan(mapAt(x1 - 20) + 20);
    for (const z of set.zones)
      expect(z.areaM2).toBeGreaterThanOrEqual(set.design!.minArea.perSampleM2 * (1 - 1e-6));
    // one sample's area: field area over the samples written (the four in the slough are left out)
    expect(set.design!.minArea.perSampleM2 / M2_PER_AC).toBeCloseTo(rx.field.areaAc / rx.nSamples, 3);
  }, 120_000);

  it('held-out field without the P trend: one zone (weak trend and lab noise dropped)', async () => {
    const rx = await heldOut(false);
    expect(rx.zoneSets[0].zones.length).toBe(1);
  }, 120_000);
});
