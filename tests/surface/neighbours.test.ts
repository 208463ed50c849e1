/**
 * One neighbour search for every surface: the shared cell and sample searches against a brute-force oracle
 * (every distance computed and sorted by distance, then index), and the shared paths (idwSurfaces,
 * crossValidateMany, nutrientSurfaces) bit for bit against one call per surface.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cellNeighbours, sampleNeighbours } from '../../src/surface/neighbours.js';
import { bruteKnn } from '../helpers/oracles.js';
import { idwSurface, idwSurfaces } from '../../src/surface/idw.js';
import { crossValidate, crossValidateMany } from '../../src/surface/crossValidate.js';
import { nutrientSurface, nutrientSurfaces } from '../../src/surface/nutrientSurface.js';
import { fieldGrid } from '../../src/surface/grid.js';
import { medianNearest } from '../../src/variability/sampling.js';
import { findNeighbourOutliers, neighbourOutliers } from '../../src/cli/safety/plausible.js';
import type { Samples } from '../../src/types.js';
import { orient } from '../../src/geo/field.js';
import { ANALYTES, type Analyte } from '../../src/types.js';

const OX = 600000,
  OY = 5500000;

function lcg(seed: number) {
  let s = seed;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
}

/** n seeded samples over (and around) a cols x rows grid; some on a 2 m lattice so equal distances occur. */
function setup(n: number, seed: number, cols: number, rows: number, cell: number) {
  const rnd = lcg(seed);
  const W = cols * cell,
    H = rows * cell;
  const xy = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    const lattice = i % 3 === 0;
    xy[2 * i] = OX - 0.2 * W + (lattice ? Math.round(rnd() * W * 0.7) * 2 : rnd() * W * 1.4);
    xy[2 * i + 1] = OY - 0.2 * H + (lattice ? Math.round(rnd() * H * 0.7) * 2 : rnd() * H * 1.4);
  }
  const zs = [0, 1, 2].map(() => Float64Array.from({ length: n }, () => Math.round(rnd() * 1000) / 10));
  return { xy, zs, grid: { xmin: OX, ymax: OY + H, cell, cols, rows } };
}

const caseArb = fc.record({
  n: fc.integer({ min: 1, max: 150 }),
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
  k: fc.constantFrom(1, 4, 8, 12, 16, 40),
  cell: fc.constantFrom(2, 5, 20),
  cols: fc.integer({ min: 1, max: 30 }),
  rows: fc.integer({ min: 1, max: 30 }),
  radius: fc.constantFrom(Infinity, 15, 80),
});

describe('cellNeighbours (shared k-nearest per cell)', () => {
  it('equals brute force: indices and squared distances, nearest first, ties to the lower index', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const { xy, grid } = setup(c.n, c.seed, c.cols, c.rows, c.cell);
        const nb = cellNeighbours(xy, grid, c.k, { radius: c.radius });
        expect(nb.k).toBe(Math.min(c.k, c.n));
        for (let r = 0; r < c.rows; r++)
          for (let col = 0; col < c.cols; col++) {
            const i = r * c.cols + col;
            const want = bruteKnn(
              xy,
              grid.xmin + (col + 0.5) * c.cell,
              grid.ymax - (r + 0.5) * c.cell,
              c.k,
              c.radius * c.radius,
            );
            expect(nb.found[i]).toBe(want.idx.length);
            expect([...nb.idx.subarray(i * nb.k, i * nb.k + nb.found[i])]).toEqual(want.idx);
            // the search works relative to the grid corner: distances agree to rounding
            want.d2.forEach((d, j) =>
              expect(Math.abs(nb.d2[i * nb.k + j] - d)).toBeLessThanOrEqual(1e-9 * Math.max(1, d)),
            );
          }
      }),
      { numRuns: 60, seed: 21 },
    );
  });

  it('sorted: false (kriging) finds the same neighbours, only not in order', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const { xy, grid } = setup(c.n, c.seed, c.cols, c.rows, c.cell);
        const a = cellNeighbours(xy, grid, c.k, { radius: c.radius });
        const b = cellNeighbours(xy, grid, c.k, { radius: c.radius, sorted: false });
        expect([...b.found]).toEqual([...a.found]);
        for (let i = 0; i < c.cols * c.rows; i++) {
          const pairs = (nb: typeof a) =>
            [...nb.idx.subarray(i * nb.k, i * nb.k + nb.found[i])]
              .map((j, t) => [nb.d2[i * nb.k + t], j])
              .sort((p, q) => p[0] - q[0] || p[1] - q[1]);
          expect(pairs(b)).toEqual(pairs(a));
        }
      }),
      { numRuns: 40, seed: 22 },
    );
  });

  it('searches only where asked (found 0 elsewhere)', () => {
    const { xy, grid } = setup(40, 3, 6, 5, 10);
    const where = new Float32Array(30);
    where[4] = 0.5;
    where[22] = 1;
    const nb = cellNeighbours(xy, grid, 8, { where });
    nb.found.forEach((f, i) => expect(f).toBe(i === 4 || i === 22 ? 8 : 0));
  });
});

