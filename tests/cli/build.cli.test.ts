/** `tilth build` end to end: the folder it writes, `tilth check` on each output, GDAL validity, user errors. */
import { mkdtempSync, readFileSync, readdirSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse as parseYaml, stringify } from 'yaml';
import { quarterBuild, ROOT, tilth } from '../helpers/cli.js';
import { ogrValid, requireTool } from '../helpers/tools.js';

const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');
const withPlan = (edit: (p: Record<string, any>) => void) => {
  const p = parseYaml(PLAN);
  edit(p);
  return stringify(p);
};

describe('tilth build (CLI)', () => {
  const tmp = () => mkdtempSync(join(tmpdir(), 'tilth-build-'));
  const args = (out: string, plan = join(ROOT, 'sample-fields/quarter/plan.yaml')) => [
    ...quarterBuild(out, { plan }),
    '--quiet',
  ];

  it('writes the prescription and its summary; --json parses', () => {
    const out = join(tmp(), 'rx');
    const r = tilth([...args(out), '--json']);
    expect(r.stderr).not.toMatch(/internal error/);
    expect(r.code).toBe(0);
    const s = JSON.parse(r.stdout);
    expect(s.zone_sets[0].zones).toBeGreaterThan(1);
    expect(readdirSync(out)).toEqual(
      expect.arrayContaining([
        'prescription.geojson',
        'zones.csv',
        'summary.json',
        'report.html',
        'report-data.json',
        'shapefiles',
      ]),
    );
    // tilth check passes its own outputs: the GeoJSON, each shapefile set and each zip
    const sets = readdirSync(join(out, 'shapefiles')).filter((f) => f.endsWith('.shp') || f.endsWith('.zip'));
    expect(sets.length).toBeGreaterThanOrEqual(2);
    for (const f of [join(out, 'prescription.geojson'), ...sets.map((x) => join(out, 'shapefiles', x))]) {
      const c = tilth([
        'check',
        f,
        '--boundary',
        'sample-fields/quarter/boundary.geojson',
        '--speed',
        '8',
        '--json',
      ]);
      expect(c.code, `${f}: ${c.stdout}${c.stderr}`).toBe(0);
    }
    const gj = JSON.parse(readFileSync(join(out, 'prescription.geojson'), 'utf8'));
    expect(gj.features.length).toBe(s.zone_sets[0].zones);
    // refuses to overwrite without --force
    const again = tilth(args(out));
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/not empty.*--force/);
    expect(tilth([...args(out), '--force']).code).toBe(0);
  });

  it.skipIf(!requireTool('ogrinfo', 'gdal-bin'))(
    'every zone is valid for GDAL (ogrinfo ST_IsValid, GDAL 3.6.2)',
    () => {
      const out = join(tmp(), 'rx');
      expect(tilth(args(out)).code).toBe(0);
      const [n, v] = ogrValid(join(out, 'prescription.geojson'), 'prescription');
      expect(n).toBeGreaterThan(1);
      expect(v).toBe(n);
    },
  );

  it('bad input: unknown product, output is a file, no sample inside the boundary', () => {
    const d = tmp();
    const bad = join(d, 'plan.yaml');
    writeFileSync(
      bad,
      withPlan((p) => {
        p.products[0].product = 'magic_dust';
      }),
    );
    const r1 = tilth(args(join(d, 'o1'), bad));
    expect(r1.code).toBe(2);
    expect(r1.stderr).toMatch(/magic_dust/);
    expect(existsSync(join(d, 'o1'))).toBe(false);
    writeFileSync(join(d, 'file'), 'x');
    const r2 = tilth(args(join(d, 'file')));
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/is a file/);
    const r3 = tilth([
      'build',
      '--samples',
      'sample-fields/zoned/samples.geojson',
      '--boundary',
      'sample-fields/quarter/boundary.geojson',
      '--plan',
      'sample-fields/quarter/plan.yaml',
      '--out',
      join(d, 'o3'),
      '--quiet',
    ]);
    expect(r3.code).toBe(2);
    expect(r3.stderr).not.toMatch(/at .*\.ts:\d+/);
    expect(existsSync(join(d, 'o3'))).toBe(false);
  });

  it('an infeasible plan: each zone reports it, the files are still written, exit 1', () => {
    const d = tmp();
    const plan = join(d, 'plan.yaml');
    // only MAP, only in the seed row, at most 10 lb/ac: the P2O5 targets cannot be met
    writeFileSync(
      plan,
      withPlan((p) => {
        p.products = [{ product: 'map', placements: ['seed_row'], max_rate: 10 }];
        p.implement.placements = ['seed_row'];
      }),
    );
    const r = tilth(args(join(d, 'rx'), plan));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/cannot meet their targets/);
    expect(r.stderr).toMatch(/zone set shared, zone \d+:/);
    expect(existsSync(join(d, 'rx', 'prescription.geojson'))).toBe(true);
  });
});
