/**
 * IDW properties (fast-check) with a brute-force oracle: every sample distance computed, sorted, the k
 * nearest weighted 1/d^p (the definition in GDAL's gdal_grid documentation for invdistnn).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { idwSurface } from '../../src/surface/idw.js';
import { buildBuckets, KnnGroup } from '../../src/surface/knn.js';
import { bruteKnn } from '../helpers/oracles.js';

const OX = 600000,
  OY = 5500000;

const caseArb = fc.record({
  n: fc.integer({ min: 1, max: 120 }),
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
  k: fc.constantFrom(1, 3, 8, 12, 16, Infinity),
  power: fc.constantFrom(1, 1.5, 2, 3),
  cell: fc.constantFrom(3, 10, 25),
  cols: fc.integer({ min: 1, max: 40 }),
  rows: fc.integer({ min: 1, max: 40 }),
  radius: fc.constantFrom(Infinity, 60, 200),
  clustered: fc.boolean(),
});

function samples(c: {
  n: number;
  seed: number;
  cell: number;
  cols: number;
  rows: number;
  clustered: boolean;
}) {
  let s = c.seed;
  const rnd = () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
  const xy = new Float64Array(2 * c.n),
    z = new Float64Array(c.n);
  const W = c.cols * c.cell,
    H = c.rows * c.cell;
  for (let i = 0; i < c.n; i++) {
    // some samples outside the grid; clustered sets put most in one corner; some on cell centres
    const spread = c.clustered && i % 4 ? 0.2 : 1.4;
    xy[2 * i] = OX - 0.2 * W + rnd() * W * spread;
    xy[2 * i + 1] = OY - 0.2 * H + rnd() * H * spread;
    if (i % 9 === 0) {
      xy[2 * i] = OX + (Math.floor(rnd() * c.cols) + 0.5) * c.cell;
      xy[2 * i + 1] = OY + H - (Math.floor(rnd() * c.rows) + 0.5) * c.cell;
    }
    z[i] = Math.round(rnd() * 1000) / 10;
  }
  return { xy, z, grid: { xmin: OX, ymax: OY + H, cell: c.cell, cols: c.cols, rows: c.rows } };
}

function brute(
  xy: Float64Array,
  z: Float64Array,
  qx: number,
  qy: number,
  k: number,
  p: number,
  radius: number,
): number {
  const { d2, idx } = bruteKnn(xy, qx, qy, k, radius * radius);
  if (d2.length === 0) return NaN;
  if (d2[0] < 1e-13) return z[idx[0]];
  let num = 0,
    den = 0;
  d2.forEach((d, j) => {
    const w = 1 / Math.pow(Math.sqrt(d), p);
    num += w * z[idx[j]];
    den += w;
  });
  return num / den;
}

describe('idwSurface', () => {
  it('agrees with the brute-force oracle cell by cell (1e-9 relative)', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const { xy, z, grid } = samples(c);
        const v = idwSurface(xy, z, grid, { neighbours: c.k, power: c.power, radius: c.radius });
        for (let r = 0; r < c.rows; r++)
          for (let col = 0; col < c.cols; col++) {
            const want = brute(
              xy,
              z,
              OX + (col + 0.5) * c.cell,
              grid.ymax - (r + 0.5) * c.cell,
              c.k,
              c.power,
              c.radius,
            );
            const got = v[r * c.cols + col];
            if (Number.isNaN(want)) expect(got).toBeNaN();
            else expect(Math.abs(got - want)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(want)));
          }
      }),
      { numRuns: 60, seed: 11 },
    );
  });

  it("stays within the samples' min and max; a cell on a sample equals it", () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const { xy, z, grid } = samples(c);
        const v = idwSurface(xy, z, grid, { neighbours: c.k, power: c.power });
        const lo = Math.min(...z),
          hi = Math.max(...z);
        for (const x of v) {
          expect(x).toBeGreaterThanOrEqual(lo);
          expect(x).toBeLessThanOrEqual(hi);
        }
        for (let i = 0; i < c.n; i += 9) {
          const col = Math.round((xy[2 * i] - OX) / c.cell - 0.5),
            r = Math.round((grid.ymax - xy[2 * i + 1]) / c.cell - 0.5);
          if (col < 0 || r < 0 || col >= c.cols || r >= c.rows) continue;
          // on a cell centre by construction (make-up above); later samples may share the cell centre
          const same = [...Array(c.n).keys()].filter(
            (j) => xy[2 * j] === xy[2 * i] && xy[2 * j + 1] === xy[2 * i + 1],
          );
          expect(same.map((j) => z[j])).toContain(v[r * c.cols + col]);
        }
      }),
      { numRuns: 60, seed: 12 },
    );
  });

  it('does not change when all coordinates shift (grid and samples by whole cells and by fractions)', () => {
    fc.assert(
      fc.property(
        caseArb,
        fc.integer({ min: -1000, max: 1000 }),
        fc.integer({ min: -1000, max: 1000 }),
        (c, sx, sy) => {
          const { xy, z, grid } = samples(c);
          const dx = sx * 10.25,
            dy = sy * 7.5;
          const moved = xy.map((v, i) => v + (i % 2 ? dy : dx));
          const a = idwSurface(xy, z, grid, { neighbours: c.k, power: c.power, radius: c.radius });
          const b = idwSurface(
            moved,
            z,
            { ...grid, xmin: grid.xmin + dx, ymax: grid.ymax + dy },
            { neighbours: c.k, power: c.power, radius: c.radius },
          );
          for (let i = 0; i < a.length; i++) {
            if (Number.isNaN(a[i])) {
              expect(b[i]).toBeNaN();
              continue;
            }
            expect(Math.abs(a[i] - b[i])).toBeLessThanOrEqual(1e-7 * Math.max(1, Math.abs(a[i])));
          }
        },
      ),
      { numRuns: 40, seed: 13 },
    );
  });

  it('computes only where fraction > 0 (NaN elsewhere)', () => {
    const { xy, z, grid } = samples({ n: 30, seed: 5, cell: 10, cols: 6, rows: 5, clustered: false });
    const fraction = new Float32Array(30);
    fraction[3] = 0.25;
    fraction[17] = 1;
    const v = idwSurface(xy, z, { ...grid, fraction }, { neighbours: 8 });
    v.forEach((x, i) => (i === 3 || i === 17 ? expect(x).not.toBeNaN() : expect(x).toBeNaN()));
  });
});

describe('KnnGroup (bucketed, proven k nearest)', () => {
  it('finds the same neighbours as brute force, excluding a skipped sample', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 300 }),
        fc.integer({ min: 1, max: 20 }),
        fc.integer({ min: 1, max: 2 ** 30 }),
        fc.constantFrom(1, 5, 40),
        (n, k, seed, size) => {
          let s = seed;
          const rnd = () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
          const xy = new Float64Array(2 * n).map(() => Math.round(rnd() * 2000) / 10);
          const nx = Math.ceil(200 / size),
            b = buildBuckets(xy, size, 0, 0, nx, nx);
          const g = new KnnGroup(b, k);
          for (let q = 0; q < 30; q++) {
            const qx = rnd() * 240 - 20,
              qy = rnd() * 240 - 20,
              skip = q % 3 === 0 ? q % n : -1;
            const bx = Math.min(nx - 1, Math.max(0, Math.floor(qx / size))),
              by = Math.min(nx - 1, Math.max(0, Math.floor(qy / size)));
            g.begin(bx, bx, by, by, 1);
            const found = g.nearest(qx, qy, skip, true);
            const want = bruteKnn(xy, qx, qy, k, Infinity, skip);
            expect(found).toBe(want.d2.length);
            expect([...g.d2.subarray(0, found)]).toEqual(want.d2);
          }
        },
      ),
      { numRuns: 80, seed: 14 },
    );
  });
});
