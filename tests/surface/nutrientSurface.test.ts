/**
 * nutrientSurface: the per-nutrient entry the build stage calls, and the bad-input cases.
 * Reference values are worked by hand in the comments (IDW definition: weighted mean with 1/d^p).
 */
import { describe, expect, it } from 'vitest';
import { fieldGrid } from '../../src/surface/grid.js';
import { analyteFromName, nutrientSurface } from '../../src/surface/nutrientSurface.js';
import { orient } from '../../src/geo/field.js';
import { ANALYTES, type Analyte, type RingsPart } from '../../src/types.js';
import { isUserError } from '../../src/errors.js';

const OX = 400000,
  OY = 5800000;
const rect = (x0: number, y0: number, x1: number, y1: number): RingsPart => ({
  exterior: orient(
    new Float64Array([x0, y0, x1, y0, x1, y1, x0, y1, x0, y0].map((v, i) => v + (i % 2 ? OY : OX))),
    true,
  ),
  holes: [],
});
const FIELD = { parts: [rect(0, 0, 400, 300)], name: 'test field' };

function samples(pts: [number, number, number][], zone?: (string | null)[]) {
  const n = pts.length;
  const values = Object.fromEntries(ANALYTES.map((a) => [a, new Float64Array(n).fill(NaN)])) as Record<
    Analyte,
    Float64Array
  >;
  pts.forEach(([, , v], i) => (values.p[i] = v));
  return {
    ids: pts.map((_, i) => `S${i + 1}`),
    xy: new Float64Array(pts.flatMap(([x, y]) => [x + OX, y + OY])),
    values,
    zone: zone ?? pts.map(() => null),
  };
}

