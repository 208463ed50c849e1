/**
 * Variability stage: semivariogram binning against a brute-force oracle written from gstat's documented rules,
 * fit recovery of models defined as in gstat's vgm(), Cambardella classes, statistics and sampling advice.
 * The study as a whole (low spots, sulphate-S findings, text, charts) is in study.test.ts.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  semivariogram,
  lagIndex,
  fitModel,
  fitModels,
  modelAt,
  unitVariogram,
  effectiveRange,
  spatialDependence,
  areaShareBelow,
  sampleShareBelow,
  samplingAdvice,
  medianNearest,
  type ModelKind,
} from '../../src/variability/index.js';
import { describe as describeStats } from '../../src/stats/describe.js';

/** Oracle: each pair tested against every lag interval (j w, (j+1) w], zero distance in lag 0, d > cutoff dropped. */
function oracle(xy: number[], z: number[], cutoff: number, width: number) {
  const nLag = Math.floor(cutoff / width) + 1;
  const np = new Array(nLag).fill(0),
    sd = new Array(nLag).fill(0),
    sg = new Array(nLag).fill(0);
  for (let i = 0; i < z.length; i++)
    for (let j = i + 1; j < z.length; j++) {
      const d = Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]);
      if (d > cutoff) continue;
      let lag = -1;
      if (d === 0) lag = 0;
      else
        for (let k = 0; k < nLag; k++)
          if (d > k * width && d <= (k + 1) * width) {
            lag = k;
            break;
          }
      np[lag]++;
      sd[lag] += d;
      sg[lag] += (z[i] - z[j]) ** 2;
    }
  const out = { np: [] as number[], dist: [] as number[], gamma: [] as number[] };
  for (let k = 0; k < nLag; k++)
    if (np[k]) {
      out.np.push(np[k]);
      out.dist.push(sd[k] / np[k]);
      out.gamma.push(sg[k] / (2 * np[k]));
    }
  return out;
}

describe('semivariogram (gstat binning rules, src/sem.c of gstat 2.1.0)', () => {
  it('matches the brute-force oracle on random integer layouts (many distances on lag boundaries)', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.integer({ min: 0, max: 12 }),
            fc.integer({ min: 0, max: 12 }),
            fc.double({ min: -50, max: 50, noNaN: true }),
          ),
          { minLength: 2, maxLength: 40 },
        ),
        fc.integer({ min: 1, max: 4 }),
        (pts, w) => {
          const xy = pts.flatMap((p) => [p[0] * 10, p[1] * 10]);
          const z = pts.map((p) => p[2]);
          const cutoff = 15 * w * 2; // integer width 2w: boundaries at even integers, hit by axis-aligned pairs
          const v = semivariogram(new Float64Array(xy), z, { cutoff, width: 2 * w });
          const o = oracle(xy, z, cutoff, 2 * w);
          expect(v.np).toEqual(o.np);
          for (let j = 0; j < o.np.length; j++) {
            expect(v.dist[j]).toBeCloseTo(o.dist[j], 9);
            expect(v.gamma[j]).toBeCloseTo(o.gamma[j], 9);
          }
        },
      ),
      { numRuns: 150 },
    );
  });

  it('puts a distance on a lag boundary into the lower lag, 0 into lag 0, and keeps d == cutoff', () => {
    expect(lagIndex(10, 10)).toBe(0);
    expect(lagIndex(10.000001, 10)).toBe(1);
    expect(lagIndex(0, 10)).toBe(0);
    // three points on a line 0, 10, 30 m; cutoff 30, width 10: pairs 10 (lag 0), 20 (lag 1), 30 (lag 2, kept)
    const v = semivariogram(new Float64Array([0, 0, 10, 0, 30, 0]), [0, 1, 3], { cutoff: 30, width: 10 });
    expect(v.lag).toEqual([0, 1, 2]);
    expect(v.np).toEqual([1, 1, 1]);
    expect(v.gamma).toEqual([0.5, 2, 4.5]); // (z_a - z_b)^2 / 2
  });

  it('default cutoff is a third of the bounding-box diagonal and width cutoff / 15 (gstat defaults)', () => {
    const v = semivariogram(new Float64Array([0, 0, 300, 0, 0, 400, 120, 80]), [1, 2, 3, 4]);
    expect(v.bboxDiagonal).toBe(500);
    expect(v.cutoff).toBeCloseTo(500 / 3, 12);
    expect(v.width).toBeCloseTo(500 / 45, 12);
  });

  it('skips NaN values, is unchanged by adding a constant and scales with the square of a factor', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.tuple(
            fc.double({ min: 0, max: 1000, noNaN: true }),
            fc.double({ min: 0, max: 1000, noNaN: true }),
            fc.double({ min: 0, max: 100, noNaN: true }),
          ),
          { minLength: 3, maxLength: 30 },
        ),
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: 0.1, max: 10, noNaN: true }),
        (pts, c, k) => {
          const xy = new Float64Array(pts.flatMap((p) => [p[0], p[1]]));
          const z = pts.map((p) => p[2]);
          const a = semivariogram(xy, z);
          const b = semivariogram(
            xy,
            z.map((x) => k * x + c),
          );
          expect(b.np).toEqual(a.np);
          for (let j = 0; j < a.np.length; j++) expect(b.gamma[j]).toBeCloseTo(k * k * a.gamma[j], 6);
          const withNaN = semivariogram(new Float64Array([...xy, 5000, 5000]), [...z, NaN]);
          expect(withNaN).toEqual(a);
        },
      ),
      { numRuns: 60 },
    );
  });
});

