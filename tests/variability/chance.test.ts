/**
 * The chance-below-threshold map of the variability study and the report: properties (chances in [0, 1], 0 and 1
 * far from the threshold, rising with the threshold, 0 or 1 on a sample), its summary, its refusals with the
 * reason, the chart, and the whole grid path against R gstat 2.1.0 conditional simulation (2000 realisations of
 * the invented S field, exponential model; tests/fixtures/gstat/kriging.R, condsim-sim-exp-below20.csv).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  analyzeVariability,
  chanceBelowMap,
  chanceMapSvg,
  chanceSummary,
  chanceClassLabels,
  variabilityText,
  type KrigedSurface,
} from '../../src/variability/index.js';
import { fieldGrid } from '../../src/surface/grid.js';
import { chanceBelow } from '../../src/surface/probability.js';
import type { KrigingInfo } from '../../src/surface/krigingChoice.js';
import type { Grid } from '../../src/types.js';
import { syntheticField } from '../helpers/variabilityField.js';
import { ROOT } from '../helpers/cli.js';

const FIX = join(ROOT, 'tests', 'fixtures', 'gstat');

function readCsv(file: string): Record<string, number[]> {
  const lines = readFileSync(file, 'utf8').trim().split('\n');
  const head = lines[0].split(',');
  const cols: Record<string, number[]> = Object.fromEntries(head.map((h) => [h, []]));
  for (const l of lines.slice(1)) l.split(',').forEach((v, j) => cols[head[j]].push(Number(v)));
  return cols;
}

/** A one-cell grid centred on (x, y). */
function cellAt(x: number, y: number, cell = 1): Grid {
  return {
    xmin: x - cell / 2,
    ymax: y + cell / 2,
    cell,
    cols: 1,
    rows: 1,
    mask: new Uint8Array([1]),
    fraction: new Float32Array([1]),
  } as Grid;
}

/** A surface whose kriging model is given (as the build hands over its S surface's model). */
function givenModel(model: KrigingInfo['model'], neighbours: number): KrigedSurface {
  return {
    method: 'idw',
    krigedMean: null,
    variance: null,
    kriging: {
      model,
      refused: null,
      transform: 'none',
      neighbours,
      cv: null,
      modelText: 'given',
      modelSource: 'given',
    },
  };
}

