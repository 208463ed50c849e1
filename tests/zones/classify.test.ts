import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  classify,
  classifyVectors,
  jenksUppers,
  kmeans1d,
  majorityFilter,
  minZoneAreaM2,
} from '../../src/zones/index.js';

/** Brute-force natural breaks: every way to cut sorted values into k runs, least total squared deviation. */
function bruteJenks(sorted: number[], k: number): number {
  const ssd = (a: number[]) => {
    const m = a.reduce((s, x) => s + x, 0) / a.length;
    return a.reduce((s, x) => s + (x - m) ** 2, 0);
  };
  let best = Infinity;
  const rec = (start: number, left: number, acc: number) => {
    if (left === 1) {
      best = Math.min(best, acc + ssd(sorted.slice(start)));
      return;
    }
    for (let e = start + 1; e <= sorted.length - left + 1; e++)
      rec(e, left - 1, acc + ssd(sorted.slice(start, e)));
  };
  rec(0, k, 0);
  return best;
}

const totalSsd = (values: number[], classOf: Int16Array) => {
  const groups = new Map<number, number[]>();
  values.forEach((v, i) => {
    const c = classOf[i];
    if (!groups.has(c)) groups.set(c, []);
    groups.get(c)!.push(v);
  });
  let s = 0;
  for (const g of groups.values()) {
    const m = g.reduce((a, b) => a + b, 0) / g.length;
    for (const x of g) s += (x - m) ** 2;
  }
  return s;
};

