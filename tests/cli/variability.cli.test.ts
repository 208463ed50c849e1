/** `tilth variability` as a user runs it. */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import { spawnSync } from 'node:child_process';
import { ROOT, tilth } from '../helpers/cli.js';
import { requireTool } from '../helpers/tools.js';

describe('tilth variability', () => {
  it('--help shows an example and the caution', () => {
    const r = tilth(['variability', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Example:');
    expect(r.stdout).toContain('--nutrient');
    expect(r.stdout).toMatch(/agronomist/);
  });

  it('an unknown nutrient is a user error naming the option and the fix (exit 2, no stack)', () => {
    const r = tilth(['variability', '--samples', 'x.geojson', '--boundary', 'y.geojson', '--nutrient', 'Zn']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--nutrient');
    expect(r.stderr).toContain('Fix:');
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('an unsupported fit method is a user error', () => {
    const r = tilth([
      'variability',
      '--samples',
      'x.geojson',
      '--boundary',
      'y.geojson',
      '--fit-method',
      '5',
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--fit-method');
  });
});

describe('tilth variability on the demo quarter (invented data: plumbing, not agronomy)', () => {
  const args = [
    'variability',
    '--samples',
    'sample-fields/quarter/samples.geojson',
    '--boundary',
    'sample-fields/quarter/boundary.geojson',
  ];

  it('text names the low spots, the dependence class and a sampling recommendation', () => {
    const r = tilth([...args, '--nutrient', 'S']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/Low spots \(below 20 lb S\/ac\):\n\s+HQ-\d+/);
    expect(r.stdout).toMatch(/Spatial dependence: (STRONG|MODERATE|WEAK)/);
    expect(r.stdout).toMatch(/ac per sample/);
    expect(r.stdout).toContain('not low says little');
    // the share of the interpolated area below the threshold, from the surface stage's IDW
    expect(r.stdout).toMatch(/\d+ % of the mapped area/);
    // beside it, the chance below the threshold from kriging, with its assumption
    expect(r.stdout).toContain('Chance below 20 lb S/ac (from kriging; Gaussian assumption)');
    expect(r.stdout).toMatch(/expected share of the field below 20 lb S\/ac: \d+ %/);
    expect(r.stdout).toContain('Gaussian with the kriging mean and variance');
  });

  it('--json agrees with the samples file: every listed low sample is below the threshold', () => {
    const r = tilth([...args, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    const fc = JSON.parse(readFileSync(join(ROOT, 'sample-fields/quarter/samples.geojson'), 'utf8'));
    expect(j.low.length).toBeGreaterThan(0);
    expect(j.stats.n).toBe(fc.features.length);
    for (const l of j.low) expect(l.value).toBeLessThan(20);
    expect(['strong', 'moderate', 'weak']).toContain(j.dependence.class);
    expect(j.sulphur.floor).toBe(10);
    expect(j.shareBelow.area).toBeGreaterThan(0);
    expect(j.shareBelow.area).toBeLessThan(1);
    // without the surface, only the sample share
    const ns = JSON.parse(tilth([...args, '--json', '--no-surface']).stdout);
    expect(ns.shareBelow.area).toBeNull();
    expect(ns.shareBelow.samples).toBe(j.shareBelow.samples);
    expect(j.chance.refused).toBeNull();
    expect(j.chance.method).toMatch(/^ordinary kriging, (spherical|exponential|gaussian)/);
    expect(j.chance.expectedShare).toBeGreaterThan(0);
    expect(j.chance.expectedShare).toBeLessThan(1);
    expect(j.chance.shareLikely.p90).toBeLessThanOrEqual(j.chance.shareLikely.p50);
    expect(ns.chance).toBeUndefined();
  });

  it('--out writes the charts and JSON as one folder; they render in Chromium', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tilth-var-'));
    try {
      const outDir = join(dir, 'charts');
      const r = tilth([...args, '--out', outDir]);
      expect(r.code, r.stderr).toBe(0);
      expect(readdirSync(outDir).sort()).toEqual([
        '.tilth-output.json',
        'so4_s-chance-below-20.svg',
        'so4_s-map.svg',
        'so4_s-semivariogram.svg',
        'variability.json',
      ]);
      // a second run into the same, now non-empty folder is refused without --force
      expect(tilth([...args, '--out', outDir]).code).toBe(2);
      if (requireTool('chromium', 'chromium')) {
        for (const f of ['so4_s-map.svg', 'so4_s-chance-below-20.svg']) {
          const png = join(dir, f + '.png');
          spawnSync(
            'chromium',
            [
              '--headless',
              '--no-sandbox',
              '--disable-gpu',
              `--screenshot=${png}`,
              '--window-size=880,660',
              join(outDir, f),
            ],
            { timeout: 60_000 },
          );
          expect(statSync(png).size).toBeGreaterThan(10_000);
        }
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('tilth variability takes the S threshold and floor from the plan and tables', () => {
  it('a wheat plan (no S floor in the default tables) and a tables file with another canola floor', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tilth-var-plan-'));
    try {
      const plan = tilth(['plan', 'init', '--crop', 'wheat']);
      expect(plan.code, plan.stderr).toBe(0);
      writeFileSync(join(dir, 'plan.yaml'), plan.stdout);
      const base = [
        'variability',
        '--samples',
        'sample-fields/quarter/samples.geojson',
        '--boundary',
        'sample-fields/quarter/boundary.geojson',
        '--json',
      ];
      const w = JSON.parse(tilth([...base, '--plan', join(dir, 'plan.yaml')]).stdout);
      expect(w.sulphur.floor).toBe(0);
      writeFileSync(
        join(dir, 'tables.yaml'),
        'crops:\n  canola:\n    s_floor_lb: { value: 15, source: "test agronomist" }\n    s_low_below_lb: { value: 25, source: "test agronomist" }\n',
      );
      const c = JSON.parse(tilth([...base, '--tables', join(dir, 'tables.yaml')]).stdout);
      expect(c.sulphur.floor).toBe(15);
      expect(c.threshold.value).toBe(25);
      expect(c.threshold.source).toContain('test agronomist');
      // --threshold and --s-floor win over the tables
      const o = JSON.parse(
        tilth([...base, '--tables', join(dir, 'tables.yaml'), '--threshold', '12', '--s-floor', '5']).stdout,
      );
      expect(o.threshold.value).toBe(12);
      expect(o.sulphur.floor).toBe(5);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('tilth build report carries the sulphate-S variability charts', () => {
  it('report.html embeds the semivariogram and the low-spot map', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tilth-var-build-'));
    try {
      const plan = tilth(['plan', 'init', '--crop', 'canola']);
      writeFileSync(join(dir, 'plan.yaml'), plan.stdout);
      const r = tilth([
        'build',
        '--samples',
        'sample-fields/quarter/samples.geojson',
        '--boundary',
        'sample-fields/quarter/boundary.geojson',
        '--plan',
        join(dir, 'plan.yaml'),
        '--out',
        join(dir, 'out'),
      ]);
      expect(r.code, r.stderr).toBe(0);
      const html = readFileSync(join(dir, 'out', 'report.html'), 'utf8');
      expect(html).toContain('<h3>Semivariogram of sulphate-S (0-24 in)</h3>');
      expect(html).toContain('<h3>sulphate-S (0-24 in): low spots</h3>');
      expect(html).toMatch(/spatial dependence (strong|moderate|weak)/);
      // the chance map beside the S surface (the plan's surfaces are IDW: kriged for the chance map alone)
      expect(html).toContain('<h3>Sulphate-S 0-24 in: chance below 20 lb S/ac</h3>');
      expect(html).toContain('data-kind="chance"');
      expect(html).toContain('The S surface map before this one is not kriged');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('tilth variability says why there is no chance map', () => {
  it('20 samples: kriging is refused; the text, the JSON and the chart say so', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tilth-var-few-'));
    try {
      const fc = JSON.parse(readFileSync(join(ROOT, 'sample-fields/quarter/samples.geojson'), 'utf8'));
      fc.features = fc.features.slice(0, 20);
      writeFileSync(join(dir, 'few.geojson'), JSON.stringify(fc));
      const args = [
        'variability',
        '--samples',
        join(dir, 'few.geojson'),
        '--boundary',
        'sample-fields/quarter/boundary.geojson',
      ];
      const r = tilth([...args, '--out', join(dir, 'out')]);
      expect(r.code, r.stderr).toBe(0);
      expect(r.stdout).toMatch(
        /Chance below 20 lb S\/ac: no map: ordinary kriging is refused: only 20 samples/,
      );
      const svg = readFileSync(join(dir, 'out', 'so4_s-chance-below-20.svg'), 'utf8');
      expect(svg).toContain('No chance map');
      const j = JSON.parse(readFileSync(join(dir, 'out', 'variability.json'), 'utf8'));
      expect(j.chance.refused).toMatch(/only 20 samples/);
      expect(j.chance.expectedShare).toBeNull();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