describe('nutrientSurface', () => {
  const grid = fieldGrid(FIELD, 10);
  const grid5x4 = [
    [50, 50],
    [150, 60],
    [250, 40],
    [350, 55],
    [60, 150],
    [160, 170],
    [240, 160],
    [340, 140],
    [50, 250],
    [170, 240],
    [260, 260],
    [360, 250],
  ];

  it('auto: chooses the lowest cross-validation RMSE and says so', () => {
    const s = nutrientSurface(
      samples(grid5x4.map(([x, y], i) => [x, y, 10 + (i % 5) * 3 + x / 40])),
      'p',
      grid,
    );
    expect(s.method).toBe('idw');
    const best = Math.min(...s.cv!.table.map((r) => r.rmse));
    expect(s.cv!.table.find((r) => r.power === s.power && r.neighbours === s.neighbours)!.rmse).toBe(best);
    expect(s.cv!.table).toHaveLength(16);
    expect(s.choice).toMatch(/chosen by leave-one-out cross-validation: lowest RMSE/);
  });

  it('given power and neighbours: a one-row table for that pair', () => {
    const s = nutrientSurface(samples(grid5x4.map(([x, y], i) => [x, y, i])), 'p', grid, null, {
      power: 2,
      neighbours: 4,
    });
    expect(s.cv!.table.map((r) => [r.power, r.neighbours])).toEqual([[2, 4]]);
    expect([s.power, s.neighbours]).toEqual([2, 4]);
  });

  it('all values equal: a flat map at that value, with a warning', () => {
    const s = nutrientSurface(samples(grid5x4.map(([x, y]) => [x, y, 17])), 'p', grid);
    for (let i = 0; i < s.values.length; i++) if (grid.fraction[i] > 0) expect(s.values[i]).toBe(17);
    expect(s.warnings.map((w) => w.code)).toContain('surface-flat');
    expect(s.cv!.best.rmse).toBeLessThan(1e-12); // zero up to rounding
  });

  it('two samples at one location with different values: averaged, with a warning naming them', () => {
    const pts: [number, number, number][] = [
      [100, 100, 10],
      [100, 100, 20],
      [300, 200, 40],
      [50, 250, 30],
    ];
    const s = nutrientSurface(samples(pts), 'p', grid, null, { power: 2, neighbours: Infinity });
    const w = s.warnings.find((x) => x.code === 'surface-same-location')!;
    expect(w.message).toMatch(
      /S1, S2 are at one location with different values \(10, 20\); their average 15/,
    );
    expect(s.samplesUsed).toBe(3);
    // cell (10, 19) has its centre at (105, 105) from the field corner, 5*sqrt(2) m from the merged sample
    // worked by hand: weights 1/50, 1/(195^2+95^2), 1/(55^2+145^2) -> 15.60...
    const v = s.values[19 * grid.cols + 10];
    const w1 = 1 / 50,
      w2 = 1 / (195 ** 2 + 95 ** 2),
      w3 = 1 / (55 ** 2 + 145 ** 2);
    expect(v).toBeCloseTo((15 * w1 + 40 * w2 + 30 * w3) / (w1 + w2 + w3), 12);
  });

  it('a nutrient missing at some samples: those are skipped and named', () => {
    const pts: [number, number, number][] = grid5x4.map(([x, y], i) => [x, y, i % 4 === 1 ? NaN : i]);
    const s = nutrientSurface(samples(pts), 'p', grid);
    expect(s.samplesUsed).toBe(9);
    expect(s.warnings.find((w) => w.code === 'surface-value-missing')!.message).toMatch(
      /3 samples have no value and are skipped for this nutrient: S2, S6, S10/,
    );
  });

  it('no sample with a value: a user error', () => {
    let err: unknown;
    try {
      nutrientSurface(samples([[10, 10, NaN]]), 'p', grid);
    } catch (e) {
      err = e;
    }
    expect(isUserError(err)).toBe(true);
    expect((err as Error).message).toMatch(/no sample has a value for P \(ppm\)/);
  });

  it('zone composites: each zone takes its sample value, no blending across the zone edge', () => {
    // zone A = west 250 m, zone B = east 150 m (the zone edge lies on a cell edge of the 10 m grid)
    const zones = { keys: ['A', 'B'], lonlat: [], parts: [[rect(0, 0, 250, 300)], [rect(250, 0, 400, 300)]] };
    const s = nutrientSurface(
      samples(
        [
          [100, 100, 12],
          [300, 200, 30],
        ],
        ['A', 'B'],
      ),
      'p',
      grid,
      zones,
    );
    expect(s.method).toBe('zones');
    let areaA = 0,
      areaB = 0;
    for (let i = 0; i < s.values.length; i++) {
      if (!(grid.fraction[i] > 0)) {
        expect(s.values[i]).toBeNaN();
        continue;
      }
      expect([12, 30]).toContain(s.values[i]);
      if (s.values[i] === 12) areaA += grid.fraction[i] * 100;
      else areaB += grid.fraction[i] * 100;
    }
    expect(areaA).toBeCloseTo(250 * 300, 6);
    expect(areaB).toBeCloseTo(150 * 300, 6);
  });

  it('over 2000 samples, "all" leaves the automatic choice (n^2 cost) with a warning', () => {
    const pts: [number, number, number][] = [];
    for (let i = 0; i < 2001; i++)
      pts.push([(i % 50) * 8 + 0.5, Math.floor(i / 50) * 7.3 + 0.5, (i * 7919) % 97]);
    const s = nutrientSurface(samples(pts), 'p', fieldGrid(FIELD, 50), null, { power: 2 });
    expect(s.warnings.map((w) => w.code)).toContain('surface-cv-all-skipped');
    expect(s.cv!.table.map((r) => r.neighbours)).toEqual([8, 12, 16]);
  });

  it('a search radius that leaves field cells without samples: those cells are empty and a warning counts them', () => {
    const s = nutrientSurface(
      samples([
        [20, 20, 5],
        [30, 20, 7],
        [25, 35, 9],
      ]),
      'p',
      grid,
      null,
      { power: 2, neighbours: 12, radius: 60 },
    );
    let empty = 0,
      inField = 0;
    for (let i = 0; i < s.values.length; i++)
      if (grid.fraction[i] > 0) {
        inField++;
        if (Number.isNaN(s.values[i])) empty++;
      }
    expect(empty).toBeGreaterThan(0);
    expect(empty).toBeLessThan(inField);
    expect(s.warnings.find((w) => w.code === 'surface-cells-empty')!.message).toContain(
      `${empty} field cells have fewer than 1 sample within the 60 m search radius`,
    );
  });

  it('nutrient names as people type them', () => {
    expect(
      ['no3_n', 'N', 'nitrate', 'p', 'K', 'so4_s', 's', 'Sulphate', 'sulfate', 'om', 'pH'].map(
        analyteFromName,
      ),
    ).toEqual(['no3_n', 'no3_n', 'no3_n', 'p', 'k', 'so4_s', 'so4_s', 'so4_s', 'so4_s', 'om', 'ph']);
    expect(() => analyteFromName('zinc')).toThrow(/not known. Fix: use one of/);
  });
});
