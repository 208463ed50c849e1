/**
 * Variability stage: semivariogram binning against a brute-force oracle written from gstat's documented rules,
 * fit recovery of models defined as in gstat's vgm(), Cambardella classes, statistics, sampling advice, the
 * sulphate-S findings and the charts.
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
  analyzeVariability,
  semivariogramSvg,
  sampleMapSvg,
  niceTicks,
  defaultThreshold,
  type ModelKind,
} from '../../src/variability/index.js';
import { describe as describeStats } from '../../src/stats/describe.js';
import type { Analyte, Field, Samples } from '../../src/types.js';

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

/** A synthetic field: 800 m square, 7 x 7 samples, sulphate high on the west, low patch in the south-east. */
function syntheticField(): { samples: Samples; field: Field } {
  const ids: string[] = [];
  const xy: number[] = [];
  const s: number[] = [];
  for (let i = 0; i < 7; i++)
    for (let j = 0; j < 7; j++) {
      const x = 500000 + 57 + i * 114,
        y = 5700000 + 57 + j * 114;
      ids.push(`S${i * 7 + j + 1}`);
      xy.push(x, y);
      s.push(i >= 5 && j <= 1 ? 8 + i + j : 45 - 3 * i + 2 * Math.sin(i * 7.3 + j * 3.1));
    }
  const n = ids.length;
  const nan = () => new Float64Array(n).fill(NaN);
  const zero = () => new Int8Array(n);
  const values = {
    no3_n: nan(),
    p: nan(),
    k: nan(),
    so4_s: new Float64Array(s),
    om: nan(),
    ph: nan(),
  } as Record<Analyte, Float64Array>;
  const censored = { no3_n: zero(), p: zero(), k: zero(), so4_s: zero(), om: zero(), ph: zero() } as Record<
    Analyte,
    Int8Array
  >;
  const samples: Samples = {
    ids,
    lonlat: new Float64Array(2 * n),
    xy: new Float64Array(xy),
    values,
    censored,
    texture: ids.map(() => null),
    zone: ids.map(() => null),
    pMethod: 'olsen',
    origin: ids.map((_, i) => `synthetic row ${i + 1}`),
  };
  const ring = new Float64Array([
    500000, 5700000, 500800, 5700000, 500800, 5700800, 500000, 5700800, 500000, 5700000,
  ]);
  const field: Field = {
    name: 'synthetic',
    lonlat: [],
    parts: [{ exterior: ring, holes: [] }],
    utm: { zone: 13, south: false, epsg: 32613, proj4: '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs' },
    areaM2: 640000,
    bbox: [500000, 5700000, 500800, 5700800],
  };
  return { samples, field };
}

