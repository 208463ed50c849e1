/**
 * `tilth surface --method kriging|auto --chance-maps` end to end on the invented demo quarter: the grids written,
 * the cross-validation table with both methods, chance values in [0, 1]; a refusal names its reason.
 * (Agreement with R gstat is in tests/surface/kriging.gstat.test.ts.)
 */
import { mkdtempSync, readFileSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { readAsc } from '../../src/surface/asc.js';
import { tilth } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'tilth-krige-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const IN = [
  '--samples',
  'sample-fields/quarter/samples.csv',
  '--boundary',
  'sample-fields/quarter/boundary.geojson',
];

describe('tilth surface with kriging', () => {
  it('--method auto --chance-maps for sulphate-S: both methods in the table, kriging variance and chance below 20 written', () => {
    const r = tilth([
      'surface',
      ...IN,
      '--nutrient',
      's',
      '--method',
      'auto',
      '--chance-maps',
      '--out',
      join(dir, 's.asc'),
      '--json',
    ]);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const methods = j.crossValidation.map((row: { method: string }) => row.method);
    expect(methods).toContain('idw');
    expect(methods).toContain('kriging');
    const chosen = j.crossValidation.filter((row: { chosen: boolean }) => row.chosen);
    expect(chosen).toHaveLength(1);
    expect(chosen[0].rmse).toBe(Math.min(...j.crossValidation.map((row: { rmse: number }) => row.rmse)));
    if (j.method === 'kriging') {
      const chance = readAsc(readFileSync(join(dir, 's-chance-below-20.asc'), 'utf8'));
      const mean = readAsc(readFileSync(join(dir, 's.asc'), 'utf8'));
      let n = 0;
      chance.values.forEach((p, i) => {
        if (p === chance.nodata || Number.isNaN(p)) return;
        n++;
        expect(p).toBeGreaterThanOrEqual(0);
        expect(p).toBeLessThanOrEqual(1);
        // a cell whose mean is well below 20 is more likely low than not, and the reverse
        if (mean.values[i] < 15) expect(p).toBeGreaterThan(0.5);
        if (mean.values[i] > 25) expect(p).toBeLessThan(0.5);
      });
      expect(n).toBeGreaterThan(1000);
      expect(existsSync(join(dir, 's-variance.asc'))).toBe(true);
    }
  });

  it('--method kriging --chance-maps for P: class chances and the expected response chance', () => {
    const r = tilth([
      'surface',
      ...IN,
      '--nutrient',
      'p',
      '--method',
      'kriging',
      '--chance-maps',
      '--out',
      join(dir, 'p.asc'),
    ]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(/ordinary kriging as asked/);
    for (const f of ['p-variance.asc', 'p-response-chance.asc', 'p-class-low.asc'])
      expect(existsSync(join(dir, f)), f).toBe(true);
  });

  it('a refusal is a user error that says why (zone-composite field: too few samples)', () => {
    const r = tilth([
      'surface',
      '--samples',
      'sample-fields/zoned/samples.csv',
      '--boundary',
      'sample-fields/zoned/boundary.geojson',
      '--nutrient',
      's',
      '--method',
      'kriging',
      '--out',
      join(dir, 'z.asc'),
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/kriging is refused: only \d+ samples/);
  });
});