describe('sampleNeighbours (leave-one-out)', () => {
  it('equals brute force without the sample itself; every sample searched once', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 200 }),
        fc.integer({ min: 1, max: 2 ** 30 }),
        fc.constantFrom(1, 8, 16, 300),
        fc.constantFrom(Infinity, 25),
        (n, seed, k, radius) => {
          const { xy } = setup(n, seed, 20, 20, 5);
          const nb = sampleNeighbours(xy, k, radius);
          expect([...nb.order].sort((a, b) => a - b)).toEqual([...Array(n).keys()]);
          for (let i = 0; i < n; i++) {
            const want = bruteKnn(xy, xy[2 * i], xy[2 * i + 1], nb.k, radius * radius, i);
            expect([...nb.idx.subarray(i * nb.k, i * nb.k + nb.found[i])]).toEqual(want.idx);
          }
        },
      ),
      { numRuns: 60, seed: 22 },
    );
  });
});

describe('shared search = one search per surface, bit for bit', () => {
  it('idwSurfaces equals idwSurface for each surface (mixed powers and neighbour counts, all, radius)', () => {
    fc.assert(
      fc.property(caseArb, fc.constantFrom(1, 1.5, 2, 3, 2.5), (c, p2) => {
        const { xy, zs, grid } = setup(c.n, c.seed, c.cols, c.rows, c.cell);
        const specs = [
          { z: zs[0], power: 1, neighbours: c.k },
          { z: zs[1], power: p2, neighbours: 8 },
          { z: zs[2], power: 1, neighbours: Infinity },
        ];
        const shared = idwSurfaces(xy, specs, grid, { radius: c.radius });
        specs.forEach((s, i) =>
          expect(shared[i]).toEqual(
            idwSurface(xy, s.z, grid, { power: s.power, neighbours: s.neighbours, radius: c.radius }),
          ),
        );
      }),
      { numRuns: 60, seed: 23 },
    );
  });

  it('crossValidateMany equals crossValidate for each value set', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 120 }),
        fc.integer({ min: 1, max: 2 ** 30 }),
        fc.constantFrom(Infinity, 40),
        (n, seed, radius) => {
          const { xy, zs } = setup(n, seed, 20, 20, 5);
          const many = crossValidateMany(xy, zs, { radius });
          zs.forEach((z, i) => expect(many[i]).toEqual(crossValidate(xy, z, { radius })));
        },
      ),
      { numRuns: 40, seed: 24 },
    );
  });

  it('nutrientSurfaces equals nutrientSurface per nutrient, also when one nutrient misses samples', () => {
    const rect = new Float64Array(
      [0, 0, 300, 0, 300, 200, 0, 200, 0, 0].map((v, i) => v + (i % 2 ? OY : OX)),
    );
    const grid = fieldGrid({ parts: [{ exterior: orient(rect, true), holes: [] }], name: 'test field' }, 5);
    const rnd = lcg(7),
      n = 60;
    const xy = Float64Array.from({ length: 2 * n }, (_, i) => (i % 2 ? OY + rnd() * 200 : OX + rnd() * 300));
    const values = Object.fromEntries(
      ANALYTES.map((a) => [a, Float64Array.from({ length: n }, () => Math.round(rnd() * 500) / 10)]),
    ) as Record<Analyte, Float64Array>;
    values.k[5] = NaN;
    values.k[17] = NaN; // K at other sites than the rest: its own search
    const samples = {
      xy,
      values,
      ids: [...Array(n).keys()].map((i) => `S${i + 1}`),
      zone: Array(n).fill(null),
    };
    const list: Analyte[] = ['no3_n', 'p', 'k', 'so4_s', 'om'];
    const shared = nutrientSurfaces(samples, list, grid);
    list.forEach((a, i) => expect(shared[i]).toEqual(nutrientSurface(samples, a, grid)));
  });
});

