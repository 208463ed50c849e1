/**
 * Worker threads for the per-cell surface work (src/surface/parallel.ts): the same Float64 values bit for
 * bit with 1, 2 and 3 threads, whichever thread computes which band, on a seeded field; workers from the
 * TypeScript sources (bin/tilth.js through tsx, as the CLI starts them when dist/ is stale). The bundled
 * worker (dist/surface-worker.mjs) is checked by tests/cli/threads.cli.test.ts.
 */
import { Worker } from 'node:worker_threads';
import { afterEach, describe, expect, it } from 'vitest';
import { idwSurfaces, type IdwSpec } from '../../src/surface/idw.js';
import { nutrientSurfaces } from '../../src/surface/nutrientSurface.js';
import { PARALLEL_MIN_CELLS, SurfacePool, type SurfaceThreads } from '../../src/surface/parallel.js';
import { fieldGrid } from '../../src/surface/grid.js';
import { orient } from '../../src/geo/field.js';
import { startSurfaceWorker } from '../../src/cli/threads.js';
import { ANALYTES, type Analyte } from '../../src/types.js';

const OX = 600000,
  OY = 5500000;

function lcg(seed: number) {
  let s = seed;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
}

/** A seeded 900 m x 700 m field at 2 m cells (157 500 cells) with n samples, some on a lattice (equal distances). */
function field(n: number, seed: number) {
  const rect = new Float64Array(
    [0, 0, 900, 0, 900, 700, 300, 700, 0, 400, 0, 0].map((v, i) => v + (i % 2 ? OY : OX)),
  );
  const grid = fieldGrid({ parts: [{ exterior: orient(rect, true), holes: [] }], name: 'seeded field' }, 2);
  const rnd = lcg(seed);
  const xy = Float64Array.from({ length: 2 * n }, (_, i) =>
    i % 6 < 2
      ? i % 2
        ? OY + 20 * Math.round(rnd() * 35)
        : OX + 20 * Math.round(rnd() * 45)
      : i % 2
        ? OY + rnd() * 700
        : OX + rnd() * 900,
  );
  const values = Object.fromEntries(
    ANALYTES.map((a) => [a, Float64Array.from({ length: n }, () => Math.round(rnd() * 500) / 10)]),
  ) as Record<Analyte, Float64Array>;
  return { grid, xy, values };
}

const pools: SurfacePool[] = [];
afterEach(() => {
  for (const p of pools.splice(0)) p.close();
});

async function pool(threads: number, onBands?: (perThread: number[]) => void): Promise<SurfacePool> {
  const p = SurfacePool.start({ threads, startWorker: startSurfaceWorker, minCells: 0, onBands }, 1)!;
  pools.push(p);
  await p.ready(); // the workers take part from the first band
  return p;
}

describe('surface worker threads', () => {
  const { grid, xy, values } = field(800, 11);
  const specs: IdwSpec[] = [
    { z: values.p, power: 2, neighbours: 12 },
    { z: values.k, power: 1.5, neighbours: 16 },
    { z: values.om, power: 2, neighbours: 8 },
    { z: values.so4_s, power: 2.5, neighbours: 12 },
    { z: values.no3_n.subarray(0, 40), power: 2, neighbours: Infinity }, // every sample, no search
  ];
  const xy40 = xy.subarray(0, 80);

  it('1, 2 and 3 threads give the same Float64 values bit for bit (searched and every-sample surfaces)', async () => {
    const one = idwSurfaces(xy, specs.slice(0, 4), grid);
    const oneAll = idwSurfaces(xy40, specs.slice(4), grid);
    for (const threads of [2, 3]) {
      let counts: number[] = [];
      const p = await pool(threads, (c) => (counts = c));
      const many = idwSurfaces(xy, specs.slice(0, 4), grid, { pool: p });
      expect(counts.length).toBe(threads);
      expect(counts.slice(1).reduce((a, b) => a + b, 0)).toBeGreaterThan(0); // the workers did bands
      const manyAll = idwSurfaces(xy40, specs.slice(4), grid, { pool: p });
      many.forEach((v, s) => expect(Buffer.compare(bytes(v), bytes(one[s]))).toBe(0));
      expect(Buffer.compare(bytes(manyAll[0]), bytes(oneAll[0]))).toBe(0);
      expect(many[0].buffer).toBeInstanceOf(SharedArrayBuffer);
    }
  });

  it('nutrientSurfaces with threads equals it without (cross-validated choice, every nutrient)', () => {
    const samples = {
      xy,
      values,
      ids: [...Array(800).keys()].map((i) => `S${i}`),
      zone: Array(800).fill(null),
    };
    const list: Analyte[] = ['no3_n', 'p', 'k', 'so4_s', 'om'];
    const threads: SurfaceThreads = { threads: 3, startWorker: startSurfaceWorker, minCells: 0 };
    const a = nutrientSurfaces(samples, list, grid, null, { neighbourChoices: [8, 12] });
    const b = nutrientSurfaces(samples, list, grid, null, { neighbourChoices: [8, 12], threads });
    list.forEach((_, i) => {
      expect(Buffer.compare(bytes(b[i].values), bytes(a[i].values))).toBe(0);
      expect({ ...b[i], values: null }).toEqual({ ...a[i], values: null });
    });
  });

  it('a worker that cannot start leaves its bands to this thread (same values)', () => {
    let counts: number[] = [];
    const broken: SurfaceThreads = {
      threads: 3,
      startWorker: () => new Worker('throw new Error("no worker here")', { eval: true }),
      minCells: 0,
      onBands: (c) => (counts = c),
    };
    const p = SurfacePool.start(broken, 1)!;
    pools.push(p);
    const v = idwSurfaces(xy, specs.slice(0, 1), grid, { pool: p });
    expect(Buffer.compare(bytes(v[0]), bytes(idwSurfaces(xy, specs.slice(0, 1), grid)[0]))).toBe(0);
    expect(counts.slice(1)).toEqual([0, 0]);
  });

  it('no pool for one thread or a small grid (below PARALLEL_MIN_CELLS); at most one thread per quarter of it', () => {
    let started = 0;
    const t = { threads: 64, startWorker: () => (started++, startSurfaceWorker()) };
    expect(SurfacePool.start({ ...t, threads: 1 }, 10_000_000)).toBeNull();
    expect(SurfacePool.start(t, PARALLEL_MIN_CELLS - 1)).toBeNull();
    expect(SurfacePool.start(undefined, 10_000_000)).toBeNull();
    expect(started).toBe(0);
    const p = SurfacePool.start(t, PARALLEL_MIN_CELLS)!; // room for 4 threads: 3 workers
    pools.push(p);
    expect(started).toBe(3);
  });
});

function bytes(v: Float64Array): Buffer {
  return Buffer.from(v.buffer, v.byteOffset, v.byteLength);
}
