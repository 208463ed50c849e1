/**
 * `tilth check` run as a command (the library parts are in tests/check/check.test.ts): passes tilth's own outputs and the hand-made good prescription, fails each broken
 * fixture naming the zone, and refuses unreadable input with exit 2. Fixtures: tests/fixtures/check/ and
 * tests/check/fixtures/ (invented field, written by scripts/make-check-fixtures.ts); binary broken sets are made here.
 */
import { describe, expect, it } from 'vitest';
import { existsSync, unlinkSync } from 'node:fs';
import { join } from 'node:path';
import { zipSync } from 'fflate';
import { tilth } from '../helpers/cli.js';
import { BOUNDARY, checkCase, COLS, fx, good, K2, line, tempSets } from '../helpers/checkFixtures.js';
import { writeShapefile } from '../../src/io/shapefile/index.js';
import type { CheckReport } from '../../src/check/index.js';

const { save } = tempSets('tilth-check-');
function json(args: string[]): { code: number; report: CheckReport; stderr: string } {
  const r = tilth(['check', ...args, '--json']);
  return {
    code: r.code,
    report: r.stdout ? (JSON.parse(r.stdout) as CheckReport) : (undefined as unknown as CheckReport),
    stderr: r.stderr,
  };
}

describe('tilth check on the hand-made prescriptions (GeoJSON)', () => {
  it('text output: one line per check, exit 0', async () => {
    const r = tilth(['check', fx('good.geojson'), '--boundary', BOUNDARY]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^PASS {2}overlap/m);
    expect(r.stdout).toMatch(/^SKIP {2}zone_size/m);
    expect(r.stdout).toMatch(/result: nothing failed/);
  });
  it('fails overlapping zones, naming both (overlap 400 m x 50 m by construction)', async () => {
    const { code, report } = json([checkCase('overlap', 'fail-overlap'), '--boundary', BOUNDARY]);
    expect(code).toBe(1);
    const [l] = line(report, 'overlap');
    expect(l.status).toBe('fail');
    expect(l.zones.sort()).toEqual(['zone 2', 'zone 3']);
    const a = Number(/\(([\d.]+) m2\)/.exec(l.message)![1]);
    expect(Math.abs(a - 20000 / K2) / (20000 / K2)).toBeLessThan(1e-3);
  });
  it('refuses a rate written as text, naming the zone and the value (exit 2)', async () => {
    const r = tilth(['check', checkCase('rates', 'refused-rate-text')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/zone 3, column "urea_lbac": "95 lb"/);
    expect(r.stderr).not.toMatch(/at .*\.ts:/); // no stack
  });
});

describe('tilth check refuses unreadable shapefiles and zips (exit 2, nothing written)', () => {
  const set = () => writeShapefile(good.features, COLS, { name: 'rx' });

  it('missing .prj: warns and reads WGS 84; --strict refuses', async () => {
    const d = save(set(), 'noprj');
    unlinkSync(join(d, 'rx.prj'));
    const { code, report } = json([join(d, 'rx.shp')]);
    expect(code).toBe(0);
    expect(line(report, 'crs')[0].status).toBe('warn');
    const r = tilth(['check', join(d, 'rx.shp'), '--strict']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/rx\.shp: has no coordinate system \(no \.prj/);
  });
  it('zip whose entry escapes the folder (zip slip): refused, nothing written', async () => {
    const f = set();
    const d = save(
      {
        'rx.zip': zipSync({ '../evil.shp': f['rx.shp'], '../evil.dbf': f['rx.dbf'], 'rx.shp': f['rx.shp'] }),
      },
      'slip/inner',
    );
    const r = tilth(['check', join(d, 'rx.zip')], { cwd: d });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/entry "\.\.\/evil\.shp" points outside the folder/);
    expect(existsSync(join(d, '..', 'evil.shp'))).toBe(false);
    expect(existsSync(join(d, 'evil.shp'))).toBe(false);
  });
});