describe('chance below the threshold (synthetic S field, 49 samples)', () => {
  const { samples, field } = syntheticField();
  const grid = fieldGrid(field, 20);
  const at = (t: number) => chanceBelowMap(samples, 'so4_s', grid, { value: t, unit: 'lb S/ac' });

  it('chances lie in [0, 1] in every field cell, NaN outside; 0 and 1 far from the threshold; rising with it', () => {
    const m20 = at(20),
      m30 = at(30),
      lo = at(-1000),
      hi = at(1000);
    expect(m20.refused).toBeNull();
    for (let i = 0; i < grid.fraction.length; i++) {
      if (!(grid.fraction[i] > 0)) {
        expect(m20.chance![i]).toBeNaN();
        continue;
      }
      expect(m20.chance![i]).toBeGreaterThanOrEqual(0);
      expect(m20.chance![i]).toBeLessThanOrEqual(1);
      expect(m30.chance![i]).toBeGreaterThanOrEqual(m20.chance![i]);
      expect(lo.chance![i]).toBeLessThan(1e-9);
      expect(hi.chance![i]).toBeGreaterThan(1 - 1e-9);
    }
    expect(lo.expectedShare).toBeLessThan(1e-9);
    expect(hi.expectedShare).toBeGreaterThan(1 - 1e-9);
    expect(hi.shareLikely).toEqual({ p50: 1, p90: 1 });
  });

  it('the expected share is the area-weighted mean chance; the likely shares count cells at or over 50 % and 90 %', () => {
    const m = at(20);
    let w = 0,
      e = 0,
      p50 = 0;
    for (let i = 0; i < grid.fraction.length; i++)
      if (grid.fraction[i] > 0) {
        w += grid.fraction[i];
        e += grid.fraction[i] * m.chance![i];
        if (m.chance![i] >= 0.5) p50 += grid.fraction[i];
      }
    expect(m.expectedShare).toBeCloseTo(e / w, 12);
    expect(m.shareLikely!.p50).toBeCloseTo(p50 / w, 12);
    expect(m.expectedAc).toBeCloseTo((e * 400) / 4046.8564224, 9);
    // the low patch in the south-east (4 of 49 samples below 20) makes a small but real expected share
    expect(m.expectedShare).toBeGreaterThan(0.02);
    expect(m.expectedShare).toBeLessThan(0.3);
  });

  it('kriged only at listed cells (a map shown coarser): those cells as in the whole map, the rest NaN, shares close', () => {
    const fine = fieldGrid(field, 5);
    const whole = chanceBelowMap(samples, 'so4_s', fine, { value: 20, unit: 'lb S/ac' });
    // every 4th cell in each direction, as the report's display view picks them
    const cells: number[] = [];
    for (let r = 2; r < fine.rows; r += 4)
      for (let c = 2; c < fine.cols; c += 4) cells.push(r * fine.cols + c);
    const shown = new Int32Array(cells);
    const some = chanceBelowMap(samples, 'so4_s', fine, { value: 20, unit: 'lb S/ac' }, { cells: shown });
    const listed = new Set(cells);
    let compared = 0;
    for (let i = 0; i < fine.fraction.length; i++) {
      if (listed.has(i) && fine.fraction[i] > 0) {
        expect(some.chance![i]).toBeCloseTo(whole.chance![i], 6);
        compared++;
      } else expect(some.chance![i]).toBeNaN();
    }
    expect(compared).toBeGreaterThan(100);
    // a sixteenth of the cells estimates the field's shares and acres closely (smooth map, 5 m cells)
    expect(Math.abs(some.expectedShare! - whole.expectedShare!)).toBeLessThan(0.01);
    expect(Math.abs(some.expectedAc! / whole.expectedAc! - 1)).toBeLessThan(0.05);
  });

  it('a kriged surface is reused as it is: the chance is that of its own mean and variance', () => {
    const mean = new Float64Array(grid.fraction.length).fill(NaN),
      variance = new Float64Array(grid.fraction.length).fill(NaN);
    for (let i = 0; i < mean.length; i++)
      if (grid.fraction[i] > 0) {
        mean[i] = 15 + (i % 13);
        variance[i] = 4 + (i % 5);
      }
    const surface = {
      ...givenModel({ kind: 'spherical', nugget: 1, psill: 9, range: 200 }, 16),
      method: 'kriging',
      krigedMean: mean,
      variance,
    };
    const m = chanceBelowMap(samples, 'so4_s', grid, { value: 20, unit: 'lb S/ac' }, { surface });
    expect(m.method).toContain("the surface's own");
    expect([...m.chance!]).toEqual([...chanceBelow({ mean, variance, transform: 'none' }, 20)]);
  });

  it('refused with the reason: fewer than 30 samples, zone composites, a pure-nugget model from the surface stage', () => {
    const few = syntheticField().samples;
    few.values.so4_s = few.values.so4_s.map((v, i) => (i < 20 ? v : NaN));
    const a = chanceBelowMap(few, 'so4_s', grid, { value: 20, unit: 'lb S/ac' });
    expect(a.chance).toBeNull();
    expect(a.refused).toMatch(/only 20 samples; kriging needs at least 30/);
    const zoned = syntheticField().samples;
    zoned.zone = zoned.ids.map((_, i) => (i < 25 ? 'a' : 'b'));
    expect(chanceBelowMap(zoned, 'so4_s', grid, { value: 20, unit: 'lb S/ac' }).refused).toMatch(
      /zone-composite/,
    );
    const nugget = givenModel(null, 16);
    nugget.kriging!.refused = 'no spatial structure: the fitted partial sill is not positive (pure nugget)';
    const c = chanceBelowMap(samples, 'so4_s', grid, { value: 20, unit: 'lb S/ac' }, { surface: nugget });
    expect(c.refused).toContain('pure nugget');
    expect(chanceSummary(c)).not.toHaveProperty('chance');
  });

  it('the chart shows % classes, the assumption and the samples; without a map, the reason in its place', () => {
    const m = at(20);
    const input = {
      parts: field.parts,
      xy: samples.xy,
      values: samples.values.so4_s,
      label: 'sulphate-S',
      grid,
    };
    const svg = chanceMapSvg({ ...input, map: m });
    expect(svg).toMatch(/^<svg[^>]+xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    for (const l of chanceClassLabels()) expect(svg).toContain(`>${l}</tspan>`);
    expect(svg).toContain('Gaussian with the kriging mean');
    expect(svg).toContain('Chance that sulphate-S is below 20 lb S/ac');
    const rings = svg.slice(
      svg.indexOf('class="low-rings"'),
      svg.indexOf('</g>', svg.indexOf('class="low-rings"')),
    );
    expect((rings.match(/<circle /g) ?? []).length).toBe(4); // 4 low
    expect((svg.match(/r="9" fill="none" stroke="#e31a1c"/g) ?? []).length).toBe(1); // the legend's
    const few = syntheticField().samples;
    few.values.so4_s = few.values.so4_s.map((v, i) => (i < 20 ? v : NaN));
    const none = chanceMapSvg({
      ...input,
      map: chanceBelowMap(few, 'so4_s', grid, { value: 20, unit: 'lb S/ac' }),
    });
    expect(none).toContain('No chance map');
    expect(none).toContain('Ordinary kriging is refused: only 20 samples');
    expect(none).not.toContain('clip-path');
  });

  it('the text says what the map says, or why there is none', () => {
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    r.chance = chanceSummary(at(20));
    const t = variabilityText(r);
    expect(t).toMatch(/Chance below 20 lb S\/ac \(from kriging; Gaussian assumption\)/);
    expect(t).toMatch(/expected share of the field below 20 lb S\/ac: \d+ %/);
    r.chance = { ...r.chance, refused: 'ordinary kriging is refused: only 20 samples' };
    expect(variabilityText(r)).toContain('Chance below 20 lb S/ac: no map: ordinary kriging is refused');
  });
});

describe('the chance map agrees with gstat conditional simulation', () => {
  it('invented S field, exponential model, all 64 samples: the grid path at 40 places vs the share of 2000 gstat simulations below 20', () => {
    const m = JSON.parse(readFileSync(join(FIX, 'kriging-meta.json'), 'utf8')).models['sim-exp12'];
    const sim = readCsv(join(FIX, 'sim-field.csv'));
    const ref = readCsv(join(FIX, 'condsim-sim-exp-below20.csv'));
    const n = sim.x.length;
    const samples = {
      xy: Float64Array.from(sim.x.flatMap((x, i) => [x, sim.y[i]])),
      values: { so4_s: Float64Array.from(sim.s) } as never,
      ids: sim.x.map((_, i) => `S${i}`),
      zone: sim.x.map(() => null),
    };
    const surface = givenModel({ kind: m.kind, nugget: m.nugget, psill: m.psill, range: m.range }, n);
    let chi = 0;
    for (let i = 0; i < ref.x.length; i++) {
      const g = cellAt(ref.x[i], ref.y[i]);
      const p = chanceBelowMap(samples, 'so4_s', g, { value: 20, unit: 'lb S/ac' }, { surface }).chance![0];
      const nsim = ref.nsim[i];
      // binomial sampling error of the simulated share; 4 standard errors (+ one simulation) per place
      const se = Math.sqrt(Math.max(p * (1 - p), 1 / nsim) / nsim);
      expect(Math.abs(p - ref.below20[i]), `place ${i}: ${p} vs ${ref.below20[i]}`).toBeLessThanOrEqual(
        4 * se + 1 / nsim,
      );
      chi += (p - ref.below20[i]) ** 2 / (se * se);
    }
    // chi-square with 40 degrees of freedom: 99.9th percentile 73.4
    expect(chi).toBeLessThan(73.4);
  });
});
