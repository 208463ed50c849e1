// Prescription pieces checked alone: display coarsening, merging close classes, machine settings. The demo
// quarter built end to end is in build.e2e.test.ts.
import { describe, expect, it } from 'vitest';
import { parsePlan, defaultTables } from '../../src/agronomy/index.js';

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

  it('the display factor is the smallest whole factor that brings the grid to at most 300 cells a side', async () => {
    const { displayFactor, REPORT_MAX_SIDE } = await import('../../src/prescription/reportMaps.js');
    expect(REPORT_MAX_SIDE).toBe(300);
    // the demo quarter at 5 m is shown cell for cell; at 2 m at 4 m; a 1 m section (1609 cells) at 6 m
    expect(displayFactor({ cols: 162, rows: 162 })).toBe(1);
    expect(displayFactor({ cols: 405, rows: 398 })).toBe(2);
    expect(displayFactor({ cols: 1609, rows: 1609 })).toBe(6);
    for (let side = 1; side <= 5000; side += 7) {
      const f = displayFactor({ cols: side, rows: Math.ceil(side / 3) });
      expect(Math.ceil(side / f)).toBeLessThanOrEqual(300);
      if (f > 1) expect(Math.ceil(side / (f - 1))).toBeGreaterThan(300);
    }
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
