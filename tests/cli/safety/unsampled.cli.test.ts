/**
 * A boundary with a part no sample speaks for, from the command line: refused without the plan key
 * unsampled_parts; with it, built, the part named in the output, and every written file passing `tilth check`
 * against the whole boundary (task data as a grid too). The field is the invented demo quarter with a detached
 * part about 1.4 km east of it.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, tilth } from '../../helpers/cli.js';
import { quarterWithUnsampledPart } from '../../helpers/inputs.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
const S = join(Q, 'samples.csv');

function setup(unsampled: string, grid = false): { dir: string; b: string; plan: string } {
  const dir = mkdtempSync(join(tmpdir(), 'tilth-unsampled-'));
  const b = join(dir, 'boundary.geojson');
  writeFileSync(b, quarterWithUnsampledPart());
  let text = readFileSync(join(Q, 'plan.yaml'), 'utf8').replace(
    /^unsampled_parts: null /m,
    `unsampled_parts: ${unsampled} `,
  );
  if (grid) text = text.replace(/^  isoxml_grid: false /m, '  isoxml_grid: true ');
  const plan = join(dir, 'plan.yaml');
  writeFileSync(plan, text);
  return { dir, b, plan };
}

const noStack = (s: string) => expect(s).not.toMatch(/internal error|\n\s+at /);

describe('unsampled boundary parts from the CLI', () => {
  it('without the plan key: exit 2 naming the part and the key; a plan rate the machine cannot take: exit 2', () => {
    const { dir, b, plan } = setup('null');
    const r = tilth([
      'build',
      '--samples',
      S,
      '--boundary',
      b,
      '--plan',
      plan,
      '--out',
      join(dir, 'rx'),
      '--quiet',
    ]);
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(
      /boundary part 2 of 2 lies more than 1000 m from every sample.*plan key unsampled_parts/s,
    );
    noStack(r.stderr);
    const bad = setup('{ urea: 1000 }');
    const r2 = tilth([
      'build',
      '--samples',
      S,
      '--boundary',
      bad.b,
      '--plan',
      bad.plan,
      '--out',
      join(bad.dir, 'rx'),
    ]);
    expect(r2.code, r2.stderr).toBe(2);
    expect(r2.stderr).toMatch(/unsampled_parts\.urea: 1000 lb\/ac is outside urea's machine limits 20-400/);
    noStack(r2.stderr);
  });

  it('with it: built, the part named, and every file passes tilth check against the whole boundary', () => {
    const { dir, b, plan } = setup('{ urea: 80, map: 40 }', true);
    const out = join(dir, 'rx');
    const r = tilth(['build', '--samples', S, '--boundary', b, '--plan', plan, '--out', out, '--quiet']);
    expect(r.code, r.stderr).toBeLessThan(2);
    const said =
      /boundary part 2 of 2 \(11\.\d ac\) lies more than 1000 m from every sample.*urea 80 lb\/ac side band, map 40 lb\/ac side band \(zone (\d+)\)/;
    expect(r.stderr).toMatch(said);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
    expect(summary.warnings.find((w: any) => w.code === 'unsampled-parts').message).toMatch(said);
    const zone = said.exec(r.stderr)![1];
    const rows = readFileSync(join(out, 'zones.csv'), 'utf8').trim().split('\n');
    const last = rows.at(-1)!;
    expect(last.split(',')[1]).toBe(zone);
    expect(last).toMatch(/unsampled part: the plan's unsampled_parts rates/);
    expect(readFileSync(join(out, 'report.html'), 'utf8')).toMatch(/unsampled part/);
    for (const f of ['prescription.geojson', 'taskdata.zip', 'shapefiles/rx_side_band.zip']) {
      const c = tilth(['check', join(out, f), '--boundary', b]);
      expect(c.code, `${f}\n${c.stdout}\n${c.stderr}`).toBe(0);
    }
  });
});
