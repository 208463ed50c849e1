import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse } from 'yaml';
import { tilth } from '../helpers/cli.js';

const dir = mkdtempSync(join(tmpdir(), 'tilth-rates-'));

describe('tilth plan / rates / tables', () => {
  it('plan init writes a commented plan that rates then uses; text and --json', () => {
    const init = tilth(['plan', 'init', '--crop', 'canola']);
    expect(init.code).toBe(0);
    expect(init.stdout).toContain('# Caution: tilth computes suggestions');
    expect(init.stdout).toContain('licensed agronomist or certified crop adviser');
    const plan = join(dir, 'plan.yaml');
    writeFileSync(plan, init.stdout);
    expect(tilth(['plan', 'check', '--plan', plan]).code).toBe(0);

    const text = tilth(['rates', '--plan', plan, '--soil', 'no3=25,p=8,k=140,s=12,om=4']);
    expect(text.code).toBe(0);
    for (const s of [
      'class low',
      'Seed row (SBU 10.0 %)',
      'MAP 11-52-0',
      'Binding',
      'Expected return (estimate)',
      'kg/ha',
    ])
      expect(text.stdout).toContain(s);

    const js = tilth([
      'rates',
      '--plan',
      plan,
      '--soil',
      'no3=25,p=8,k=140,s=12,om=4,texture=light',
      '--json',
    ]);
    expect(js.code).toBe(0);
    const d = JSON.parse(js.stdout);
    expect(d.status).toBe('ok');
    expect(d.texture).toBe('light');
    // canola, light soil, 1 in spread on 10 in rows = SBU 10 %: [published] Manitoba Agriculture, Seed-Placed
    // Nitrogen Fertilizer: 0 lb urea-N at 1 in / 6-12 in rows, so no urea or ammonium sulphate with the seed;
    // MAP goes with the seed within its P2O5-as-MAP limit ([published] Manitoba Agriculture, Safe Rates of Seed-Placed
    // Phosphorus: 20 lb P2O5 at 1 in on 6-7 in rows, lowered to 20 x 7/10 = 14 on 10 in rows)
    expect(d.seedRow.n).toBe(0);
    expect(d.seedRow.applied.nCounted).toBe(0);
    expect(d.seedRow.p2o5).toBeCloseTo(14, 9);
    expect(d.seedRow.applied.p2o5).toBeGreaterThan(10);
    expect(d.seedRow.applied.p2o5).toBeLessThanOrEqual(14);
    expect(
      d.placements
        .find((p: { placement: string }) => p.placement === 'seed_row')
        .products.map((q: { product: string }) => q.product),
    ).toEqual(['map']);
  });

  it('every crop starter plan runs on a typical soil with exit 0, peas included', () => {
    // common practice (agronomy.md): inoculated peas need no N; no urea-type N with pea seed, MAP within its P limit
    for (const crop of ['canola', 'wheat', 'barley', 'malt_barley', 'peas']) {
      const file = join(dir, `${crop}.yaml`);
      writeFileSync(file, tilth(['plan', 'init', '--crop', crop]).stdout);
      const r = tilth([
        'rates',
        '--plan',
        file,
        '--soil',
        'no3=25,p=8,k=140,s=12,om=4,texture=heavy',
        '--json',
      ]);
      expect(r.code, `${crop}: ${r.stderr}`).toBe(0);
      const d = JSON.parse(r.stdout);
      expect(d.seedRow.applied.p2o5, crop).toBeGreaterThan(0);
    }
  });

  it('tables prints editable YAML that --tables reads back', () => {
    const t = tilth(['tables']);
    expect(t.code).toBe(0);
    const obj = parse(t.stdout);
    obj.crops.canola.n_per_bu = { value: 2.5, source: 'our own hybrid trials' };
    const edited = join(dir, 'my-tables.yaml');
    writeFileSync(edited, JSON.stringify(obj));
    const plan = join(dir, 'plan.yaml'); // written by the first test
    const d = JSON.parse(
      tilth(['rates', '--plan', plan, '--tables', edited, '--soil', 'no3=25,p=8,k=140,s=12,om=4', '--json'])
        .stdout,
    );
    // 2.5 lb N/bu x 50 bu - 25 nitrate = 100
    expect(d.nutrients.n.target.lbac).toBeCloseTo(100, 9);
  });

  it('user errors exit 2 with the key and the allowed values', () => {
    const plan = join(dir, 'bad.yaml');
    writeFileSync(plan, 'crop: canola\ntarget_yield_bu: 50\nunits: bu/ac\nproducts: [{ product: map }]\n');
    const r = tilth(['rates', '--plan', plan, '--soil', 'no3=25']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('key "units"');
    expect(r.stderr).toContain('allowed: lb/ac, kg/ha');
    expect(r.stderr).not.toContain('    at ');
    const s = tilth(['rates', '--plan', plan, '--soil', 'nitrate=25']);
    expect(s.code).toBe(2);
    expect(tilth(['plan', 'init', '--crop', 'sorghum']).stderr).toContain('allowed: canola, wheat');
  });

  it('an infeasible plan prints why and exits 2', () => {
    const plan = join(dir, 'nos.yaml');
    writeFileSync(
      plan,
      'crop: canola\ntarget_yield_bu: 50\nseed_row: { when_table_missing: light_soil_values }\nproducts: [{ product: map }, { product: urea }]\n',
    );
    const r = tilth(['rates', '--plan', plan, '--soil', 'no3=25,p=8,k=200,s=12,om=4']);
    expect(r.code).toBe(2);
    expect(r.stdout).toContain('no product in the plan carries S');
  });

  it('--help shows an example', () => {
    expect(tilth(['rates', '--help']).stdout).toContain('tilth rates --plan plan.yaml --soil');
  });
});