/** A seeded linear congruential generator in [0, 1) (the constants of Numerical Recipes). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32;
}

describe('classify', () => {
  it('natural breaks reach the least within-class squared deviation (brute-force oracle)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 200 }), { minLength: 4, maxLength: 11 }),
        fc.integer({ min: 2, max: 4 }),
        (ints, k) => {
          const values = ints.map((x) => x / 2);
          const c = classify(Float64Array.from(values), { method: 'jenks', classes: k, step: 0 });
          const distinct = new Set(values).size;
          const want = bruteJenks(
            [...new Set(values)].sort((a, b) => a - b).flatMap((v) => values.filter((x) => x === v)),
            Math.min(k, distinct),
          );
          expect(c.count).toBeLessThanOrEqual(k);
          expect(totalSsd(values, c.classOf)).toBeCloseTo(want, 6);
        },
      ),
      { numRuns: 150 },
    );
  });

  it('jenks on a textbook-style split: two tight groups go to two classes', () => {
    // worked example (by hand): cutting {1,2,3,10,11,12} between 3 and 10 leaves 2 + 2 = 4 squared deviation, any other cut more
    const u = jenksUppers([1, 2, 3, 10, 11, 12], [1, 1, 1, 1, 1, 1], [1, 2, 3, 10, 11, 12], 2);
    expect(u).toEqual([3]);
  });

  it('equal interval breaks split the range evenly', () => {
    const v = Float64Array.from({ length: 101 }, (_, i) => i);
    const c = classify(v, { method: 'equal', classes: 4, step: 0 });
    expect(c.breaks).toEqual([0, 25, 50, 75, 100]);
    expect(c.classOf[25]).toBe(0);
    expect(c.classOf[26]).toBe(1);
  });

  it('quantile classes hold equal shares of the area (weights)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0, max: 100, noNaN: true }), { minLength: 40, maxLength: 200 }),
        (arr) => {
          const v = Float64Array.from(arr);
          const c = classify(v, { method: 'quantile', classes: 4, step: 0 });
          // every class but ties stays within 1/4 of the count plus the largest tie
          const ties = Math.max(...[...new Set(arr)].map((x) => arr.filter((y) => y === x).length));
          for (const w of c.weight) expect(w).toBeLessThanOrEqual(arr.length / 4 + ties + 1);
          expect(c.weight.reduce((a, b) => a + b, 0)).toBe(arr.length);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('k-means: every value sits in the class of its nearest centre, and NaN stays unclassed', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: 5, maxLength: 300 }), (ints) => {
        const v = Float64Array.from([...ints, NaN]);
        const c = classify(v, { method: 'kmeans', classes: 5, step: 0 });
        expect(c.classOf[v.length - 1]).toBe(-1);
        const cs = kmeans1d(
          [...new Set(ints)].sort((a, b) => a - b),
          [...new Set(ints)].sort((a, b) => a - b).map((x) => ints.filter((y) => y === x).length),
          5,
        );
        for (let i = 0; i < ints.length; i++) {
          const d = Math.abs(ints[i] - c.mean[c.classOf[i]]);
          for (const m of c.mean) expect(d).toBeLessThanOrEqual(Math.abs(ints[i] - m) + 1e-9);
        }
        expect(cs.length).toBeGreaterThanOrEqual(c.count);
      }),
      { numRuns: 60 },
    );
  });

  it('representative values are rounded to the step, and the binned summary keeps large grids exact enough', () => {
    const n = 200_000;
    const v = new Float64Array(n);
    for (let i = 0; i < n; i++) v[i] = (i % 1000) / 10 + (i < n / 2 ? 0 : 200); // two groups: 0..99.9 and 200..299.9
    const c = classify(v, { method: 'jenks', classes: 2, step: 5 });
    expect(c.count).toBe(2);
    expect(c.breaks[1]).toBeCloseTo(99.9, 6);
    expect(c.value).toEqual([50, 250]); // means 49.95 and 249.95 rounded to 5
  });
});

describe('classifyVectors (one zone set for several products)', () => {
  it('separates well-separated groups whatever the units, orders classes by need, and skips NaN', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }),
        fc.double({ min: 0.01, max: 1000, noNaN: true }),
        (seed, scale) => {
          // three groups in (N lb/ac, S lb/ac x scale): low, middle, high need; S in arbitrary units must not matter
          const rnd = lcg(seed);
          const n = 300,
            nRate = new Float64Array(n + 1),
            sRate = new Float64Array(n + 1),
            group: number[] = [];
          for (let i = 0; i < n; i++) {
            const g = i % 3;
            group.push(g);
            nRate[i] = [40, 80, 120][g] + 4 * rnd();
            sRate[i] = ([5, 10, 15][g] + 0.5 * rnd()) * scale;
          }
          nRate[n] = NaN;
          sRate[n] = 10;
          const vc = classifyVectors([nRate, sRate], { classes: 3, steps: [5, 0] });
          expect(vc.classOf[n]).toBe(-1);
          expect(vc.count).toBe(3);
          for (let i = 0; i < n; i++) expect(vc.classOf[i]).toBe(group[i]);
          expect(vc.value.map((v) => v[0])).toEqual([40, 80, 120]); // means 42, 82, 122 rounded to 5
        },
      ),
      { numRuns: 40 },
    );
  });
  it('gives the classes and means of the plain cell-by-cell k-means on seeded lab-step data (golden)', () => {
    // golden values recorded with the implementation that found every sample's and every cell's centre on its
    // own (before the shortcuts for repeated vectors); the shortcuts must not change one class or one bit of a mean
    const rnd = lcg(12345);
    const n = 3000,
      dims = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    for (let i = 0; i < n; i++) {
      dims[0][i] = 100 + 5 * Math.floor(rnd() * 8);
      dims[1][i] = 20 + 2.5 * Math.floor(rnd() * 10);
      dims[2][i] = rnd() < 0.3 ? 0 : 10 * Math.floor(rnd() * 3);
    }
    const v = classifyVectors(dims, { classes: 5, seed: 3, sample: 1000 });
    expect(createHash('sha256').update(Buffer.from(v.classOf.buffer)).digest('hex').slice(0, 16)).toBe(
      '052398100a37b3b5',
    );
    expect(v.mean).toEqual([
      [105.53497942386831, 29.386145404663925, 1.7421124828532235],
      [126.33136094674556, 25.236686390532544, 0],
      [124.21550094517958, 25.340264650283554, 15.51984877126654],
      [123.59756097560975, 38.864329268292686, 2.057926829268293],
      [111.50259067357513, 35.88946459412781, 17.202072538860104],
    ]);
  });
  it('four dimensions (written-out loops) give what the general loops give, bit for bit', () => {
    // the general loops run when a fifth dimension is all 0: it standardizes to 0 and adds 0 to every distance,
    // so classes, weights and means must be those of the four dimensions alone
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), (seed) => {
        const rnd = lcg(seed);
        const n = 1500;
        const dims = Array.from({ length: 4 }, () => new Float64Array(n));
        const weights = new Float32Array(n);
        for (let i = 0; i < n;) {
          const run = 1 + Math.floor(rnd() * 8);
          const v = [
            100 + 5 * Math.floor(rnd() * 8),
            2.5 * Math.floor(rnd() * 10),
            20 * Math.floor(rnd() * 3),
            5 * Math.floor(rnd() * 5),
          ];
          for (let r = 0; r < run && i < n; r++, i++) {
            for (let j = 0; j < 4; j++) dims[j][i] = v[j];
            // edge cells (a fraction of the cell in the field), cells outside (0), cells without a value (NaN)
            weights[i] = rnd() < 0.1 ? 0 : rnd() < 0.2 ? Math.fround(rnd()) : 1;
            if (rnd() < 0.03) dims[Math.floor(rnd() * 4)][i] = NaN;
          }
        }
        const opts = { classes: 5, seed, sample: 500, weights };
        const four = classifyVectors(dims, { ...opts, steps: [5, 1, 1, 1] });
        const five = classifyVectors([...dims, new Float64Array(n)], { ...opts, steps: [5, 1, 1, 1, 1] });
        expect(four.classOf).toEqual(five.classOf);
        expect(four.weight).toEqual(five.weight);
        expect(four.mean).toEqual(five.mean.map((m) => m.slice(0, 4)));
        expect(four.value).toEqual(five.value.map((m) => m.slice(0, 4)));
        expect(four.count).toBeGreaterThan(1);
      }),
      { numRuns: 30 },
    );
  });
  it('gives every cell with the same values the same class, in runs or apart (brute-force oracle over pairs)', () => {
    // lab-precision targets repeat along rows; each cell must still take the centre nearest its own values
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.integer({ min: 1, max: 3 }), (seed, d) => {
        const rnd = lcg(seed);
        const n = 400;
        const dims = Array.from({ length: d }, () => new Float64Array(n));
        for (let i = 0; i < n;) {
          // runs of 1-6 equal cells; each dimension drawn from a few values, so runs share some dimensions
          const run = 1 + Math.floor(rnd() * 6);
          const v = dims.map(() => 5 * Math.floor(rnd() * 4));
          for (let r = 0; r < run && i < n; r++, i++) for (let j = 0; j < d; j++) dims[j][i] = v[j];
        }
        const vc = classifyVectors(dims, { classes: 4, seed });
        const byKey = new Map<string, number>();
        for (let i = 0; i < n; i++) {
          const key = dims.map((a) => a[i]).join(',');
          const c = byKey.get(key);
          if (c === undefined) byKey.set(key, vc.classOf[i]);
          else expect(vc.classOf[i]).toBe(c);
        }
      }),
      { numRuns: 60 },
    );
  });
});

describe('cleaning helpers', () => {
  it('minimum zone area: 0.5 ac floor (1 ac = 4046.8564224 m2, international acre) or swath x 4 s of travel', () => {
    // 18.3 m (60 ft) boom at 8 km/h: 18.3 x 8.89 = 162.7 m2 < 0.5 ac -> 2023.43 m2
    expect(minZoneAreaM2({ swathM: 18.3, speedKmh: 8 })).toBeCloseTo(2023.4282112, 6);
    // 40 m air drill at 20 km/h: 40 x (20 / 3.6 x 4) = 888.9 m2 < 2023 -> floor; 120 m sprayer-width spreader at 30 km/h: 120 x 33.33 = 4000 m2
    expect(minZoneAreaM2({ swathM: 120, speedKmh: 30 })).toBeCloseTo(4000, 6);
    expect(() => minZoneAreaM2({ swathM: 0, speedKmh: 8 })).toThrow(/swath/);
  });

  it('majority filter removes a lone cell and keeps a uniform raster', () => {
    const cols = 5,
      rows = 5;
    const a = new Int16Array(25).fill(1);
    a[12] = 3;
    const f = majorityFilter(a, cols, rows, 1);
    expect(f[12]).toBe(1);
    expect(majorityFilter(new Int16Array(25).fill(2), cols, rows, 3)).toEqual(new Int16Array(25).fill(2));
  });

  it('majority filter equals a brute-force 3 x 3 count on clumpy rasters with unclassed cells', () => {
    // oracle: each classed cell takes the class most frequent in its 3 x 3 window (clipped at the edges,
    // unclassed cells not counted), keeping its own on a tie and otherwise the lowest such class
    const oracle = (src: Int16Array, cols: number, rows: number, nc: number) => {
      const dst = new Int16Array(src.length);
      for (let r = 0; r < rows; r++)
        for (let c = 0; c < cols; c++) {
          const i = r * cols + c;
          if (src[i] < 0) {
            dst[i] = src[i];
            continue;
          }
          const counts = new Array<number>(nc).fill(0);
          for (let rr = Math.max(0, r - 1); rr <= Math.min(rows - 1, r + 1); rr++)
            for (let cc = Math.max(0, c - 1); cc <= Math.min(cols - 1, c + 1); cc++)
              if (src[rr * cols + cc] >= 0) counts[src[rr * cols + cc]]++;
          let best = src[i];
          for (let k = 0; k < nc; k++) if (counts[k] > counts[best]) best = k;
          dst[i] = best;
        }
      return dst;
    };
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }),
        fc.integer({ min: 1, max: 14 }),
        fc.integer({ min: 1, max: 14 }),
        fc.integer({ min: 1, max: 3 }),
        (seed, cols, rows, iterations) => {
          const rnd = lcg(seed);
          // runs along rows (long stretches of one class, some unclassed), so the run shortcut is exercised
          const a = new Int16Array(cols * rows);
          let v = 0;
          for (let i = 0; i < a.length; i++) {
            if (rnd() < 0.25) v = rnd() < 0.15 ? -1 : Math.floor(rnd() * 3);
            a[i] = v;
          }
          let want = a;
          for (let it = 0; it < iterations; it++) want = oracle(want, cols, rows, 3);
          const got = majorityFilter(a, cols, rows, iterations);
          // the filter stops early once a pass changes nothing; the oracle's further passes change nothing then
          expect(Array.from(got)).toEqual(Array.from(want));
        },
      ),
      { numRuns: 300 },
    );
  });
});
