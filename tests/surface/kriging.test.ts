/**
 * Ordinary kriging properties (fast-check) against a brute-force oracle: the full bordered system
 * [C 1; 1' 0] [w; mu] = [c0; 1] solved by Gaussian elimination with partial pivoting on plain arrays
 * (textbook ordinary kriging, e.g. Webster & Oliver 2007, Geostatistics for Environmental Scientists, ch. 8),
 * with every sample a neighbour. The gstat comparison is in kriging.gstat.test.ts.
 * Also the surface stage's use of kriging: refusals with reasons, the auto choice, the grid's variance.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { covariance, krigingSurface, type KrigingModel } from '../../src/surface/kriging.js';
import { krigingAtPoints } from '../../src/surface/krigingCv.js';
import { fieldGrid } from '../../src/surface/grid.js';
import { nutrientSurface } from '../../src/surface/nutrientSurface.js';
import { chooseVariogram } from '../../src/surface/variogram.js';
import { orient } from '../../src/geo/field.js';
import { isUserError } from '../../src/errors.js';
import { ANALYTES, type Analyte } from '../../src/types.js';

/** Textbook ordinary kriging at one point with all samples: Gaussian elimination on the bordered system. */
function oracle(
  xy: number[],
  z: number[],
  x: number,
  y: number,
  m: KrigingModel,
): { mean: number; variance: number } {
  const n = z.length;
  const A: number[][] = [];
  for (let i = 0; i <= n; i++) {
    const row: number[] = [];
    for (let j = 0; j <= n; j++) {
      if (i === n || j === n) row.push(i === n && j === n ? 0 : 1);
      else row.push(covariance(m, (xy[2 * i] - xy[2 * j]) ** 2 + (xy[2 * i + 1] - xy[2 * j + 1]) ** 2));
    }
    const c0 = i === n ? 1 : covariance(m, (xy[2 * i] - x) ** 2 + (xy[2 * i + 1] - y) ** 2);
    row.push(c0);
    A.push(row);
  }
  for (let c = 0; c <= n; c++) {
    let p = c;
    for (let r = c + 1; r <= n; r++) if (Math.abs(A[r][c]) > Math.abs(A[p][c])) p = r;
    [A[c], A[p]] = [A[p], A[c]];
    for (let r = 0; r <= n; r++) {
      if (r === c) continue;
      const f = A[r][c] / A[c][c];
      for (let k = c; k <= n + 1; k++) A[r][k] -= f * A[c][k];
    }
  }
  const sol = A.map((r, i) => r[n + 1] / r[i]);
  let mean = 0,
    wc = 0;
  for (let i = 0; i < n; i++) {
    mean += sol[i] * z[i];
    wc += sol[i] * covariance(m, (xy[2 * i] - x) ** 2 + (xy[2 * i + 1] - y) ** 2);
  }
  return { mean, variance: m.nugget + m.psill - wc - sol[n] };
}

const modelArb = fc.record({
  kind: fc.constantFrom('spherical' as const, 'exponential' as const, 'gaussian' as const),
  nugget: fc.double({ min: 0, max: 5, noNaN: true }),
  psill: fc.double({ min: 0.5, max: 50, noNaN: true }),
  range: fc.double({ min: 20, max: 300, noNaN: true }),
});
// samples on a jittered 6 x 6 lattice (60 m apart): no two closer than 20 m, so every model's matrix is well conditioned
const samplesArb = fc
  .array(
    fc.tuple(
      fc.double({ min: -20, max: 20, noNaN: true }),
      fc.double({ min: -20, max: 20, noNaN: true }),
      fc.double({ min: 1, max: 60, noNaN: true }),
    ),
    { minLength: 36, maxLength: 36 },
  )
  // a fixed irregular offset per sample keeps shrunk cases (jitter 0) free of exact distance ties, where rounding
  // in different coordinate frames could pick different, equally near neighbours
  .map((a) => ({
    xy: a.flatMap(([dx, dy], i) => [
      30 + (i % 6) * 60 + dx + 3 * Math.sin(i * 12.9898),
      30 + Math.floor(i / 6) * 60 + dy + 3 * Math.cos(i * 78.233),
    ]),
    z: a.map((t) => t[2]),
  }));