describe('models (gstat vgm() definitions) and WLS fits', () => {
  it('unit models at known points', () => {
    // spherical at h = a/2: 1.5 * 0.5 - 0.5 * 0.125 = 0.6875 (gstat Sph definition)
    expect(unitVariogram('spherical', 50, 100)).toBeCloseTo(0.6875, 15);
    expect(unitVariogram('spherical', 150, 100)).toBe(1);
    // exponential at 3a and Gaussian at sqrt(3) a reach 1 - e^-3 = 95.0 % of the sill (the effective ranges)
    expect(unitVariogram('exponential', effectiveRange('exponential', 100), 100)).toBeCloseTo(
      1 - Math.exp(-3),
      15,
    );
    expect(unitVariogram('gaussian', effectiveRange('gaussian', 100), 100)).toBeCloseTo(1 - Math.exp(-3), 15);
    expect(modelAt({ kind: 'spherical', nugget: 1, psill: 2, range: 10 }, 0)).toBe(0);
  });

  it('recovers nugget, partial sill and range from an exact model semivariogram (any weights)', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<ModelKind>('spherical', 'exponential', 'gaussian'),
        fc.double({ min: 0.05, max: 5, noNaN: true }),
        fc.double({ min: 0.5, max: 20, noNaN: true }),
        fc.double({ min: 150, max: 600, noNaN: true }),
        fc.constantFrom(7, 2, 1, 6) as fc.Arbitrary<7 | 2 | 1 | 6>,
        (kind, nugget, psill, range, method) => {
          const dist = Array.from({ length: 15 }, (_, j) => 40 * (j + 0.6));
          const np = dist.map((_, j) => 30 + 7 * j);
          const gamma = dist.map((h) => nugget + psill * unitVariogram(kind, h, range));
          const m = fitModel({ np, dist, gamma }, kind, { method });
          expect(m.ok).toBe(true);
          expect(m.nugget).toBeCloseTo(nugget, 4);
          expect(m.psill / psill).toBeCloseTo(1, 4);
          expect(m.range / range).toBeCloseTo(1, 4);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('names the generating model as the best fit and refuses fewer than three lags', () => {
    const dist = Array.from({ length: 15 }, (_, j) => 40 * (j + 0.6));
    const np = dist.map(() => 100);
    const gamma = dist.map((h) => 0.5 + 3 * unitVariogram('spherical', h, 300));
    expect(fitModels({ np, dist, gamma }).best?.kind).toBe('spherical');
    expect(fitModel({ np: [5, 5], dist: [10, 20], gamma: [1, 2] }, 'spherical').ok).toBe(false);
  });

  it('a linear semivariogram (no sill) is reported as such, not as a best fit', () => {
    const dist = Array.from({ length: 15 }, (_, j) => 40 * (j + 0.6));
    const r = fitModels({ np: dist.map(() => 100), dist, gamma: dist.map((h) => 0.2 + 0.01 * h) });
    // spherical can reach a sill at the largest lag, but exponential / Gaussian run to the range limit
    expect(r.fits.some((f) => f.rangeAtLimit)).toBe(true);
  });
});

describe('spatial dependence classes [published] Cambardella et al. 1994, SSSAJ 58:1501-1511', () => {
  it('< 25 % strong, 25-75 % moderate, > 75 % weak', () => {
    expect(spatialDependence(0.25, 0.75).class).toBe('moderate'); // exactly 25 %
    expect(spatialDependence(0.24, 0.76).class).toBe('strong');
    expect(spatialDependence(0.75, 0.25).class).toBe('moderate'); // exactly 75 %
    expect(spatialDependence(0.76, 0.24).class).toBe('weak');
    // Meuse log(zinc) spherical fit from gstat: nugget 0.0507, psill 0.5906 -> 7.9 % strong
    const d = spatialDependence(0.05065922802156908, 0.59060462737461805);
    expect(d.ratio).toBeCloseTo(0.079, 3);
    expect(d.class).toBe('strong');
  });
});

describe('statistics and shares', () => {
  it('describe() on the textbook set 2, 4, 4, 4, 5, 5, 7, 9', () => {
    // population SD 2 (the classic worked example, e.g. Wikipedia "Standard deviation"); sample SD sqrt(32 / 7)
    const d = describeStats([2, 4, 4, 4, 5, 5, 7, 9, NaN]);
    expect(d).toMatchObject({ n: 8, min: 2, max: 9, mean: 5, median: 4.5 });
    expect(d.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(d.cv).toBeCloseTo(Math.sqrt(32 / 7) / 5, 12);
  });

  it('area share weights cells by their in-field fraction and skips cells without a value', () => {
    const a = areaShareBelow([5, 15, NaN, 9], [1, 0.5, 1, 0.5], 10);
    expect(a.totalCells).toBe(2);
    expect(a.share).toBeCloseTo(0.75, 15);
    expect(sampleShareBelow([5, 15, NaN, 8], 10)).toBeCloseTo(2 / 3, 15);
    // value == threshold is not below
    expect(sampleShareBelow([10], 10)).toBe(0);
  });
});

describe('sampling advice (spacing under half the effective range: common practice)', () => {
  const grid = (n: number, step: number) => {
    const xy: number[] = [];
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) xy.push(i * step, j * step);
    return xy;
  };
  it('8 x 8 grid at 100 m on 64 ha', () => {
    const xy = grid(8, 100);
    expect(medianNearest(xy)).toBe(100);
    const areaM2 = 800 * 800;
    const ok = samplingAdvice({
      areaM2,
      xy,
      effectiveRange: 400,
      dependence: 'strong',
      firstLag: 100,
      noSill: false,
    });
    expect(ok.spacing).toBeCloseTo(100, 9);
    expect(ok.acresPerSample).toBeCloseTo(10000 / 4046.8564224, 9); // 1 ha = 2.471 ac ([published] 1959 yard and pound agreement)
    expect(ok.verdict).toBe('adequate');
    const sparse = samplingAdvice({
      areaM2,
      xy,
      effectiveRange: 120,
      dependence: 'moderate',
      firstLag: 100,
      noSill: false,
    });
    expect(sparse.verdict).toBe('too-sparse');
    expect(sparse.needed?.spacing).toBe(60);
    expect(sparse.needed?.samples).toBe(Math.ceil(areaM2 / 3600));
    expect(
      samplingAdvice({ areaM2, xy, effectiveRange: 400, dependence: 'weak', firstLag: 100, noSill: false })
        .verdict,
    ).toBe('no-structure');
  });
});