describe('medianNearest (variability) on the shared search', () => {
  it('equals a brute-force scan of every pair (Math.hypot), duplicates and lattice ties included', () => {
    fc.assert(
      fc.property(fc.integer({ min: 2, max: 150 }), fc.integer({ min: 1, max: 2 ** 30 }), (n, seed) => {
        const { xy } = setup(n, seed, 15, 15, 4);
        if (n > 3) {
          xy[2] = xy[0];
          xy[3] = xy[1];
        } // two samples at one place
        const d: number[] = [];
        for (let i = 0; i < n; i++) {
          let best = Infinity;
          for (let j = 0; j < n; j++)
            if (j !== i)
              best = Math.min(best, Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]));
          d.push(best);
        }
        d.sort((a, b) => a - b);
        const want = n % 2 ? d[(n - 1) / 2] : (d[n / 2 - 1] + d[n / 2]) / 2;
        expect(medianNearest(xy)).toBe(want);
      }),
      { numRuns: 80, seed: 25 },
    );
  });
});

describe('neighbourOutliers (input safety) on the shared search', () => {
  it("each sample's 6 nearest (10 from the search, ordered by Math.hypot) equal a stable sort of every distance", () => {
    fc.assert(
      fc.property(fc.integer({ min: 8, max: 150 }), fc.integer({ min: 1, max: 2 ** 30 }), (n, seed) => {
        const { xy } = setup(n, seed, 12, 12, 5);
        // the oracle: the original every-pair version in src/cli/safety/plausible.ts (stable sort of all distances)
        for (let i = 0; i < n; i++) {
          const d: [number, number][] = [];
          for (let j = 0; j < n; j++)
            if (j !== i) d.push([Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]), j]);
          expect(nearestSix(xy, i)).toEqual(
            d
              .sort((a, b) => a[0] - b[0])
              .slice(0, 6)
              .map((x) => x[1]),
          );
        }
      }),
      { numRuns: 60, seed: 26 },
    );
  });
  it('names the same planted outlier as before (tests/cli/safety/plausible.test.ts has the hand-made cases)', () => {
    const n = 64,
      rnd = lcg(9);
    const xy = Float64Array.from(
      { length: 2 * n },
      (_, i) => (i % 2 ? OY : OX) + Math.floor(i % 2 ? Math.floor(i / 2) / 8 : (i / 2) % 8) * 50 + rnd(),
    );
    const p = Float64Array.from({ length: n }, () => 12 + rnd() * 6);
    p[20] = 180;
    const values = Object.fromEntries(
      ANALYTES.map((a) => [a, a === 'p' ? p : new Float64Array(n).fill(NaN)]),
    );
    const s = { ids: [...Array(n).keys()].map((i) => `S${i + 1}`), xy, values } as unknown as Samples;
    const w = neighbourOutliers(s, 's.csv');
    expect(w.map((x) => x.where)).toEqual([expect.stringMatching(/^"S21" \(180/)]);
  });
});