describe('ordinary kriging: properties against the textbook system', () => {
  it('with every sample a neighbour, mean and variance equal the bordered-system oracle; variance >= 0', () => {
    fc.assert(
      fc.property(
        modelArb,
        samplesArb,
        fc.double({ min: 0, max: 360, noNaN: true }),
        fc.double({ min: 0, max: 360, noNaN: true }),
        (m, s, x, y) => {
          const model = m.kind === 'gaussian' ? { ...m, nugget: m.nugget + 0.01 * m.psill } : m; // Gaussian without nugget is ill-conditioned
          const r = krigingAtPoints(Float64Array.from(s.xy), s.z, new Float64Array([x, y]), model, {
            neighbours: 36,
          });
          const o = oracle(s.xy, s.z, x, y, model);
          const sill = model.nugget + model.psill;
          expect(Math.abs(r.mean[0] - o.mean)).toBeLessThan(1e-7 * 60);
          expect(Math.abs(r.variance[0] - Math.max(0, o.variance))).toBeLessThan(1e-7 * sill);
          expect(r.variance[0]).toBeGreaterThanOrEqual(0);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('on the grid: variance >= 0 everywhere; at cells centred on samples the value is the sample and the variance 0', () => {
    fc.assert(
      fc.property(
        modelArb,
        fc.array(
          fc.tuple(
            fc.integer({ min: 0, max: 29 }),
            fc.integer({ min: 0, max: 29 }),
            fc.double({ min: 1, max: 60, noNaN: true }),
          ),
          { minLength: 5, maxLength: 40 },
        ),
        fc.integer({ min: 1, max: 20 }),
        (m0, cells, k) => {
          const model = {
            ...m0,
            nugget: 0,
            kind: m0.kind === 'gaussian' ? ('exponential' as const) : m0.kind,
          };
          const seen = new Set<number>();
          const pts = cells.filter(([c, r]) => !seen.has(r * 30 + c) && seen.add(r * 30 + c));
          // sample i at the centre of cell (c, r) of a 10 m grid whose north-west corner is (0, 300)
          const xy = Float64Array.from(pts.flatMap(([c, r]) => [(c + 0.5) * 10, 300 - (r + 0.5) * 10]));
          const res = krigingSurface(
            xy,
            pts.map((p) => p[2]),
            { xmin: 0, ymax: 300, cell: 10, cols: 30, rows: 30 },
            model,
            { neighbours: k },
          );
          for (let i = 0; i < 900; i++) expect(res.variance[i]).toBeGreaterThanOrEqual(0);
          pts.forEach(([c, r, v]) => {
            expect(res.values[r * 30 + c]).toBe(v);
            expect(res.variance[r * 30 + c]).toBe(0);
          });
        },
      ),
      { numRuns: 40 },
    );
  });

  it('the grid interpolator equals the point interpolator at cell centres (neighbour-set reuse changes nothing)', () => {
    fc.assert(
      fc.property(modelArb, samplesArb, fc.integer({ min: 3, max: 20 }), (m, s, k) => {
        const model = m.kind === 'gaussian' ? { ...m, nugget: m.nugget + 0.01 * m.psill } : m;
        const grid = { xmin: 0, ymax: 360, cell: 15, cols: 24, rows: 24 };
        const g = krigingSurface(Float64Array.from(s.xy), s.z, grid, model, { neighbours: k });
        const q = new Float64Array(2 * 576);
        for (let i = 0; i < 576; i++) {
          q[2 * i] = ((i % 24) + 0.5) * 15;
          q[2 * i + 1] = 360 - (Math.floor(i / 24) + 0.5) * 15;
        }
        const p = krigingAtPoints(Float64Array.from(s.xy), s.z, q, model, { neighbours: k });
        for (let i = 0; i < 576; i++) {
          expect(Math.abs(g.values[i] - p.mean[i])).toBeLessThan(1e-9 * 60);
          expect(Math.abs(g.variance[i] - p.variance[i])).toBeLessThan(1e-9 * (model.nugget + model.psill));
        }
      }),
      { numRuns: 25 },
    );
  });

  it('with `cells`, only those cells are computed, in their order, as in the whole grid', () => {
    fc.assert(
      fc.property(
        modelArb,
        samplesArb,
        fc.integer({ min: 3, max: 20 }),
        fc.integer({ min: 2, max: 5 }),
        (m, s, k, f) => {
          const model = m.kind === 'gaussian' ? { ...m, nugget: m.nugget + 0.01 * m.psill } : m;
          const grid = { xmin: 0, ymax: 360, cell: 15, cols: 24, rows: 24 };
          const whole = krigingSurface(Float64Array.from(s.xy), s.z, grid, model, { neighbours: k });
          // every f-th cell each way, as a map shown f times coarser picks them
          const list: number[] = [];
          for (let r = f >> 1; r < 24; r += f) for (let c = f >> 1; c < 24; c += f) list.push(r * 24 + c);
          const cells = Int32Array.from(list);
          const some = krigingSurface(Float64Array.from(s.xy), s.z, grid, model, { neighbours: k, cells });
          expect(some.values.length).toBe(cells.length);
          cells.forEach((i, j) => {
            expect(Math.abs(some.values[j] - whole.values[i])).toBeLessThan(1e-9 * 60);
            expect(Math.abs(some.variance[j] - whole.variance[i])).toBeLessThan(
              1e-9 * (model.nugget + model.psill),
            );
          });
        },
      ),
      { numRuns: 15 },
    );
  });
});

const OX = 400000,
  OY = 5800000;
const FIELD = {
  parts: [
    {
      exterior: orient(
        new Float64Array([0, 0, 600, 0, 600, 600, 0, 600, 0, 0].map((v, i) => v + (i % 2 ? OY : OX))),
        true,
      ),
      holes: [],
    },
  ],
  name: 'test field',
};

function samples(pts: [number, number, number][]) {
  const values = Object.fromEntries(
    ANALYTES.map((a) => [a, new Float64Array(pts.length).fill(NaN)]),
  ) as Record<Analyte, Float64Array>;
  pts.forEach(([, , v], i) => (values.so4_s[i] = v));
  return {
    ids: pts.map((_, i) => `S${i + 1}`),
    xy: new Float64Array(pts.flatMap(([x, y]) => [x + OX, y + OY])),
    values,
    zone: pts.map(() => null),
  };
}

/** 64 samples on an 8 x 8 grid, 75 m apart, with a smooth pattern (spatially structured) or a checkerboard-free scramble. */
function lattice(value: (x: number, y: number, i: number) => number): [number, number, number][] {
  const out: [number, number, number][] = [];
  for (let i = 0; i < 64; i++) {
    const x = 37.5 + (i % 8) * 75,
      y = 37.5 + Math.floor(i / 8) * 75;
    out.push([x, y, value(x, y, i)]);
  }
  return out;
}

describe('the surface stage with kriging', () => {
  const grid = fieldGrid(FIELD, 10);
  const smooth = samples(lattice((x, y) => 20 + 10 * Math.sin(x / 120) * Math.cos(y / 150)));

  it('kriging: values, variance and the model in the result; CV row with MSSE; choice says it was asked for', () => {
    const s = nutrientSurface(smooth, 'so4_s', grid, null, { method: 'kriging' });
    expect(s.method).toBe('kriging');
    expect(s.kriging?.model).not.toBeNull();
    expect(s.cv!.table).toHaveLength(1);
    expect(s.cv!.best.method).toBe('kriging');
    expect(s.cv!.best.msse).toBeGreaterThan(0);
    expect(s.choice).toMatch(/ordinary kriging as asked/);
    for (let i = 0; i < s.values.length; i++)
      if (grid.fraction[i] > 0) expect(s.variance![i]).toBeGreaterThanOrEqual(0);
  });

  it('auto: the lowest leave-one-out RMSE of IDW and kriging is used and the choice names both', () => {
    const s = nutrientSurface(smooth, 'so4_s', grid, null, { method: 'auto' });
    const best = Math.min(...s.cv!.table.map((r) => r.rmse));
    expect(s.cv!.best.rmse).toBe(best);
    expect(s.cv!.table.filter((r) => r.method === 'kriging')).toHaveLength(1);
    expect(s.choice).toMatch(/RMSE .* against/);
  });

  it('refuses kriging with too few samples: UserError for kriging, IDW with a warning for auto', () => {
    const few = samples(lattice((x, y) => 20 + x / 50 + y / 70).slice(0, 20));
    try {
      nutrientSurface(few, 'so4_s', grid, null, { method: 'kriging' });
      expect.unreachable();
    } catch (e) {
      expect(isUserError(e)).toBe(true);
      expect(String((e as Error).message)).toMatch(/only 20 samples; kriging needs at least 30/);
    }
    const s = nutrientSurface(few, 'so4_s', grid, null, { method: 'auto' });
    expect(s.method).toBe('idw');
    expect(s.warnings.map((w) => w.code)).toContain('surface-kriging-refused');
  });

  it('refuses a pure-nugget semivariogram (values unrelated to position)', () => {
    // a fixed pseudo-random sequence: no spatial structure
    let seed = 12345;
    const rnd = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 4294967296;
    const noise = lattice(() => 20 + 10 * rnd());
    const c = chooseVariogram(
      new Float64Array(noise.flatMap(([x, y]) => [x, y])),
      noise.map((p) => p[2]),
    );
    expect(c.model).toBeNull();
    expect(c.refused).toMatch(/no usable semivariogram model|pure nugget/);
  });

  it('log: refuses values of 0; back-transformed values are positive', () => {
    const zero = samples(lattice((x, y, i) => (i === 3 ? 0 : 20 + x / 50 + y / 70)));
    expect(() =>
      nutrientSurface(zero, 'so4_s', grid, null, { method: 'kriging', kriging: { log: true } }),
    ).toThrow(/no logarithm/);
    const s = nutrientSurface(smooth, 'so4_s', grid, null, { method: 'kriging', kriging: { log: true } });
    expect(s.kriging!.transform).toBe('log');
    for (let i = 0; i < s.values.length; i++)
      if (grid.fraction[i] > 0) expect(s.values[i]).toBeGreaterThan(0);
  });
});
