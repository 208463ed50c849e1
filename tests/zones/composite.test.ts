import { describe, expect, it } from 'vitest';
import { zoneMeans, zonesFromSampleZones } from '../../src/zones/index.js';
import { pointInRing } from '../../src/zones/index.js';
import { fieldFromParts, ring, X0, Y0 } from './fixtures.js';

// a 400 m x 300 m field (12 ha) with a 50 m x 40 m slough: areas by hand, 120 000 - 2 000 = 118 000 m2
const field = fieldFromParts([
  {
    exterior: ring(
      [
        [X0, Y0],
        [X0 + 400, Y0],
        [X0 + 400, Y0 + 300],
        [X0, Y0 + 300],
      ],
      true,
    ),
    holes: [
      ring(
        [
          [X0 + 100, Y0 + 100],
          [X0 + 150, Y0 + 100],
          [X0 + 150, Y0 + 140],
          [X0 + 100, Y0 + 140],
        ],
        false,
      ),
    ],
  },
]);
const rect = (x0: number, y0: number, x1: number, y1: number) => [
  {
    exterior: ring(
      [
        [X0 + x0, Y0 + y0],
        [X0 + x1, Y0 + y0],
        [X0 + x1, Y0 + y1],
        [X0 + x0, Y0 + y1],
      ],
      true,
    ),
    holes: [],
  },
];

describe('zone-composite fields', () => {
  it('clips sampled zones to the boundary and keeps the slough out', () => {
    const sz = {
      keys: ['A', 'B'],
      lonlat: [[], []],
      parts: [rect(-20, -20, 200, 320), rect(200, -20, 420, 320)],
    };
    const { zones, warnings } = zonesFromSampleZones(sz, field);
    expect(warnings).toEqual([]);
    expect(zones[0].areaM2).toBeCloseTo(200 * 300 - 2000, 6); // by hand
    expect(zones[1].areaM2).toBeCloseTo(200 * 300, 6);
    expect(zones[0].lonlat[0][0].length).toBeGreaterThan(3);
    // a point in the slough is in no zone
    expect(
      zones.some((z) =>
        z.parts.some(
          (p) =>
            pointInRing(p.exterior, X0 + 120, Y0 + 120) &&
            !p.holes.some((h) => pointInRing(h, X0 + 120, Y0 + 120)),
        ),
      ),
    ).toBe(false);
  });

  it('reports overlaps (first zone keeps them), gaps, and zones outside the field', () => {
    const sz = {
      keys: ['A', 'B', 'C'],
      lonlat: [[], [], []],
      parts: [rect(0, 0, 210, 300), rect(200, 0, 390, 300), rect(1000, 1000, 1100, 1100)],
    };
    const { zones, warnings } = zonesFromSampleZones(sz, field);
    expect(zones.map((z) => z.key)).toEqual(['A', 'B']);
    expect(zones[1].areaM2).toBeCloseTo((390 - 210) * 300, 6); // by hand: B minus the 10 m strip A keeps
    expect(warnings.map((w) => w.code).sort()).toEqual([
      'zones-sampled-gap',
      'zones-sampled-outside',
      'zones-sampled-overlap',
    ]);
    expect(warnings.find((w) => w.code === 'zones-sampled-gap')!.message).toMatch(/Fix:/);
  });
});

describe('zoneMeans', () => {
  it('area-weighted means by hand, NaN cells left out', () => {
    // zone 0: values 10 (w 1) and 20 (w 0.5) -> (10 + 10) / 1.5 = 13.33; zone 1: 30 and NaN -> 30; zone 2: no cell -> NaN
    const m = zoneMeans(Int32Array.from([0, 0, 1, 1, -1]), 3, [10, 20, 30, NaN, 99], [1, 0.5, 1, 1, 1]);
    expect(m[0]).toBeCloseTo(20 / 1.5, 12);
    expect(m[1]).toBe(30);
    expect(m[2]).toBeNaN();
  });
});
