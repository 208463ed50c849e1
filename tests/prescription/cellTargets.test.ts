// cellTargets runs the rate engine once per distinct quantized soil value and looks the result up per cell.
// Oracle: the engine run directly on every cell's quantized values (brute force, no cache), as the kdbush
// tests check an index against a scan. The engine itself is checked against published values elsewhere.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cellTargets, TARGET_PRECISION } from '../../src/prescription/cellTargets.js';
import { parsePlan, defaultTables } from '../../src/agronomy/index.js';
import { interpret, type SoilValues } from '../../src/agronomy/interpret.js';
import { targets } from '../../src/agronomy/targets.js';
import { NUTRIENTS } from '../../src/agronomy/tables.js';
import type { Analyte } from '../../src/types.js';
import { ROOT } from '../helpers/cli.js';

const tables = defaultTables();
// the demo plan with the organic-matter N credit on, so that the N target reads two surfaces (nitrate and OM)
const planText = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8').replace(
  /organic_matter: false/,
  'organic_matter: true',
);
const plan = parsePlan(planText, 'plan.yaml', tables);
const crop = tables.crops[plan.crop];
const ANALYTES = ['no3_n', 'p', 'k', 'so4_s', 'om'] as const;
const RANGE: Record<(typeof ANALYTES)[number], [number, number]> = {
  no3_n: [0, 120],
  p: [0, 60],
  k: [20, 600],
  so4_s: [0, 80],
  om: [0.5, 9],
};

function oracle(surfaces: Partial<Record<Analyte, Float64Array>>, i: number) {
  const soil: SoilValues = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN };
  for (const a of ANALYTES) {
    const v = surfaces[a];
    if (v)
      (soil as unknown as Record<string, number>)[a] =
        Math.round(v[i] / TARGET_PRECISION[a]) * TARGET_PRECISION[a];
  }
  return targets(interpret(soil, crop, plan, tables), crop, plan, tables, []);
}

describe('cellTargets', () => {
  it('the test plan makes N depend on organic matter', () => {
    expect(planText).toMatch(/organic_matter: true/);
    const n = (om: number) =>
      cellTargets({ no3_n: Float64Array.of(20), om: Float64Array.of(om) }, [1], plan, tables).n[0];
    expect(n(1)).not.toBe(n(6));
  });

  it('equals the rate engine run on each cell (random surfaces, NaN cells, missing surfaces, zero-fraction cells)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 60 }),
        fc.subarray([...ANALYTES], { minLength: 0 }),
        fc.integer({ min: 0, max: 2 ** 31 - 1 }),
        (n, present, seed) => {
          let s = seed >>> 0;
          const rnd = () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
          const surfaces: Partial<Record<Analyte, Float64Array>> = {};
          for (const a of present)
            surfaces[a] = Float64Array.from({ length: n }, () =>
              rnd() < 0.1 ? NaN : RANGE[a][0] + rnd() * (RANGE[a][1] - RANGE[a][0]),
            );
          const fraction = Float32Array.from({ length: n }, () =>
            rnd() < 0.1 ? 0 : rnd() < 0.2 ? rnd() : 1,
          );
          const got = cellTargets(surfaces, fraction, plan, tables);
          for (let i = 0; i < n; i++) {
            const anyNaN = (drivers: Analyte[]) =>
              drivers.some((a) => surfaces[a] && Number.isNaN(surfaces[a]![i]));
            const want = fraction[i] > 0 ? oracle(surfaces, i) : null;
            const drivers = { n: ['no3_n', 'om'], p2o5: ['p'], k2o: ['k'], s: ['so4_s'] } as const;
            for (const nut of NUTRIENTS) {
              if (!want || anyNaN([...drivers[nut]])) expect(got[nut][i]).toBeNaN();
              else expect(got[nut][i]).toBe(want[nut].lbac);
            }
          }
        },
      ),
      { numRuns: 60 },
    );
  });

  it('values spread too far for the lookup table (K 20 to 5 million ppm, nitrate and OM a million cells apart) give the same targets', () => {
    // 1e6 quantized K values or 1e6 x 100 nitrate x OM pairs exceed the flat table: the Map path answers
    const k = Float64Array.of(20, 5e6, 140, 140.4, NaN, 60);
    const no3_n = Float64Array.of(0, 5e5, 30, 30.2, 12, NaN);
    const om = Float64Array.of(0.5, 5, 3, 3, NaN, 4);
    const p = Float64Array.of(3, 12, 25, 8, 8, 40);
    const fraction = Float32Array.of(1, 1, 1, 0.5, 1, 1);
    const got = cellTargets({ k, no3_n, om, p }, fraction, plan, tables);
    const small = cellTargets(
      { k: k.map((v) => Math.min(v, 600)), no3_n: no3_n.map((v) => Math.min(v, 250)), om, p },
      fraction,
      plan,
      tables,
    );
    for (let i = 0; i < k.length; i++) {
      const want = oracle({ k, no3_n, om, p }, i);
      if (Number.isNaN(k[i])) expect(got.k2o[i]).toBeNaN();
      else expect(got.k2o[i]).toBe(want.k2o.lbac);
      if (Number.isNaN(no3_n[i]) || Number.isNaN(om[i])) expect(got.n[i]).toBeNaN();
      else expect(got.n[i]).toBe(want.n.lbac);
      expect(got.p2o5[i]).toBe(want.p2o5.lbac);
      // the table path (values within a small spread) agrees with the oracle too
      expect(small.p2o5[i]).toBe(got.p2o5[i]);
    }
  });
});
