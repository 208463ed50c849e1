/**
 * Hostile and careless inputs end in a user error (exit 2, a message, no stack) or, for inspect, a warning
 * block with exit 0. Cases from a careless-user trial of the CLI; inputs are temporary edits of the invented demo.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, quarterBuild, tilth } from '../../helpers/cli.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
const tmp = () => mkdtempSync(join(tmpdir(), 'tilth-refuse-'));
const noStack = (s: string) => expect(s).not.toMatch(/internal error|\n\s+at /);

/** The demo CSV with only the id and position columns (no nutrient column). */
function noNutrientCsv(d: string): string {
  const lines = readFileSync(join(Q, 'samples.csv'), 'utf8').split('\n');
  const h = lines.findIndex((l) => l.startsWith('Lab No'));
  const out = lines
    .slice(h)
    .filter(Boolean)
    .map((l) => l.split(',').slice(1, 4).join(','));
  const p = join(d, 'ids-only.csv');
  writeFileSync(p, out.join('\n') + '\n');
  return p;
}

describe('refusals before any work', () => {
  it('build with no nutrient column: exit 2 naming the fix; inspect: a warning block and exit 0', () => {
    const d = tmp(),
      csv = noNutrientCsv(d);
    const b = tilth([...quarterBuild(join(d, 'rx'), { samples: csv }), '--quiet']);
    expect(b.code, b.stderr).toBe(2);
    expect(b.stderr).toMatch(
      /cannot make a prescription[\s\S]*no usable nitrate-N, P, K or sulphate-S value/,
    );
    noStack(b.stderr);
    const i = tilth(['inspect', '--samples', csv, '--boundary', join(Q, 'boundary.geojson')]);
    expect(i.code, i.stderr).toBe(0);
    expect(i.stderr).toMatch(/warning: these inputs cannot make a prescription/);
  });
  it('variability --width 1e-9 and --cutoff/--width contradictions: exit 2, at once', () => {
    const r = tilth([
      'variability',
      '--samples',
      join(Q, 'samples.csv'),
      '--boundary',
      join(Q, 'boundary.geojson'),
      '--no-surface',
      '--width',
      '1e-9',
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/lags, more than 1,000\. Fix: give --width/);
    noStack(r.stderr);
  });
  it('surface --min-neighbours above the number of samples, or above --neighbours: exit 2', () => {
    const base = [
      'surface',
      '--samples',
      join(Q, 'samples.csv'),
      '--boundary',
      join(Q, 'boundary.geojson'),
      '--nutrient',
      'p',
      '--out',
      join(tmp(), 'p.asc'),
    ];
    const a = tilth([...base, '--min-neighbours', '1000']);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/every cell would be empty/);
    const b = tilth([...base, '--neighbours', '8', '--min-neighbours', '12']);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/contradict/);
  });
  it('check --min above --max is a usage error, not a failed check', () => {
    const r = tilth([
      'check',
      join(ROOT, 'tests', 'fixtures', 'check', 'good.geojson'),
      '--min',
      '300',
      '--max',
      '10',
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--min 300 and --max 10 contradict/);
  });
  it('check of a GeoJSON with null and NaN coordinates: a failed geometry line, no stack', () => {
    const d = tmp(),
      p = join(d, 'nan.geojson');
    writeFileSync(
      p,
      '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"N_lbac":1},"geometry":{"type":"Polygon","coordinates":[[[-106,52],[-105.99,52],[-105.99,NaN],[-106,52]]]}},' +
        '{"type":"Feature","properties":{"N_lbac":2},"geometry":{"type":"Polygon","coordinates":[null]}}]}',
    );
    const r = tilth(['check', p]);
    noStack(r.stderr);
    expect([1, 2]).toContain(r.code);
  });
  it('build --cell below the documented minimum (0.5 m) is refused at once', () => {
    const d = tmp();
    const r = tilth([...quarterBuild(join(d, 'rx')), '--cell', '0.1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--cell: "0\.1" is not a number >= 0\.5/);
  });
});