describe('analyzeVariability on sulphate-S', () => {
  it('lists the low samples, says a composite hides them, states the floor', () => {
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    // default threshold: 20 lb S/ac ([published] Canola Encyclopedia, responses below 20-30 lb/ac)
    expect(r.threshold?.value).toBe(20);
    expect(defaultThreshold('so4_s')?.source).toMatch(/Canola Encyclopedia/);
    expect(r.low.map((l) => l.id).sort()).toEqual(['S36', 'S37', 'S43', 'S44']);
    expect(r.shareBelow?.samples).toBeCloseTo(4 / 49, 12);
    expect(r.sulphur?.compositeReadsNotLow).toBe(true);
    expect(r.sulphur?.compositeHidesLow).toBe(true);
    expect(r.sulphur?.notLowIsUncertain).toMatch(/not low says little/);
    expect(r.sulphur?.floor).toBe(10); // common practice: about 10 lb S/ac for canola regardless of test
    expect(r.semivariogram.np.length).toBeGreaterThan(3);
    expect(r.sampling.text).toMatch(/ac per sample/);
    // a surface with half its area below the threshold
    const r2 = analyzeVariability(
      samples,
      field,
      {},
      { values: [5, 30, 10, 40], fraction: [1, 1, 1, 1], cell: 400 },
    );
    expect(r2.shareBelow?.area).toBe(0.5);
    expect(r2.shareBelow?.areaAc).toBeCloseTo(320000 / 4046.8564224, 9);
  });

  it('no S statements for other nutrients; no threshold for nitrate', () => {
    const { samples, field } = syntheticField();
    samples.values.no3_n = samples.values.so4_s;
    const r = analyzeVariability(samples, field, { nutrient: 'no3_n' });
    expect(r.sulphur).toBeNull();
    expect(r.threshold).toBeNull();
    expect(r.low).toEqual([]);
  });

  it('charts carry titles, axis labels with units, legends and the low-sample marks', () => {
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    const sv = semivariogramSvg({
      semivariogram: r.semivariogram,
      fits: r.fits,
      best: r.best,
      label: r.label,
      unit: r.unit,
    });
    expect(sv).toMatch(/^<svg[^>]+xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    expect(sv).toContain('distance between samples (m)');
    expect(sv).toContain('semivariance (lb S/ac)²');
    expect(sv).toContain('(best fit)');
    const map = sampleMapSvg({
      parts: field.parts,
      xy: samples.xy,
      values: samples.values.so4_s,
      ids: samples.ids,
      label: r.label,
      unit: r.unit,
      threshold: 20,
    });
    expect((map.match(/r="12" fill="none" stroke="#e31a1c"/g) ?? []).length).toBe(4 + 1); // 4 low rings + legend ring
    for (const l of r.low) expect(map).toContain(`${l.id}: `);
    expect(niceTicks(0, 1597, 6, true)).toEqual([0, 500, 1000, 1500, 2000]);
  });
});

describe('text and map with a surface', () => {
  it('the text names the dependence class with its source, the sampling verdict and the S statements', async () => {
    const { variabilityText } = await import('../../src/variability/index.js');
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    const t = variabilityText(r);
    expect(t).toContain('Cambardella et al. 1994');
    expect(t).toContain('ac per sample');
    expect(t).toContain('S36');
    expect(t).toContain('not low says little');
    expect(t).toContain('at least 10 lb S/ac');
  });

  it('zone-composite samples are flagged', () => {
    const { samples, field } = syntheticField();
    samples.zone = samples.ids.map((_, i) => (i < 20 ? 'a' : 'b'));
    expect(analyzeVariability(samples, field).warnings.map((w) => w.code)).toContain(
      'variability.zone-composites',
    );
  });

  it('a surface row of equal colours becomes one rectangle; cells outside the mask are not drawn', () => {
    const grid = {
      xmin: 0,
      ymax: 20,
      cell: 10,
      cols: 3,
      rows: 2,
      mask: new Uint8Array([1, 1, 1, 1, 1, 0]),
      fraction: new Float32Array(6).fill(1),
    };
    const svg = sampleMapSvg({
      parts: [{ exterior: new Float64Array([0, 0, 30, 0, 30, 20, 0, 20, 0, 0]), holes: [] }],
      xy: new Float64Array([5, 5]),
      values: [1],
      ids: ['A'],
      label: 'x',
      unit: 'u',
      threshold: null,
      surface: { grid, values: [1, 1, 1, 1, 9, 9] },
    });
    // row 0: one run of three equal cells; row 1: two runs (1 and 9), the masked cell skipped
    const g = svg.slice(svg.indexOf('<g opacity'), svg.indexOf('</g>'));
    expect((g.match(/<rect /g) ?? []).length).toBe(3);
  });
});

describe('thresholds', () => {
  it('P "low" is <= 10 ppm Olsen, <= 17 ppm modified Kelowna ([published] Canola Encyclopedia), so 10 itself counts', () => {
    expect(defaultThreshold('p', 'olsen')).toMatchObject({ value: 10, inclusive: true });
    expect(defaultThreshold('p', 'kelowna')).toMatchObject({ value: 17, inclusive: true });
    expect(defaultThreshold('k')?.value).toBe(125); // common practice
    expect(defaultThreshold('no3_n')).toBeNull();
    const { samples, field } = syntheticField();
    samples.values.p = new Float64Array(samples.ids.length).fill(30);
    samples.values.p[3] = 10;
    samples.values.p[4] = 10.5;
    const r = analyzeVariability(samples, field, { nutrient: 'p' });
    expect(r.low.map((l) => l.id)).toEqual(['S4']);
    expect(sampleShareBelow([10, 11], 10, true)).toBe(0.5);
    expect(areaShareBelow([10, 11], [1, 1], 10, true).share).toBe(0.5);
  });
});

describe('report charts', () => {
  it('the report embeds the variability charts (the same SVG) with captions carrying the findings', async () => {
    const { variabilityReportCharts } = await import('../../src/variability/index.js');
    const { renderReport } = await import('../../src/report/index.js');
    const { demoInput } = await import('../helpers/report-fixture.js');
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    const charts = variabilityReportCharts(r, samples, field);
    expect(charts.map((c) => c.title)).toEqual([
      'Semivariogram of sulphate-S (0-24 in)',
      'sulphate-S (0-24 in): low spots',
    ]);
    expect(charts[1].caption).toContain('S36');
    const inp = demoInput();
    inp.charts = charts;
    const html = renderReport(inp);
    const uris = [...html.matchAll(/src="data:image\/svg\+xml;base64,([^"]+)"/g)].map((m) =>
      Buffer.from(m[1], 'base64').toString('utf8'),
    );
    expect(uris).toContain(charts[0].svg);
    expect(uris).toContain(charts[1].svg);
  });
});
