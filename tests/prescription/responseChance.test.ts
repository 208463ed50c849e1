/**
 * Zoning on the expected chance of a yield response (plan key zoning.basis): the per-cell layer (sum of class
 * probability x class response chance, from kriging's mean and variance) against the tables' classes, the plan
 * key's default and validation. The demo quarter built on both bases is in responseChance.e2e.test.ts.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { defaultTables, parsePlan } from '../../src/agronomy/index.js';
import { chanceSpec, responseChanceBasis } from '../../src/variability/index.js';
import type { Grid } from '../../src/types.js';
import { ROOT } from '../helpers/cli.js';
import { quarterPlanWith } from '../helpers/inputs.js';

const tables = defaultTables();
const canola = tables.crops.canola!;
const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');
const planWith = (edit: (p: Record<string, any>) => void) => quarterPlanWith(edit, tables);

/** A 1-row grid of n cells, all in the field. */
function row(n: number): Grid {
  return {
    xmin: 0,
    ymax: 10,
    cell: 10,
    cols: n,
    rows: 1,
    mask: new Uint8Array(n).fill(1),
    fraction: new Float32Array(n).fill(1),
  } as Grid;
}

/** Samples with P only (their values do not matter when the surface's own kriging is handed over). */
function pSamples(n: number) {
  const nan = () => new Float64Array(n).fill(NaN);
  return {
    xy: new Float64Array(2 * n),
    values: { no3_n: nan(), p: new Float64Array(n).fill(12), k: nan(), so4_s: nan(), om: nan(), ph: nan() },
    ids: Array.from({ length: n }, (_, i) => `S${i}`),
    zone: Array.from({ length: n }, () => null),
    pMethod: 'olsen' as const,
  };
}

/** The expected chance layer for given kriging means and variances of P (a kriged surface handed over). */
function pLayer(mean: number[], variance: number[]): Float64Array {
  const surface = {
    analyte: 'p' as const,
    method: 'kriging',
    krigedMean: Float64Array.from(mean),
    variance: Float64Array.from(variance),
    kriging: {
      model: { kind: 'spherical' as const, nugget: 1, psill: 10, range: 200 },
      refused: null,
      transform: 'none' as const,
      neighbours: 16,
      cv: null,
      modelText: 'test',
      modelSource: 'test',
    },
  };
  const b = responseChanceBasis(
    { samples: pSamples(4), grid: row(mean.length), surfaces: [surface], crop: canola, tables },
    ['p2o5'],
  );
  expect(b.warnings).toEqual([]);
  return b.layers.p2o5!.values;
}

describe('expected chance of a response per cell', () => {
  const spec = chanceSpec('p', canola, tables, 'olsen');
  if (spec.kind !== 'classes') throw new Error('P has classes');
  const { below, chance } = spec.classes;
  const classChance = (v: number) => chance[below.findIndex((b) => b === null || v < b)];

  it("on a sample (variance 0) it is the chance of the value's class; between classes' chances otherwise", () => {
    const means = [2, 7, 12, 25, 45, 5, 10, 20];
    // a value exactly at a limit (5, 10, 20) is in the upper class, as the rate engine's half-open classes
    const got = pLayer(
      means,
      means.map(() => 0),
    );
    means.forEach((m, i) => expect(got[i]).toBeCloseTo(classChance(m), 6));
    const l = pLayer([2, 7, 12, 25, 45], [9, 9, 9, 9, 9]);
    for (const v of l) {
      expect(v).toBeGreaterThanOrEqual(Math.min(...chance));
      expect(v).toBeLessThanOrEqual(Math.max(...chance));
    }
  });

  it('falls as the mean rises (the tables: lower P, likelier response); the variance blurs the class steps', () => {
    // precondition from the tables: response chances fall class by class
    for (let c = 1; c < chance.length; c++) expect(chance[c]).toBeLessThanOrEqual(chance[c - 1]);
    const means = Array.from({ length: 60 }, (_, i) => 1 + i * 0.7);
    for (const v of [0.5, 4, 25]) {
      const l = pLayer(
        means,
        means.map(() => v),
      );
      for (let i = 1; i < l.length; i++) expect(l[i]).toBeLessThanOrEqual(l[i - 1] + 1e-12);
    }
    // at the 10 ppm limit the chance is between the two classes' (75 % and 50 %); a surer test (smaller
    // variance) moves it towards the class the mean falls in, from both sides of the limit
    const [sure, unsure] = [pLayer([9.5, 10.5], [0.01, 0.01]), pLayer([9.5, 10.5], [16, 16])];
    expect(sure[0]).toBeCloseTo(0.75, 6);
    expect(sure[1]).toBeCloseTo(0.5, 6);
    expect(unsure[0]).toBeLessThan(sure[0]);
    expect(unsure[1]).toBeGreaterThan(sure[1]);
  });

  it('kriging refused: a warning names the nutrient and the reason, and there is no layer', () => {
    const surface = {
      analyte: 'p' as const,
      method: 'idw',
      krigedMean: null,
      variance: null,
      kriging: {
        model: null,
        refused: 'only 12 samples; kriging needs at least 30',
        transform: 'none' as const,
        neighbours: 16,
        cv: null,
        modelText: '',
        modelSource: '',
      },
    };
    const b = responseChanceBasis(
      { samples: pSamples(4), grid: row(3), surfaces: [surface], crop: canola, tables },
      ['p2o5', 'n'],
    );
    expect(b.layers).toEqual({});
    expect(b.warnings.map((w) => w.code)).toEqual(['zones-response-chance-refused']);
    expect(b.warnings[0]!.message).toMatch(/P zones are drawn from the P2O5 target.*only 12 samples/);
  });
});

describe('plan key zoning.basis', () => {
  it('defaults to targets; anything but targets or response_chance is refused naming the key', () => {
    expect(parsePlan(PLAN, 'plan.yaml', tables).zoning.basis).toBe('targets');
    expect(() =>
      planWith((p) => {
        p.zoning.basis = 'chance';
      }),
    ).toThrow(/zoning\.basis/);
  });
});
