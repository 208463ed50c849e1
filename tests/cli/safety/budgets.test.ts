/**
 * Work budgets and refusals made before the work (src/cli/safety/budgets.ts, readiness.ts). The numbers are
 * tilth's own documented limits (docs/reliability.md); the cases are the runaway inputs they exist for.
 */
import { describe, expect, it } from 'vitest';
import {
  BUILD_MAX_CELLS,
  checkBoundaryVertices,
  checkBuildCells,
  checkLags,
  checkOrder,
  farParts,
  MAX_LAGS,
} from '../../../src/cli/safety/budgets.js';
import { nutrientsNeeded, readinessProblems } from '../../../src/cli/safety/readiness.js';
import { defaultTables, parsePlan } from '../../../src/agronomy/index.js';
import type { FieldInputs } from '../../../src/types.js';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { ROOT } from '../../helpers/cli.js';

const square = (x0: number, y0: number, s: number) => ({
  exterior: Float64Array.from([x0, y0, x0 + s, y0, x0 + s, y0 + s, x0, y0 + s, x0, y0]),
  holes: [],
});

describe('budgets', () => {
  it('build cells: an 800 m field at 0.5 m cells (2.56 million) fits; 0.2 m does not, and the message names --cell that fits', () => {
    expect(() => checkBuildCells([0, 0, 800, 800], 0.5)).not.toThrow();
    expect(() => checkBuildCells([0, 0, 800, 800], 0.2)).toThrow(
      /16,000,000 cells, more than the 4,000,000.*--cell 0\.5 or larger/,
    );
    // two parts 800 km apart at the default 50 m cell
    expect(() => checkBuildCells([0, 0, 800_000, 500_000], 50)).toThrow(/far apart/);
    // the suggested size really fits
    const m = /--cell ([\d.]+)/.exec(
      (() => {
        try {
          checkBuildCells([0, 0, 3000, 2500], 0.3);
        } catch (e) {
          return (e as Error).message;
        }
        return '';
      })(),
    )!;
    expect(Math.ceil(3000 / Number(m[1])) * Math.ceil(2500 / Number(m[1]))).toBeLessThanOrEqual(
      BUILD_MAX_CELLS,
    );
  });
  it('boundary vertices: 100 000 pass, 100 001 are refused with the GDAL command that simplifies', () => {
    const ring = (n: number) => ({ parts: [{ exterior: new Float64Array(2 * n), holes: [] }] });
    expect(() => checkBoundaryVertices(ring(100_000), 'b.shp')).not.toThrow();
    expect(() => checkBoundaryVertices(ring(100_001), 'b.shp')).toThrow(
      /100,001 vertices.*ogr2ogr -simplify/,
    );
  });
  it('lags: --width 1e-9 is refused before any array is made; the suggested width fits', () => {
    const xy = Float64Array.from([0, 0, 300, 400]); // diagonal 500 m, default cutoff 166.7 m
    expect(() => checkLags(xy, undefined, 1e-9)).toThrow(/more than 1,000\. Fix: give --width 0\.17 or more/);
    expect(() => checkLags(xy, 400, 400 / MAX_LAGS)).not.toThrow();
    expect(() => checkLags(xy, undefined, undefined)).not.toThrow();
  });
  it('contradictory options are usage errors', () => {
    expect(() => checkOrder('--min', 300, '--max', 10)).toThrow(/contradict/);
    expect(() => checkOrder('--min', 10, '--max', 10)).not.toThrow();
    expect(() => checkOrder('--min', undefined, '--max', 10)).not.toThrow();
  });
  it('farParts: a part 800 km from every sample is named, a part 500 m away is not', () => {
    const parts = [square(0, 0, 800), square(800_000, 0, 800), square(1300, 0, 100)];
    expect(farParts(parts, Float64Array.from([100, 100, 400, 400]))).toEqual([2]);
  });
});

/** Minimal inputs: samples at `xy` with the given analyte values, one square field. */
function inputs(xy: number[], values: Partial<Record<string, number[]>>): FieldInputs {
  const n = xy.length / 2;
  const v = (a: string) => Float64Array.from(values[a] ?? new Array(n).fill(NaN));
  return {
    samples: {
      ids: Array.from({ length: n }, (_, i) => `S${i}`),
      xy: Float64Array.from(xy),
      values: { no3_n: v('no3_n'), p: v('p'), k: v('k'), so4_s: v('so4_s'), om: v('om'), ph: v('ph') },
    },
    field: { parts: [square(0, 0, 800)] },
    zones: null,
    warnings: [],
  } as unknown as FieldInputs;
}

describe('readiness: what cannot make a prescription', () => {
  const plan = parsePlan(
    readFileSync(join(ROOT, 'sample-fields', 'quarter', 'plan.yaml'), 'utf8'),
    'plan.yaml',
    defaultTables(),
  );
  const spread = [100, 100, 400, 100, 400, 400, 100, 400];
  it('the default plan reads all four soil nutrients', () =>
    expect(nutrientsNeeded(plan).sort()).toEqual(['k', 'no3_n', 'p', 'so4_s']));
  it('no nutrient column at all', () => {
    expect(readinessProblems(inputs(spread, { om: [3, 3, 3, 3] }), plan, 's.csv')[0]).toMatch(
      /no usable nitrate-N, P, K or sulphate-S value/,
    );
  });
  it('a nutrient the plan needs has no usable value (every cell empty)', () => {
    const p = readinessProblems(
      inputs(spread, { no3_n: [10, 12, 9, 11], p: [10, 12, 9, 11], so4_s: [5, 6, 7, 8] }),
      plan,
      's.csv',
    );
    expect(p).toEqual([
      expect.stringMatching(
        /no usable K value, and the plan's K strategy needs one.*strategy\.k\.method to none/,
      ),
    ]);
  });
  it('every sample at one place', () => {
    const p = readinessProblems(inputs([5, 5, 5.2, 5.1, 5, 5], { p: [1, 2, 3] }), 'p', 's.csv');
    expect(p).toEqual([expect.stringMatching(/all 3 samples lie within 1 m/)]);
  });
  it('usable inputs give no problem', () => {
    expect(
      readinessProblems(
        inputs(spread, { no3_n: [1, 2, 3, 4], p: [1, 2, 3, 4], k: [1, 2, 3, 4], so4_s: [1, 2, 3, 4] }),
        plan,
      ),
    ).toEqual([]);
  });
});
