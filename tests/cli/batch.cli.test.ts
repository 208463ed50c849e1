/**
 * `tilth batch` end to end: every field attempted, one exit code, the farm totals equal the sum of the
 * fields' own summary.json totals, and each field's folder equals what `tilth build` writes for it.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, tilth } from '../helpers/cli.js';

const Q = join(ROOT, 'sample-fields/quarter');
const field = (name: string, out: string, samples = `${Q}/samples.csv`) =>
  `  - name: ${name}\n    samples: ${samples}\n    boundary: ${Q}/boundary.geojson\n    out: ${out}\n`;

describe('tilth batch (CLI)', () => {
  it('builds every field, lists the bad one, exits 2; totals are the sum of the fields', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tilth-batch-'));
    writeFileSync(
      join(dir, 'farm.yaml'),
      `defaults:\n  plan: ${Q}/plan.yaml\n  cell: 10\nfields:\n${field('North', 'rx/north')}${field('Bad', 'rx/bad', `${Q}/no-such-file.csv`)}${field('South', 'rx/south')}`,
    );
    const r = tilth(['batch', 'farm.yaml', '--json', '--workers', '2'], { cwd: dir });
    expect(r.stderr).not.toMatch(/internal error/);
    expect(r.code).toBe(2);
    const s = JSON.parse(r.stdout);
    expect(s.fields.map((f: { name: string; status: string }) => [f.name, f.status])).toEqual([
      ['North', 'ok'],
      ['Bad', 'bad-input'],
      ['South', 'ok'],
    ]);
    expect(r.stderr).toMatch(/\[\d\/3\] Bad: bad input: .*no-such-file\.csv/);
    expect(r.stderr).toMatch(/1 of 3 field\(s\) need attention/);
    // the farm totals: each product and placement summed over the fields' summary.json (rounded to 1 lb each)
    const per = ['north', 'south'].map((f) =>
      JSON.parse(readFileSync(join(dir, 'rx', f, 'summary.json'), 'utf8')),
    );
    for (const t of s.totals) {
      const sum = per
        .flatMap((p) => p.totals)
        .filter(
          (x: { product: string; placement: string }) =>
            x.product === t.product && x.placement === t.placement,
        )
        .reduce((a: number, x: { total_lb: number }) => a + x.total_lb, 0);
      expect(Math.abs(t.total_lb - sum)).toBeLessThanOrEqual(1);
    }
    // a field's folder holds what tilth build writes for it (the same zones and totals)
    const b = tilth([
      'build',
      '--samples',
      `${Q}/samples.csv`,
      '--boundary',
      `${Q}/boundary.geojson`,
      '--plan',
      `${Q}/plan.yaml`,
      '--cell',
      '10',
      '--out',
      join(dir, 'single'),
      '--json',
      '--quiet',
    ]);
    expect(b.code).toBe(0);
    const single = JSON.parse(b.stdout);
    expect(per[0].totals).toEqual(single.totals);
    expect(readFileSync(join(dir, 'rx/north/zones.csv'), 'utf8')).toBe(
      readFileSync(join(dir, 'single/zones.csv'), 'utf8'),
    );
  });

  it('a farm file without fields is a user error naming the key', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tilth-batch-'));
    writeFileSync(join(dir, 'farm.yaml'), 'fields: []\n');
    const r = tilth(['batch', 'farm.yaml'], { cwd: dir });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/farm\.yaml: key "fields"/);
  });
});
