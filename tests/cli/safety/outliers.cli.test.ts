/**
 * Keep or drop flagged neighbour outliers from the command line: --outliers on build, surface and variability
 * (default keep, said in --help), and the plan key soil_test.outliers for build (--outliers wins). The input is
 * the invented demo quarter with one P value typed ten times too high (HQ-04: 16 -> 160 ppm).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, tilth } from '../../helpers/cli.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
const B = join(Q, 'boundary.geojson');

function inputs(): { dir: string; csv: string; plan: string } {
  const dir = mkdtempSync(join(tmpdir(), 'tilth-outliers-'));
  const csv = join(dir, 'samples.csv');
  const text = readFileSync(join(Q, 'samples.csv'), 'utf8');
  const typo = text.replace(/^(261406,HQ-04,[^,]+,[^,]+,0-6,16,)16,/m, '$1160,');
  expect(typo).not.toBe(text);
  writeFileSync(csv, typo);
  const plan = join(dir, 'plan.yaml');
  writeFileSync(
    plan,
    readFileSync(join(Q, 'plan.yaml'), 'utf8').replace(/^  outliers: keep /m, '  outliers: drop '),
  );
  return { dir, csv, plan };
}

describe('--outliers keep | drop', () => {
  it('--help of build, surface and variability names the option and its default', () => {
    for (const cmd of ['build', 'surface', 'variability']) {
      const h = tilth([cmd, '--help']);
      expect(h.code).toBe(0);
      expect(h.stdout.replace(/\s+/g, ' ')).toMatch(/--outliers <keep\|drop>.*default keep/);
    }
  });

  it('surface: kept, the typed 160 shows in the map; dropped, the map stays within the field values', () => {
    const { dir, csv } = inputs();
    const run = (mode: string) => {
      const r = tilth([
        'surface',
        '--samples',
        csv,
        '--boundary',
        B,
        '--nutrient',
        'p',
        '--cell',
        '20',
        '--power',
        '2',
        '--neighbours',
        '8',
        '--out',
        join(dir, `p-${mode}.asc`),
        '--json',
        '--outliers',
        mode,
      ]);
      expect(r.code, r.stderr).toBe(0);
      return JSON.parse(r.stdout);
    };
    const keep = run('keep'),
      drop = run('drop');
    const msg = (j: any) => j.warnings.find((w: any) => w.code === 'neighbour-outlier').message;
    expect(msg(keep)).toMatch(/P of sample "HQ-04" \(160.*kept \(--outliers keep/);
    expect(msg(drop)).toMatch(/dropped from the maps \(--outliers drop\).*Dropped: HQ-04\./);
    expect(keep.max).toBeGreaterThan(100);
    expect(drop.max).toBeLessThanOrEqual(22); // the demo's other Olsen P values are at most 22 ppm (samples.csv); IDW stays within the data
    expect(drop.samplesUsed).toBe(keep.samplesUsed - 1);
  });

  it('build: the plan key drops, and the dropped id is in summary.json and the report; --outliers keep wins', () => {
    const { dir, csv, plan } = inputs();
    const build = (out: string, extra: string[] = []) => {
      const r = tilth([
        'build',
        '--samples',
        csv,
        '--boundary',
        B,
        '--plan',
        plan,
        '--out',
        join(dir, out),
        '--quiet',
        ...extra,
      ]);
      expect(r.code, r.stderr).toBeLessThan(2);
      return r;
    };
    const r = build('rx');
    expect(r.stderr).toMatch(/dropped from the maps \(plan key soil_test\.outliers: drop\).*Dropped: HQ-04/);
    const summary = JSON.parse(readFileSync(join(dir, 'rx', 'summary.json'), 'utf8'));
    const w = summary.warnings.find((x: any) => x.code === 'neighbour-outlier');
    expect(w.message).toMatch(/Dropped: HQ-04\./);
    expect(readFileSync(join(dir, 'rx', 'report.html'), 'utf8')).toMatch(/Dropped: HQ-04\./);
    const k = build('rx-keep', ['--outliers', 'keep']);
    expect(k.stderr).toMatch(/P of sample "HQ-04" \(160.*it is kept \(--outliers keep/);
  });

  it('a value other than keep or drop is a usage error', () => {
    const r = tilth(['inspect', '--samples', join(Q, 'samples.csv'), '--boundary', B, '--outliers', 'maybe']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/option --outliers: "maybe" is not keep or drop\. Fix: /);
  });
});
