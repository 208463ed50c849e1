/**
 * Zoning on the expected chance of a yield response (plan key zoning.basis): the per-cell layer (sum of class
 * probability x class response chance, from kriging's mean and variance) against the tables' classes, the plan
 * key's default and validation, and the demo quarter built on both bases: the P and K zones move, the N and S
 * zones do not, and zones with a higher chance of a P response get at least as much P2O5.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse as parseYaml, stringify } from 'yaml';
import { buildPrescription } from '../../src/prescription/index.js';
import { defaultTables, parsePlan } from '../../src/agronomy/index.js';
import { chanceSpec, responseChanceBasis } from '../../src/variability/index.js';
import type { Grid } from '../../src/types.js';
import { fieldInputs } from '../helpers/inputs.js';
import { ROOT } from '../helpers/cli.js';

const tables = defaultTables();
const canola = tables.crops.canola!;
const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');
const planWith = (edit: (p: Record<string, any>) => void) => {
  const p = parseYaml(PLAN);
  edit(p);
  return parsePlan(stringify(p), 'plan.yaml', tables);
};
const src = (f: string) => ({ name: f, bytes: readFileSync(join(ROOT, 'sample-fields/quarter', f)) });

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
    expect(b.warnings.map((w) => w.code)).toEqual(['zones.response-chance-refused']);
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

  it('demo quarter: P and K zones follow the response chance, N and S zones stay; more chance, no less P2O5', async () => {
    const inputs = await fieldInputs(src('samples.csv'), src('boundary.geojson'));
    const build = (basis?: string) =>
      buildPrescription(
        inputs,
        planWith((p) => {
          p.zoning.zone_sets = 'per_product';
          if (basis) p.zoning.basis = basis;
        }),
        tables,
        { cell: 10 },
      );
    const [byDefault, targets, chance] = [build(), build('targets'), build('response_chance')];
    const set = (rx: typeof chance, name: string) => rx.zoneSets.find((s) => s.name === name)!;
    // the default is today's behaviour
    for (const s of targets.zoneSets)
      expect(Array.from(set(byDefault, s.name).zoneOfCell!)).toEqual(Array.from(s.zoneOfCell!));
    // N and S sets are untouched; P2O5 and K2O sets are drawn from the chance and their cells move
    for (const n of ['n', 's'])
      expect(Array.from(set(chance, n).zoneOfCell!)).toEqual(Array.from(set(targets, n).zoneOfCell!));
    for (const n of ['p2o5', 'k2o']) {
      expect(set(chance, n).drivenBy).toMatch(
        /^expected chance of a yield response to [PK] \(from ordinary kriging/,
      );
      expect(set(chance, n).breaks).toBeNull();
      const a = set(chance, n).zoneOfCell!,
        b = set(targets, n).zoneOfCell!;
      expect(a.some((z, i) => z !== b[i])).toBe(true);
    }
    // sensible: ranked by their mean chance of a P response, zones get no less P2O5 as the chance rises
    const layer = responseChanceBasis(
      {
        samples: inputs.samples,
        grid: chance.grid,
        surfaces: chance.surfaces,
        crop: canola,
        tables,
        kelownaFactor: chance.plan.soil_test.kelowna_factor,
      },
      ['p2o5'],
    ).layers.p2o5!.values;
    const p = set(chance, 'p2o5');
    const mean = p.zones.map((_, zi) => {
      let w = 0,
        s = 0;
      p.zoneOfCell!.forEach((z, i) => {
        if (z === zi && Number.isFinite(layer[i])) {
          w += chance.grid.fraction[i];
          s += chance.grid.fraction[i] * layer[i];
        }
      });
      return s / w;
    });
    const order = p.zones.map((_, i) => i).sort((x, y) => mean[x] - mean[y]);
    expect(order.length).toBeGreaterThanOrEqual(2);
    for (let k = 1; k < order.length; k++) {
      const [lo, hi] = [p.zones[order[k - 1]], p.zones[order[k]]];
      expect(hi.decision.nutrients.p2o5.target.value).toBeGreaterThanOrEqual(
        lo.decision.nutrients.p2o5.target.value,
      );
      expect(hi.soil.p).toBeLessThan(lo.soil.p);
    }
  }, 240_000);
});
