/**
 * Maps of how sure the soil test is: properties (fast-check) and handbook values of the standard normal
 * distribution (Abramowitz & Stegun 1964, Handbook of Mathematical Functions, table 26.1: Phi(1) = 0.841345,
 * Phi(1.96) = 0.975002). The agreement with gstat's conditional simulation is in kriging.gstat.test.ts.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { chanceBelow, chanceBelowAt, classProbabilities } from '../../src/surface/probability.js';

const cellsArb = fc.array(
  fc.tuple(fc.double({ min: -50, max: 200, noNaN: true }), fc.double({ min: 0, max: 400, noNaN: true })),
  { minLength: 1, maxLength: 50 },
);

describe('chance maps', () => {
  it('handbook values of Phi: P(value < mean + 1 sd) = 0.841345, P(value < mean - 1.96 sd) = 0.024998', () => {
    expect(chanceBelowAt(20, 25, 25)).toBeCloseTo(0.841345, 6);
    expect(chanceBelowAt(20, 25, 20 - 1.96 * 5)).toBeCloseTo(1 - 0.975002, 6);
    // on logarithms: P(S < 20) for ln S ~ N(ln 20, v) is one half, whatever v
    expect(chanceBelowAt(Math.log(20), 0.3, 20, 'log')).toBeCloseTo(0.5, 12);
  });

  it('variance 0 (a cell on a sample): the chance is 0 or 1', () => {
    expect(chanceBelowAt(19.9, 0, 20)).toBe(1);
    expect(chanceBelowAt(20, 0, 20)).toBe(0); // a certain 20 is not below 20, as in the rate engine's classes
    // and a certain value on a class limit is in the upper class ([limit, next limit), as src/agronomy classes)
    const r = classProbabilities(
      { mean: [10], variance: [0], transform: 'none' },
      { names: ['low', 'medium', 'high'], below: [10, 20, null], chance: [0.75, 0.5, 0.2] },
    );
    expect(r.probability.map((p) => p[0])).toEqual([0, 1, 0]);
    expect(r.expected[0]).toBe(0.5);
    expect(chanceBelowAt(20.1, 0, 20)).toBe(0);
  });

  it('chance below is in [0, 1] and falls as the mean rises', () => {
    fc.assert(
      fc.property(cellsArb, fc.double({ min: 1, max: 100, noNaN: true }), (cells, t) => {
        const c = chanceBelow(
          { mean: cells.map((x) => x[0]), variance: cells.map((x) => x[1]), transform: 'none' },
          t,
        );
        c.forEach((p) => {
          expect(p).toBeGreaterThanOrEqual(0);
          expect(p).toBeLessThanOrEqual(1);
        });
        for (const [m, v] of cells)
          expect(chanceBelowAt(m + 1, v, t)).toBeLessThanOrEqual(chanceBelowAt(m, v, t));
      }),
    );
  });

  it("class probabilities are in [0, 1] and sum to 1; the expected chance lies between the classes' chances", () => {
    const classes = {
      names: ['very low', 'low', 'medium', 'high', 'very high'],
      below: [5, 10, 15, 20, null],
      chance: [0.9, 0.7, 0.5, 0.3, 0.1],
    };
    fc.assert(
      fc.property(cellsArb, fc.boolean(), (cells, log) => {
        const k = {
          mean: cells.map((x) => (log ? Math.log(Math.max(1e-3, x[0])) : x[0])),
          variance: cells.map((x) => (log ? x[1] / 400 : x[1])),
          transform: (log ? 'log' : 'none') as 'log' | 'none',
        };
        const r = classProbabilities(k, classes);
        for (let i = 0; i < cells.length; i++) {
          let sum = 0;
          for (const p of r.probability) {
            expect(p[i]).toBeGreaterThanOrEqual(0);
            expect(p[i]).toBeLessThanOrEqual(1);
            sum += p[i];
          }
          expect(Math.abs(sum - 1)).toBeLessThan(1e-6);
          expect(r.expected[i]).toBeGreaterThanOrEqual(0.1 - 1e-6);
          expect(r.expected[i]).toBeLessThanOrEqual(0.9 + 1e-6);
          // the first class's probability is the chance below its limit
          expect(r.probability[0][i]).toBeCloseTo(chanceBelowAt(k.mean[i], k.variance[i], 5, k.transform), 6);
        }
      }),
    );
  });

  it('no value where the mean is NaN (cells outside the field)', () => {
    const r = classProbabilities(
      { mean: [NaN], variance: [NaN], transform: 'none' },
      { names: ['a', 'b'], below: [10, null], chance: [1, 0] },
    );
    expect(r.expected[0]).toBeNaN();
    expect(chanceBelow({ mean: [NaN], variance: [1], transform: 'none' }, 3)[0]).toBeNaN();
  });
});
