/**
 * Ordinary kriging against R gstat 2.1.0 `krige()` and `krige.cv()` (same model, same nmax), fixtures made by
 * `Rscript tests/fixtures/gstat/kriging.R` (R 4.2.2, gstat 2.1.0, sp 1.6.0; versions in kriging-meta.json), and a
 * live re-run of that script when Rscript with gstat is installed. Data: Meuse log(zinc) (Rikken & Van Rijn 1993,
 * shipped with sp) and an invented sulphate-S field simulated by the script.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { krigingSurface, type KrigingModel } from '../../src/surface/kriging.js';
import { krigingAtPoints, krigingCv } from '../../src/surface/krigingCv.js';
import { chanceBelowAt } from '../../src/surface/probability.js';
import { requireTool } from '../helpers/tools.js';
import { ROOT } from '../helpers/cli.js';

const FIX = join(ROOT, 'tests', 'fixtures', 'gstat');
const REL = 1e-6;

export function readCsv(file: string): Record<string, number[]> {
  const lines = readFileSync(file, 'utf8').trim().split('\n');
  const head = lines[0].split(',').map((h) => h.replace(/"/g, ''));
  const cols: Record<string, number[]> = Object.fromEntries(head.map((h) => [h, []]));
  for (const l of lines.slice(1)) l.split(',').forEach((v, j) => cols[head[j]].push(Number(v)));
  return cols;
}

export function meta(dir = FIX): {
  models: Record<string, KrigingModel & { nmax: number }>;
  versions: Record<string, string>;
} {
  return JSON.parse(readFileSync(join(dir, 'kriging-meta.json'), 'utf8'));
}

function xyOf(c: Record<string, number[]>): Float64Array {
  const xy = new Float64Array(c.x.length * 2);
  c.x.forEach((x, i) => {
    xy[2 * i] = x;
    xy[2 * i + 1] = c.y[i];
  });
  return xy;
}

function meuseData(): { xy: Float64Array; z: Float64Array } {
  const c = readCsv(join(FIX, 'meuse.csv'));
  return { xy: xyOf(c), z: Float64Array.from(c.zinc, Math.log) };
}

function simData(dir = FIX): { xy: Float64Array; z: Float64Array } {
  const c = readCsv(join(dir, 'sim-field.csv'));
  return { xy: xyOf(c), z: Float64Array.from(c.s) };
}

/** |a - b| <= rel * max(|b|, scale): relative, with the variable's scale guarding values near 0. */
function close(a: number, b: number, scale: number, what: string) {
  expect(Math.abs(a - b), `${what}: tilth ${a} vs gstat ${b}`).toBeLessThanOrEqual(
    REL * Math.max(Math.abs(b), scale),
  );
}

function comparePoints(
  dir: string,
  file: string,
  data: { xy: Float64Array; z: Float64Array },
  model: KrigingModel & { nmax: number },
) {
  const ref = readCsv(join(dir, file));
  const r = krigingAtPoints(data.xy, data.z, xyOf(ref), model, { neighbours: model.nmax });
  const sill = model.nugget + model.psill;
  for (let i = 0; i < ref.x.length; i++) {
    close(r.mean[i], ref.pred[i], 1e-3 * sill, `${file} pred ${i}`);
    close(r.variance[i], Math.max(0, ref.var[i]), 1e-6 * sill, `${file} var ${i}`);
  }
  return ref.x.length;
}

function compareCv(
  dir: string,
  file: string,
  data: { xy: Float64Array; z: Float64Array },
  model: KrigingModel & { nmax: number },
) {
  const ref = readCsv(join(dir, file));
  const cv = krigingCv(data.xy, data.z, model, model.nmax);
  const sill = model.nugget + model.psill;
  for (let i = 0; i < ref.pred.length; i++) {
    expect(data.z[i]).toBeCloseTo(ref.observed[i], 12);
    close(cv.pred[i], ref.pred[i], 1e-3 * sill, `${file} pred ${i}`);
    close(cv.variance[i], ref.var[i], 1e-6 * sill, `${file} var ${i}`);
  }
  const e = ref.pred.map((p, i) => p - ref.observed[i]);
  close(cv.rmse, Math.sqrt(e.reduce((s, x) => s + x * x, 0) / e.length), 0, `${file} RMSE`);
  close(cv.msse, e.reduce((s, x, i) => s + (x * x) / ref.var[i], 0) / e.length, 0, `${file} MSSE`);
}