describe('findNeighbourOutliers against an every-pair oracle', () => {
  it('flags the same values with the same neighbour medians as sorting every distance and every neighbour list', () => {
    // the oracle: every pair's Math.hypot distance, a stable sort, the 6 nearest, their non-NaN values' median by
    // sorting, 1.4826 x the median absolute residual, then z > 5 and a factor of 3 (pH 1.5 units) from the median
    const med = (xs: number[]) => {
      const t = [...xs].sort((a, b) => a - b);
      const m = t.length >> 1;
      return t.length % 2 ? t[m] : (t[m - 1] + t[m]) / 2;
    };
    fc.assert(
      fc.property(fc.integer({ min: 8, max: 120 }), fc.integer({ min: 1, max: 2 ** 30 }), (n, seed) => {
        const { xy } = setup(n, seed, 12, 12, 5);
        const rnd = lcg(seed ^ 0x5bd1e995);
        const values = Object.fromEntries(
          ANALYTES.map((a) => [
            a,
            Float64Array.from({ length: n }, () => {
              const u = rnd();
              // a few missing values, a few planted far-off ones, the rest on a lab's 0.5 steps (ties in medians)
              return u < 0.1
                ? NaN
                : u > 0.95
                  ? 400 + Math.round(rnd() * 100)
                  : 10 + Math.round(rnd() * 20) / 2;
            }),
          ]),
        );
        const s = { ids: [...Array(n).keys()].map((i) => `S${i + 1}`), xy, values } as unknown as Samples;
        const want: { analyte: string; index: number[]; neighbourMedian: number[] }[] = [];
        const near = [...Array(n).keys()].map((i) => {
          const d: [number, number][] = [];
          for (let j = 0; j < n; j++)
            if (j !== i) d.push([Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]), j]);
          return d
            .sort((a, b) => a[0] - b[0])
            .slice(0, 6)
            .map((x) => x[1]);
        });
        for (const a of ['no3_n', 'p', 'k', 'so4_s', 'om', 'ph'] as Analyte[]) {
          const v = values[a];
          const res = near.map((nb, i) => {
            const around = nb.map((j) => v[j]).filter((x) => !Number.isNaN(x));
            return !Number.isNaN(v[i]) && around.length >= 3 ? v[i] - med(around) : NaN;
          });
          const abs = res.filter((x) => !Number.isNaN(x)).map(Math.abs);
          if (abs.length < 6) continue;
          const scale = 1.4826 * med(abs);
          if (!(scale > 0)) continue;
          const f = { analyte: a, index: [] as number[], neighbourMedian: [] as number[] };
          res.forEach((r, i) => {
            const m = v[i] - r;
            const far = a === 'ph' ? Math.abs(v[i] - m) > 1.5 : v[i] > 3 * m || v[i] * 3 < m;
            if (Math.abs(r) / scale > 5 && far) {
              f.index.push(i);
              f.neighbourMedian.push(m);
            }
          });
          if (f.index.length) want.push(f);
        }
        expect(findNeighbourOutliers(s)).toEqual(want);
      }),
      { numRuns: 80, seed: 41 },
    );
  });
});

/** The shared search's six nearest of sample i, ordered by Math.hypot then index (what plausible.ts uses). */
function nearestSix(xy: Float64Array, i: number): number[] {
  const nb = sampleNeighbours(xy, 10);
  const d: [number, number][] = [];
  for (let t = 0; t < nb.found[i]; t++) {
    const j = nb.idx[i * nb.k + t];
    d.push([Math.hypot(xy[2 * i] - xy[2 * j], xy[2 * i + 1] - xy[2 * j + 1]), j]);
  }
  return d
    .sort((a, b) => a[0] - b[0] || a[1] - b[1])
    .slice(0, 6)
    .map((x) => x[1]);
}