function all(dir: string) {
  const m = meta(dir).models;
  const meuse = meuseData(),
    sim = simData(dir);
  expect(comparePoints(dir, 'krige-meuse-sph16.csv', meuse, m['meuse-sph16'])).toBeGreaterThan(700);
  compareCv(dir, 'krige-cv-meuse-sph16.csv', meuse, m['meuse-sph16']);
  for (const name of ['exp12', 'gau16', 'sph16']) {
    expect(comparePoints(dir, `krige-sim-${name}.csv`, sim, m[`sim-${name}`])).toBe(1600);
    compareCv(dir, `krige-cv-sim-${name}.csv`, sim, m[`sim-${name}`]);
  }
}

describe('ordinary kriging matches R gstat krige / krige.cv to 1e-6 relative', () => {
  it('fixtures: Meuse log(zinc) spherical nmax 16; invented S field exponential 12, Gaussian 16, spherical 16 (gstat 2.1.0)', () => {
    expect(meta().versions.gstat).toBe('2.1.0');
    all(FIX);
  });

  it('the grid interpolator gives the same values as the point interpolator on a regular grid (gstat fixture grid)', () => {
    const m = meta().models['sim-exp12'];
    const sim = simData();
    const ref = readCsv(join(FIX, 'krige-sim-exp12.csv'));
    // the fixture's 40 x 40 points are the centres of 20 m cells from (450000, 5770000) to (450800, 5770800)
    const grid = { xmin: 450000, ymax: 5770800, cell: 20, cols: 40, rows: 40 };
    const r = krigingSurface(sim.xy, sim.z, grid, m, { neighbours: m.nmax });
    for (let i = 0; i < ref.x.length; i++) {
      const c = Math.round((ref.x[i] - 450010) / 20),
        row = Math.round((5770790 - ref.y[i]) / 20);
      close(r.values[row * 40 + c], ref.pred[i], 1e-3 * 68, `cell ${c},${row} pred`);
      close(r.variance[row * 40 + c], ref.var[i], 1e-6 * 68, `cell ${c},${row} var`);
    }
    expect(r.singular).toBe(0);
  });

  it('exact at the samples with zero nugget: gstat gives the sample value and variance 0 (to rounding)', () => {
    const m = meta().models['sim-sph16'];
    const sim = simData();
    const ref = readCsv(join(FIX, 'krige-sim-sph16-at-samples.csv'));
    const r = krigingAtPoints(sim.xy, sim.z, xyOf(ref), m, { neighbours: 16 });
    for (let i = 0; i < ref.x.length; i++) {
      expect(r.mean[i]).toBe(sim.z[i]);
      expect(ref.pred[i]).toBeCloseTo(sim.z[i], 9);
      expect(r.variance[i]).toBe(0);
      expect(Math.abs(ref.var[i])).toBeLessThan(1e-9);
    }
  });

  it.skipIf(!requireTool('Rscript', 'r-cran-gstat r-cran-sp', ['-e', 'library(gstat)']))(
    'live Rscript run of kriging.R',
    () => {
      const dir = mkdtempSync(join(tmpdir(), 'tilth-krige-'));
      try {
        const r = spawnSync('Rscript', ['tests/fixtures/gstat/kriging.R', dir], {
          cwd: ROOT,
          encoding: 'utf8',
        });
        expect(r.status, r.stderr).toBe(0);
        all(dir);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    },
    300_000,
  ); // R starts slowly on a busy machine
});

describe('chance below a threshold agrees with gstat conditional simulation', () => {
  it('invented S field, exponential model, all 64 samples as neighbours: P(S < 20) vs the share of 2000 gstat simulations below 20', () => {
    const m = meta().models['sim-exp12'];
    const sim = simData();
    const ref = readCsv(join(FIX, 'condsim-sim-exp-below20.csv'));
    const k = krigingAtPoints(sim.xy, sim.z, xyOf(ref), m, { neighbours: 64 });
    let chi = 0;
    for (let i = 0; i < ref.x.length; i++) {
      const p = chanceBelowAt(k.mean[i], k.variance[i], 20);
      const nsim = ref.nsim[i];
      // binomial sampling error of the simulated share; 4 standard errors (+ one simulation) per location
      const se = Math.sqrt(Math.max(p * (1 - p), 1 / nsim) / nsim);
      expect(
        Math.abs(p - ref.below20[i]),
        `location ${i}: tilth ${p} vs gstat share ${ref.below20[i]}`,
      ).toBeLessThanOrEqual(4 * se + 1 / nsim);
      chi += (p - ref.below20[i]) ** 2 / (se * se);
    }
    // overall: the squared standardized differences add up like a chi-square with 40 degrees of freedom
    // (99.9th percentile 73.4); a systematic error (e.g. a wrong variance) would push it far above
    expect(chi).toBeLessThan(73.4);
  });
});
